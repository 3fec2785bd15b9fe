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
import org.lanesift.plugin.Tool;

/**
 * {@code lanesift capture}: captures a device (or the built-in simulator) into a spool directory
 * with a one-line live status on stderr, stopping cleanly on Ctrl-C. {@code lanesift live} uses
 * it and adds decoding while capturing. Usage: {@link #USAGE}.
 */
public final class CaptureTool implements Tool {
    static final String USAGE = String.join("\n",
            "Usage: lanesift capture (--port NAME | --device VID:PID | --simulate) [options]",
            "       lanesift capture --list",
            "Captures a device into a spool directory (docs/spool.md); every received byte is kept.",
            "  --port NAME        serial port name or path (a pseudo-terminal's path works)",
            "  --device VID:PID   first port with this USB id, hex (see --list)",
            "  --simulate         the built-in device simulator over an in-memory link",
            "  --out DIR          spool directory, new or empty (default lanesift-spool)",
            "  --duration T       stop after T: 30s, 500ms, 2m, 1h; a bare number is seconds (default: until Ctrl-C)",
            "  --raw --rate HZ    the device streams plain logic8 bytes at HZ with no framing",
            "  --rate HZ          (framed) sample rate to configure; one the device lists",
            "  --channels N       raw mode: channels 1..8 (default 8)",
            "  --reconnect T      keep trying to reopen after a disconnect for T (default 10s; 0 = stop)",
            "  --baud N           baud rate for real UARTs (default 115200; USB CDC ignores it)",
            "  --sim-mb N         simulator: megabytes of samples to send (default 64)",
            "  --sim-faults LIST  simulator: drop=F,corrupt=F,dup=F,stall=F:MS,disconnect=F (F = frame number)",
            "  -q, --quiet        no status line",
            "Exit codes: 0 done, 1 device or disk failure, 2 bad arguments.",
            "Caution: connect probes and devices as their makers instruct; a device on a mains-referenced",
            "circuit can put the host's USB ground at a dangerous potential. Follow local codes and practice.");

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
    public String name() {
        return "capture";
    }

    @Override
    public String summary() {
        return "captures a USB acquisition device (or the simulator) into a spool, losing nothing";
    }

    /** Thrown for a bad argument; the message is the one line shown. */
    static final class BadArgument extends RuntimeException {
        private static final long serialVersionUID = 1L;

        BadArgument(String m) {
            super(m);
        }
    }

