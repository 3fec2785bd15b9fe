package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.lanesift.plugins.si.EyeDiagramPluginTest.num;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.lanesift.data.Artifact;
import org.lanesift.data.Edges;
import org.lanesift.testkit.StageHarness;

class JitterDecompositionTest {
    static final double PERIOD_FS = 1_000_000; // 1 GHz clock

    /** Kind of deterministic jitter added to each rising edge. */
    enum Dj { TWO_LEVEL, SINE }

    /**
     * Rising edges of a clock: edge k at k T + dj(k) + N(0, rj^2), falling edges midway (no jitter).
     * Two-level DJ: +dj/2 or -dj/2 with equal probability; sinusoidal: (dj/2) sin(2 pi k / 97.3).
     */
    static Edges clock(int cycles, double rjPs, double djPs, Dj kind, long seed) {
        Random r = new Random(seed);
        long[] t = new long[2 * cycles];
        for (int k = 0; k < cycles; k++) {
            double d = kind == Dj.TWO_LEVEL ? (r.nextBoolean() ? 0.5 : -0.5) * djPs
                    : 0.5 * djPs * Math.sin(2 * Math.PI * k / 97.3);
            t[2 * k] = 1_000_000 + Math.round(k * PERIOD_FS + 1000 * (d + rjPs * r.nextGaussian()));
            t[2 * k + 1] = 1_000_000 + Math.round((k + 0.5) * PERIOD_FS);
        }
        return Edges.of("clk", 0, Math.round(1_000_000 + (cycles + 1) * PERIOD_FS), false, t);
    }

    static String run(Edges e, Map<String, Object> opts) {
        StageHarness h = StageHarness.of(new JitterPlugin(), opts);
        h.push("clock", e).finish();
        return new String(h.outputs("files", Artifact.class).get(0).content(), StandardCharsets.UTF_8);
    }

    @Test
    void qOfTheDefaultBerIsThePublishedValue() {
        // Fibre Channel Methodologies for Jitter and Signal Quality Specification (T11.2, MJSQ):
        // Q(1e-12) = 7.034, so TJ(1e-12) = DJ + 14.069 RJ (value from memory)
        assertEquals(7.034, JitterDecomposition.q(1e-12), 0.0005);
        assertEquals(14.069, 2 * JitterDecomposition.q(1e-12), 0.001);
    }

    @ParameterizedTest
    @CsvSource({"2, 20", "2, 50", "5, 20", "5, 50", "10, 20", "10, 50"})
    void twoLevelDeterministicAndGaussianRandomJitterAreRecovered(double rjPs, double djPs) {
        String j = run(clock(200_000, rjPs, djPs, Dj.TWO_LEVEL, (long) (rjPs * 100 + djPs)), Map.of());
        double rj = num(j, "randomJitterRmsPs");
        double dj = num(j, "deterministicJitterDualDiracPs");
        double tj = num(j, "totalJitterPs");
        System.out.printf("two-level: RJ %.1f ps, DJ %.0f ps -> RJ %.3f, DJ %.3f, TJ(1e-12) %.3f%n", rjPs, djPs, rj, dj, tj);
        assertEquals(rjPs, rj, 0.1 * rjPs, j);
        assertEquals(djPs, dj, 0.1 * djPs, j);
        // the relation of the dual-Dirac model, Fibre Channel MJSQ (T11.2): TJ(1e-12) = DJ + 14.069 RJ
        assertEquals(dj + 14.069 * rj, tj, 0.001 * tj, j);
        assertEquals(true, org.lanesift.testkit.JsonScan.parse("report", j).get("decomposition").get("modelHolds").asBoolean(), j);
    }

    @ParameterizedTest
    @CsvSource({"2", "10"})
    void pureGaussianJitterGivesTheRightTotalJitter(double rjPs) {
        // no DJ at all: the dual-Dirac fit splits a little of the Gaussian off as DJ (a known property
        // of the model with equal weights), but TJ(1e-12) stays within 10 % of 14.069 sigma (T11.2 MJSQ)
        String j = run(clock(200_000, rjPs, 0, Dj.TWO_LEVEL, 17), Map.of());
        double tj = num(j, "totalJitterPs");
        System.out.printf("gaussian only: RJ %.1f ps -> RJ %.3f, DJ %.3f, TJ(1e-12) %.3f (expected %.3f)%n", rjPs,
                num(j, "randomJitterRmsPs"), num(j, "deterministicJitterDualDiracPs"), tj, 14.069 * rjPs);
        assertEquals(14.069 * rjPs, tj, 0.1 * 14.069 * rjPs, j);
        assertTrue(num(j, "deterministicJitterDualDiracPs") < rjPs, j);
    }

