package org.lanesift.plugins.serial;

import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.function.Supplier;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OutputException;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;
import org.lanesift.time.Femtos;
import org.lanesift.time.TimeValue;

/**
 * {@code lanesift capture}: captures a device (or the built-in simulator) into a spool directory
 * with a one-line live status on stderr, stopping cleanly on Ctrl-C. {@code lanesift live} uses
 * it and adds decoding while capturing. Options: {@link #SPEC}.
 */
public final class CaptureTool implements Tool {
    /** The command line; {@code lanesift live} offers the same options. */
    static final ToolSpec SPEC = ToolSpec.builder("capture")
            .summary("captures a USB acquisition device (or the simulator) into a spool, losing nothing")
            .description("Captures a device into a spool directory (docs/spool.md); every received byte is kept.",
                    "Give exactly one of --port, --device, --simulate (or --list).")
            .flag("list", "list the serial ports and exit")
            .option(OptionSpec.text("port", null, "serial port name or path (a pseudo-terminal's path works)"), "NAME")
            .option(OptionSpec.text("device", null, "first port with this USB id, hex (see --list)"), "VID:PID")
            .flag("simulate", "the built-in device simulator over an in-memory link")
            .option(OptionSpec.text("out", "lanesift-spool", "spool directory, new or empty"), "DIR")
            .option(OptionSpec.time("duration", TimeValue.Unit.S, null,
                    "stop after this long: 30s, 500ms, 2min, 1h; a bare number is seconds (default: until Ctrl-C)"), "T")
            .flag("raw", "the device streams plain logic8 bytes at --rate with no framing")
            .option(OptionSpec.number("rate", "Hz", null, 1.0, 1e12,
                    "framed: sample rate to configure, one the device lists; raw: the device's rate (such as 24MHz)"), "HZ")
            .option(OptionSpec.integer("channels", 8L, 1, 8, "raw mode: channels"), "N")
            .option(OptionSpec.time("reconnect", TimeValue.Unit.S, "10s",
                    "keep trying to reopen after a disconnect for this long (0 = stop)"), "T")
            .option(OptionSpec.integer("baud", 115200L, 1, 100_000_000, "baud rate for real UARTs (USB CDC ignores it)"), "N")
            .option(OptionSpec.integer("sim-mb", 64L, 1, 1_000_000, "simulator: megabytes of samples to send"), "N")
            .option(OptionSpec.text("sim-faults", "", "simulator: drop=F,corrupt=F,dup=F,stall=F:MS,disconnect=F (F = frame number)"),
                    "LIST")
            .footer("Exit codes: 0 done, 1 device or disk failure, 2 bad arguments. --quiet: no status line.",
                    "Caution: connect probes and devices as their makers instruct; a device on a mains-referenced "
                            + "circuit can put the host's USB ground at a dangerous potential. Follow local codes and practice.")
            .build();

    private final SerialPorts ports;

    /** Creates the tool on the real ports (ServiceLoader). */
    public CaptureTool() {
        this(new JSerialCommPorts());
    }

