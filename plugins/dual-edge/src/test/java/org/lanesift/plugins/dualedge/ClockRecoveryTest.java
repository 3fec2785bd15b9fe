package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.StageContext;

/** The clock-recovery state machine driven directly with hand-made clock transitions. */
class ClockRecoveryTest {
    static final long P = 10_000; // clock period, fs
    static final long T0 = 1_000; // first (rising) transition

    /** Collects what the annotation queue publishes. */
    static final class Ctx implements StageContext {
        final List<Annotation> notes = new ArrayList<>();

        @Override
        public String instanceId() {
            return "t";
        }

        @Override
        public OptionValues options() {
            return null;
        }

        @Override
        public List<PortSpec> inputs() {
            return List.of();
        }

        @Override
        public List<PortSpec> outputs() {
            return List.of();
        }

        @Override
        public boolean isConnected(int output) {
            return false;
        }

        @Override
        public void emit(int output, Block block) {
        }

        @Override
        public void annotate(Annotation a) {
            notes.add(a);
        }

        @Override
        public void progress(long done, long total) {
        }

        @Override
        public boolean isCancelled() {
            return false;
        }
    }

    final EdgeQueue q = new EdgeQueue("clk");
    final AnnotationQueue notes = new AnnotationQueue(new Ctx());
    final ClockRecovery cr = new ClockRecovery(config(Map.of()), q, notes);

    static SamplerConfig config(Map<String, Object> options) {
        return SamplerConfig.from(OptionValues.validate(new DualEdgePlugin().descriptor(), options));
    }

    /** A 50 % clock: transition k at T0 + k * P / 2, k in [from, to). */
    static long[] clock(int from, int to, long offsetFs) {
        long[] t = new long[to - from];
        for (int k = from; k < to; k++) {
            t[k - from] = offsetFs + T0 + k * (P / 2);
        }
        return t;
    }

    static long[] concat(long[]... parts) {
        long[] out = new long[0];
        for (long[] p : parts) {
            int n = out.length;
            out = Arrays.copyOf(out, n + p.length);
            System.arraycopy(p, 0, out, n, p.length);
        }
        return out;
    }

    void feed(long startFs, long endFs, boolean initialLevel, long[] times) {
        q.append(new Edges("clk", startFs, endFs, initialLevel, times, times.length, null, 0));
    }

    long[] acceptedTimes() {
        return Arrays.copyOf(cr.edges().timesFs(), cr.edges().count());
    }

    @Test
    void waitsForEnoughTransitionsThenAcquiresAndTracks() {
        assertEquals(ClockRecovery.Phase.WAITING, cr.phase());
        long[] first = clock(0, 20, 0);
        long end1 = first[19] + 1000;
        feed(0, end1, false, first);
        cr.run(end1, false);
        assertEquals(ClockRecovery.Phase.ACQUIRING, cr.phase());
        assertFalse(cr.hasPeriod());
        assertEquals(0, cr.edges().count());

        long[] rest = clock(20, 200, 0);
        long end2 = rest[rest.length - 1] + P / 4;
        feed(end1, end2, false, rest);
        cr.run(end2, false);
        assertEquals(ClockRecovery.Phase.TRACKING, cr.phase());
        assertTrue(cr.hasPeriod());
        assertEquals(P, cr.periodFs());
        assertEquals(1, notes.count(ClockRecovery.TRACK, "clock-acquired"));
        long[] acc = acceptedTimes();
        assertEquals(T0, acc[0]);
        assertTrue((cr.edges().flags()[0] & AcceptedEdges.RISING) != 0);
        assertEquals(0, cr.edges().flags()[1] & AcceptedEdges.RISING);
        // the horizon lies more than glitchFraction periods past the last transition: it is final too
        assertEquals(200, acc.length);
        assertEquals(200, cr.acceptedEdges());
        assertEquals(ClockRecovery.Gap.UNKNOWN, cr.gapAfterLast(end2));

        cr.edges().consumed(150);
        assertEquals(50, cr.edges().count());
        assertEquals(T0 + 150 * (P / 2), cr.edges().timesFs()[0]);
    }

