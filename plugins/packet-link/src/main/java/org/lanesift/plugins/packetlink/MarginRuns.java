package org.lanesift.plugins.packetlink;

import java.util.function.Consumer;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;

/**
 * The timing-margin check of one data lane with line states, made only on the bits the decoder
 * uses (those inside a high-speed burst): each run of bits the sampler flagged (a setup or hold
 * margin below its threshold, or a bit taken in an unknown span) becomes one {@code margin-low}
 * warning naming the lane. A run never spans two bursts. Between bursts a data lane sits in
 * low-power states while the clock may keep running, so the sampler's flags there carry no
 * meaning and are never looked at. The chain's sampler leaves its own margin findings to this
 * check (dual-edge option {@code marginFindings = decoder}). A link without line states has no
 * such check here: every bit is data, and the sampler's own check covers it.
 */
final class MarginRuns {
    private final Consumer<Annotation> out;
    private final String track;
    private String lane;
    private boolean inRun;
    private long runStartFs;
    private long runEndFs;
    private long runBits;
    private long minSetupFs;
    private long minHoldFs;

    /**
     * @param laneIndex the lane's number (its track is {@code lane<k>})
     * @param out       where findings go
     */
    MarginRuns(int laneIndex, Consumer<Annotation> out) {
        this.out = out;
        this.track = "lane" + laneIndex;
        this.lane = track;
    }

    /**
     * Looks at bits {@code [from, to)} of a stream, all inside one burst.
     *
     * @param s    the lane's bits
     * @param from first bit
     * @param to   end bit, exclusive
     */
    void feed(BitStream s, int from, int to) {
        lane = s.channel();
        long[] flagged = s.flagged();
        if (!inRun && !BitSets.any(flagged, from, to)) {
            return; // the usual case: no flagged bit in the whole range
        }
        for (int i = from; i < to; i++) {
            if (!BitSets.get(flagged, i)) {
                close();
                continue;
            }
            if (!inRun) {
                inRun = true;
                runStartFs = s.timesFs()[i];
                runBits = 0;
                minSetupFs = BitStream.UNKNOWN_MARGIN;
                minHoldFs = BitStream.UNKNOWN_MARGIN;
            }
            runBits++;
            runEndFs = s.timesFs()[i];
            minSetupFs = Math.min(minSetupFs, s.setupFs()[i]);
            minHoldFs = Math.min(minHoldFs, s.holdFs()[i]);
        }
    }

    /** Ends the open run, if any: the burst is over (or a bit that was not flagged came). */
    void close() {
        if (!inRun) {
            return;
        }
        inRun = false;
        Annotation.Builder b = Annotation.on(track, "margin-low").span(runStartFs, runEndFs).severity(Severity.WARNING)
                .label(lane + ": " + (runBits == 1 ? "1 flagged bit" : runBits + " flagged bits"))
                .text("lane", lane).field("bits", Field.integer(runBits, ""));
        if (minSetupFs != BitStream.UNKNOWN_MARGIN) {
            b.number("minSetupFs", minSetupFs, "fs");
        }
        if (minHoldFs != BitStream.UNKNOWN_MARGIN) {
            b.number("minHoldFs", minHoldFs, "fs");
        }
        out.accept(b.build());
    }
}