    /**
     * Creates the tool on given ports (tests).
     *
     * @param ports port access
     */
    public CaptureTool(SerialPorts ports) {
        this.ports = ports;
    }

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        if (args.flag("list")) {
            return list(console.out());
        }
        String port = args.text("port");
        String device = args.text("device");
        boolean simulate = args.flag("simulate");
        Path dir = Path.of(args.text("out"));
        Capture.Settings s = new Capture.Settings();
        s.raw = args.flag("raw");
        s.rateHz = args.has("rate") ? args.number("rate") : 0;
        s.channels = (int) args.integer("channels", 8);
        s.durationMs = args.has("duration") ? millis(args, "duration") : -1;
        s.reconnectMs = millis(args, "reconnect");
        int baud = (int) args.integer("baud", 115200);
        int sources = (port != null ? 1 : 0) + (device != null ? 1 : 0) + (simulate ? 1 : 0);
        if (sources != 1) {
            throw new OptionException("port", "give exactly one of --port NAME, --device VID:PID, --simulate (or --list)");
        }
        if (s.raw && !(s.rateHz > 0)) {
            throw new OptionException("rate", "--raw needs --rate HZ, the device's sample rate");
        }
        if (Files.exists(dir) && (!Files.isDirectory(dir) || !isEmpty(dir))) {
            throw new OptionException("out", "--out " + dir + ": exists and is not an empty directory; a spool needs a new or empty one");
        }
        Supplier<SerialLink> opener;
        if (simulate) {
            DeviceSimulator.Plan plan = simPlan(args.text("sim-faults"), args.integer("sim-mb", 64), s.raw);
            SimulatedDevice sim = new SimulatedDevice(plan);
            opener = sim::connect;
        } else if (device != null) {
            int[] id = SerialPorts.parseUsbId(device);
            opener = () -> ports.openById(id[0], id[1], baud);
        } else {
            opener = () -> ports.open(port, baud);
        }
        try {
            return capture(opener, dir, s, console.quiet(), console.err());
        } catch (IOException e) {
            throw new OutputException("capture: " + dir + ": " + e.getMessage(), e);
        }
    }

    private static boolean isEmpty(Path dir) {
        try (var files = Files.list(dir)) {
            return files.findAny().isEmpty();
        } catch (IOException e) {
            throw new OutputException("--out " + dir + ": cannot be listed: " + e.getMessage(), e);
        }
    }

    /** A time option in whole milliseconds, from 0 up to about 31 years. */
    private static long millis(ToolArgs args, String name) {
        TimeValue t = args.time(name);
        double ms = t.toFs(Double.NaN, Double.NaN) / Femtos.PER_MS;
        if (!(ms >= 0) || ms > 1e12) {
            throw new OptionException(name, "--" + name + " " + t + ": expected a time from 0 up to about 31 years");
        }
        return Math.round(ms);
    }

    private int list(PrintStream out) {
        List<PortInfo> all = ports.list();
        if (all.isEmpty()) {
            out.println("no serial ports found (pseudo-terminals are not listed; give their path to --port)");
        }
        for (PortInfo p : all) {
            out.printf(Locale.ROOT, "%-14s %-24s %-9s %-16s %s%n", p.name(), p.path(), p.usbId().isEmpty() ? "-" : p.usbId(),
                    p.serialNumber().isEmpty() ? "-" : p.serialNumber(), p.description());
        }
        return 0;
    }

    private static int capture(Supplier<SerialLink> opener, Path dir, Capture.Settings s, boolean quiet, PrintStream err) throws IOException {
        Capture c = new Capture(opener, dir, s);
        CountDownLatch done = new CountDownLatch(1);
        Thread hook = new Thread(() -> {
            c.stop();
            try {
                done.await(10, TimeUnit.SECONDS);
            } catch (InterruptedException ignored) {
                // exiting anyway
            }
        }, "capture-stop");
        Runtime.getRuntime().addShutdownHook(hook);
        Status status = quiet ? null : new Status(c, dir, err);
        if (status != null) {
            status.start();
        }
        Capture.Result r;
        try {
            r = c.run();
        } finally {
            done.countDown();
            if (status != null) {
                status.finish();
            }
            try {
                Runtime.getRuntime().removeShutdownHook(hook);
            } catch (IllegalStateException shuttingDown) {
                // Ctrl-C: the hook is running
            }
        }
        err.printf(Locale.ROOT, "capture: kept %d bytes in %d segment(s) of %s: %d frames, %d gaps, %d CRC failures; ended by %s%n",
                r.bytes(), r.segments(), dir, r.frames(), r.gaps(), r.crcFailures(), r.reason());
        return 0;
    }

    /** The one-line status, refreshed twice a second. */
    static final class Status extends Thread {
        private final Capture c;
        private final Path dir;
        private final PrintStream err;
        private volatile boolean end;

        Status(Capture c, Path dir, PrintStream err) {
            super("capture-status");
            setDaemon(true);
            this.c = c;
            this.dir = dir;
            this.err = err;
        }

        @Override
        public void run() {
            long lastBytes = 0;
            long lastT = System.nanoTime();
            while (!end) {
                try {
                    Thread.sleep(500);
                } catch (InterruptedException e) {
                    return;
                }
                SpoolWriter w = c.writer();
                if (w == null || end) {
                    continue;
                }
                long now = System.nanoTime();
                long b = w.bytes();
                double mbs = (b - lastBytes) / 1e6 / ((now - lastT) / 1e9);
                lastBytes = b;
                lastT = now;
                err.print("\r" + line(w, mbs, decodeLag(dir, b)));
                err.flush();
            }
        }

        static String line(SpoolWriter w, double mbs, String lag) {
            return String.format(Locale.ROOT, "live %7.2f MB/s %10.1f MB %9d frames %5d gaps %5d crc  seg %d  decode lag %s   ",
                    mbs, w.bytes() / 1e6, w.frames(), w.gaps(), w.crcFailures(), w.segment(), lag);
        }

        static String decodeLag(Path dir, long bytes) {
            Path p = dir.resolve(SpoolFiles.DECODE_POS);
            try {
                if (!Files.exists(p)) {
                    return "-";
                }
                String[] f = Files.readString(p, StandardCharsets.US_ASCII).trim().split(" ");
                long read = Long.parseLong(f[0]);
                return String.format(Locale.ROOT, "%.1f MB", Math.max(0, bytes - read) / 1e6);
            } catch (IOException | RuntimeException e) {
                return "?";
            }
        }

        void finish() {
            end = true;
            interrupt();
            err.println();
        }
    }

    static DeviceSimulator.Plan simPlan(String faults, long mb, boolean raw) {
        DeviceSimulator.Plan p = new DeviceSimulator.Plan();
        p.raw = raw;
        p.totalSamples = mb * 1_000_000L;
        if (faults.isEmpty()) {
            return p;
        }
        for (String f : faults.split(",")) {
            String[] kv = f.split("=", 2);
            if (kv.length != 2) {
                throw new OptionException("sim-faults", "--sim-faults " + faults + ": '" + f + "' is not NAME=FRAME");
            }
            try {
                switch (kv[0]) {
                    case "drop" -> p.drop.add(Long.parseLong(kv[1]));
                    case "corrupt" -> p.corrupt.add(Long.parseLong(kv[1]));
                    case "dup" -> p.duplicate.add(Long.parseLong(kv[1]));
                    case "disconnect" -> p.disconnectAfter = Long.parseLong(kv[1]);
                    case "stall" -> {
                        String[] fm = kv[1].split(":", 2);
                        p.stallMs.put(Long.parseLong(fm[0]), fm.length > 1 ? Long.parseLong(fm[1]) : 500L);
                    }
                    default -> throw new OptionException("sim-faults", "--sim-faults: unknown fault '" + kv[0] + "'; expected drop, corrupt, dup, stall, disconnect");
                }
            } catch (NumberFormatException e) {
                throw new OptionException("sim-faults", "--sim-faults " + faults + ": '" + f + "' needs a whole frame number");
            }
        }
        return p;
    }

    /** The simulator behind {@code --simulate}: after a disconnect fault it reconnects once and goes on. */
    static final class SimulatedDevice {
        private final DeviceSimulator.Plan plan;
        private int connects;

        SimulatedDevice(DeviceSimulator.Plan plan) {
            this.plan = plan;
        }

        synchronized SerialLink connect() {
            DeviceSimulator.Plan p = plan;
            if (connects > 0) {
                if (plan.disconnectAfter < 0 || connects > 1) {
                    throw new DeviceException("simulator: no device");
                }
                p = new DeviceSimulator.Plan();
                p.raw = plan.raw;
                p.samplesPerFrame = plan.samplesPerFrame;
                p.firstFrame = plan.disconnectAfter + 1 + 100; // a hundred frames' time passed while away
                p.totalSamples = Math.max(0, plan.totalSamples - (plan.disconnectAfter + 1) * plan.samplesPerFrame);
            }
            connects++;
            Loopback lb = new Loopback(1 << 22);
            Thread t = new Thread(new DeviceSimulator(lb.device(), p), "simulator");
            t.setDaemon(true);
            t.start();
            return lb.host();
        }
    }
}
