package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.chain.Chain;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.json.JsonValue;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.testkit.JsonScan;
import org.lanesift.testkit.Synth;

/**
 * The differential signal P-N from plugin {@code differential} (output {@code diff}) in chains
 * with the leg deskew before it and the eye diagram after it: it is the difference of the
 * deskewed legs sample for sample, and an eye of it has the amplitude of the difference.
 */
class DifferentialSignalTest {
    static final double PERIOD_FS = 100_000; // 10 GS/s
    static final double UI_FS = 2_000_000; // 500 Mbit/s
    static final double RISE_FS = 250_000;
    static final double LEG_SWING = 0.175; // each leg +/- 175 mV around 1.2 V: VOD 350 mV
    static final int N = 40_000;
    static final boolean[] BITS = Synth.randomBits((int) (N * PERIOD_FS / UI_FS) + 4, 11);

    /** The ideal difference at time t (fs): smooth edges (tanh, bandlimited enough for the sinc deskew). */
    static double diff(double tFs) {
        double u = tFs / UI_FS;
        int k = (int) Math.floor(u);
        double v = BITS[0] ? 1 : -1;
        for (int j = 1; j <= k + 1 && j < BITS.length; j++) {
            if (BITS[j] != BITS[j - 1]) {
                double step = (BITS[j] ? 1 : -1) - (BITS[j - 1] ? 1 : -1);
                v += step / 2 * (1 + Math.tanh((tFs - j * UI_FS) / (RISE_FS / 2.2)));
            }
        }
        return 2 * LEG_SWING * v;
    }

    /** A leg of the pair, delayed by {@code delayFs}: the common mode 1.2 V plus or minus half the difference. */
    static AnalogBlock leg(String name, boolean positive, double delayFs) {
        return Synth.analog(name, 1e15 / PERIOD_FS, N, s -> 1.2 + (positive ? 0.5 : -0.5) * diff(s * 1e15 - delayFs));
    }

    /** Samples of a port by sample number from time 0, NaN where missing or invalid. */
    static double[] collect(List<AnalogBlock> blocks) {
        double[] v = new double[N];
        java.util.Arrays.fill(v, Double.NaN);
        for (AnalogBlock b : blocks) {
            long first = Math.round(b.startFs() / PERIOD_FS);
            for (int i = 0; i < b.length(); i++) {
                long k = first + i;
                if (k >= 0 && k < N && (b.invalid() == null || !BitSets.get(b.invalid(), i))) {
                    v[(int) k] = b.volts()[i];
                }
            }
        }
        return v;
    }

    @Test
    void afterAKnownLegSkewTheDifferenceIsTheDifferenceOfTheDeskewedLegs() {
        double skewFs = 40_000; // the N leg arrives 40 ps late
        Map<String, List<AnalogBlock>> got = new HashMap<>();
        for (String at : new String[] {"fix.out0", "fix.out1", "rx.diff"}) {
            got.put(at, new ArrayList<>());
        }
        Chain c = Chain.builder(PluginRegistry.discover(null))
                .input("p", DataKind.ANALOG).input("n", DataKind.ANALOG)
                .add("fix", "deskew", Map.of("kind", "analog", "channels", 2, "offsets", List.of(0.0, -40.0)))
                .add("rx", "differential", Map.of("name", "D0", "diffOutput", true, "levelProfile", "none"))
                .wire("p", "fix.in0").wire("n", "fix.in1").wire("fix.out0", "rx.p").wire("fix.out1", "rx.n")
                .tap("fix.out0", b -> got.get("fix.out0").add((AnalogBlock) b))
                .tap("fix.out1", b -> got.get("fix.out1").add((AnalogBlock) b))
                .tap("rx.diff", b -> got.get("rx.diff").add((AnalogBlock) b))
                .build();
        List<AnalogBlock> ps = Synth.split(leg("D0_P", true, 0), 4096);
        List<AnalogBlock> ns = Synth.split(leg("D0_N", false, skewFs), 4096);
        for (int i = 0; i < ps.size(); i++) {
            c.push("p", ps.get(i));
            c.push("n", ns.get(i));
        }
        c.finish();
        double[] p = collect(got.get("fix.out0"));
        double[] n = collect(got.get("fix.out1"));
        double[] d = collect(got.get("rx.diff"));
        int compared = 0;
        double worstTrue = 0;
        double worstSkewed = 0;
        for (int k = 0; k < N; k++) {
            if (Double.isNaN(d[k])) {
                continue;
            }
            assertEquals((float) p[k] - (float) n[k], (float) d[k], 0f, "P-N at sample " + k);
            compared++;
            double t = k * PERIOD_FS;
            worstTrue = Math.max(worstTrue, Math.abs(d[k] - diff(t)));
            // what the difference of the legs would be without the correction
            worstSkewed = Math.max(worstSkewed, Math.abs(0.5 * diff(t) + 0.5 * diff(t - skewFs) - diff(t)));
        }
        assertTrue(compared > N - 200, "samples compared: " + compared);
        // the corrected difference follows the unskewed one; uncorrected, 40 ps on a 250 ps edge of 700 mV is tens of mV
        assertTrue(worstTrue < 0.005, "worst error of the deskewed difference " + worstTrue + " V");
        assertTrue(worstSkewed > 0.03, "the skew must matter for this check to mean anything: " + worstSkewed + " V");
    }

    @Test
    void theEyeOfTheDifferenceHasTwiceTheAmplitudeOfALegOfASymmetricPair() {
        Map<String, JsonValue> eyes = new HashMap<>();
        Chain c = Chain.builder(PluginRegistry.discover(null))
                .input("p", DataKind.ANALOG).input("n", DataKind.ANALOG)
                .add("rx", "differential", Map.of("name", "D0", "diffOutput", true, "levelProfile", "lvds"))
                .add("d0", "eye-diagram", Map.of("bitRateHz", 1e15 / UI_FS))
                .add("d0-p", "eye-diagram", Map.of("bitRateHz", 1e15 / UI_FS))
                .wire("p", "rx.p").wire("n", "rx.n").wire("rx.diff", "d0.signal").wire("p", "d0-p.signal")
                .outputs((id, port, b) -> {
                    if (b instanceof Artifact a && a.fileName().endsWith("-eye.json")) {
                        eyes.put(id, JsonScan.parse(a.fileName(), new String(a.content(), StandardCharsets.UTF_8)));
                    }
                })
                .build();
        c.push("p", leg("D0_P", true, 0));
        c.push("n", leg("D0_N", false, 0));
        c.finish();
        JsonValue diffEye = eyes.get("d0");
        JsonValue legEye = eyes.get("d0-p");
        assertEquals("D0 (P-N)", diffEye.get("channel").asString(), "the eye names the signal it measured");
        assertEquals("D0_P", legEye.get("channel").asString());
        double diffMv = JsonScan.number(diffEye, "highLevelMv") - JsonScan.number(diffEye, "lowLevelMv");
        double legMv = JsonScan.number(legEye, "highLevelMv") - JsonScan.number(legEye, "lowLevelMv");
        // construction: P-N swings between -350 and +350 mV (VOD 350 mV), a leg between 1.025 and 1.375 V
        assertEquals(700, diffMv, 700 * 0.02, "levels of the eye of P-N");
        assertEquals(350, legMv, 350 * 0.02, "levels of the eye of one leg");
        assertEquals(2.0, diffMv / legMv, 0.03);
    }
}
