package org.lanesift.plugins.packetlink;

import java.util.Locale;
import java.util.function.Consumer;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;

/**
 * Framing consistency across lanes: the lanes of one link start their bursts together, so each
 * lane finds its sync pattern at the same clock edge. A lane that finds it whole unit intervals
 * later (or earlier) than the first lane to find it is skewed by that many unit intervals: its
 * margins look clean (its transitions still sit on the bit boundaries), yet its words belong to
 * other clock edges than its neighbours'. Each such lane is named once, as a warning, at the
 * first burst where it happens, unless the sampler flagged its first word (it then named the lane
 * itself, such as a lane skewed by about half a unit interval) (common practice: a deserialiser aligns lanes on their sync
 * patterns, and a lane whose pattern comes at another clock edge is reported as skewed).
 */
final class SyncAlignment {
    private final Consumer<Annotation> out;
    private final boolean[] named;

    SyncAlignment(int lanes, Consumer<Annotation> out) {
        this.out = out;
        this.named = new boolean[lanes];
    }

    /**
     * Compares the lanes' sync times of one burst (or of a link without bursts).
     *
     * @param d the lanes' deserializers, all synced
     */
    void check(LaneDeserializer[] d) {
        long first = Long.MAX_VALUE;
        int firstLane = 0;
        double uiFs = 0;
        for (int k = 0; k < d.length; k++) {
            if (d[k].syncFoundFs < first) {
                first = d[k].syncFoundFs;
                firstLane = k;
            }
            uiFs = Math.max(uiFs, d[k].uiFs);
        }
        if (!(uiFs > 0)) {
            return;
        }
        for (int k = 0; k < d.length; k++) {
            double offsetUi = (d[k].syncFoundFs - first) / uiFs;
            if (named[k] || offsetUi < 0.5 || d[k].anyFlagged && d[k].nbits >= d[k].wordBits && d[k].wordFlagged(0)) {
                continue; // (flagged from its first word on: the sampler already named the lane, its bits are suspect)
            }
            named[k] = true;
            long ui = Math.round(offsetUi);
            out.accept(Annotation.on("lane" + k + ".bits", "lane-sync-offset").span(first, d[k].syncFoundFs).severity(Severity.WARNING)
                    .label(String.format(Locale.ROOT, "lane %d found its sync pattern %d UI after lane %d: skewed by whole unit"
                            + " intervals; its words belong to other clock edges", k, ui, firstLane))
                    .field("lane", Field.integer(k, "")).field("offsetUI", Field.integer(ui, "UI"))
                    .field("referenceLane", Field.integer(firstLane, "")).build());
        }
    }
}
