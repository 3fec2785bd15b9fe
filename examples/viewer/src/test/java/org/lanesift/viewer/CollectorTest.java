package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.LogicBlock;

class CollectorTest {
    @Test
    void blocksCutAnywhereMakeOneTraceOfTheSameSamples() {
        Random rnd = new Random(5);
        float[] all = new float[200_000];
        for (int i = 0; i < all.length; i++) {
            all[i] = rnd.nextFloat();
        }
        Collector c = new Collector();
        int at = 0;
        while (at < all.length) {
            int n = Math.min(all.length - at, 1 + rnd.nextInt(70_000));
            c.accept("P", new AnalogBlock("P", at, 5_000L + at * 400_000L, 400_000, Arrays.copyOfRange(all, at, at + n), n, null));
            at += n;
        }
        ViewModel m = c.build();
        AnalogTrace t = m.rows().get(0).analog();
        assertEquals(all.length, t.length());
        assertArrayEquals(all, Arrays.copyOf(t.volts(), t.length()));
        assertEquals(5_000L, t.startFs());
        assertEquals(5_000L + all.length * 400_000L, m.endFs());
    }

    @Test
    void logicBlocksBecomeEdgeTimes() {
        // 1 ns samples, high from sample 10 to 19 and from sample 70 on (across a 64-sample word)
        long[] bits = new long[BitSets.words(100)];
        for (int i = 0; i < 100; i++) {
            if (i >= 10 && i < 20 || i >= 70) {
                bits[i >>> 6] |= 1L << i;
            }
        }
        Collector c = new Collector();
        c.accept("d", new LogicBlock("d", 0, 0, 1_000_000, bits, 100, null));
        LogicTrace l = c.build().rows().get(0).logic();
        assertEquals(3, l.count());
        // host-api LogicEdges puts a change between samples j-1 and j at their midpoint, (j - 0.5) periods
        assertArrayEquals(new long[] {9_500_000, 19_500_000, 69_500_000}, Arrays.copyOf(l.timesFs(), 3));
        assertEquals(false, l.initialLevel());
    }

    @Test
    void annotationsAreHandedOverInBatchesAndAllReachTheModel() {
        Collector c = new Collector();
        for (int i = 0; i < 3; i++) {
            c.accept("src", Annotation.on("t", "k").span(i, i + 1).label("a" + i).severity(Severity.INFO).build());
        }
        assertEquals(3, c.drainFresh().size());
        assertTrue(c.drainFresh().isEmpty(), "a batch is handed over once");
        c.accept("src", Annotation.on("t", "k").span(9, 10).label("late").severity(Severity.WARNING).build());
        assertEquals("late", c.drainFresh().get(0).label());
        assertEquals(4, c.build().findings().size());
    }
}
