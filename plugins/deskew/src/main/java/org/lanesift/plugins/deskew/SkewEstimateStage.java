package org.lanesift.plugins.deskew;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.time.Femtos;
import org.lanesift.time.TimeValue;

/** The running {@code skew-estimate} instance. */
final class SkewEstimateStage implements Stage {
    /** Largest legs search range in samples either way (bounds the FFT size). */
    static final int MAX_LAG = 1 << 15;
    /** Second-to-first correlation peak ratio from which a legs estimate is ambiguous. */
    static final double AMBIGUOUS_PEAK_RATIO = 0.8;
    /**
     * Edge modes: a folded phase (fraction of the interval) beyond this is near half an interval,
     * where the fold may have picked the wrong side (common practice: keep skew well inside half a UI).
     */
    static final double NEAR_HALF_INTERVAL = 0.4;

    private final StageContext ctx;
    private final String mode;
    private final int lanes;
    private final boolean ddr;
    private final boolean centre;
    private final double minConfidence;
    private final long minEdges;
    private final TimeValue maxSkew;
    private final String[] names;
    private final boolean[] named;
    private final String who;
    private EdgeAligner aligner;
    private LegsEstimator legs;
    private long legsStartP = Long.MIN_VALUE;
    private long legsStartN = Long.MIN_VALUE;
    private double legsPeriodFs = Double.NaN;
    private long firstFs = Long.MAX_VALUE;
    private long lastFs = Long.MIN_VALUE;

    SkewEstimateStage(StageContext ctx) {
        this.ctx = ctx;
        OptionValues o = ctx.options();
        this.who = "plugin 'skew-estimate' instance '" + ctx.instanceId() + "'";
        this.mode = o.getString("mode");
        this.lanes = o.getInt("lanes");
        this.ddr = o.getBoolean("ddr");
        this.centre = o.getString("alignment").equals("centre");
        this.minConfidence = o.getDouble("minConfidence");
        this.minEdges = o.getLong("minEdges");
        this.maxSkew = o.getTime("maxSkew");
        this.names = new String[ctx.inputs().size()];
        this.named = new boolean[names.length];
        for (int i = 0; i < names.length; i++) {
            names[i] = ctx.inputs().get(i).name();
        }
        switch (mode) {
            case "clock" -> aligner = new EdgeAligner(EdgeAligner.Mode.CLOCK, lanes, ddr, 0);
            case "lanes" -> {
                if (lanes < 2) {
                    throw new OptionException("lanes", who + ": mode=lanes compares lanes with lane0, so option 'lanes' must be"
                            + " at least 2, got " + lanes);
                }
                TimeValue ui = o.getTime("unitInterval");
                double uiFs;
                try {
                    uiFs = ui.toFs(Double.NaN, Double.NaN);
                } catch (IllegalStateException e) {
                    throw new OptionException("unitInterval", who + ": option 'unitInterval' must be an absolute time such as"
                            + " 2500ps (edge lists carry no sample period), got " + ui);
                }
                if (uiFs < 0) {
                    throw new OptionException("unitInterval", who + ": option 'unitInterval' must be positive, or 0 to estimate it; got " + ui);
                }
                aligner = new EdgeAligner(EdgeAligner.Mode.LANES, lanes - 1, false, uiFs, o.getInt("bitsPerClock"));
            }
            default -> {
                if (maxSkew.value() <= 0) {
                    throw new OptionException("maxSkew", who + ": option 'maxSkew' must be positive, got " + maxSkew);
                }
                if (maxSkew.unit() == TimeValue.Unit.UI) {
                    throw new OptionException("maxSkew", who + ": option 'maxSkew' must be in ps, ns or samples, got " + maxSkew);
                }
            }
        }
    }

