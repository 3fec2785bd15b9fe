package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;

/**
 * The planner's bulk loops ({@link SampleBuf#addEdges}, {@link SampleBuf#addPixel}) against the
 * plain one-sample-at-a-time reference: the per-edge and per-slot formulas written out here, fed to
 * {@link SampleBuf#add}. Random edges, periods, flags, slot counts and chunk sizes (crossing the
 * buffer's growth); every array must be equal element by element.
 */
class SampleBufBulkTest {

    static void assertSame(SampleBuf ref, SampleBuf bulk) {
        assertEquals(ref.n, bulk.n, "sample count");
        int n = ref.n;
        assertArrayEquals(Arrays.copyOf(ref.nominal, n), Arrays.copyOf(bulk.nominal, n), "nominal");
        assertArrayEquals(Arrays.copyOf(ref.edge, n), Arrays.copyOf(bulk.edge, n), "edge");
        assertArrayEquals(Arrays.copyOf(ref.ui, n), Arrays.copyOf(bulk.ui, n), "ui");
        assertArrayEquals(Arrays.copyOf(ref.reach, n), Arrays.copyOf(bulk.reach, n), "reach");
        assertArrayEquals(Arrays.copyOf(ref.thr, n), Arrays.copyOf(bulk.thr, n), "thr");
        assertArrayEquals(Arrays.copyOf(ref.scale, n), Arrays.copyOf(bulk.scale, n), "scale");
        assertArrayEquals(Arrays.copyOf(ref.flags, n), Arrays.copyOf(bulk.flags, n), "flags");
        assertArrayEquals(Arrays.copyOf(ref.slot, n), Arrays.copyOf(bulk.slot, n), "slot");
    }

    @Property(tries = 100)
    void edgesMatchTheReference(@ForAll long seed, @ForAll @IntRange(min = 0, max = 3) int modeNo,
                                @ForAll @IntRange(min = 0, max = 1) int aligned) {
        Random r = new Random(seed);
        boolean wantRising = modeNo != 2;
        boolean wantFalling = modeNo != 1;
        boolean ddr = modeNo == 0 || modeNo == 3;
        double align = aligned * 0.5;
        double threshold = 0.05 + 0.4 * r.nextDouble();
        SampleBuf ref = new SampleBuf(threshold);
        SampleBuf bulk = new SampleBuf(threshold);
        long t = r.nextInt(1_000_000);
        double period = 1e5 + r.nextDouble() * 1e8;
        long index = 0;
        for (int chunk = 0; chunk < 6; chunk++) {
            int count = r.nextInt(3000);
            long[] accT = new long[count];
            double[] accP = new double[count];
            byte[] accF = new byte[count];
            long[] accI = new long[count];
            for (int i = 0; i < count; i++) {
                // tracked periods repeat now and then (the cache of derived values is hit) or drift
                if (r.nextInt(4) != 0) {
                    period += (r.nextGaussian() * 0.01) * period;
                }
                t += (long) (period / 2);
                accT[i] = t;
                accP[i] = period;
                boolean rising = (index & 1) == 0;
                accF[i] = (byte) ((rising ? AcceptedEdges.RISING : 0) | (r.nextInt(10) == 0 ? AcceptedEdges.SUSPECT : 0)
                        | (r.nextInt(50) == 0 ? AcceptedEdges.RESTART : 0));
                accI[i] = index++;
            }
            for (int i = 0; i < count; i++) {
                boolean rising = (accF[i] & AcceptedEdges.RISING) != 0;
                if (rising ? !wantRising : !wantFalling) {
                    continue;
                }
                double ui = ddr ? accP[i] * 0.5 : accP[i];
                long nominal = align == 0 ? accT[i] : accT[i] + Math.round(align * ui);
                ref.add(nominal, accI[i], ui, !rising, (accF[i] & AcceptedEdges.SUSPECT) != 0, 0);
            }
            bulk.addEdges(accT, accP, accF, accI, count, wantRising, wantFalling, ddr ? 0.5 : 1, align);
            assertSame(ref, bulk);
            if (r.nextBoolean()) {
                int k = r.nextInt(ref.n + 1);
                ref.removePrefix(k);
                bulk.removePrefix(k);
            }
        }
    }

    @Property(tries = 100)
    void pixelsMatchTheReference(@ForAll long seed, @ForAll @IntRange(min = 2, max = 16) int slots) {
        Random r = new Random(seed);
        int slot0AfterRef = r.nextInt(slots);
        double[][] f = SamplePlanner.slotFractions(slots, slot0AfterRef);
        SampleBuf ref = new SampleBuf(0.15);
        SampleBuf bulk = new SampleBuf(0.15);
        long r0 = r.nextInt(1_000_000);
        long p = 1_000_000 + r.nextInt(100_000_000);
        for (int px = 0; px < 1500; px++) {
            if (r.nextInt(3) != 0) {
                p += r.nextInt(2001) - 1000; // some pixels repeat the previous period exactly
            }
            long r1 = r0 + p;
            boolean falling = r.nextInt(5) == 0;
            boolean suspect = r.nextInt(7) == 0;
            double ui = p / (double) slots;
            for (int j = 0; j < slots; j++) {
                double fj = (slot0AfterRef + j + 0.5) / slots;
                long nominal = fj < 1 ? r0 + Math.round(fj * p) : r1 + Math.round((fj - 1) * p);
                ref.add(nominal, px, ui, falling, suspect, j);
            }
            bulk.addPixel(r0, r1, f[0], f[1], px, falling, suspect);
            r0 = r1;
        }
        assertSame(ref, bulk);
    }
}
