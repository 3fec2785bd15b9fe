package org.lanesift.testkit;

import java.time.Duration;
import java.util.function.BooleanSupplier;

/**
 * Waits in a test for a condition instead of sleeping a fixed time: checks the condition every few
 * milliseconds and fails with a message naming it when it has not come true within a bound, so a
 * slow machine waits longer and a fast one does not wait at all.
 */
public final class Poll {
    /** Time between two checks, in milliseconds. */
    static final long STEP_MS = 5;

    private Poll() {
    }

    /**
     * Returns as soon as the condition holds.
     *
     * @param timeout   longest wait
     * @param what      the condition in words, for the failure message
     * @param condition the condition, checked from the calling thread
     * @throws AssertionError       if it does not hold within the timeout
     * @throws InterruptedException if the waiting thread is interrupted
     */
    public static void until(Duration timeout, String what, BooleanSupplier condition) throws InterruptedException {
        long deadline = System.nanoTime() + timeout.toNanos();
        while (!condition.getAsBoolean()) {
            if (System.nanoTime() - deadline > 0) {
                throw new AssertionError("waited " + timeout.toMillis() + " ms for " + what + "; it did not happen");
            }
            Thread.sleep(STEP_MS);
        }
    }
}
