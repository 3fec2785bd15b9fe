package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.kit.DitheredStride;
import org.lanesift.kit.TwoLevelFinder;
import org.lanesift.kit.TwoLevels;
import org.lanesift.capture.Captures;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.lanesift.data.WordStream;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PortSpec;

/**
 * Summarises a capture without keeping it in memory: per channel its kind, size, duration and,
 * for analog channels, the level statistics, an automatic threshold and the edges it gives; then
 * guesses of differential pairs and clocks. Analog channels take three streaming passes over the
 * file (range; samples for the level finder; edges at the threshold); logic-only files one. The rules and the JSON
 * schema are in docs/capture-csv.md, section "inspect".
 */
public final class Inspector {
    /** Most samples of one channel given to the level finder; longer channels are thinned evenly. */
    static final int MAX_LEVEL_SAMPLES = 1 << 16;
    /** Fewest samples per channel for the level finder, however many channels there are. */
    static final int MIN_LEVEL_SAMPLES = 1 << 12;
    /** Level-finder samples of all channels together, so many channels stay within memory. */
    static final long LEVEL_SAMPLE_BUDGET = 1L << 24;
    /** Hysteresis either side of the threshold, as a fraction of the distance between the two levels. */
    static final double HYSTERESIS = 0.1;
    /** Correlation at or below which two analog channels are guessed to be the legs of one pair. */
    static final double PAIR_CORRELATION = -0.8;
    /**
     * Correlation of sample-to-sample steps at or below which two analog channels are guessed to be
     * the legs of one pair even when their levels correlate positively: D-PHY data lanes spend most
     * of the time in low-power states where both legs sit high or low together
     * (docs/reference-facts.md#d-phy-levels-and-states), while at every high-speed edge the legs step
     * against each other.
     */
    static final double PAIR_STEP_CORRELATION = -0.5;
    /** Coefficient of variation of rising-edge intervals below which a channel is guessed to be a clock. */
    static final double CLOCK_CV = 0.05;
    /** Fewest rising edges for a clock guess. */
    static final int CLOCK_MIN_EDGES = 8;
    /** Most analog channels correlated pairwise. */
    static final int MAX_CORRELATED = 64;

    private Inspector() {
    }

    /**
     * Inspects a capture.
     *
     * @param file    the capture file; its plugin is chosen by {@link Captures#pluginFor}
     * @param options the reader's options as text (such as {@code rateHz}); {@code file} is set from the path
     * @return the report
     * @throws CaptureFormatException for a malformed file
     * @throws org.lanesift.plugin.OptionException for a bad or unknown option
     */
    public static InspectReport inspect(Path file, Map<String, String> options) {
        String plugin = Captures.pluginFor(file);
        PluginDescriptor d = CaptureReaders.descriptor(plugin);
        Map<String, Object> raw = new LinkedHashMap<>();
        if (options != null) {
            raw.putAll(options);
        }
        raw.put("file", file.toString());
        OptionValues ov = OptionValues.validate(d, raw);
        try {
            return run(file, plugin, ov);
        } catch (IOException e) {
            throw new CaptureFormatException(file, 0, "cannot read: " + e.getMessage(), e);
        }
    }

    private static CaptureReader open(String plugin, OptionValues ov) throws IOException {
        return CaptureReaders.open(plugin, ov);
    }

    /** Per-channel accumulators. */
    static final class Acc {
        final String name;
        final DataKind kind;
        final String unit;
        long startFs = Long.MAX_VALUE;
        long endFs = Long.MIN_VALUE;
        long samples;
        long invalid;
        double periodFs = Double.NaN;
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        double shift = Double.NaN; // first valid value, subtracted for stable sums
        /** Samples for the level finder: one in each run of {@code pickStride} valid samples, at a hashed position. */
        float[] picked;
        int pickedCount;
        int pickStride;
        long validSeen;
        double low = Double.NaN;
        double high = Double.NaN;
        // edges (counted or found at the threshold)
        long edges = -1;
        long rising;
        long lastRisingFs = Long.MIN_VALUE;
        long firstRisingFs = Long.MIN_VALUE;
        double ivMean;
        double ivM2;
        long ivCount;
        long unknownFs;
        // schmitt state
        int state = -1; // -1 unknown, 0 low, 1 high
        double prevV = Double.NaN;
        long prevT;
        double lastUpCross = Double.NaN;
        double lastDownCross = Double.NaN;
        // words
        long words = -1;
        long suspectWords;
        int widthBits;

