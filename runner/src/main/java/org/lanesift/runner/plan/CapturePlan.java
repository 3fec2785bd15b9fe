package org.lanesift.runner.plan;

/**
 * What a capture of a link needs, worked out from the link description by named rules
 * (docs/capture-planning.md). Every figure is a pure function of the inputs, so the tests check
 * them against values worked by hand.
 *
 * @param kind            the link kind
 * @param clockHz         forwarded clock frequency: the pixel clock (pixel link) or the DDR clock (packet link)
 * @param lanes           data lanes
 * @param frames          complete frames wanted
 * @param frameRateHz     frames per second of the picture
 * @param riseS           rise time planned for: the standard's fastest unless given
 * @param riseGiven       true when the rise time was given, not taken from the standard
 */
record CapturePlan(LinkKind kind, double clockHz, int lanes, int frames, double frameRateHz, double riseS, boolean riseGiven) {
    /** Samples per unit interval a logic capture needs (docs/sampling-rate.md): {@code Ts <= UI / 2}. */
    static final double DECODE_SAMPLES_PER_UI = 2;
    /** Bandwidth times rise time (docs/reference-facts.md#probe-and-bench-rules-of-thumb, common practice). */
    static final double BANDWIDTH_RISE_PRODUCT = 0.35;
    /**
     * Instrument rise time as a fraction of the signal's for measuring edges: a third reads the
     * edge about 5 % slow (root sum of squares, docs/reference-facts.md#probe-and-bench-rules-of-thumb).
     */
    static final double MEASURE_RISE_FRACTION = 1.0 / 3;
    /** Samples per hertz of bandwidth to reconstruct an edge (common practice, same anchor). */
    static final double SAMPLES_PER_HZ = 2.5;

    /** The plan with the standard's fastest rise time. */
    static CapturePlan of(LinkKind kind, double clockHz, int lanes, int frames, double frameRateHz) {
        return new CapturePlan(kind, clockHz, lanes, frames, frameRateHz, kind.fastestRiseS, false);
    }

    /** Unit interval, seconds: the clock period over the unit intervals per clock. */
    double unitIntervalS() {
        return 1 / (clockHz * kind.unitIntervalsPerClock);
    }

    /** Bits per second on each data lane. */
    double laneBitRate() {
        return 1 / unitIntervalS();
    }

    /** Least sample rate to decode from a logic capture: 2 samples per unit interval. */
    double decodeRateHz() {
        return DECODE_SAMPLES_PER_UI / unitIntervalS();
    }

    /** Least bandwidth that passes the planned edge: 0.35 / tr. */
    double passBandwidthHz() {
        return BANDWIDTH_RISE_PRODUCT / riseS;
    }

    /** Bandwidth to measure the planned edge within about 5 %: 0.35 / (tr / 3). */
    double measureBandwidthHz() {
        return BANDWIDTH_RISE_PRODUCT / (riseS * MEASURE_RISE_FRACTION);
    }

    /** Sample rate to measure edges and eyes: 2.5 samples per hertz of the measuring bandwidth. */
    double measureRateHz() {
        return SAMPLES_PER_HZ * measureBandwidthHz();
    }

    /**
     * Record length for the frames wanted: a capture starts anywhere inside a frame, so N complete
     * frames need N + 1 frame periods.
     */
    double recordS() {
        return (frames + 1) / frameRateHz;
    }

    /** Samples per channel of the record at a rate. */
    double recordSamples(double rateHz) {
        return Math.ceil(recordS() * rateHz);
    }

    /** Signals on the link: the clock and the data lanes. */
    int signals() {
        return 1 + lanes;
    }
}
