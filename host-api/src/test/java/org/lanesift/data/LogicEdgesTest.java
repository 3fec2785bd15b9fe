package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import net.jqwik.api.constraints.LongRange;
import org.junit.jupiter.api.Test;

class LogicEdgesTest {
    static LogicBlock random(int n, long seed, double density) {
        Random r = new Random(seed);
        long[] bits = new long[BitSets.words(n)];
        boolean level = r.nextBoolean();
        for (int i = 0; i < n; i++) {
            if (r.nextDouble() < density) {
                level = !level;
            }
            BitSets.set(bits, i, level);
        }
        return new LogicBlock("d", 0, 1000, 1e6, bits, n, null);
    }

    @Test
    void transitionsSitMidwayBetweenSamples() {
        // samples at 0, 1, 2, 3, 4 ns read 0 0 1 1 0
        LogicBlock b = new LogicBlock("d", 0, 0, 1e6, new long[] {0b01100L}, 5, null);
        Edges e = LogicEdges.edgesOf(b);
        assertEquals(false, e.initialLevel());
        assertArrayEquals(new long[] {1_500_000L, 3_500_000L}, Arrays.copyOf(e.timesFs(), e.count()));
        assertEquals(-500_000L, e.startFs());
        assertEquals(4_500_000L, e.endFs());
    }

    @Test
    void transitionAcrossABlockBoundaryIsKept() {
        LogicEdges conv = new LogicEdges();
        Edges a = conv.toEdges(new LogicBlock("d", 0, 0, 1e6, new long[] {0L}, 3, null));
        Edges b = conv.toEdges(new LogicBlock("d", 3, 3_000_000, 1e6, new long[] {0b111L}, 3, null));
        assertEquals(0, a.count());
        assertEquals(1, b.count());
        assertEquals(2_500_000L, b.timesFs()[0]);
        assertEquals(a.endFs(), b.startFs(), "consecutive spans are contiguous");
    }

    @Test
    void unknownSamplesGiveAnUnknownSpanAndKeepTheLevelAfterIt() {
        // 0 0 [1 0] 1 1 with samples 2 and 3 unknown: the change hidden in the unknown run shows at its end
        long bits = 0b110100L;
        long inv = 0b001100L;
        Edges e = LogicEdges.edgesOf(new LogicBlock("d", 0, 0, 1e6, new long[] {bits}, 6, new long[] {inv}));
        assertEquals(1, e.count());
        assertEquals(3_500_000L, e.timesFs()[0]);
        assertEquals(1, e.invalidCount());
        assertEquals(1_500_000L, e.invalidSpans()[0]);
        assertEquals(3_500_000L, e.invalidSpans()[1]);
        assertTrue(e.isUnknownAt(2_000_000L));
        LogicBlock back = LogicEdges.toLogic(e, 0, 1e6, 6);
        assertEquals(inv, back.invalid()[0]);
        assertEquals(bits & ~inv, back.bits()[0] & ~inv, "every known sample keeps its level");
        // 1 1 [x x] 0 0: the valid samples after the run must come back low
        Edges f = LogicEdges.edgesOf(new LogicBlock("d", 0, 0, 1e6, new long[] {0b000011L}, 6, new long[] {inv}));
        LogicBlock fb = LogicEdges.toLogic(f, 0, 1e6, 6);
        assertEquals(0b000011L, fb.bits()[0] & ~inv);
    }

    // Property: known samples survive logic -> edges -> logic whatever the unknown runs, also across blocks.
    @Property(tries = 300)
    void knownSamplesRoundTripAroundUnknownRuns(@ForAll @IntRange(min = 1, max = 500) int n, @ForAll long seed) {
        Random r = new Random(seed);
        LogicBlock b = random(n, seed, 0.3);
        long[] inv = new long[BitSets.words(n)];
        for (int i = 0; i < n; i++) {
            if (r.nextInt(5) == 0) {
                int len = 1 + r.nextInt(12);
                BitSets.setRange(inv, i, Math.min(n, i + len));
                i += len;
            }
        }
        LogicBlock withInv = new LogicBlock("d", 0, b.startFs(), b.periodFs(), b.bits(), n, inv);
        LogicEdges conv = new LogicEdges();
        int cut = n / 2;
        List<Long> times = new ArrayList<>();
        boolean initial = false;
        for (int part = 0; part < 2; part++) {
            int from = part == 0 ? 0 : cut;
            int len = part == 0 ? cut : n - cut;
            if (len == 0) {
                continue;
            }
            long[] pb = new long[BitSets.words(len)];
            long[] pi = new long[BitSets.words(len)];
            for (int i = 0; i < len; i++) {
                BitSets.set(pb, i, BitSets.get(b.bits(), from + i));
                BitSets.set(pi, i, BitSets.get(inv, from + i));
            }
            Edges e = conv.toEdges(new LogicBlock("d", from, b.startFs() + Math.round(from * b.periodFs()), b.periodFs(), pb, len, pi));
            if (from == 0) {
                initial = e.initialLevel();
            }
            if (from == 0 && !BitSets.any(new long[] {0}, 0, 0) && BitSets.count(pi, len) == len) {
                initial = LogicEdges.edgesOf(withInv).initialLevel(); // the first part was all unknown: its level is arbitrary
            }
            for (int i = 0; i < e.count(); i++) {
                times.add(e.timesFs()[i]);
            }
        }
        long[] t = times.stream().mapToLong(Long::longValue).toArray();
        Edges all = new Edges("d", b.startFs() - 500_000, b.startFs() + Math.round((n - 0.5) * 1e6), initial, t, t.length, null, 0);
        LogicBlock back = LogicEdges.toLogic(all, b.startFs(), b.periodFs(), n);
        for (int i = 0; i < n; i++) {
            if (!BitSets.get(inv, i)) {
                assertEquals(withInv.get(i), back.get(i), "known sample " + i);
            }
        }
        Edges whole = LogicEdges.edgesOf(withInv);
        assertEquals(whole.count(), t.length, "split and whole give the same transitions");
    }