        /** The converter of a LOGIC channel's samples to edges, made on its first block. */
        private LogicEdges logicEdges;

        LogicEdges logicEdges() {
            if (logicEdges == null) {
                logicEdges = new LogicEdges();
            }
            return logicEdges;
        }

        Acc(String name, DataKind kind, String unit) {
            this.name = name;
            this.kind = kind;
            this.unit = unit;
        }

        void span(Block b) {
            startFs = Math.min(startFs, b.startFs());
            endFs = Math.max(endFs, b.endFs());
        }

        void risingAt(long t) {
            rising++;
            if (lastRisingFs != Long.MIN_VALUE) {
                double iv = t - lastRisingFs;
                ivCount++;
                double delta = iv - ivMean;
                ivMean += delta / ivCount;
                ivM2 += delta * (iv - ivMean);
            } else {
                firstRisingFs = t;
            }
            lastRisingFs = t;
        }
    }

    private static InspectReport run(Path file, String plugin, OptionValues ov) throws IOException {
        List<Acc> acc = new ArrayList<>();
        List<Integer> analog = new ArrayList<>();
        double[][][] sums;   // per pair p<q: sums of dx, dy, dx^2, dy^2, dx*dy of shifted values; ex*ey, ex^2, ey^2 of steps
        long[][] n2;         // per pair: samples valid in both
        try (CaptureReader r = open(plugin, ov)) {
            List<PortSpec> ports = r.ports();
            for (int i = 0; i < ports.size(); i++) {
                acc.add(new Acc(ports.get(i).name(), ports.get(i).kind(), r.units().get(i)));
                if (ports.get(i).kind() == DataKind.ANALOG && analog.size() < MAX_CORRELATED) {
                    analog.add(i);
                }
            }
            int na = analog.size();
            int[] slot = new int[ports.size()];
            java.util.Arrays.fill(slot, -1);
            for (int k = 0; k < na; k++) {
                slot[analog.get(k)] = k;
            }
            sums = new double[na][na][8];
            n2 = new long[na][na];
            // pass 1: range, counts, correlations, logic edges and words
            AnalogBlock[] span = new AnalogBlock[na];
            final double[][][] sumsF = sums;
            final long[][] n2F = n2;
            while (r.next((ch, b) -> {
                Acc a = acc.get(ch);
                a.span(b);
                if (b instanceof AnalogBlock ab) {
                    rangePass(a, ab);
                    if (slot[ch] >= 0) {
                        span[slot[ch]] = ab;
                    }
                } else if (b instanceof Edges e) {
                    edgePass(a, e);
                } else if (b instanceof LogicBlock lb) {
                    a.periodFs = lb.periodFs();
                    a.samples += lb.length();
                    edgePass(a, a.logicEdges().toEdges(lb));
                } else if (b instanceof WordStream w) {
                    a.words = Math.max(0, a.words) + w.count();
                    a.widthBits = w.widthBits();
                    for (int i = 0; i < w.count(); i++) {
                        if ((w.flags()[i] & WordStream.FLAG_SUSPECT) != 0) {
                            a.suspectWords++;
                        }
                    }
                }
            })) {
                correlate(span, acc, analog, sumsF, n2F);
                java.util.Arrays.fill(span, null);
            }
        }
        // pass 2: samples for the level finder; pass 3: edges at the threshold
        boolean anyAnalog = acc.stream().anyMatch(a -> a.kind == DataKind.ANALOG && a.samples > a.invalid && a.max > a.min);
        if (anyAnalog) {
            long analogCount = acc.stream().filter(a -> a.kind == DataKind.ANALOG).count();
            int perChannel = (int) Math.max(MIN_LEVEL_SAMPLES, Math.min(MAX_LEVEL_SAMPLES, LEVEL_SAMPLE_BUDGET / analogCount));
            for (Acc a : acc) {
                if (a.kind == DataKind.ANALOG) {
                    long valid = a.samples - a.invalid;
                    a.pickStride = (int) Math.max(1, (valid + perChannel - 1) / perChannel);
                    a.picked = new float[(int) Math.min(valid, perChannel) + 1];
                }
            }
            try (CaptureReader r = open(plugin, ov)) {
                while (r.next((ch, b) -> {
                    if (b instanceof AnalogBlock ab) {
                        histPass(acc.get(ch), ab);
                    }
                })) {
                    // all work is in the callback
                }
            }
            for (Acc a : acc) {
                if (a.kind == DataKind.ANALOG) {
                    levels(a);
                    a.edges = 0;
                }
            }
            try (CaptureReader r = open(plugin, ov)) {
                while (r.next((ch, b) -> {
                    if (b instanceof AnalogBlock ab) {
                        thresholdPass(acc.get(ch), ab);
                    }
                })) {
                    // all work is in the callback
                }
            }
        } else {
            for (Acc a : acc) {
                if (a.kind == DataKind.ANALOG && a.samples > a.invalid) {
                    a.low = a.min;
                    a.high = a.max;
                    a.edges = 0;
                }
            }
        }
        return report(file, plugin, acc, analog, sums, n2);
    }

