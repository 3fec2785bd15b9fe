package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;

/**
 * A zero delay hands the input's own sample arrays on once the run's front margin is behind
 * ({@link AnalogDelayLine}): checked sample by sample against the input on seeded random blocks
 * with invalid masks (bits set past the block length too), NaN and infinite samples, and gaps.
 */
class IdentityPassThroughTest {
    static final double PERIOD_FS = 400_000;

    @Test
    void zeroDelayOutputIsTheInputSampleForSample() {
        for (long seed = 1; seed <= 40; seed++) {
            Random r = new Random(seed);
            int front = r.nextInt(10);
            List<AnalogBlock> in = new ArrayList<>();
            List<AnalogBlock> out = new ArrayList<>();
            AnalogDelayLine line = new AnalogDelayLine(DelayKernel.SINC, 0.0, front, 0, out::add);
            long index = 0;
            int blocks = 1 + r.nextInt(12);
            for (int b = 0; b < blocks; b++) {
                int n = r.nextInt(5) == 0 ? 1 + r.nextInt(3) : 1 + r.nextInt(700);
                float[] v = new float[n + r.nextInt(3)];
                for (int i = 0; i < v.length; i++) {
                    v[i] = (float) (1.2 + 0.2 * r.nextGaussian());
                }
                if (r.nextInt(4) == 0) {
                    v[r.nextInt(n)] = r.nextBoolean() ? Float.NaN : Float.POSITIVE_INFINITY;
                }
                long[] inv = null;
                if (r.nextInt(3) == 0) {
                    inv = new long[BitSets.words(n) + 1];
                    for (int k = 0; k < 3; k++) {
                        int i = r.nextInt(n);
                        inv[i >>> 6] |= 1L << i;
                    }
                    inv[inv.length - 1] |= 1L << 63; // past the length: must not reach the output
                }
                AnalogBlock blk = new AnalogBlock("ch", index, Math.round(index * PERIOD_FS), PERIOD_FS, v, n, inv);
                in.add(blk);
                line.accept(blk);
                index += n;
            }
            line.finish();
            check(seed, front, in, out);
        }
    }

    private static void check(long seed, int front, List<AnalogBlock> in, List<AnalogBlock> out) {
        long total = 0;
        for (AnalogBlock b : in) {
            total += b.length();
        }
        long expectIndex = Math.min(front, total);
        int passed = 0;
        for (AnalogBlock o : out) {
            assertEquals(expectIndex, o.firstIndex(), "seed " + seed + ": output blocks follow each other");
            assertEquals(Math.round(o.firstIndex() * PERIOD_FS), o.startFs(), "seed " + seed + ": block time");
            for (int i = 0; i < o.length(); i++) {
                long k = o.firstIndex() + i;
                AnalogBlock src = blockOf(in, k);
                int j = (int) (k - src.firstIndex());
                float x = src.volts()[j];
                boolean inputInvalid = src.invalid() != null && (src.invalid()[j >>> 6] & (1L << j)) != 0;
                boolean outputInvalid = o.invalid() != null && (o.invalid()[i >>> 6] & (1L << i)) != 0;
                if (Float.isFinite(x)) {
                    assertEquals(Float.floatToRawIntBits(x), Float.floatToRawIntBits(o.volts()[i]), "seed " + seed + " sample " + k);
                    assertEquals(inputInvalid, outputInvalid, "seed " + seed + " validity of sample " + k);
                } else {
                    assertTrue(Float.isFinite(o.volts()[i]), "seed " + seed + ": a non-finite sample is replaced");
                    assertTrue(outputInvalid, "seed " + seed + ": a non-finite sample is marked invalid");
                }
            }
            if (o.invalid() != null) {
                for (int i = o.length(); i < 64 * o.invalid().length; i++) {
                    assertFalse((o.invalid()[i >>> 6] & (1L << i)) != 0, "seed " + seed + ": no mask bit past the length");
                }
            }
            if (o.volts() == blockOf(in, o.firstIndex()).volts()) {
                passed++;
            }
            expectIndex += o.length();
        }
        assertEquals(total, expectIndex, "seed " + seed + ": every sample after the front margin is handed on");
        if (in.size() > 1 && total > front + 1000) {
            assertTrue(passed > 0, "seed " + seed + ": later blocks share the input's array");
        }
    }

    private static AnalogBlock blockOf(List<AnalogBlock> in, long k) {
        for (AnalogBlock b : in) {
            if (k >= b.firstIndex() && k < b.firstIndex() + b.length()) {
                return b;
            }
        }
        throw new AssertionError("no input block holds sample " + k);
    }

    @Test
    void aFractionalDelayNeverSharesTheInputArray() {
        float[] v = new float[4096];
        for (int i = 0; i < v.length; i++) {
            v[i] = (float) Math.sin(i * 0.1);
        }
        List<AnalogBlock> out = new ArrayList<>();
        AnalogDelayLine line = new AnalogDelayLine(DelayKernel.SINC, 0.25, out::add);
        line.accept(new AnalogBlock("ch", 0, 0, PERIOD_FS, v, 2048, null));
        AnalogBlock second = new AnalogBlock("ch", 2048, Math.round(2048 * PERIOD_FS), PERIOD_FS, v, 2048, null);
        line.accept(second);
        assertEquals(2, out.size());
        assertFalse(out.get(1).volts() == v, "a filtered block gets its own array");
        AnalogDelayLine ident = new AnalogDelayLine(DelayKernel.SINC, 0.0, out::add);
        ident.accept(new AnalogBlock("ch", 0, 0, PERIOD_FS, v, 2048, null));
        assertSame(v, out.get(out.size() - 1).volts(), "no margin and no delay: the first block is handed on as it is");
    }
}
