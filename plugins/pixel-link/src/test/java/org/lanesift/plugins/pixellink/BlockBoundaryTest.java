package org.lanesift.plugins.pixellink;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import java.util.Random;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import org.lanesift.data.Frame;
import org.lanesift.testkit.StageHarness;

/** The same link cut into blocks of any sizes (even mid-pixel) gives the same frames and report. */
class BlockBoundaryTest {

    @Property(tries = 25)
    void anyBlockCutGivesTheSameResult(@ForAll @IntRange(min = 1, max = 400) int maxPiece, @ForAll long seed,
                                       @ForAll boolean dual) throws Exception {
        Capture whole = FrameAssemblyTest.small(dual ? FrameAssemblyTest.SMALL_EVEN : FrameAssemblyTest.SMALL);
        whole.dual = dual;
        whole.blockClocks = 100_000;
        String refJson;
        List<Frame> ref;
        try (StageHarness h = whole.run()) {
            ref = h.outputs("frames", Frame.class);
            refJson = Report.text(h, "dut-timing.json");
        }
        Capture cut = FrameAssemblyTest.small(dual ? FrameAssemblyTest.SMALL_EVEN : FrameAssemblyTest.SMALL);
        cut.dual = dual;
        cut.blockClocks = 1 + new Random(seed).nextInt(300);
        Random r = new Random(seed ^ 0x5DEECE66DL);
        cut.recut = k -> 1 + r.nextInt(maxPiece);
        try (StageHarness h = cut.run()) {
            List<Frame> got = h.outputs("frames", Frame.class);
            assertEquals(ref.size(), got.size());
            for (int i = 0; i < ref.size(); i++) {
                assertEquals(ref.get(i).toString(), got.get(i).toString());
                assertArrayEquals(ref.get(i).rgb(), got.get(i).rgb());
                assertEquals(ref.get(i).startFs(), got.get(i).startFs());
            }
            assertEquals(refJson, Report.text(h, "dut-timing.json"));
        }
    }
}
