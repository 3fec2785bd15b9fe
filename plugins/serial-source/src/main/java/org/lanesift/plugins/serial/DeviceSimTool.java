package org.lanesift.plugins.serial;

import java.io.PrintStream;
import java.util.Locale;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;

/**
 * {@code lanesift simulate-device}: runs the {@link DeviceSimulator} on a serial port, such as one
 * end of a pseudo-terminal pair made by {@code socat}, so {@code lanesift live --port} can capture
 * it from the other end as it would a real device. Options: {@link #SPEC}.
 */
public final class DeviceSimTool implements Tool {
    /** The command line. */
    static final ToolSpec SPEC = ToolSpec.builder("simulate-device")
            .summary("acts as a simulated acquisition device on a serial port (for a socat pty pair)")
            .description("Acts as an acquisition device on a serial port (such as one end of a socat pty pair):",
                    "answers the identification exchange, then streams framed 8-channel logic (docs/device-stream.md).")
            .required(OptionSpec.text("port", null, "serial port name or path to serve"), "NAME")
            .option(OptionSpec.integer("mb", 64L, 1, 1_000_000, "megabytes of samples to send"), "N")
            .option(OptionSpec.text("faults", "", "drop=F,corrupt=F,dup=F,stall=F:MS,disconnect=F (F = frame number)"), "LIST")
            .flag("real-time", "send at the configured sample rate, as a device does (default: as fast as the port takes it)")
            .flag("raw", "plain sample bytes, no framing and no handshake (the host needs --raw --rate too)")
            .option(OptionSpec.number("rate", "Hz", null, 1.0, 4e9, "sample rate, with --raw (such as 24MHz)"), "HZ")
            .option(OptionSpec.integer("baud", 115200L, 1, 100_000_000, "baud rate (ptys and USB CDC ignore it)"), "N")
            .footer("After the last sample the port stays open until the host sends STOP (or Ctrl-C).",
                    "Exit codes: 0 done, 1 port failure, 2 bad arguments.")
            .build();

    private final SerialPorts ports;

    /** Creates the tool on the real ports (ServiceLoader). */
    public DeviceSimTool() {
        this(new JSerialCommPorts());
    }

    DeviceSimTool(SerialPorts ports) {
        this.ports = ports;
    }

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        PrintStream err = console.err();
        String port = args.text("port");
        boolean raw = args.flag("raw");
        double rate = args.has("rate") ? args.number("rate") : 0;
        int baud = (int) args.integer("baud", 115200);
        if (raw && rate <= 0) {
            throw new OptionException("rate", "--raw needs --rate HZ, the rate the host is told with its own --rate");
        }
        try {
            DeviceSimulator.Plan plan = CaptureTool.simPlan(args.text("faults"), args.integer("mb", 64), raw);
            plan.realTime = args.flag("real-time");
            plan.closeAtEnd = false;
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
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return 1;
        }
    }
}
