package org.lanesift.plugin;

/**
 * Whether a stage, with given options, can decode a long capture cut into time segments that are
 * decoded independently and stitched: a host may then open one instance per segment, feed each
 * the samples of its segment preceded by a warm-up, and keep each instance's outputs only from
 * the segment's start on. A plugin declares support only when, after the warm-up, its stream
 * outputs and annotations are the same as those of one instance run from the capture start (the
 * stage keeps no state longer than the warm-up and emits no capture-wide summary). Hosts still
 * compare neighbouring segments where they overlap and refuse to stitch where they differ.
 *
 * @param warmupSamples warm-up in sample periods of the stage's sample-based inputs
 * @param warmupFs      further warm-up in femtoseconds (for example the largest skew a stage shifts by)
 * @param blocker       why the stage cannot run in segments with these options, or null when it can
 */
public record SegmentSupport(long warmupSamples, long warmupFs, String blocker) {
    /**
     * The name of the boolean option by which a stage lets part of its work run on a second thread
     * of its own (deskew's filter worker). A host that decodes in segments already keeps the cores
     * busy with one segment per thread, so it sets this option false in every stage that declares
     * it, as it turns a source's read-ahead off.
     */
    public static final String STAGE_THREAD_OPTION = "stageThread";


    /**
     * Checks the values.
     *
     * @param warmupSamples warm-up in sample periods, not negative
     * @param warmupFs      warm-up in femtoseconds, not negative
     * @param blocker       reason, or null
     */
    public SegmentSupport {
        if (warmupSamples < 0 || warmupFs < 0) {
            throw new IllegalArgumentException("segment warm-up must not be negative: " + warmupSamples + " samples, "
                    + warmupFs + " fs");
        }
        if (blocker != null && blocker.isBlank()) {
            throw new IllegalArgumentException("a segment blocker needs a reason");
        }
    }

    /**
     * The stage decodes in segments once it has seen this much input before a segment's start.
     *
     * @param warmupSamples sample periods
     * @param warmupFs      femtoseconds, added to the samples
     * @return support with that warm-up
     */
    public static SegmentSupport after(long warmupSamples, long warmupFs) {
        return new SegmentSupport(warmupSamples, warmupFs, null);
    }

    /**
     * The stage cannot decode in segments with these options.
     *
     * @param reason what prevents it and, where there is one, which option would allow it
     * @return no support
     */
    public static SegmentSupport no(String reason) {
        return new SegmentSupport(0, 0, reason);
    }

    /**
     * Whether segments are supported.
     *
     * @return true when {@link #blocker()} is null
     */
    public boolean supported() {
        return blocker == null;
    }

    /**
     * The warm-up in femtoseconds for a sample period.
     *
     * @param samplePeriodFs the period of the stage's sample-based inputs (0 when it has none)
     * @return femtoseconds, rounded up
     */
    public long warmupFs(double samplePeriodFs) {
        return warmupFs + (long) Math.ceil(warmupSamples * samplePeriodFs);
    }
}