    @Override
    public void accept(int input, Block block) {
        if (!named[input]) {
            names[input] = block.channel(); // tables and annotations use the channel names the blocks carry
            named[input] = true;
        }
        firstFs = Math.min(firstFs, block.startFs());
        lastFs = Math.max(lastFs, block.endFs());
        switch (mode) {
            case "legs" -> acceptLeg(input, (AnalogBlock) block);
            case "clock" -> {
                if (input == 0) {
                    aligner.reference((Edges) block);
                } else {
                    aligner.data(input - 1, (Edges) block);
                }
            }
            default -> {
                if (input == 0) {
                    aligner.reference((Edges) block);
                    refuseUnknownUnitInterval();
                } else {
                    aligner.data(input - 1, (Edges) block);
                }
            }
        }
    }

    /** Lanes mode: a clock on lane 0 whose bits per clock are unknown leaves no unit interval: stop naming the option. */
    private void refuseUnknownUnitInterval() {
        UnitIntervalSource.Finding f = aligner.unitIntervalFinding();
        if (f != null && f.refused()) {
            throw new OptionException("unitInterval", who + ": option 'unitInterval' is 0 and " + f.how());
        }
    }

    private void acceptLeg(int input, AnalogBlock b) {
        if (legs == null) {
            legsPeriodFs = b.periodFs();
            double fs = maxSkew.toFs(b.periodFs(), Double.NaN);
            double lag = Math.ceil(fs / b.periodFs()) + 1;
            if (lag > MAX_LAG) {
                throw new OptionException("maxSkew", who + ": option 'maxSkew' " + maxSkew + " is " + (long) lag
                        + " samples at this sample rate; at most " + MAX_LAG + " samples are supported");
            }
            legs = new LegsEstimator((int) lag);
        }
        if (input == 0 && legsStartP == Long.MIN_VALUE) {
            legsStartP = b.startFs();
        }
        if (input == 1 && legsStartN == Long.MIN_VALUE) {
            legsStartN = b.startFs();
        }
        if (legsStartP != Long.MIN_VALUE && legsStartN != Long.MIN_VALUE
                && Math.abs(legsStartP - legsStartN) > legsPeriodFs / 2) {
            throw new org.lanesift.plugin.InputFormatException("inputs 'p' and 'n' must start at the same sample time; 'p' starts at "
                    + Femtos.format(legsStartP) + ", 'n' at " + Femtos.format(legsStartN));
        }
        if (input == 0) {
            legs.p(b);
        } else {
            legs.n(b);
        }
    }

    @Override
    public void finish() {
        long s = firstFs == Long.MAX_VALUE ? 0 : firstFs;
        long e = lastFs == Long.MIN_VALUE ? s : Math.max(s, lastFs);
        List<SkewTable.Entry> rows = new ArrayList<>();
        if (mode.equals("legs")) {
            finishLegs(rows, s, e);
        } else {
            finishEdges(rows, s, e);
        }
        for (SkewTable.Entry row : rows) {
            if (row.isSuspect()) {
                ctx.annotate(Annotation.on(row.name(), "skew-suspect").span(s, e).severity(Severity.WARNING).label("suspect skew estimate")
                        .text("detail", String.format(Locale.ROOT, "the estimate %+.3f ps for %s is suspect: %s; a decode corrected"
                                + " with it is suspect too", row.offsetPs(), row.name(), row.suspect()))
                        .number("offsetPs", row.offsetPs(), "ps").number("confidence", row.confidence(), "")
                        .text("reason", row.suspect()).build());
            }
        }
        byte[] json = new SkewTable(mode, rows).toJson().getBytes(StandardCharsets.UTF_8);
        ctx.emit(0, new Artifact(ctx.instanceId(), s, e, ctx.instanceId() + "-skew.json", "application/json", json));
    }

