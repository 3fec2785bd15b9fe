package org.lanesift.plugins.pixellink;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Frame;

/** The small parts the frame assembler is made of, each on its own. */
class FrameAssemblerPartsTest {

    @Test
    void pictureRowsArePaddedOrCutToTheFirstWidth() {
        PictureBuffer p = new PictureBuffer(4);
        assertEquals(-1, p.width());
        p.width(3);
        p.appendRow(new int[] {1, 2, 3, 99}, 3);
        p.appendRow(new int[] {4, 5, 77, 99}, 2); // short: padded with black
        p.appendRow(new int[] {6, 7, 8, 9}, 4); // long: cut
        assertEquals(3, p.rows());
        assertArrayEquals(new int[] {1, 2, 3, 4, 5, 0, 6, 7, 8}, p.pixels());
        int[] tail = p.cutFrom(1);
        assertArrayEquals(new int[] {4, 5, 0, 6, 7, 8}, tail);
        assertEquals(1, p.rows());
        p.reset();
        assertEquals(-1, p.width());
        assertEquals(0, p.rows());
        p.refill(3, tail, 2);
        assertEquals(3, p.width());
        assertArrayEquals(tail, p.pixels());
    }

    @Test
    void pictureGrowsUpToMaxHeightRows() {
        PictureBuffer p = new PictureBuffer(5);
        p.width(2);
        for (int r = 0; r < 5; r++) {
            p.appendRow(new int[] {r, -r}, 2);
        }
        assertArrayEquals(new int[] {0, 0, 1, -1, 2, -2, 3, -3, 4, -4}, p.pixels());
    }

    @Test
    void syncPolarityIsTheLevelEnteredAfterARunWithDe() {
        SyncPolarity s = new SyncPolarity(-1);
        s.start(false);
        assertFalse(s.edge(1, false)); // no DE in the run before: nothing learned
        assertFalse(s.known());
        s.deSeen();
        assertTrue(s.edge(0, false)); // leaving a run that held DE: the level entered is active
        assertEquals(0, s.active());
        assertTrue(s.edge(1, true)); // known from then on, whatever comes
        assertEquals(0, s.active());

        SyncPolarity forced = new SyncPolarity(1);
        forced.start(false);
        assertTrue(forced.edge(0, false));
        assertEquals(1, forced.active());
    }

    @Test
    void firstGapVerdicts() {
        FirstGap g = new FirstGap();
        assertFalse(g.pendingAt(0));
        // period across the gap 1000, next period 600, gap 700 longer than a line: vertical blanking
        g.hold(7, 700, 1000, 2000, 123);
        assertTrue(g.pendingAt(2000));
        assertFalse(g.pendingAt(1999));
        assertEquals(FirstGap.Verdict.VERTICAL, g.decide(2600));
        assertFalse(g.pendingAt(2000));
        assertEquals(7, g.row());
        assertEquals(123, g.riseT());
        // period across the gap 600, next period 1000: the next gap is the vertical one
        g.hold(3, 100, 600, 2000, 0);
        assertEquals(FirstGap.Verdict.HORIZONTAL_BEFORE_VERTICAL, g.decide(3000));
        // alike: both were lines
        g.hold(3, 100, 600, 2000, 0);
        assertEquals(FirstGap.Verdict.HORIZONTAL, g.decide(2620));
        // a long period across a gap no longer than the next line is no blanking either
        g.hold(3, 600, 1000, 2000, 0);
        assertEquals(FirstGap.Verdict.HORIZONTAL, g.decide(2600));
        g.hold(3, 100, 600, 2000, 0);
        g.drop();
        assertFalse(g.pendingAt(2000));
    }

    @Test
    void frameStateKeepsTheFirstBreakAndReportsLatchesOncePerFrame() {
        FrameState f = new FrameState(Long.MIN_VALUE);
        f.suspectPixel(); // between frames: counted, but no frame to make suspect
        assertFalse(f.suspect());
        f.open(10, 1000, true, false, 5, 6);
        assertTrue(f.isOpen());
        assertEquals(0, f.suspectPixels());
        assertNull(f.brokenReason());
        f.markBroken("first");
        f.markBroken("second");
        assertEquals("first", f.brokenReason());
        assertTrue(f.firstDriftReport());
        assertFalse(f.firstDriftReport());
        assertTrue(f.firstMismatch());
        assertFalse(f.firstMismatch());
        f.suspectPixel();
        assertTrue(f.suspect());
        f.close();
        f.advanceIndex();
        f.open(20, 2000, false, true, -1, 0);
        assertEquals(1, f.index());
        assertFalse(f.broken());
        assertTrue(f.firstDriftReport());
        assertTrue(f.firstTooTallReport());
        assertFalse(f.firstTooTallReport());
        assertEquals(2000, f.lastFallT());
    }