    @Override
    public int run(String[] args, PrintStream out, PrintStream err) {
        String port = null;
        String device = null;
        boolean simulate = false;
        boolean list = false;
        boolean quiet = false;
        Path dir = Path.of("lanesift-spool");
        Capture.Settings s = new Capture.Settings();
        s.reconnectMs = 10_000;
        int baud = 115200;
        long simMb = 64;
        String faults = "";
        try {
            for (int i = 0; i < args.length; i++) {
                String a = args[i];
                switch (a) {
                    case "-h", "--help" -> {
                        out.println(USAGE);
                        return 0;
                    }
                    case "--list" -> list = true;
                    case "--port" -> port = value(args, ++i, a);
                    case "--device" -> device = value(args, ++i, a);
                    case "--simulate" -> simulate = true;
                    case "--out" -> dir = Path.of(value(args, ++i, a));
                    case "--duration" -> s.durationMs = millis(value(args, ++i, a), a);
                    case "--raw" -> s.raw = true;
                    case "--rate" -> s.rateHz = positive(value(args, ++i, a), a, 1e12);
                    case "--channels" -> s.channels = (int) positive(value(args, ++i, a), a, 8);
                    case "--reconnect" -> s.reconnectMs = millis(value(args, ++i, a), a);
                    case "--baud" -> baud = (int) positive(value(args, ++i, a), a, 1e8);
                    case "--sim-mb" -> simMb = (long) positive(value(args, ++i, a), a, 1e6);
                    case "--sim-faults" -> faults = value(args, ++i, a);
                    case "-q", "--quiet" -> quiet = true;
                    default -> throw new BadArgument("unknown argument '" + a + "'; see --help");
                }
            }
            if (list) {
                return list(out);
            }
            int sources = (port != null ? 1 : 0) + (device != null ? 1 : 0) + (simulate ? 1 : 0);
            if (sources != 1) {
                throw new BadArgument("give exactly one of --port NAME, --device VID:PID, --simulate (or --list)");
            }
            if (s.raw && !(s.rateHz > 0)) {
                throw new BadArgument("--raw needs --rate HZ, the device's sample rate");
            }
            if (s.channels < 1 || s.channels != Math.floor(s.channels)) {
                throw new BadArgument("--channels: expected 1 to 8");
            }
            if (Files.exists(dir) && (!Files.isDirectory(dir) || Files.list(dir).findAny().isPresent())) {
                throw new BadArgument("--out " + dir + ": exists and is not an empty directory; a spool needs a new or empty one");
            }
            Supplier<SerialLink> opener;
            if (simulate) {
                DeviceSimulator.Plan plan = simPlan(faults, simMb, s.raw);
                SimulatedDevice sim = new SimulatedDevice(plan);
                opener = sim::connect;
            } else if (device != null) {
                int[] id = SerialPorts.parseUsbId(device);
                int b = baud;
                opener = () -> ports.openById(id[0], id[1], b);
            } else {
                String p = port;
                int b = baud;
                opener = () -> ports.open(p, b);
            }
            return capture(opener, dir, s, quiet, err);
        } catch (BadArgument e) {
            err.println("capture: " + e.getMessage());
            return 2;
        } catch (DeviceException e) {
            err.println("capture: " + e.getMessage());
            return e.getMessage().startsWith("--") ? 2 : 1;
        } catch (IOException e) {
            err.println("capture: " + dir + ": " + e.getMessage());
            return 1;
        }
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

    static String value(String[] args, int i, String opt) {
        if (i >= args.length || args[i].startsWith("--")) {
            throw new BadArgument(opt + " needs a value; see --help");
        }
        return args[i];
    }

    static double positive(String v, String opt, double max) {
        double d;
        try {
            d = Double.parseDouble(v);
        } catch (NumberFormatException e) {
            throw new BadArgument(opt + " " + v + ": expected a number");
        }
        if (!(d > 0) || d > max) {
            throw new BadArgument(opt + " " + v + ": expected a number above 0 and at most " + (long) max);
        }
        return d;
    }

    static long millis(String v, String opt) {
        String t = v.trim().toLowerCase(Locale.ROOT);
        double mult = 1000;
        String num = t;
        if (t.endsWith("ms")) {
            mult = 1;
            num = t.substring(0, t.length() - 2);
        } else if (t.endsWith("s")) {
            num = t.substring(0, t.length() - 1);
        } else if (t.endsWith("m")) {
            mult = 60_000;
            num = t.substring(0, t.length() - 1);
        } else if (t.endsWith("h")) {
            mult = 3_600_000;
            num = t.substring(0, t.length() - 1);
        }
        double d;
        try {
            d = Double.parseDouble(num);
        } catch (NumberFormatException e) {
            throw new BadArgument(opt + " " + v + ": expected a time such as 30s, 500ms, 2m or 1h");
        }
        if (!(d >= 0) || d * mult > 1e12) {
            throw new BadArgument(opt + " " + v + ": expected a time from 0 up to about 31 years");
        }
        return Math.round(d * mult);
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
                throw new BadArgument("--sim-faults " + faults + ": '" + f + "' is not NAME=FRAME");
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
                    default -> throw new BadArgument("--sim-faults: unknown fault '" + kv[0] + "'; expected drop, corrupt, dup, stall, disconnect");
                }
            } catch (NumberFormatException e) {
                throw new BadArgument("--sim-faults " + faults + ": '" + f + "' needs a whole frame number");
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