    private static void rangePass(Acc a, AnalogBlock b) {
        a.periodFs = b.periodFs();
        a.samples += b.length();
        float[] v = b.volts();
        double mn = a.min;
        double mx = a.max;
        for (int i = 0, n = b.length(); i < n; i++) {
            if (!b.isValid(i)) {
                a.invalid++;
                continue;
            }
            double x = v[i];
            if (x < mn) {
                mn = x;
            }
            if (x > mx) {
                mx = x;
            }
        }
        a.min = mn;
        a.max = mx;
    }

    private static void correlate(AnalogBlock[] span, List<Acc> acc, List<Integer> analog, double[][][] sums, long[][] n2) {
        int na = span.length;
        for (int p = 0; p < na; p++) {
            AnalogBlock a = span[p];
            if (a == null) {
                continue;
            }
            Acc ap = acc.get(analog.get(p));
            if (Double.isNaN(ap.shift)) {
                for (int i = 0; i < a.length(); i++) {
                    if (a.isValid(i)) {
                        ap.shift = a.volts()[i];
                        break;
                    }
                }
            }
            for (int q = p + 1; q < na; q++) {
                AnalogBlock b = span[q];
                if (b == null || b.length() != a.length() || b.firstIndex() != a.firstIndex() || b.periodFs() != a.periodFs()) {
                    continue;
                }
                Acc aq = acc.get(analog.get(q));
                if (Double.isNaN(aq.shift)) {
                    for (int i = 0; i < b.length(); i++) {
                        if (b.isValid(i)) {
                            aq.shift = b.volts()[i];
                            break;
                        }
                    }
                }
                if (Double.isNaN(ap.shift) || Double.isNaN(aq.shift)) {
                    continue;
                }
                double kx = ap.shift;
                double ky = aq.shift;
                double sx = 0;
                double sy = 0;
                double sxx = 0;
                double syy = 0;
                double sxy = 0;
                double exy = 0;
                double exx = 0;
                double eyy = 0;
                long n = 0;
                float[] x = a.volts();
                float[] y = b.volts();
                boolean clean = a.invalid() == null && b.invalid() == null;
                boolean prevValid = false;
                for (int i = 0, len = a.length(); i < len; i++) {
                    if (!clean && (!a.isValid(i) || !b.isValid(i))) {
                        prevValid = false;
                        continue;
                    }
                    double dx = x[i] - kx;
                    double dy = y[i] - ky;
                    sx += dx;
                    sy += dy;
                    sxx += dx * dx;
                    syy += dy * dy;
                    sxy += dx * dy;
                    if (prevValid) {
                        // steps between neighbouring samples: the legs of a pair step against each other at every
                        // differential edge, whatever their common-mode levels do between bursts
                        double ex = x[i] - x[i - 1];
                        double ey = y[i] - y[i - 1];
                        exy += ex * ey;
                        exx += ex * ex;
                        eyy += ey * ey;
                    }
                    prevValid = true;
                    n++;
                }
                double[] t = sums[p][q];
                t[0] += sx;
                t[1] += sy;
                t[2] += sxx;
                t[3] += syy;
                t[4] += sxy;
                t[5] += exy;
                t[6] += exx;
                t[7] += eyy;
                n2[p][q] += n;
            }
        }
    }