    @Test
    void aDropoutSendsItBackToAcquisitionAndTheNextEdgeIsARestart() {
        long gap = 10 * P;
        long[] before = clock(0, 100, 0);
        long[] after = clock(100, 120, gap); // fewer than ACQUIRE_EDGES after the gap
        long[] t = concat(before, after);
        long end = t[t.length - 1] + P / 4;
        feed(0, end, false, t);
        cr.run(end, false);
        assertEquals(ClockRecovery.Phase.REACQUIRING, cr.phase());
        assertEquals(1, cr.dropouts());
        assertEquals(ClockRecovery.Gap.YES, cr.gapAfterLast(end));

        cr.run(end, true);
        assertEquals(ClockRecovery.Phase.FINISHED, cr.phase());
        assertEquals(1, cr.restarts());
        assertEquals(1, notes.count(ClockRecovery.TRACK, "clock-restart"));
        long[] acc = acceptedTimes();
        int firstAfter = 100;
        assertEquals(after[0], acc[firstAfter]);
        assertTrue((cr.edges().flags()[firstAfter] & AcceptedEdges.RESTART) != 0);
        for (int i = 0; i < firstAfter; i++) {
            assertEquals(0, cr.edges().flags()[i] & AcceptedEdges.RESTART, "edge " + i);
        }
        assertEquals(120, acc.length);
    }

    @Test
    void aRuntPulseIsRemovedWithBothItsEdges() {
        long[] clean = clock(0, 100, 0);
        long high = clean[40]; // a rising edge: the clock is high for P / 2 after it
        long[] runt = {high + 2200, high + 2700}; // a 500 fs low pulse inside the high half
        long[] t = concat(Arrays.copyOf(clean, 41), runt, Arrays.copyOfRange(clean, 41, 100));
        long end = t[t.length - 1] + P;
        feed(0, end, false, t);
        cr.run(end, true);
        assertEquals(1, cr.glitches());
        assertEquals(1, notes.count(ClockRecovery.TRACK, "clock-glitch"));
        assertTrue(Arrays.equals(clean, acceptedTimes()));
        assertEquals(P, cr.periodMean());
        assertEquals(0, cr.periodStd());
    }

    @Test
    void theEndOfTheCaptureDecidesWhetherTheClockStopped() {
        long[] t = clock(0, 60, 0);
        long soon = t[59] + P;
        feed(0, soon, false, t);
        cr.run(soon, true);
        assertEquals(ClockRecovery.Phase.FINISHED, cr.phase());
        assertEquals(ClockRecovery.Gap.NO, cr.gapAfterLast(soon));
        assertEquals(0, cr.dropouts());

        EdgeQueue q2 = new EdgeQueue("clk");
        ClockRecovery stopped = new ClockRecovery(config(Map.of()), q2, notes);
        long late = t[59] + 5 * P;
        q2.append(new Edges("clk", 0, late, false, t, t.length, null, 0));
        stopped.run(late, true);
        assertEquals(ClockRecovery.Gap.YES, stopped.gapAfterLast(late));
        assertEquals(1, stopped.dropouts());
    }

    @Test
    void noTransitionsMeansNoClock() {
        feed(0, 1_000_000, false, new long[0]);
        cr.run(1_000_000, true);
        assertEquals(ClockRecovery.Phase.FINISHED, cr.phase());
        assertFalse(cr.hasPeriod());
        assertTrue(Double.isNaN(cr.frequencyHz()));
        assertEquals(1, notes.count(ClockRecovery.TRACK, "clock-absent"));
    }

    @Test
    void statsKeepMeanSpreadAndExtremes() {
        ClockStats s = new ClockStats();
        assertTrue(Double.isNaN(s.periodMinFs()));
        assertTrue(Double.isNaN(s.dutyMean()));
        assertEquals(7.0, s.periodMeanFs(7.0));
        assertEquals(0, s.periodStdFs());
        for (double v : new double[] {1e6 + 2, 1e6 + 4, 1e6 + 4, 1e6 + 4, 1e6 + 5, 1e6 + 5, 1e6 + 7, 1e6 + 9}) {
            s.addPeriod(v);
        }
        assertEquals(8, s.intervals());
        assertEquals(1e6 + 5, s.periodMeanFs(0), 1e-9);
        // sample standard deviation of 2,4,4,4,5,5,7,9: sqrt(32 / 7)
        assertEquals(Math.sqrt(32.0 / 7), s.periodStdFs(), 1e-9);
        assertEquals(1e6 + 2, s.periodMinFs());
        assertEquals(1e6 + 9, s.periodMaxFs());
        s.addDuty(0.4);
        s.addDuty(0.6);
        assertEquals(0.5, s.dutyMean(), 1e-15);
        assertEquals(0.4, s.dutyMin());
        assertEquals(0.6, s.dutyMax());
    }