    private void finishLegs(List<SkewTable.Entry> rows, long s, long e) {
        if (legs == null) {
            warn(names[0], "skew-no-estimate", Severity.ERROR, "no estimate", "no samples arrived", s, e);
            rows.add(new SkewTable.Entry(names[0], 0, 1, "reference", 0));
            rows.add(new SkewTable.Entry(names[1], 0, 0, "legs-xcorr", 0));
            return;
        }
        legs.finish();
        LegsEstimator.Result r = legs.result();
        double skewFs = r.lagSamples() * legsPeriodFs;
        double conf = r.samples() == 0 ? 0 : r.correlation();
        rows.add(new SkewTable.Entry(names[0], 0, 1, "reference", r.samples()));
        rows.add(new SkewTable.Entry(names[1], -skewFs / Femtos.PER_PS, conf, "legs-xcorr", r.samples(), legsSuspect(r, conf)));
        ctx.annotate(Annotation.on(names[1], "skew-estimate").span(s, e)
                .label(String.format(Locale.ROOT, "lags by %.1f ps", skewFs / Femtos.PER_PS))
                .number("offsetPs", -skewFs / Femtos.PER_PS, "ps").number("confidence", conf, "")
                .number("samples", r.samples(), "").text("method", "legs-xcorr").text("reference", names[0]).build());
        if (r.samples() == 0) {
            warn(names[1], "skew-no-estimate", Severity.ERROR, "no estimate", "too few samples for the search range of "
                    + legs.maxLag() + " samples either way", s, e);
            return;
        }
        if (legs.nonFinite() > 0) {
            warn(names[1], "skew-bad-samples", Severity.WARNING, "non-finite samples", legs.nonFinite()
                    + " samples were NaN or infinite and were replaced by the sample before them", s, e);
        }
        if (r.atEdge()) {
            warn(names[1], "skew-out-of-range", Severity.ERROR, "skew beyond search range", "correlation peak at the edge of the search range (+/-"
                    + maxSkew + "): the skew is larger, raise maxSkew", s, e);
        }
        if (r.secondPeakRatio() >= AMBIGUOUS_PEAK_RATIO) {
            warn(names[1], "skew-ambiguous", Severity.WARNING, "ambiguous skew", String.format(Locale.ROOT,
                    "a second correlation peak reaches %.0f %% of the main one: periodic signal, reduce maxSkew below half its period",
                    100 * r.secondPeakRatio()), s, e);
        }
        if (conf < minConfidence) {
            warn(names[1], "skew-low-confidence", Severity.WARNING, "low confidence", String.format(Locale.ROOT,
                    "legs correlate only %.2f (below %.2f): check the wiring of P and N", conf, minConfidence), s, e);
        }
    }

    /** Why a legs estimate is not to be trusted, or empty. */
    private String legsSuspect(LegsEstimator.Result r, double conf) {
        List<String> why = new ArrayList<>();
        if (r.samples() == 0) {
            why.add("no estimate (too few samples)");
        }
        if (r.atEdge()) {
            why.add("peak at the edge of the +/-" + maxSkew + " search");
        }
        if (r.secondPeakRatio() >= AMBIGUOUS_PEAK_RATIO) {
            why.add(String.format(Locale.ROOT, "ambiguous: a second correlation peak reaches %.0f %% of the main one",
                    100 * r.secondPeakRatio()));
        }
        if (conf < minConfidence) {
            why.add(String.format(Locale.ROOT, "low confidence %.2f (below %.2f)", conf, minConfidence));
        }
        return String.join("; ", why);
    }

    /** Why an edge-mode estimate is not to be trusted, or empty. */
    private String edgesSuspect(EdgeAligner.Result r, double conf, double phaseFromTarget) {
        List<String> why = new ArrayList<>();
        if (r.count() == 0) {
            return "no estimate (no usable transitions)";
        }
        if (r.count() < minEdges) {
            why.add(r.count() + " transitions (fewer than " + minEdges + ")");
        }
        if (r.clusters() > 1) {
            why.add("ambiguous: transitions fall in " + r.clusters() + " clusters");
        }
        if (conf < minConfidence) {
            why.add(String.format(Locale.ROOT, "low confidence %.2f (below %.2f)", conf, minConfidence));
        }
        if (Math.abs(phaseFromTarget) > NEAR_HALF_INTERVAL) {
            why.add(String.format(Locale.ROOT, "skew of %.2f of an interval is near half an interval: the true skew may be"
                    + " one interval the other way", phaseFromTarget));
        }
        return String.join("; ", why);
    }

