package org.lanesift.plugins.differential;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.testkit.StageHarness;

/** Helpers shared by the tests: leg pairs around a common mode, running the plugin, merging outputs. */
final class TestSignals {
    private TestSignals() {
    }

    /** The P leg of a pair with difference {@code diff} around common mode {@code vcm}. */
    static AnalogBlock legP(AnalogBlock diff, double vcm) {
        float[] v = new float[diff.length()];
        for (int i = 0; i < v.length; i++) {
            v[i] = (float) (vcm + diff.volts()[i] / 2.0);
        }
        return new AnalogBlock("p", diff.firstIndex(), diff.startFs(), diff.periodFs(), v, v.length, diff.invalid());
    }

    /** The N leg of a pair with difference {@code diff} around common mode {@code vcm}. */
    static AnalogBlock legN(AnalogBlock diff, double vcm) {
        float[] v = new float[diff.length()];
        for (int i = 0; i < v.length; i++) {
            v[i] = (float) (vcm - diff.volts()[i] / 2.0);
        }
        return new AnalogBlock("n", diff.firstIndex(), diff.startFs(), diff.periodFs(), v, v.length, null);
    }

    /** Runs a harness over whole blocks, P then N. */
    static StageHarness runPair(java.util.Map<String, ?> options, AnalogBlock p, AnalogBlock n) {
        StageHarness h = StageHarness.of(new DifferentialPlugin(), options);
        h.push("p", p).push("n", n).finish();
        return h;
    }

    /** All transition times of a list of edge blocks, checking they join up. */
    static long[] times(List<Edges> edges) {
        long[] all = new long[0];
        long end = Long.MIN_VALUE;
        for (Edges e : edges) {
            if (end != Long.MIN_VALUE && e.startFs() != end) {
                throw new AssertionError("edge blocks do not join: " + end + " then " + e.startFs());
            }
            end = e.endFs();
            int k = all.length;
            all = Arrays.copyOf(all, k + e.count());
            System.arraycopy(e.timesFs(), 0, all, k, e.count());
        }
        return all;
    }

    /** Unknown spans of a list of edge blocks, with touching spans joined. */
    static List<long[]> spans(List<Edges> edges) {
        List<long[]> out = new ArrayList<>();
        for (Edges e : edges) {
            for (int i = 0; i < e.invalidCount(); i++) {
                long a = e.invalidSpans()[2 * i];
                long z = e.invalidSpans()[2 * i + 1];
                if (!out.isEmpty() && out.get(out.size() - 1)[1] == a) {
                    out.get(out.size() - 1)[1] = z;
                } else {
                    out.add(new long[] {a, z});
                }
            }
        }
        return out;
    }

    /** Concatenated logic samples as levels, and invalid flags. */
    static boolean[][] logic(List<LogicBlock> blocks) {
        int n = 0;
        for (LogicBlock b : blocks) {
            n += b.length();
        }
        boolean[][] out = new boolean[2][n];
        int k = 0;
        for (LogicBlock b : blocks) {
            for (int i = 0; i < b.length(); i++, k++) {
                out[0][k] = b.get(i);
                out[1][k] = b.invalid() != null && BitSets.get(b.invalid(), i);
            }
        }
        return out;
    }

    static List<String> kinds(List<Annotation> as) {
        return as.stream().map(Annotation::kind).toList();
    }

    /**
     * A smooth NRZ difference signal: bit k occupies sample positions [offset + k ui, offset + (k+1) ui),
     * each edge is a tanh step of time constant tau samples centred exactly on the bit boundary, so a
     * threshold of 0 V is crossed exactly at offset + k ui when the bits change.
     */
    static float[] nrz(boolean[] bits, double ui, double tau, double amp, double offset, int n) {
        float[] v = new float[n];
        for (int s = 0; s < n; s++) {
            double x = (s - offset) / ui;
            int i = (int) Math.floor(x);
            double val = amp * (2 * bit(bits, i - 1) - 1)
                    + amp * (bit(bits, i) - bit(bits, i - 1)) * (1 + Math.tanh((s - offset - i * ui) / tau))
                    + amp * (bit(bits, i + 1) - bit(bits, i)) * (1 + Math.tanh((s - offset - (i + 1) * ui) / tau));
            v[s] = (float) val;
        }
        return v;
    }

    private static int bit(boolean[] bits, int i) {
        if (i < 0) {
            return bits[0] ? 1 : 0;
        }
        return bits[Math.min(i, bits.length - 1)] ? 1 : 0;
    }

    /** Exact edge positions (in samples) of {@link #nrz}. */
    static double[] nrzEdges(boolean[] bits, double ui, double offset, int n) {
        double[] e = new double[bits.length];
        int k = 0;
        for (int i = 1; i < bits.length; i++) {
            double pos = offset + i * ui;
            if (bits[i] != bits[i - 1] && pos < n - 2) {
                e[k++] = pos;
            }
        }
        return Arrays.copyOf(e, k);
    }

    static AnalogBlock block(String ch, double periodFs, float[] v) {
        return new AnalogBlock(ch, 0, 0, periodFs, v, v.length, null);
    }
}