    @Test
    void patternDecisionFollowsTheDutyAndAnnotatesOnlyChanges() {
        // 7 slots, pattern 1100011: 4 of 7 slots high; 3 of 7 means the lane is inverted
        AnnotationQueue n = new AnnotationQueue(new Ctx());
        ClockPattern p = new ClockPattern(config(Map.of("mode", "multiplied")), n);
        assertEquals("", p.verdict());
        p.decide(3.0 / 7, 0);
        assertTrue(p.inverted());
        assertTrue(p.verdict().startsWith("duty 0.4286 matches 3/7: clock lane inverted"), p.verdict());
        p.decide(3.0 / 7, 10);
        assertEquals(1, n.count(ClockRecovery.TRACK, "clock-inverted"));
        p.decide(4.0 / 7, 20);
        assertFalse(p.inverted());
        assertEquals(1, n.count(ClockRecovery.TRACK, "clock-pattern"));
        p.decide(0.2, 30);
        assertTrue(p.inverted());
        assertEquals(1, n.count(ClockRecovery.TRACK, "clock-duty-unexpected"));
        assertTrue(p.verdict().contains("matches neither 4/7 nor 3/7"), p.verdict());

        ClockPattern unmeasured = new ClockPattern(config(Map.of("mode", "multiplied")), n);
        unmeasured.decide(Double.NaN, 0);
        assertFalse(unmeasured.inverted());
        assertEquals("duty cycle not measurable: clock taken as not inverted", unmeasured.verdict());
        assertEquals(2, n.count(ClockRecovery.TRACK, "clock-duty-unexpected"));
    }

    @Test
    void acceptedEdgesGrowAndRefuseABadBulkCount() {
        AcceptedEdges e = new AcceptedEdges();
        int cap = e.capacity();
        for (int i = 0; i < cap + 3; i++) {
            e.add(i * 10L, 10.0, AcceptedEdges.RISING, i);
        }
        assertEquals(cap + 3, e.count());
        assertTrue(e.capacity() > cap);
        assertEquals((cap + 2) * 10L, e.timesFs()[cap + 2]);
        assertEquals(cap + 2, e.indices()[cap + 2]);
        org.junit.jupiter.api.Assertions.assertThrows(IllegalStateException.class, () -> e.appended(e.count() - 1));
        org.junit.jupiter.api.Assertions.assertThrows(IllegalStateException.class, () -> e.appended(e.capacity() + 1));
    }

    @Test
    void theAcquisitionWindowTakesMediansSoOneGlitchDoesNotMoveThem() {
        // 30 % duty clock with one runt (two extra transitions) inside the window
        long[] t = new long[40];
        int k = 0;
        for (int c = 0; k < 40; c++) {
            t[k++] = T0 + c * P;
            t[k++] = T0 + c * P + 3 * P / 10;
            if (c == 5) {
                t[k++] = T0 + c * P + 5 * P / 10;
                t[k++] = T0 + c * P + 5 * P / 10 + 100;
            }
        }
        feed(0, t[39] + P, false, t);
        assertEquals(P, AcquisitionWindow.medianPeriodFs(q, 0, 40));
        assertEquals(3 * P / 10, AcquisitionWindow.medianHighFs(q, 0, 40));
        // a window whose only rising transition is its last has no high time
        assertTrue(Double.isNaN(AcquisitionWindow.medianHighFs(q, 1, 2)));
        double[] v = {5, 1, 4, 2};
        assertEquals(3.0, AcquisitionWindow.median(v, 4));
        assertEquals(4.0, AcquisitionWindow.median(v, 3));
        assertEquals(5.0, v[0]); // the input is left as it was
    }
}