    private void finishEdges(List<SkewTable.Entry> rows, long s, long e) {
        aligner.finish();
        boolean clock = mode.equals("clock");
        if (!clock) {
            refuseUnknownUnitInterval();
            UnitIntervalSource.Finding f = aligner.unitIntervalFinding();
            if (f != null) {
                ctx.annotate(Annotation.on(names[0], "skew-unit-interval").span(s, e).severity(Severity.INFO)
                        .label(String.format(Locale.ROOT, "unit interval %.3f ps", f.unitIntervalFs() / Femtos.PER_PS))
                        .number("unitIntervalPs", f.unitIntervalFs() / Femtos.PER_PS, "ps")
                        .number("bitsPerClock", f.bitsPerClock(), "").text("detail", f.how()).build());
            }
        }
        rows.add(new SkewTable.Entry(names[0], 0, 1, "reference", 0));
        if (!aligner.referenceSeen() || Double.isNaN(aligner.periodFs())) {
            warn(names[0], "skew-no-estimate", Severity.ERROR, "no estimate", clock ? "too few clock edges to know the clock interval"
                    : "too few lane0 transitions to estimate the unit interval (give unitInterval)", s, e);
        }
        String method = clock ? (centre ? "clock-centre" : "clock-edge") : "lanes";
        double target = clock && centre ? 0.5 : 0.0;
        for (int l = 0; l < lanesCompared(); l++) {
            EdgeAligner.Result r = aligner.result(l);
            String name = names[l + 1];
            double offFs = 0;
            double conf = 0;
            double phase = 0;
            if (r.count() > 0 && !Double.isNaN(r.centre())) {
                phase = PhaseHistogram.wrap(r.centre() - target);
                offFs = -phase * r.intervalFs();
                conf = Math.max(0, Math.min(1, r.concentration()));
            }
            rows.add(new SkewTable.Entry(name, offFs / Femtos.PER_PS, conf, method, r.count(), edgesSuspect(r, conf, phase)));
            ctx.annotate(Annotation.on(name, "skew-estimate").span(s, e)
                    .label(String.format(Locale.ROOT, "correct %+.1f ps", offFs / Femtos.PER_PS))
                    .number("offsetPs", offFs / Femtos.PER_PS, "ps").number("confidence", conf, "")
                    .number("edges", r.count(), "").number("intervalPs", r.intervalFs() / Femtos.PER_PS, "ps")
                    .text("method", method).text("reference", names[0]).build());
            if (r.count() == 0) {
                warn(name, "skew-no-estimate", Severity.ERROR, "no estimate", "no usable transitions", s, e);
                continue;
            }
            if (r.count() < minEdges) {
                warn(name, "skew-few-edges", Severity.WARNING, "few edges", r.count() + " usable transitions (fewer than " + minEdges
                        + "): the estimate is rough", s, e);
            }
            if (r.clusters() > 1) {
                warn(name, "skew-multimodal", Severity.WARNING, r.clusters() + " clusters", "transitions fall in " + r.clusters() + " separate clusters: "
                        + (clock ? "wrong clock, or ddr/alignment set wrong" : "lanes run at different rates, or the unit interval is wrong"), s, e);
            }
            if (conf < minConfidence) {
                warn(name, "skew-low-confidence", Severity.WARNING, "low confidence", String.format(Locale.ROOT,
                        "cluster concentration %.2f is below %.2f: jitter too large, or no fixed phase relation", conf, minConfidence), s, e);
            }
            long bad = r.rejected();
            if (clock && bad > (r.count() + bad) / 100) {
                warn(name, "skew-clock-gaps", Severity.WARNING, "clock gaps", bad + " transitions fell in clock intervals far from the nominal "
                        + Femtos.format(aligner.periodFs()) + " (gaps or a wandering clock) and were skipped", s, e);
            }
        }
    }

    private int lanesCompared() {
        return mode.equals("clock") ? lanes : lanes - 1;
    }

    private void warn(String track, String kind, Severity sev, String label, String detail, long s, long e) {
        ctx.annotate(Annotation.on(track, kind).span(s, e).severity(sev).label(label).text("detail", detail).build());
    }
}