    /**
     * Sinusoidal DJ: each figure is checked against its own definition. The dual-Dirac DJ is the
     * separation of the Diracs fitted to the tails, which for a sinusoid lies below its peak-to-peak
     * (docs/reference-facts.md#jitter-under-the-dual-dirac-model; Fibre Channel MJSQ, T11.2): it is
     * checked within 10 % against the same Q-scale fit applied to the exact distribution of a sine
     * plus Gaussian jitter (computed here by numerical integration), and TJ against the published
     * relation TJ(1e-12) = DJ(dd) + 14.069 RJ (T11.2 MJSQ). The peak-to-peak is measured by the
     * spectral lines of the TIE and checked within 10 % against the sine's peak-to-peak; the TIE with
     * the lines removed within 10 % against the Gaussian's RMS.
     */
    @ParameterizedTest
    @CsvSource({"2, 20", "2, 50", "5, 50", "5, 20"})
    void sinusoidalDeterministicJitterIsMeasuredByEachDefinition(double rjPs, double djPs) {
        String j = run(clock(200_000, rjPs, djPs, Dj.SINE, 5), Map.of());
        double rj = num(j, "randomJitterRmsPs");
        double dj = num(j, "deterministicJitterDualDiracPs");
        double pj = num(j, "periodicJitterPeakToPeakPs");
        double rest = num(j, "residualTieRmsPs");
        double[] exact = exactDualDirac(djPs / 2, rjPs, 200_000);
        System.out.printf("sine: RJ %.1f ps, DJ %.0f ps p-p -> RJ %.3f (exact model %.3f), DJ(dd) %.3f (exact model %.3f),"
                + " PJ(p-p) %.3f, residual RMS %.3f%n", rjPs, djPs, rj, exact[1], dj, exact[0], pj, rest);
        assertEquals(exact[0], dj, 0.1 * exact[0], j);
        assertEquals(exact[1], rj, 0.1 * exact[1], j);
        assertEquals(dj + 14.069 * rj, num(j, "totalJitterPs"), 0.001 * (dj + 14.069 * rj), j);
        assertTrue(dj <= pj, "DJ(dd) is at most the peak-to-peak: " + j);
        assertEquals(djPs, pj, 0.1 * djPs, j);
        assertEquals(rjPs, rest, 0.1 * rjPs, j);
    }

    @Test
    void withoutPeriodicJitterNoLineIsFound() {
        String j = run(clock(200_000, 5, 40, Dj.TWO_LEVEL, 11), Map.of());
        assertEquals(0, num(j, "periodicJitterPeakToPeakPs"), j);
        assertEquals(0, org.lanesift.testkit.JsonScan.parse("report", j).get("decomposition").get("periodicLines").elements().size(), j);
    }

