package org.lanesift.plugins.differential;

import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.plugin.StageContext;

/**
 * Annotates the runs of invalid input samples the comparator reports ({@code input-invalid}, at
 * most {@link #MAX_ANNOTATIONS} of them), counts them all, and sums up the rest at the end.
 */
final class InvalidRuns implements Comparator.GapListener {
    /** Most gap annotations; later gaps are only counted. */
    static final int MAX_ANNOTATIONS = 1000;

    private final StageContext ctx;
    private final String channel;
    private long originIndex;
    private long count;
    private long samples;

    InvalidRuns(StageContext ctx, String channel) {
        this.ctx = ctx;
        this.channel = channel;
    }

    /** @param originIndex capture index of the stream's first sample, so reported sample numbers count from the capture start */
    void origin(long originIndex) {
        this.originIndex = originIndex;
    }

    long count() {
        return count;
    }

    long samples() {
        return samples;
    }

    @Override
    public void gap(long startIndex, long endIndex, long startFs, long endFs, boolean levelChanged) {
        count++;
        samples += endIndex - startIndex;
        if (count > MAX_ANNOTATIONS) {
            return;
        }
        ctx.annotate(Annotation.on(channel, "input-invalid").span(startFs, endFs).severity(Severity.WARNING)
                .label((endIndex - startIndex) + " invalid input samples: no edges here")
                .field("firstSample", Field.integer(originIndex + startIndex, "")).field("samples", Field.integer(endIndex - startIndex, ""))
                .field("levelChanged", Field.enumValue(levelChanged ? "yes" : "no")).build());
    }

    /** The summary of the runs not annotated singly, if there were any. */
    void finish(long t0, long t1) {
        if (count > MAX_ANNOTATIONS) {
            ctx.annotate(Annotation.on(channel, "input-invalid-summary").span(t0, t1).severity(Severity.WARNING)
                    .label(count + " runs of invalid samples, " + (count - MAX_ANNOTATIONS) + " not annotated singly")
                    .field("runs", Field.integer(count, "")).field("samples", Field.integer(samples, "")).build());
        }
    }
}
