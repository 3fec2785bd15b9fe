package org.lanesift.testkit;

import java.lang.management.ManagementFactory;

/**
 * "No allocation beyond the guards" (issue 18 item 8) for a fuzz target: counts the bytes the
 * calling thread allocates while one input is parsed (HotSpot's per-thread counter,
 * {@code com.sun.management.ThreadMXBean.getThreadAllocatedBytes}) and fails when they exceed a
 * fixed allowance plus a number of bytes per input byte. The fixed allowance is what the parser's
 * documented guards let any input allocate (line buffers, one block of samples at its cap, class
 * loading on first use); the per-byte part is what the data itself may become (samples, edges,
 * names). An input that makes a parser allocate from a size or count it declares, rather than
 * from what it holds, breaks the bound. Allocation is counted, not retained memory: a loop that
 * allocates per sample breaks it too. Not thread-safe; one instance per target.
 */
public final class AllocationBound {
    /** A target run for one input. */
    public interface Action {
        void run() throws Exception;
    }

    private static final com.sun.management.ThreadMXBean THREADS = threads();

    private final String what;
    private final long fixedBytes;
    private final long bytesPerInputByte;
    private long maxBytes;
    private long maxInputBytes;
    private long inputs;

    /**
     * A bound for one parser.
     *
     * @param what              the parser, for the failure message
     * @param fixedBytes        the allowance for any input, bytes
     * @param bytesPerInputByte further bytes allowed per byte of input
     */
    public AllocationBound(String what, long fixedBytes, long bytesPerInputByte) {
        this.what = what;
        this.fixedBytes = fixedBytes;
        this.bytesPerInputByte = bytesPerInputByte;
    }

    private static com.sun.management.ThreadMXBean threads() {
        if (!(ManagementFactory.getThreadMXBean() instanceof com.sun.management.ThreadMXBean t)
                || !t.isThreadAllocatedMemorySupported()) {
            throw new AssertionError("this JVM does not count allocated bytes per thread (com.sun.management.ThreadMXBean)");
        }
        if (!t.isThreadAllocatedMemoryEnabled()) {
            t.setThreadAllocatedMemoryEnabled(true);
        }
        return t;
    }

    /**
     * Bytes the calling thread has allocated so far.
     *
     * @return bytes
     */
    public static long allocatedBytes() {
        return THREADS.getThreadAllocatedBytes(Thread.currentThread().getId());
    }

    /**
     * Runs the action for one input and checks what it allocated. An action over the bound is run
     * once more and judged on that second run, so it must parse the same input again from the start.
     *
     * @param inputBytes size of the input, bytes
     * @param action     the parse, in the calling thread, repeatable
     * @throws AssertionError if it allocated more than the bound
     * @throws Exception      what the action throws
     */
    public void check(long inputBytes, Action action) throws Exception {
        long used = measure(action);
        if (used > limitBytes(inputBytes)) {
            // judged on a second parse of the same input: the first may have paid for loading classes
            // on first use (a few MiB, once per JVM), which is no allocation of the parser's own
            used = measure(action);
        }
        inputs++;
        if (used > maxBytes) {
            maxBytes = used;
            maxInputBytes = inputBytes;
        }
        long limit = limitBytes(inputBytes);
        if (used > limit) {
            throw new AssertionError(what + ": an input of " + inputBytes + " bytes allocated " + used
                    + " bytes; the guards allow " + limit + " (" + fixedBytes + " + " + bytesPerInputByte + " per input byte)");
        }
    }

    private static long measure(Action action) throws Exception {
        long before = allocatedBytes();
        action.run();
        return allocatedBytes() - before;
    }

    /**
     * The bound for an input of a size.
     *
     * @param inputBytes size of the input, bytes
     * @return bytes
     */
    public long limitBytes(long inputBytes) {
        return fixedBytes + bytesPerInputByte * inputBytes;
    }

    /**
     * The largest allocation seen, with the size of its input, for the test's log.
     *
     * @return a line
     */
    public String summary() {
        return what + ": " + inputs + " inputs, at most " + maxBytes + " bytes allocated (input of " + maxInputBytes
                + " bytes; bound " + limitBytes(maxInputBytes) + ")";
    }
}
