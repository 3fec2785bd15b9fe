package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Edges;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.JsonScan;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * The low-power/high-speed state pattern from the legs of a capture made in the test tree: one
 * D-PHY-like data lane whose legs stop at LP-11 (both at 1.2 V), then request with LP-01 and
 * bridge with LP-00 for 60 ns each before every high-speed burst (docs/reference-facts.md#d-phy-levels-and-states:
 * LP high about 1.2 V, HS a swing around a common mode of about 200 mV; the 60 ns states are
 * invented, longer than the 50 ns low-power state the standard asks for, from memory). The
 * negative case: the same bits on LVDS-like legs (1.2 V common mode, +/-175 mV per leg; common
 * practice), where no pattern may be claimed.
 */
class LineStatePatternTest {
    private static final long UI_FS = 2_000_000;
    private static final long STOP_FS = 300_000_000;
    private static final long REQUEST_FS = 60_000_000;
    private static final long BRIDGE_FS = 60_000_000;
    private static final double RATE_HZ = 4e9;
    private static final int BURSTS = 12;

    /** Bursts: start of the high-speed bits, bit values (sync B8 LSB first, then bytes LSB first). */
    private final List<Long> hsStartFs = new ArrayList<>();
    private final List<boolean[]> hsBits = new ArrayList<>();
    private long endFs;

    LineStatePatternTest() {
        Random r = new Random(2012);
        long t = STOP_FS;
        for (int b = 0; b < BURSTS; b++) {
            t += REQUEST_FS + BRIDGE_FS;
            int bytes = 16 + r.nextInt(25);
            boolean[] bits = new boolean[8 * (bytes + 1)];
            for (int j = 0; j < 8; j++) {
                bits[j] = (0xB8 >> j & 1) != 0;
            }
            for (int i = 8; i < bits.length; i++) {
                bits[i] = r.nextBoolean();
            }
            hsStartFs.add(t);
            hsBits.add(bits);
            t += bits.length * UI_FS + STOP_FS;
        }
        endFs = t;
    }

    /** The state at {@code t}: 0 LP-11, 1 LP-01, 2 LP-00, 3 HS bit 0, 4 HS bit 1. */
    private int state(long t) {
        for (int b = 0; b < BURSTS; b++) {
            long hs = hsStartFs.get(b);
            long end = hs + hsBits.get(b).length * UI_FS;
            if (t >= hs - REQUEST_FS - BRIDGE_FS && t < end) {
                if (t < hs - BRIDGE_FS) {
                    return 1;
                }
                if (t < hs) {
                    return 2;
                }
                return hsBits.get(b)[(int) ((t - hs) / UI_FS)] ? 4 : 3;
            }
        }
        return 0;
    }

    /** A leg: D-PHY-like (LP at 0 or 1.2 V, HS 200 mV +/- 100 mV) or LVDS-like (1.2 V +/- 175 mV, idle low between bursts). */
    private AnalogBlock leg(String name, boolean positive, boolean dphy) {
        int n = (int) (endFs * 1e-15 * RATE_HZ);
        return Synth.analog(name, RATE_HZ, n, s -> {
            int st = state(Math.round(s * 1e15));
            if (!dphy) {
                boolean one = st == 4;
                return 1.2 + (one == positive ? 0.175 : -0.175);
            }
            return switch (st) {
                case 0 -> 1.2;
                case 1 -> positive ? 0.0 : 1.2;
                case 2 -> 0.0;
                default -> 0.2 + ((st == 4) == positive ? 0.1 : -0.1);
            };
        });
    }

    private Map<String, Artifact> run(boolean dphy) {
        return run(dphy, true);
    }