    private static void edgePass(Acc a, Edges e) {
        if (a.edges < 0) {
            a.edges = 0;
        }
        a.edges += e.count();
        long[] sp = e.invalidSpans();
        int k = 0;
        for (int i = 0; i < e.invalidCount(); i++) {
            a.unknownFs += sp[2 * i + 1] - sp[2 * i];
        }
        for (int i = 0; i < e.count(); i++) {
            long t = e.timesFs()[i];
            // an unknown span since the last rising edge breaks the chain of intervals
            while (k < e.invalidCount() && sp[2 * k] <= t) {
                if (sp[2 * k + 1] > sp[2 * k]) {
                    a.lastRisingFs = Long.MIN_VALUE;
                }
                k++;
            }
            if (e.levelAfter(i)) {
                a.risingAt(t);
            }
        }
        while (k < e.invalidCount()) {
            if (sp[2 * k + 1] > sp[2 * k]) {
                a.lastRisingFs = Long.MIN_VALUE;
            }
            k++;
        }
    }

    private static void histPass(Acc a, AnalogBlock b) {
        if (!(a.max > a.min)) {
            return;
        }
        float[] v = b.volts();
        for (int i = 0, n = b.length(); i < n; i++) {
            if (!b.isValid(i)) {
                continue;
            }
            if (DitheredStride.taken(a.validSeen++, a.pickStride) && a.pickedCount < a.picked.length) {
                a.picked[a.pickedCount++] = v[i];
            }
        }
    }

    /**
     * The two levels, by the shared {@link TwoLevelFinder} (the one the differential plugin learns its
     * threshold with) over the channel's valid samples, thinned evenly to at most
     * {@link #MAX_LEVEL_SAMPLES}; the minimum and maximum when there are not two.
     */
    static void levels(Acc a) {
        TwoLevels lv = a.max > a.min ? TwoLevelFinder.find(a.picked, a.pickedCount) : null;
        a.picked = null;
        if (lv == null || !lv.twoLevels()) {
            a.low = a.min;
            a.high = a.max;
            return;
        }
        a.low = lv.low();
        a.high = lv.high();
    }

    private static void thresholdPass(Acc a, AnalogBlock b) {
        if (!(a.high > a.low)) {
            return;
        }
        double mid = (a.low + a.high) / 2;
        double hys = HYSTERESIS * (a.high - a.low);
        double up = mid + hys;
        double down = mid - hys;
        float[] v = b.volts();
        double p = b.periodFs();
        for (int i = 0, n = b.length(); i < n; i++) {
            if (!b.isValid(i)) {
                a.prevV = Double.NaN;
                a.state = -1;
                a.lastRisingFs = Long.MIN_VALUE; // no interval across missing samples
                continue;
            }
            double x = v[i];
            long t = b.startFs() + Math.round(i * p);
            if (!Double.isNaN(a.prevV)) {
                if (a.prevV < mid && x >= mid) {
                    a.lastUpCross = a.prevT + (mid - a.prevV) / (x - a.prevV) * (t - a.prevT);
                } else if (a.prevV >= mid && x < mid) {
                    a.lastDownCross = a.prevT + (a.prevV - mid) / (a.prevV - x) * (t - a.prevT);
                }
            }
            if (a.state != 1 && x >= up) {
                if (a.state == 0) {
                    a.edges++;
                    a.risingAt(Double.isNaN(a.lastUpCross) ? t : Math.round(a.lastUpCross));
                }
                a.state = 1;
            } else if (a.state != 0 && x <= down) {
                if (a.state == 1) {
                    a.edges++;
                }
                a.state = 0;
            }
            a.prevV = x;
            a.prevT = t;
        }
    }

