package org.lanesift.plugins.serial;

import org.lanesift.plugin.OptionException;
import java.io.IOException;
import java.nio.file.Path;
import java.util.function.Supplier;

/**
 * Captures a device into a spool: reads the link, appends every byte to the spool before
 * anything else, and never waits for decoding (decoding reads the spool files behind it). In
 * framed mode it first runs the identification exchange and starts the stream
 * (docs/device-stream.md). A disconnect closes the current segment; if reconnecting is allowed,
 * the link is opened again and the capture resumes in a new segment.
 */
public final class Capture {
    /** How to capture. */
    public static final class Settings {
        /** Raw mode: the device streams plain logic8 bytes at {@link #rateHz} with no framing. */
        public boolean raw;
        /** Sample rate to configure (framed; 0 = the device's first rate) or the known rate (raw), Hz. */
        public double rateHz;
        /** Channels in raw mode, 1 to 8. */
        public int channels = 8;
        /** Stop after this long, ms, or -1 for until {@link #stop()}. */
        public long durationMs = -1;
        /** How long to keep trying to reopen the link after a disconnect, ms (0 = do not reconnect). */
        public long reconnectMs;
        /** How long to wait for the IDENT reply, ms. */
        public long identTimeoutMs = 2000;
    }

    /** What a capture kept. */
    public record Result(long bytes, long frames, long gaps, long crcFailures, int segments, String reason, DeviceInfo device) {
    }

    private final Supplier<SerialLink> opener;
    private final Settings s;
    private final Path dir;
    private volatile boolean stop;
    private volatile SpoolWriter writer;
    private volatile SerialLink link;
    private DeviceInfo device;

    /**
     * Creates a capture.
     *
     * @param opener opens the link (again after a disconnect); throws {@link DeviceException} if it cannot
     * @param dir    spool directory, new or empty
     * @param s      settings
     */
    public Capture(Supplier<SerialLink> opener, Path dir, Settings s) {
        this.opener = opener;
        this.dir = dir;
        this.s = s;
        if (s.raw && !(s.rateHz > 0)) {
            throw new OptionException("rate", "--rate: raw mode needs the device's sample rate in Hz");
        }
    }

    /** Asks the capture to stop; {@link #run()} then sends STOP, closes the spool and returns. */
    public void stop() {
        stop = true;
    }

    /** @return the spool writer once running (for status), or null */
    public SpoolWriter writer() {
        return writer;
    }

    /**
     * Runs the capture until stopped, the duration ends, or the device is gone for good.
     *
     * @return what was kept
     * @throws IOException when the spool cannot be written (the message names the file)
     */
    public Result run() throws IOException {
        long t0 = System.nanoTime();
        SerialLink l = opener.get();
        link = l;
        // framed: the rate and channels are provisional until the device identifies itself
        SpoolWriter w = new SpoolWriter(dir, new SpoolHeader(!s.raw, s.raw ? s.rateHz : Math.max(1, s.rateHz), s.channels, "", ""),
                !s.raw);
        writer = w;
        String reason = "stop";
        byte[] buf = new byte[1 << 16];
        try {
            if (!s.raw) {
                start(l, w, buf);
            }
            while (!stop) {
                if (s.durationMs >= 0 && System.nanoTime() - t0 >= s.durationMs * 1_000_000L) {
                    reason = "duration";
                    break;
                }
                int n = l.read(buf, 0, buf.length);
                if (n > 0) {
                    w.append(buf, 0, n);
                } else if (n < 0) {
                    l.close();
                    w.sync();
                    SerialLink again = reconnect();
                    if (again == null) {
                        reason = "disconnect";
                        break;
                    }
                    l = again;
                    link = l;
                    w.nextSegment("disconnect");
                    if (!s.raw) {
                        start(l, w, buf);
                    }
                }
            }
            if (!reason.equals("disconnect") && !s.raw) {
                try {
                    l.write(Framing.encode(FrameType.STOP, 0, new byte[0]));
                    drain(l, w, buf, 200);
                } catch (DeviceException ignored) {
                    // the device is gone already
                }
            }
        } finally {
            try {
                l.close();
            } finally {
                w.close(reason);
            }
        }
        return new Result(w.bytes(), w.frames(), w.gaps(), w.crcFailures(), w.segment(), reason, device);
    }

    private void drain(SerialLink l, SpoolWriter w, byte[] buf, long ms) throws IOException {
        long end = System.nanoTime() + ms * 1_000_000L;
        while (System.nanoTime() < end) {
            int n = l.read(buf, 0, buf.length);
            if (n < 0) {
                return;
            }
            if (n > 0) {
                w.append(buf, 0, n);
            }
        }
    }

    private SerialLink reconnect() {
        long end = System.nanoTime() + s.reconnectMs * 1_000_000L;
        while (!stop && System.nanoTime() < end) {
            try {
                return opener.get();
            } catch (DeviceException | OptionException e) { // a port not there yet counts as gone for now
                try {
                    Thread.sleep(200);
                } catch (InterruptedException ie) {
                    Thread.currentThread().interrupt();
                    return null;
                }
            }
        }
        return null;
    }

    /** Identification exchange, configuration and START; every byte read is spooled. */
    private void start(SerialLink l, SpoolWriter w, byte[] buf) throws IOException {
        DeviceInfo[] got = {null};
        FrameDecoder d = new FrameDecoder(new FrameDecoder.Listener() {
            @Override
            public void frame(int code, int seq, byte[] b, int off, int len, long at) {
                if (code == FrameType.IDENT.code && got[0] == null) {
                    got[0] = DeviceInfo.decode(b, off, len);
                }
            }

            @Override
            public void skipped(long at, long length, int crc) {
            }
        });
        l.write(Framing.encode(FrameType.IDENTIFY, 0, new byte[0]));
        long end = System.nanoTime() + s.identTimeoutMs * 1_000_000L;
        while (got[0] == null) {
            if (System.nanoTime() > end || stop) {
                throw new DeviceException("port " + l.name() + ": no IDENT reply within " + s.identTimeoutMs
                        + " ms; for a device that streams plain sample bytes use --raw --rate HZ");
            }
            int n = l.read(buf, 0, buf.length);
            if (n < 0) {
                throw new DeviceException("port " + l.name() + ": the device went away during the identification exchange");
            }
            if (n > 0) {
                w.append(buf, 0, n);
                d.feed(buf, 0, n);
            }
        }
        DeviceInfo info = got[0];
        if (info.sampleFormat() != DeviceInfo.FORMAT_LOGIC8) {
            throw new DeviceException("port " + l.name() + ": device reports sample format " + info.sampleFormat() + "; only 1 (logic8) is supported");
        }
        long rate = info.ratesHz()[0];
        if (s.rateHz > 0) {
            rate = -1;
            for (long r : info.ratesHz()) {
                if (r == Math.round(s.rateHz)) {
                    rate = r;
                }
            }
            if (rate < 0) {
                throw new OptionException("rate", "--rate " + (long) s.rateHz + ": the device supports " + java.util.Arrays.toString(info.ratesHz()) + " Hz");
            }
        }
        device = info;
        w.updateHeader(new SpoolHeader(true, rate, info.channels(), info.model(), info.firmware()));
        byte[] cfg = new byte[4];
        Framing.putU32(cfg, 0, (int) rate);
        l.write(Framing.encode(FrameType.CONFIGURE, 0, cfg));
        l.write(Framing.encode(FrameType.START, 0, new byte[0]));
    }
}