    private Map<String, Artifact> run(boolean dphy, boolean withLegs) {
        List<Long> clock = new ArrayList<>();
        List<Long> lane = new ArrayList<>();
        boolean level = false;
        for (int b = 0; b < BURSTS; b++) {
            long hs = hsStartFs.get(b);
            boolean[] bits = hsBits.get(b);
            for (int j = 0; j < bits.length; j++) {
                clock.add(hs + j * UI_FS + UI_FS / 2); // double edge: the clock toggles in the middle of each bit
                if (bits[j] != level) {
                    lane.add(hs + j * UI_FS);
                    level = bits[j];
                }
            }
            if (level) {
                lane.add(hs + bits.length * UI_FS);
                level = false;
            }
        }
        if (clock.size() % 2 == 1) {
            clock.add(clock.get(clock.size() - 1) + UI_FS);
        }
        StageHarness h = StageHarness.of(new LinkDiscoveryPlugin(), Map.of("lanes", 1, "legs", withLegs));
        h.push("clock", edges("CLK", clock));
        h.push("lane0", edges("D0", lane));
        List<AnalogBlock> p = Synth.split(leg("D0_P", true, dphy), 7001, 20000);
        List<AnalogBlock> n = Synth.split(leg("D0_N", false, dphy), 12345);
        for (int i = 0; withLegs && i < Math.max(p.size(), n.size()); i++) {
            if (i < p.size()) {
                h.push("lane0p", p.get(i));
            }
            if (i < n.size()) {
                h.push("lane0n", n.get(i));
            }
        }
        h.finish();
        Map<String, Artifact> files = new java.util.HashMap<>();
        for (Artifact a : h.outputs("files", Artifact.class)) {
            files.put(a.fileName().substring(a.fileName().indexOf('-') + 1), a);
        }
        return files;
    }

    private Edges edges(String name, List<Long> t) {
        long[] a = t.stream().mapToLong(Long::longValue).toArray();
        return new Edges(name, 0, endFs, false, a, a.length, null, 0);
    }

    @Test
    void lowPowerEntryBeforeEveryBurstIsFoundWithItsEvidence() {
        Map<String, Artifact> f = run(true);
        JsonValue j = JsonScan.parse("hypotheses.json", new String(f.get("hypotheses.json").content(), StandardCharsets.UTF_8));
        JsonValue ls = j.at("/bursts/lineStates");
        assertEquals("LP-11, LP-01, LP-00, HS", ls.get("pattern").asString());
        assertEquals(BURSTS, ls.get("highSpeedIntervals").asDouble());
        assertEquals(BURSTS, ls.get("enteredThroughPattern").asDouble());
        assertEquals(1.0, ls.get("confidence").asDouble());
        assertEquals(1.2, ls.get("stopLevelVolts").asDouble(), 1e-3);
        assertEquals(0.2, ls.get("highSpeedCommonModeVolts").asDouble(), 1e-3);
        // a state is committed where it began: LP-01 and LP-00 last 60 ns each, within a sample (250 ps)
        assertEquals(60e-9, ls.get("lp01MeanS").asDouble(), 0.3e-9);
        assertEquals(60e-9, ls.get("lp00MeanS").asDouble(), 0.3e-9);
        assertEquals("clock-stops", j.at("/bursts/boundaries").asString());
        String md = new String(f.get("hypotheses.md").content(), StandardCharsets.UTF_8);
        assertTrue(md.contains("12 of 12 high-speed intervals entered through LP-11, LP-01, LP-00 (LP-01 for 60.00 ns, LP-00 for 60.00 ns on average); stop level (LP-11) 1.200 V; high-speed common mode 200.0 mV"),
                md);
        assertTrue(md.contains("The lanes have the low-power/high-speed state pattern LP-11, LP-01, LP-00, HS (confidence 1.00)."), md);
    }

    @Test
    void lvdsLikeLegsClaimNoPattern() {
        Map<String, Artifact> f = run(false);
        JsonValue ls = JsonScan.parse("hypotheses.json", new String(f.get("hypotheses.json").content(), StandardCharsets.UTF_8))
                .at("/bursts/lineStates");
        assertEquals("none", ls.get("pattern").asString());
        assertEquals(0, ls.get("highSpeedIntervals").asDouble());
        // both legs stay above the 880 mV low-power high threshold: the receiver would read LP-11 throughout
        assertEquals(1.0, ls.get("timeShare").get("LP-11").asDouble());
        assertFalse(ls.members().containsKey("lp01MeanS"));
        String md = new String(f.get("hypotheses.md").content(), StandardCharsets.UTF_8);
        assertTrue(md.contains("0 of 0 high-speed intervals entered through LP-11, LP-01, LP-00"), md);
        assertTrue(md.contains("No low-power/high-speed state pattern (confidence 1.00)."), md);
    }

    @Test
    void withoutLegsTheReportSaysNothingOfLineStates() {
        Map<String, Artifact> f = run(true, false);
        JsonValue j = JsonScan.parse("hypotheses.json", new String(f.get("hypotheses.json").content(), StandardCharsets.UTF_8));
        assertEquals("clock-stops", j.at("/bursts/boundaries").asString());
        assertEquals(null, j.at("/bursts/lineStates"));
        assertFalse(new String(f.get("hypotheses.md").content(), StandardCharsets.UTF_8).contains("Line states"));
    }
}
