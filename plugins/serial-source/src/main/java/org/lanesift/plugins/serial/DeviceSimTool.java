package org.lanesift.plugins.serial;

import java.io.PrintStream;
import java.util.Locale;
import org.lanesift.plugin.Tool;

/**
 * {@code lanesift simulate-device}: runs the {@link DeviceSimulator} on a serial port, such as one
 * end of a pseudo-terminal pair made by {@code socat}, so {@code lanesift live --port} can capture
 * it from the other end as it would a real device. Usage: {@link #USAGE}.
 */
public final class DeviceSimTool implements Tool {
    static final String USAGE = String.join("\n",
            "Usage: lanesift simulate-device --port NAME [options]",
            "Acts as an acquisition device on a serial port (such as one end of a socat pty pair):",
            "answers the identification exchange, then streams framed 8-channel logic (docs/device-stream.md).",
            "  --port NAME        serial port name or path to serve",
            "  --mb N             megabytes of samples to send (default 64)",
            "  --faults LIST      drop=F,corrupt=F,dup=F,stall=F:MS,disconnect=F (F = frame number)",
            "  --real-time        send at the configured sample rate, as a device does (default: as fast as the port takes it)",
            "  --raw --rate HZ    plain sample bytes, no framing and no handshake (the host needs --raw --rate too)",
            "  --baud N           baud rate (default 115200; ptys and USB CDC ignore it)",
            "After the last sample the port stays open until the host sends STOP (or Ctrl-C).",
            "Exit codes: 0 done, 1 port failure, 2 bad arguments.");

    private final SerialPorts ports;

    /** Creates the tool on the real ports (ServiceLoader). */
    public DeviceSimTool() {
        this(new JSerialCommPorts());
    }

    DeviceSimTool(SerialPorts ports) {
        this.ports = ports;
    }

    @Override
    public String name() {
        return "simulate-device";
    }

    @Override
    public String summary() {
        return "acts as a simulated acquisition device on a serial port (for a socat pty pair)";
    }

    @Override
    public int run(String[] args, PrintStream out, PrintStream err) {
        String port = null;
        long mb = 64;
        String faults = "";
        boolean realTime = false;
        boolean raw = false;
        double rate = 0;
        int baud = 115200;
        try {
            for (int i = 0; i < args.length; i++) {
                String a = args[i];
                switch (a) {
                    case "-h", "--help" -> {
                        out.println(USAGE);
                        return 0;
                    }
                    case "--port" -> port = CaptureTool.value(args, ++i, a);
                    case "--mb" -> mb = (long) CaptureTool.positive(CaptureTool.value(args, ++i, a), a, 1e6);
                    case "--faults" -> faults = CaptureTool.value(args, ++i, a);
                    case "--real-time" -> realTime = true;
                    case "--raw" -> raw = true;
                    case "--rate" -> rate = CaptureTool.positive(CaptureTool.value(args, ++i, a), a, 4e9);
                    case "--baud" -> baud = (int) CaptureTool.positive(CaptureTool.value(args, ++i, a), a, 1e8);
                    default -> throw new CaptureTool.BadArgument("unknown argument '" + a + "'; see --help");
                }
            }
            if (port == null) {
                throw new CaptureTool.BadArgument("--port NAME is required: the serial port to act as a device on");
            }
            if (raw && rate <= 0) {
                throw new CaptureTool.BadArgument("--raw needs --rate HZ, the rate the host is told with its own --rate");
            }
            DeviceSimulator.Plan plan = CaptureTool.simPlan(faults, mb, raw);
            plan.closeAtEnd = false;
            plan.realTime = realTime;
            if (rate > 0) {
                plan.rateHz = rate;
            }
            SerialLink link = ports.open(port, baud);
            DeviceSimulator sim = new DeviceSimulator(link, plan);
            Thread hook = new Thread(() -> {
                sim.stop();
                link.close();
            }, "simulate-device-stop");
            Runtime.getRuntime().addShutdownHook(hook);
            err.println("simulate-device: on " + port + (raw ? ", raw" : ", waiting for the host (lanesift live --port ...)"));
            sim.run();
            // all sent: keep the port open until the host says STOP, so it can drain what is buffered
            while (!sim.stopped() && !raw) {
                Thread.sleep(50);
            }
            link.close();
            try {
                Runtime.getRuntime().removeShutdownHook(hook);
            } catch (IllegalStateException shuttingDown) {
                // Ctrl-C: the hook is running
            }
            err.printf(Locale.ROOT, "simulate-device: sent %d frames (%d samples each)%s%n", sim.framesSent(), plan.samplesPerFrame,
                    raw ? "" : "; the host stopped the stream");
            return 0;
        } catch (CaptureTool.BadArgument e) {
            err.println("simulate-device: " + e.getMessage());
            return 2;
        } catch (DeviceException e) {
            err.println("simulate-device: " + e.getMessage());
            return 1;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return 1;
        }
    }
}
