package org.lanesift.plugins.serial;

/**
 * An in-memory byte link with a bounded ring buffer in each direction: the fastest local
 * transport, for the device simulator and tests. {@link #host()} is the end a capture reads;
 * {@link #device()} is the end the simulator writes. Closing either end is a disconnect: the
 * other end reads what is buffered, then -1.
 */
final class Loopback {
    private final Pipe toHost;
    private final Pipe toDevice;
    private final SerialLink host;
    private final SerialLink device;

    /**
     * Creates a link.
     *
     * @param bufferBytes ring buffer size of each direction
     */
    Loopback(int bufferBytes) {
        toHost = new Pipe(bufferBytes);
        toDevice = new Pipe(4096);
        host = new End("loopback-host", toHost, toDevice);
        device = new End("loopback-device", toDevice, toHost);
    }

    /** @return the host end (what a capture opens) */
    SerialLink host() {
        return host;
    }

    /** @return the device end (what the simulator drives) */
    SerialLink device() {
        return device;
    }

    private static final class End implements SerialLink {
        private final String name;
        private final Pipe in;
        private final Pipe out;

        End(String name, Pipe in, Pipe out) {
            this.name = name;
            this.in = in;
            this.out = out;
        }

        @Override
        public int read(byte[] b, int off, int len) {
            return in.read(b, off, len, 100);
        }

        @Override
        public void write(byte[] b) {
            out.write(b, 0, b.length);
        }

        @Override
        public String name() {
            return name;
        }

        @Override
        public void close() {
            in.close();
            out.close();
        }
    }

    private static final class Pipe {
        private final byte[] ring;
        private int head;
        private int size;
        private boolean closed;

        Pipe(int n) {
            ring = new byte[n];
        }

        synchronized void write(byte[] b, int off, int len) {
            while (len > 0) {
                while (size == ring.length && !closed) {
                    try {
                        wait();
                    } catch (InterruptedException e) {
                        Thread.currentThread().interrupt();
                        throw new DeviceException("loopback: interrupted while writing");
                    }
                }
                if (closed) {
                    throw new DeviceException("loopback: the other end is gone");
                }
                int tail = (head + size) % ring.length;
                int k = Math.min(len, Math.min(ring.length - size, ring.length - tail));
                System.arraycopy(b, off, ring, tail, k);
                size += k;
                off += k;
                len -= k;
                notifyAll();
            }
        }

        synchronized int read(byte[] b, int off, int len, long timeoutMs) {
            long deadline = System.nanoTime() + timeoutMs * 1_000_000L;
            while (size == 0) {
                if (closed) {
                    return -1;
                }
                long left = deadline - System.nanoTime();
                if (left <= 0) {
                    return 0;
                }
                try {
                    wait(Math.max(1, left / 1_000_000L));
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                    return closed ? -1 : 0;
                }
            }
            int k = Math.min(len, Math.min(size, ring.length - head));
            System.arraycopy(ring, head, b, off, k);
            head = (head + k) % ring.length;
            size -= k;
            notifyAll();
            return k;
        }

        synchronized void close() {
            closed = true;
            notifyAll();
        }
    }
}
