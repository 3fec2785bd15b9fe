package org.lanesift.runner.output;

import java.nio.ByteBuffer;

/**
 * A first-in first-out queue of one VCD variable's value changes on primitive arrays: time
 * (femtoseconds), value and state ({@link VcdWriter#KNOWN} or {@link VcdWriter#UNKNOWN}). Its
 * binary record for spooling is {@value #RECORD_BYTES} bytes: time, value (big-endian longs), state.
 */
final class ChangeQueue {
    /** Bytes of one spooled change. */
    static final int RECORD_BYTES = 17;
    private long[] timeFs;
    private long[] value;
    private byte[] state;
    private int head;
    private int tail;

    ChangeQueue(int capacity) {
        timeFs = new long[capacity];
        value = new long[capacity];
        state = new byte[capacity];
    }

    int size() {
        return tail - head;
    }

    boolean isEmpty() {
        return tail == head;
    }

    void add(long t, long v, byte s) {
        if (tail == timeFs.length) {
            makeRoom();
        }
        timeFs[tail] = t;
        value[tail] = v;
        state[tail] = s;
        tail++;
    }

    private void makeRoom() {
        int n = size();
        if (n > timeFs.length / 2) {
            int cap = Math.max(16, timeFs.length * 2);
            long[] t = new long[cap];
            long[] v = new long[cap];
            byte[] s = new byte[cap];
            System.arraycopy(timeFs, head, t, 0, n);
            System.arraycopy(value, head, v, 0, n);
            System.arraycopy(state, head, s, 0, n);
            timeFs = t;
            value = v;
            state = s;
        } else {
            System.arraycopy(timeFs, head, timeFs, 0, n);
            System.arraycopy(value, head, value, 0, n);
            System.arraycopy(state, head, state, 0, n);
        }
        head = 0;
        tail = n;
    }

    long headTime() {
        return timeFs[head];
    }

    long headValue() {
        return value[head];
    }

    byte headState() {
        return state[head];
    }

    void pop() {
        head++;
        if (head == tail) {
            head = 0;
            tail = 0;
        }
    }

    /**
     * Empties the queue; its arrays shrink back to {@code capacity} if they grew beyond it.
     *
     * @param capacity the capacity to keep at most
     */
    void clear(int capacity) {
        head = 0;
        tail = 0;
        if (timeFs.length > capacity) {
            timeFs = new long[capacity];
            value = new long[capacity];
            state = new byte[capacity];
        }
    }

    /**
     * Moves changes from the head into a buffer as binary records, as many as fit.
     *
     * @param b destination, in write mode
     * @return changes moved
     */
    int drainTo(ByteBuffer b) {
        int n = Math.min(size(), b.remaining() / RECORD_BYTES);
        for (int i = 0; i < n; i++) {
            b.putLong(timeFs[head]).putLong(value[head]).put(state[head]);
            head++;
        }
        if (head == tail) {
            head = 0;
            tail = 0;
        }
        return n;
    }

    /**
     * Appends the whole binary records a buffer holds.
     *
     * @param b source, in read mode
     */
    void fillFrom(ByteBuffer b) {
        while (b.remaining() >= RECORD_BYTES) {
            add(b.getLong(), b.getLong(), b.get());
        }
    }
}