    @Test
    void findingsFollowTheDetailLevelAndCountAnomalies() {
        List<Annotation> got = new ArrayList<>();
        FrameAssembler.Out out = new FrameAssembler.Out() {
            @Override
            public void frame(Frame f) {
            }

            @Override
            public void annotate(Annotation a) {
                got.add(a);
            }
        };
        Timing timing = new Timing();
        FrameFindings quiet = new FrameFindings("px", out, timing, FrameAssembler.Detail.ANOMALIES, "the lane carrying DE/HS/VS (lane2)");
        quiet.line(0, 10, 4, 0, 0);
        quiet.hsync(0, 10, 2);
        quiet.vsync(0, 10, 40, 2, Long.MIN_VALUE);
        Frame complete = new Frame("px", 0, 10, 0, 2, 1, new int[2], false, false);
        quiet.frame(complete, 0, true, false, null, false, 0, 0, null);
        assertTrue(got.isEmpty(), got.toString());
        Frame partial = new Frame("px", 0, 10, 1, 2, 1, new int[2], true, false);
        quiet.frame(partial, 1, false, false, "the capture ended inside this frame", true, 3, 0, null);
        assertEquals(List.of("frame", "partial-frame", "suspect-bits"), got.stream().map(Annotation::kind).toList());
        // cut by the capture window: information; the flagged bits in it stay a warning
        assertEquals(List.of(Severity.INFO, Severity.INFO, Severity.WARNING), got.stream().map(Annotation::severity).toList());
        assertEquals("px.anomalies", got.get(1).track());
        quiet.anomaly(5, 50, "lost-lock", Severity.ERROR, "lock lost: x");
        assertEquals(1L, timing.anomalies.get("partial-frame"));
        assertEquals(1L, timing.anomalies.get("lost-lock"));

        // lines changing length: one warning naming the control lane, the later ones information pointing back
        got.clear();
        quiet.lineLength(1_000_000, 2_000_000, 12, 16, 3, 0);
        quiet.lineLength(3_000_000, 4_000_000, 20, 16, 4, 0);
        quiet.lineLength(5_000_000, 6_000_000, 12, 16, 5, 0);
        assertEquals(List.of(Severity.WARNING, Severity.INFO, Severity.INFO), got.stream().map(Annotation::severity).toList());
        assertTrue(got.get(0).label().contains("framing from the lane carrying DE/HS/VS (lane2) is inconsistent"), got.get(0).label());
        assertTrue(got.get(2).label().contains("consequence: see the first line-length finding at 1.000 ns"), got.get(2).label());
        assertEquals(3L, timing.anomalies.get("line-length"));

        got.clear();
        FrameFindings all = new FrameFindings("px", out, new Timing(), FrameAssembler.Detail.LINES, "the lane carrying DE/HS/VS (lane2)");
        all.line(0, 10, 4, 0, 0);
        all.hsync(0, 10, 2);
        all.vsync(0, 10, 40, Long.MIN_VALUE, Long.MIN_VALUE);
        assertEquals(List.of("line", "hsync", "vsync"), got.stream().map(Annotation::kind).toList());
        assertEquals("VS ? lines", got.get(2).label());
    }

    @Test
    void lineMarksCountLinesByHsWhenBothEndsHaveIt() {
        LineMark m = new LineMark(-1);
        assertFalse(m.since(0));
        m.set(100, 5000, 10, 12);
        assertTrue(m.since(100));
        assertFalse(m.since(101));
        assertEquals(5, m.linesTo(15, 40)); // HS count on both ends wins
        assertEquals(28, m.linesTo(-1, 40)); // no HS at the far end: DE periods
        assertEquals(LineMark.NONE, m.linesTo(-1, LineMark.NONE));
        m.vLine(3);
        assertEquals(37, m.linesTo(-1, 40));
        assertEquals(LineMark.NONE, LineMark.linesBetween(-1, LineMark.NONE, 4, 7));
    }
}