    /**
     * The dual-Dirac fit of the exact distribution of {@code a sin(theta) + N(0, sigma^2)}, theta
     * uniform, over the probability range the plugin fits for n edges (ranks 5 to Phi(-1.5)/2 n,
     * JitterDecomposition's documented range): {DJ(dd), RJ}. The distribution is symmetric, so the
     * left tail alone gives both.
     */
    static double[] exactDualDirac(double a, double sigma, int n) {
        org.apache.commons.math3.distribution.NormalDistribution phi = new org.apache.commons.math3.distribution.NormalDistribution(0, 1);
        int m = 4000;
        double[] s = new double[m];
        for (int i = 0; i < m; i++) {
            s[i] = a * Math.sin(2 * Math.PI * (i + 0.5) / m);
        }
        java.util.function.DoubleUnaryOperator cdf = x -> {
            double sum = 0;
            for (double v : s) {
                sum += phi.cumulativeProbability((x - v) / sigma);
            }
            return sum / m;
        };
        int r0 = JitterDecomposition.MIN_BEYOND;
        int r1 = (int) Math.floor(JitterDecomposition.upper(JitterDecomposition.Q_SHALLOW) / 2 * n - 0.5);
        int pts = 200;
        double sq = 0;
        double sx = 0;
        double sqq = 0;
        double sqx = 0;
        for (int i = 0; i < pts; i++) {
            double f = (r0 + (double) i * (r1 - r0) / (pts - 1) + 0.5) / n;
            double lo = -a - 12 * sigma;
            double hi = a;
            for (int it = 0; it < 60; it++) {
                double mid = (lo + hi) / 2;
                if (cdf.applyAsDouble(mid) < f) {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            double x = (lo + hi) / 2;
            double q = phi.inverseCumulativeProbability(f / JitterDecomposition.WEIGHT);
            sq += q;
            sx += x;
            sqq += q * q;
            sqx += q * x;
        }
        double slope = (pts * sqx - sq * sx) / (pts * sqq - sq * sq);
        double mu = (sx - slope * sq) / pts;
        return new double[] {-2 * mu, slope};
    }

    @Test
    void tooFewEdgesSayTheModelCannotBeFitted() {
        String j = run(clock(500, 2, 20, Dj.TWO_LEVEL, 1), Map.of());
        org.lanesift.json.JsonValue decomposition = org.lanesift.testkit.JsonScan.parse("report", j).get("decomposition");
        assertEquals(false, decomposition.get("modelHolds").asBoolean(), j);
        assertTrue(decomposition.get("leftTail") != null && decomposition.get("rightTail") != null, j);
        assertTrue(j.contains("only 500 edges"), j);
        assertTrue(Double.isNaN(num(j, "totalJitterPs")), j);
    }

    @Test
    void uniformJitterIsFlaggedAsNonGaussian() {
        // bounded (uniform) jitter has no Gaussian tails: the Q-scale lines bend
        Random r = new Random(9);
        double[] tie = new double[100_000];
        for (int i = 0; i < tie.length; i++) {
            tie[i] = 20 * (r.nextDouble() - 0.5);
        }
        JitterDecomposition.Result d = JitterDecomposition.decompose(tie, tie.length, 1e-12);
        assertFalse(d.modelHolds(), d.toString());
        assertFalse(d.caveats().isEmpty());
    }

    @Test
    void theModelBathtubReachesTheBerWhereTotalJitterEnds() {
        // RJ 5 ps, DJ 50 ps, unit interval 1000 ps: TJ(1e-12) = 50 + 14.069 * 5 = 120.3 ps, centred on the
        // ideal edge, so at x = TJ/2 the late Dirac's tail holds Q(1e-12) sigma: probability 0.5 * 1e-12
        // (its weight 1/2); the other three terms are negligible there
        double rj = 5;
        double dj = 50;
        double q = JitterDecomposition.q(1e-12);
        JitterDecomposition.Result d = new JitterDecomposition.Result(200_000, new JitterDecomposition.Tail(-dj / 2, rj, 1, 100, 0.5),
                new JitterDecomposition.Tail(dj / 2, rj, 1, 100, 0.5), rj, dj, 1e-12, q, dj + 2 * q * rj, List.of());
        double p = JitterDecomposition.bathtubModel(d, 1000, d.tj() / 2);
        assertEquals(Math.log10(0.5e-12), Math.log10(p), 0.01);
        // the bottom of the tub, mid-interval, is far below any BER of interest
        assertTrue(JitterDecomposition.bathtubModel(d, 1000, 500) < 1e-100);
    }

    @Test
    void aTrackingClockRemovesSlowWanderThatTheLeastSquaresClockKeeps() {
        // 1 GHz clock, 1 ps RMS random jitter, plus 100 ps amplitude sinusoidal wander at 100 kHz
        // (period 10000 edges); a loop of 10 MHz bandwidth follows it (wander 100 x below the bandwidth)
        int cycles = 200_000;
        Random r = new Random(4);
        long[] t = new long[2 * cycles];
        for (int k = 0; k < cycles; k++) {
            double wander = 100 * Math.sin(2 * Math.PI * k / 10_000.0);
            t[2 * k] = 1_000_000 + Math.round(k * PERIOD_FS + 1000 * (wander + r.nextGaussian()));
            t[2 * k + 1] = 1_000_000 + Math.round((k + 0.5) * PERIOD_FS);
        }
        Edges e = Edges.of("clk", 0, Math.round(1_000_000 + (cycles + 1) * PERIOD_FS), false, t);
        for (int order = 1; order <= 2; order++) {
            String j = run(e, Map.of("trackingBandwidthHz", 10e6, "trackingOrder", (long) order));
            double lsRms = num(j, "tieRmsPs");
            org.lanesift.json.JsonValue tracking = org.lanesift.testkit.JsonScan.parse("report", j).get("trackingReference");
            double trRms = tracking.at("/tieRmsPs/value").asDouble();
            System.out.printf("wander: least-squares TIE %.3f ps RMS, tracking (order %d, 10 MHz) %.3f ps RMS%n", lsRms, order, trRms);
            // least squares keeps the wander: RMS of a 100 ps sine is 70.7 ps
            assertEquals(100 / Math.sqrt(2), lsRms, 2, j);
            // the loop removes it: the rest is the 1 ps random jitter (raised a little by the loop's peaking)
            assertEquals(1.0, trRms, 0.3, j);
        }
    }

    @Test
    void aLoopBandwidthTooWideForTheEdgeRateIsRefusedNamingTheOption() {
        // 1 GHz edges: at most 0.1 / (2 pi 1 ns) = 15.9 MHz
        StageHarness h = StageHarness.of(new JitterPlugin(), Map.of("trackingBandwidthHz", 100e6));
        h.push("clock", clock(2_000, 1, 0, Dj.TWO_LEVEL, 2));
        Throwable t = org.junit.jupiter.api.Assertions.assertThrows(RuntimeException.class, h::finish);
        while (t.getCause() != null && !(t instanceof org.lanesift.plugin.OptionException)) {
            t = t.getCause();
        }
        assertTrue(t instanceof org.lanesift.plugin.OptionException, String.valueOf(t));
        assertTrue(t.getMessage().contains("trackingBandwidthHz") && t.getMessage().contains("15.9 MHz"), t.getMessage());
    }
}