    private static InspectReport report(Path file, String plugin, List<Acc> acc, List<Integer> analog, double[][][] sums,
                                        long[][] n2) {
        List<InspectReport.Channel> chans = new ArrayList<>();
        List<InspectReport.Clock> clocks = new ArrayList<>();
        for (Acc a : acc) {
            double dur = a.endFs > a.startFs ? (a.endFs - a.startFs) / 1e15 : 0;
            Double freq = null;
            Double cv = null;
            if (a.ivCount >= 1 && a.ivMean > 0) {
                freq = 1e15 / a.ivMean;
                cv = a.ivCount >= 2 ? Math.sqrt(a.ivM2 / (a.ivCount - 1)) / a.ivMean : null;
            }
            boolean analogKind = a.kind == DataKind.ANALOG;
            boolean logicKind = a.kind == DataKind.LOGIC;
            boolean valid = analogKind && a.samples > a.invalid;
            Double th = valid ? (a.low + a.high) / 2 : null;
            InspectReport.Channel c = new InspectReport.Channel(a.name, a.kind.name(), analogKind ? a.unit : null,
                    analogKind || logicKind ? a.samples : null, analogKind ? a.invalid : null,
                    a.kind == DataKind.WORDS ? Long.valueOf(Math.max(0, a.words)) : null,
                    a.kind == DataKind.WORDS ? a.suspectWords : null, a.kind == DataKind.WORDS ? a.widthBits : null,
                    a.edges >= 0 ? Long.valueOf(a.edges) : a.kind == DataKind.EDGES ? Long.valueOf(0) : null,
                    a.kind == DataKind.EDGES ? a.unknownFs / 1e15 : null,
                    dur, (analogKind || logicKind) && !Double.isNaN(a.periodFs) ? 1e15 / a.periodFs : null,
                    valid ? a.min : null, valid ? a.max : null, valid ? a.low : null, valid ? a.high : null,
                    th, valid ? HYSTERESIS * (a.high - a.low) : null, freq, cv);
            chans.add(c);
            if (a.rising >= CLOCK_MIN_EDGES && cv != null && cv < CLOCK_CV) {
                clocks.add(new InspectReport.Clock(a.name, freq, cv, null));
            }
        }
        List<InspectReport.Pair> pairs = new ArrayList<>();
        List<InspectReport.Pair> cands = new ArrayList<>();
        for (int p = 0; p < analog.size(); p++) {
            for (int q = p + 1; q < analog.size(); q++) {
                long n = n2[p][q];
                if (n < 3) {
                    continue;
                }
                double[] s = sums[p][q];
                double cov = s[4] - s[0] * s[1] / n;
                double vx = s[2] - s[0] * s[0] / n;
                double vy = s[3] - s[1] * s[1] / n;
                if (vx <= 0 || vy <= 0) {
                    continue;
                }
                double rr = cov / Math.sqrt(vx * vy);
                double re = s[6] > 0 && s[7] > 0 ? s[5] / Math.sqrt(s[6] * s[7]) : 0;
                if (rr <= PAIR_CORRELATION || re <= PAIR_STEP_CORRELATION) {
                    cands.add(new InspectReport.Pair(acc.get(analog.get(p)).name, acc.get(analog.get(q)).name, rr, re));
                }
            }
        }
        cands.sort((x, y) -> Double.compare(Math.min(x.correlation(), x.stepCorrelation()),
                Math.min(y.correlation(), y.stepCorrelation())));
        java.util.Set<String> used = new java.util.HashSet<>();
        for (InspectReport.Pair c : cands) {
            if (!used.contains(c.first()) && !used.contains(c.second())) {
                used.add(c.first());
                used.add(c.second());
                pairs.add(c);
            }
        }
        return new InspectReport(file.toString(), plugin, chans, pairs, onePerPair(clocks, pairs));
    }

    /** A clock found on both legs of a pair is listed once, on its first leg, naming the other leg. */
    static List<InspectReport.Clock> onePerPair(List<InspectReport.Clock> clocks, List<InspectReport.Pair> pairs) {
        java.util.Map<String, String> other = new java.util.HashMap<>();
        for (InspectReport.Pair p : pairs) {
            other.put(p.first(), p.second());
            other.put(p.second(), p.first());
        }
        List<InspectReport.Clock> out = new ArrayList<>();
        java.util.Set<String> listed = new java.util.HashSet<>();
        for (InspectReport.Clock c : clocks) {
            String leg = other.get(c.channel());
            if (listed.contains(c.channel())) {
                continue;
            }
            listed.add(c.channel());
            if (leg != null) {
                listed.add(leg);
            }
            out.add(new InspectReport.Clock(c.channel(), c.frequencyHz(), c.periodCv(), leg));
        }
        return out;
    }
}
