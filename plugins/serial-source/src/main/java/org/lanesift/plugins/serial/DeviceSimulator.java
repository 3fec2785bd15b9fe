package org.lanesift.plugins.serial;

import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;

/**
 * A simulated acquisition device speaking the framed stream (or raw mode) on a {@link SerialLink}
 * (an in-memory {@link Loopback} or one end of a pseudo-terminal pair), with fault injection. Its
 * samples are a fixed function of the sample index ({@link #sample}), so a receiver can check
 * every byte. Faults are given by frame number: dropped, corrupted (one payload byte flipped),
 * duplicated (sent twice), stalled (a pause after the frame), and a disconnect after a frame.
 */
final class DeviceSimulator implements Runnable {
    /** Identity the simulator reports. */
    static final DeviceInfo INFO = new DeviceInfo("lanesift-sim", "1.0.0", 8, DeviceInfo.FORMAT_LOGIC8,
            new long[] {1_000_000L, 10_000_000L, 50_000_000L});

    /** Fault plan and stream shape; mutable, set before {@link #run()}. */
    static final class Plan {
        /** Samples per DATA frame (payload = 8 + this), 1 to {@link Framing#MAX_PAYLOAD} - 8. */
        public int samplesPerFrame = 4096;
        /** Total samples to send; then the device closes the link if {@link #closeAtEnd}. */
        public long totalSamples = 1 << 20;
        /** Whether to close the link after the last frame. */
        public boolean closeAtEnd = true;
        /** Wait for IDENTIFY/START from the host before streaming. */
        public boolean handshake = true;
        /** Raw mode: plain sample bytes, no frames, no handshake. */
        public boolean raw;
        /** Frames not sent (their sequence numbers are used up). */
        public final Set<Long> drop = new TreeSet<>();
        /** Frames sent with one payload byte flipped. */
        public final Set<Long> corrupt = new TreeSet<>();
        /** Frames sent twice. */
        public final Set<Long> duplicate = new TreeSet<>();
        /** Frame number to pause length in ms after it. */
        public final TreeMap<Long, Long> stallMs = new TreeMap<>();
        /** Close the link after this frame, or -1. */
        public long disconnectAfter = -1;
        /** First sample index and first sequence number (a reconnected device may start again at 0). */
        public long firstFrame;
        /**
         * Send at the sample rate, as a real device does, instead of as fast as the link takes the
         * bytes: the rate the host configures (CONFIGURE), else {@link #rateHz}.
         */
        public boolean realTime;
        /** Sample rate for {@link #realTime} when the host configures none (raw mode, no handshake), Hz. */
        public double rateHz = 50_000_000;
    }

    private final SerialLink link;
    private final Plan plan;
    private volatile boolean stopped;
    private volatile long framesSent;
    private volatile double configuredHz;
    private long paceStartNanos;

    /**
     * Creates a simulator.
     *
     * @param link the device end of the link
     * @param plan what to send
     */
    DeviceSimulator(SerialLink link, Plan plan) {
        this.link = link;
        this.plan = plan;
        if (plan.samplesPerFrame < 1 || plan.samplesPerFrame > Framing.MAX_PAYLOAD - 8) {
            throw new IllegalArgumentException("samplesPerFrame must be 1.." + (Framing.MAX_PAYLOAD - 8));
        }
    }

    /**
     * The sample byte at a capture-wide index: what the simulator sends and tests expect.
     *
     * @param i sample index
     * @return the logic8 sample
     */
    static byte sample(long i) {
        return (byte) (i ^ (i >>> 7) ^ (i >>> 13) ^ (i >>> 21));
    }

    /** @return frames sent so far (dropped ones count) */
    long framesSent() {
        return framesSent;
    }

    /** @return true once the host sent STOP, the link went away, or {@link #stop()} was called */
    boolean stopped() {
        return stopped;
    }

    /** Asks the simulator to stop streaming. */
    void stop() {
        stopped = true;
    }

    @Override
    public void run() {
        try {
            if (plan.raw) {
                streamRaw();
            } else {
                if (plan.handshake) {
                    awaitStart();
                }
                if (!stopped) {
                    streamFrames();
                }
            }
        } catch (DeviceException e) {
            // the host went away: a device simply stops
        }
        if (plan.closeAtEnd || stopped) {
            link.close();
        }
    }

