package org.lanesift.testkit;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The allocation check of the fuzz targets fails on an allocation past its bound and passes below it. */
class AllocationBoundTest {
    static volatile Object sink;

    @Test
    void anAllocationFromADeclaredSizeBreaksTheBound() {
        AllocationBound b = new AllocationBound("test parser", 1 << 20, 64);
        // a 10-byte "input" whose parser sizes an array from a count it declares: 8 MiB
        AssertionError e = assertThrows(AssertionError.class, () -> b.check(10, () -> sink = new long[1 << 20]));
        assertTrue(e.getMessage().contains("test parser: an input of 10 bytes allocated"), e.getMessage());
    }

    @Test
    void aParseWithinTheBoundPasses() throws Exception {
        AllocationBound b = new AllocationBound("test parser", 1 << 20, 64);
        b.check(100_000, () -> sink = new byte[4 << 20]); // 4 MiB < 1 MiB + 64 * 100000 bytes
        b.check(10, () -> sink = new byte[1000]);
        assertTrue(b.summary().startsWith("test parser: 2 inputs, at most "), b.summary());
    }

    @Test
    void aOneOffCostOfTheFirstParseIsNotHeldAgainstTheInput() throws Exception {
        AllocationBound b = new AllocationBound("test parser", 1 << 20, 64);
        boolean[] loaded = {false};
        // the first run pays 8 MiB once (as class loading would), the repeat only its own 1 kB
        b.check(10, () -> {
            if (!loaded[0]) {
                loaded[0] = true;
                sink = new long[1 << 20];
            }
            sink = new byte[1000];
        });
        assertTrue(b.summary().contains("at most"), b.summary());
    }

    @Test
    void theCounterSeesAllocationsOfThisThread() {
        long before = AllocationBound.allocatedBytes();
        sink = new byte[1 << 20];
        long used = AllocationBound.allocatedBytes() - before;
        assertTrue(used >= 1 << 20 && used < 2 << 20, "allocated " + used);
    }
}