    // Property: logic -> edges -> logic is the identity for random blocks of any length and activity.
    @Property(tries = 300)
    void roundTrip(@ForAll @IntRange(min = 1, max = 700) int n, @ForAll long seed,
                   @ForAll @IntRange(min = 0, max = 100) int densityPct) {
        LogicBlock b = random(n, seed, densityPct / 100.0);
        Edges e = LogicEdges.edgesOf(b);
        LogicBlock back = LogicEdges.toLogic(e, b.startFs(), b.periodFs(), n);
        for (int i = 0; i < n; i++) {
            assertEquals(b.get(i), back.get(i), "sample " + i);
        }
    }

    // Property: converting a capture block by block gives the same transitions as converting it whole.
    @Property(tries = 200)
    void blockSplitInvariance(@ForAll @IntRange(min = 2, max = 600) int n, @ForAll long seed,
                              @ForAll @LongRange(min = 1, max = 200) long cutSeed) {
        LogicBlock whole = random(n, seed, 0.2);
        Edges one = LogicEdges.edgesOf(whole);
        Random r = new Random(cutSeed);
        LogicEdges conv = new LogicEdges();
        List<Long> times = new ArrayList<>();
        int pos = 0;
        while (pos < n) {
            int len = Math.min(n - pos, 1 + r.nextInt(130));
            long[] bits = new long[BitSets.words(len)];
            for (int i = 0; i < len; i++) {
                BitSets.set(bits, i, whole.get(pos + i));
            }
            Edges part = conv.toEdges(new LogicBlock("d", pos, whole.startFs() + Math.round(pos * 1e6), 1e6, bits, len, null));
            for (int i = 0; i < part.count(); i++) {
                times.add(part.timesFs()[i]);
            }
            pos += len;
        }
        assertEquals(one.count(), times.size());
        for (int i = 0; i < one.count(); i++) {
            assertEquals(one.timesFs()[i], times.get(i));
        }
    }

    @Test
    void badEdgeListsAreNamed() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Edges.of("clk", 0, 100, false, 10, 5));
        assertTrue(e.getMessage().contains("'clk'") && e.getMessage().contains("transition 1"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new Edges("clk", 0, 10, false, null, 0, null, 0));
        assertTrue(e.getMessage().contains("null"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> Edges.of("clk", 0, 10, false, 10));
        assertTrue(e.getMessage().contains("end of the span"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> Edges.of("clk", 10, 5, false));
        assertTrue(e.getMessage().contains("before start"), e.getMessage());
        Edges empty = Edges.of("clk", 0, 10, true);
        assertEquals(true, empty.finalLevel());
    }

    @Test
    void otherBlocksCheckTheirArrays() {
        assertThrows(IllegalArgumentException.class, () -> new LogicBlock("d", 0, 0, 1e6, new long[1], 65, null));
        assertThrows(IllegalArgumentException.class, () -> new AnalogBlock("a", 0, 0, 0, new float[3], 3, null));
        assertThrows(IllegalArgumentException.class, () -> new AnalogBlock("a", 0, 0, 1, new float[3], 4, null));
        assertThrows(IllegalArgumentException.class, () -> new Frame("f", 0, 0, 0, 2, 2, new int[3], false, false));
        assertThrows(IllegalArgumentException.class, () -> new Artifact("x", 0, 0, "../evil", "text/plain", new byte[0]));
        assertThrows(IllegalArgumentException.class,
                () -> new WordStream("w", 0, 0, 1, 65, new long[1], new long[1], new long[1], new int[1], new byte[1]));
    }

    @Test
    void rawCodesBecomeVoltsAndClippedCodesInvalid() {
        short[] codes = {-128, 0, 64, 127};
        AnalogBlock a = AnalogBlock.fromCodes("ch", 0, 0, 1e6, codes, 4, 0.01, 0.5, -128, 127);
        assertEquals(0.5f, a.volts()[1], 1e-6);
        assertEquals(1.14f, a.volts()[2], 1e-6);
        assertTrue(!a.isValid(0) && a.isValid(1) && a.isValid(2) && !a.isValid(3));
        assertEquals(4_000_000L, a.endFs());
    }
}