    private void awaitStart() {
        byte[] buf = new byte[4096];
        boolean[] started = {false};
        FrameDecoder d = new FrameDecoder(new FrameDecoder.Listener() {
            @Override
            public void frame(int code, int seq, byte[] b, int off, int len, long at) {
                FrameType t = FrameType.of(code);
                if (t == FrameType.CONFIGURE && len >= 4) {
                    configuredHz = Framing.u32(b, off) & 0xFFFFFFFFL;
                }
                if (t == FrameType.IDENTIFY) {
                    link.write(Framing.encode(FrameType.IDENT, 0, INFO.encode()));
                } else if (t == FrameType.CONFIGURE || t == FrameType.START || t == FrameType.STOP) {
                    link.write(Framing.encode(FrameType.ACK, 0, new byte[] {(byte) code}));
                    started[0] |= t == FrameType.START;
                }
            }

            @Override
            public void skipped(long at, long length, int crc) {
            }
        });
        while (!started[0] && !stopped) {
            int n = link.read(buf, 0, buf.length);
            if (n < 0) {
                stopped = true;
                return;
            }
            d.feed(buf, 0, n);
        }
        Thread t = new Thread(() -> {
            byte[] b = new byte[256];
            FrameDecoder stopWatch = new FrameDecoder(new FrameDecoder.Listener() {
                @Override
                public void frame(int code, int seq, byte[] x, int off, int len, long at) {
                    if (code == FrameType.STOP.code) {
                        stopped = true;
                    }
                }

                @Override
                public void skipped(long at, long length, int crc) {
                }
            });
            while (!stopped) {
                int n = link.read(b, 0, b.length);
                if (n < 0) {
                    stopped = true;
                    return;
                }
                stopWatch.feed(b, 0, n);
            }
        }, "simulator-commands");
        t.setDaemon(true);
        t.start();
    }

    private void streamFrames() {
        int spf = plan.samplesPerFrame;
        int frameBytes = Framing.HEADER + 8 + spf + Framing.TRAILER;
        byte[] out = new byte[Math.max(1 << 16, 2 * frameBytes)];
        byte[] payload = new byte[8 + spf];
        int used = 0;
        long frame = plan.firstFrame;
        long idx = frame * spf;
        long end = plan.firstFrame * spf + plan.totalSamples;
        long firstIdx = idx;
        paceStartNanos = System.nanoTime();
        while (idx < end && !stopped) {
            int n = (int) Math.min(spf, end - idx);
            Framing.putU64(payload, 0, idx);
            for (int i = 0; i < n; i++) {
                payload[8 + i] = sample(idx + i);
            }
            if (out.length - used < 2 * frameBytes) {
                pace(idx - firstIdx);
                link.write(java.util.Arrays.copyOf(out, used));
                used = 0;
            }
            if (!plan.drop.contains(frame)) {
                int at = used;
                used += Framing.encode(FrameType.DATA, (int) frame, payload, 0, 8 + n, out, used);
                if (plan.corrupt.contains(frame)) {
                    out[at + Framing.HEADER + 8 + n / 2] ^= 0x5A;
                }
                if (plan.duplicate.contains(frame)) {
                    System.arraycopy(out, at, out, used, used - at);
                    used += used - at;
                }
            }
            framesSent++;
            Long stall = plan.stallMs.get(frame);
            boolean disconnect = frame == plan.disconnectAfter;
            if (stall != null || disconnect) {
                link.write(java.util.Arrays.copyOf(out, used));
                used = 0;
                if (disconnect) {
                    link.close();
                    return;
                }
                sleep(stall);
            }
            frame++;
            idx += n;
        }
        if (used > 0) {
            link.write(java.util.Arrays.copyOf(out, used));
        }
    }

    private void streamRaw() {
        byte[] out = new byte[1 << 16];
        long idx = 0;
        paceStartNanos = System.nanoTime();
        while (idx < plan.totalSamples && !stopped) {
            int n = (int) Math.min(out.length, plan.totalSamples - idx);
            for (int i = 0; i < n; i++) {
                out[i] = sample(idx + i);
            }
            pace(idx + n);
            link.write(n == out.length ? out : java.util.Arrays.copyOf(out, n));
            idx += n;
        }
    }

    /** In real time, waits until {@code samples} samples' time has passed since streaming began. */
    private void pace(long samples) {
        if (!plan.realTime) {
            return;
        }
        double hz = configuredHz > 0 ? configuredHz : plan.rateHz;
        long due = paceStartNanos + (long) (samples * 1e9 / hz);
        long wait;
        while ((wait = due - System.nanoTime()) > 0 && !stopped) {
            java.util.concurrent.locks.LockSupport.parkNanos(wait);
        }
    }

    private static void sleep(long ms) {
        try {
            Thread.sleep(ms);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
