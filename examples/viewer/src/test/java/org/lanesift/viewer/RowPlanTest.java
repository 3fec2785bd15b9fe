package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;

class RowPlanTest {
    private static AnalogTrace analog(String name) {
        return AnalogTrace.of(name, 0, 1000, new float[] {0, 1, 0, 1}, 4);
    }

    private static LogicTrace logic(String name) {
        return new LogicTrace(name, 0, 4000, false, new long[] {1000}, 1);
    }

    private static NoteTrack track(String name, int overlapping) {
        List<Annotation> notes = new java.util.ArrayList<>();
        for (int i = 0; i < overlapping; i++) {
            notes.add(Annotation.on(name, "k").span(i, 100).label("x").severity(Severity.INFO).build());
        }
        return new NoteTrack(name, notes);
    }

    @Test
    void decodedSignalsAndTracksHangUnderTheChannelsTheyCameFrom() {
        List<Row> rows = RowPlan.plan(
                List.of(analog("CLK_P"), analog("CLK_N"), analog("D0_P"), analog("D0_N")),
                List.of(logic("D0"), logic("CLK")),
                List.of(track("panel.sync", 1), track("CLK.levels", 2), track("CLK_N", 1), track("D0", 1), track("legs", 1)));
        List<String> names = rows.stream().map(Row::name).toList();
        assertEquals(List.of("CLK_P", "CLK_N", "CLK_N", "CLK", "CLK.levels", "D0_P", "D0_N", "D0", "D0", "legs", "panel.sync"), names);
        assertEquals("CLK_N", rows.get(2).owner(), "the skew note of leg CLK_N hangs under it");
        assertEquals("CLK_N", rows.get(3).owner(), "logic CLK follows its legs");
        assertEquals("CLK", rows.get(4).owner(), "CLK.levels hangs under the decoded CLK");
        assertEquals(2, rows.get(4).lanes(), "two annotations overlap, so two lanes");
        assertEquals(null, rows.get(9).owner(), "a track that names no channel goes to the bottom");
        assertEquals(Row.ANALOG_PX, rows.get(0).heightPx());
        assertEquals(Row.LOGIC_PX, rows.get(3).heightPx());
        assertEquals(2 * Row.LANE_PX + 2, rows.get(4).heightPx());
    }

    @Test
    void lanesAreCappedAndRowTopsAddUp() {
        assertEquals(RowPlan.MAX_LANES, RowPlan.lanesFor(track("t", 10)));
        List<Row> rows = RowPlan.plan(List.of(analog("A")), List.of(), List.of(track("A", 1)));
        int[] tops = WavePainter.rowTops(rows, 5);
        assertEquals(WavePainter.RULER_PX - 5, tops[0]);
        assertEquals(tops[0] + Row.ANALOG_PX, tops[1]);
        assertEquals(tops[1] + Row.LANE_PX + 2, tops[2]);
    }
}
