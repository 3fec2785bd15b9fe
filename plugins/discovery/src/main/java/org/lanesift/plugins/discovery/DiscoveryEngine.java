package org.lanesift.plugins.discovery;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

/**
 * Finds the format of an undocumented link from its edges: clocking ({@link ClockFinder}),
 * bits and bursts ({@link LaneSampler}), the bursts' common prefix ({@link SyncFinder}), word and
 * sync length from the burst lengths ({@link WordLengthFinder}), then for every lane distribution,
 * likely word length and bit order: checksum ({@link CrcCatalogue}), leading word and length field
 * ({@link BurstFields}) and candidate pictures ({@link PictureFinder}). The framing that explains
 * most (the smoothest picture, a checksum and a length field that hold on every burst) wins.
 */
public final class DiscoveryEngine {
    /** Bits per lane examined at most (memory is bounded by this, not by the capture). */
    public static final int DEFAULT_MAX_BITS = 1 << 24;
    static final int MAX_BURSTS = 4096;
    static final int CRC_BURSTS = 256;
    static final double CRC_SHARE = 0.8;
    static final int WORD_CANDIDATES = 3;

    private final int maxBits;

    /**
     * @param maxBits bits per lane examined at most
     */
    public DiscoveryEngine(int maxBits) {
        this.maxBits = maxBits;
    }

    Hypotheses discover(LinkEdgesInput in) {
        Clocking c = ClockFinder.find(in.risingFs(), in.nRising(), in.fallingFs(), in.nFalling(), in.laneEdgesFs(), in.laneCounts());
        double clockConf = c.clusteredShare() * Math.min(1.0, c.eyeUi() / 0.5);
        SampledLink sampled = LaneSampler.sample(c, in.risingFs(), in.nRising(), in.laneInitial(), in.laneEdgesFs(), in.laneCounts(), maxBits);
        int lanes = sampled.lanes().length;
        SampledLink framed = StreamFramer.frame(sampled);
        SampledLink link = BurstAligner.align(framed, SyncFinder.prefixes(framed));
        int[][] pre = SyncFinder.prefixes(link);
        int prefix = Integer.MAX_VALUE;
        for (int[] p : pre) {
            prefix = Math.min(prefix, p[0]);
        }
        List<LaneDistribution> dists = lanes == 1 ? List.of(LaneDistribution.SINGLE)
                : List.of(LaneDistribution.WORD, LaneDistribution.BIT, LaneDistribution.INDEPENDENT);
        List<Hypotheses.Framing> framings = new ArrayList<>();
        List<PictureCandidate> pictures = new ArrayList<>();
        List<WordLengthFinder.Candidate> laneLevel = WordLengthFinder.rank(link, prefix, 1);
        boolean idleRuns = link.burstMode().equals("idle-runs");
        for (LaneDistribution d : dists) {
            boolean spread = d == LaneDistribution.BIT && idleRuns;
            List<WordLengthFinder.Candidate> wl = spread ? spreadCandidates(link, prefix, lanes, laneLevel)
                    : d == LaneDistribution.BIT ? WordLengthFinder.rank(link, prefix, lanes) : laneLevel;
            for (int i = 0; i < (spread ? wl.size() : WordLengthFinder.tried(wl, WORD_CANDIDATES)); i++) {
                WordLengthFinder.Candidate w = wl.get(i);
                double prior = w.eligible() && !spread ? 0.02 * Math.max(0, WORD_CANDIDATES - i) : 0;
                List<MergedBurst> merged = LaneMerger.merge(link, w.syncBits(), w.wordBits(), d, MAX_BURSTS);
                List<CrcCatalogue.Match> crcs = CrcCatalogue.search(merged, CRC_BURSTS, CRC_SHARE);
                double slope = entropySlope(merged, w.wordBits());
                for (boolean msb : new boolean[] {false, true}) {
                    CrcCatalogue.Match crc = CrcCatalogue.pick(crcs, msb);
                    BurstFields f = BurstFields.find(merged, w.wordBits(), msb);
                    String label = w.wordBits() + "-bit words, " + (msb ? "msb" : "lsb") + " first" + (lanes > 1 ? ", lanes " + d.label : "");
                    Bits data = dataBits(merged, w.wordBits(), msb, f, crc);
                    List<PictureCandidate> pics = PictureFinder.candidates(data.bits(), data.count(), label);
                    double pic = 0;
                    for (PictureCandidate p : pics) {
                        pic = Math.max(pic, p.smoothness());
                    }
                    pictures.addAll(pics);
                    double score = pic + 0.3 * (crc == null ? 0 : crc.share()) + 0.2 * f.lengthShare + 0.1 * f.opcodeShare + prior
                            + 0.05 * (msb ? slope : -slope);
                    framings.add(new Hypotheses.Framing(d, w.wordBits(), w.syncBits(), msb, w.wholeShare(), crc, f, pic, score));
                }
            }
        }
        framings.sort(Comparator.comparingDouble(Hypotheses.Framing::score).reversed());
        pictures.sort(Comparator.comparingDouble(PictureCandidate::smoothness).reversed());
        Hypotheses.Framing best = framings.get(0);
        int s = best.syncBits();
        StringBuilder wire = new StringBuilder();
        for (int p = 0; p < s; p++) {
            wire.append(pre[0][p + 1]);
        }
        double syncShare = s == 0 ? 0 : syncShare(link, pre, s);
        List<WordLengthFinder.Candidate> ranked = best.distribution() == LaneDistribution.BIT ? WordLengthFinder.rank(link, prefix, lanes)
                : laneLevel;
        List<WordLengthFinder.Candidate> wordOrder = new ArrayList<>(ranked);
        wordOrder.sort(Comparator.comparingInt((WordLengthFinder.Candidate x) -> x.wordBits() == best.wordBits() ? 0 : 1));
        List<MergedBurst> merged = LaneMerger.merge(link, best.syncBits(), best.wordBits(), best.distribution(), MAX_BURSTS);
        SyncTolerance.Choice restart = link.burstMode().equals("streaming") && s > 0
                ? SyncTolerance.choose(link, wire.toString(), best.wordBits()) : null;
        return new Hypotheses(c, clockConf, link, s, wire.toString(), syncShare, prefix, wordOrder, framings, best,
                distinct(pictures), bitAutocorrelation(link, s), entropy(merged, best.wordBits()), restart);
    }

    /** Word lengths tried with bits spread over the lanes on idle-run links (at most this many). */
    static final int SPREAD_CANDIDATES = 5;

    /**
     * Bits spread over N lanes, idle-run links: a lane carries {@code words * w / N} bits, so the
     * burst lengths show a lane unit {@code U} (the best lane-level word length) and cannot tell
     * apart the word lengths {@code w} that divide {@code N * U}; all of them (longest first, at
     * most {@link #SPREAD_CANDIDATES}) are tried, with the best spread-lane ranking's first
     * candidate when it is not among them, and the picture, checksum and fields decide.
     */
    private static List<WordLengthFinder.Candidate> spreadCandidates(SampledLink link, int prefix, int lanes,
                                                                     List<WordLengthFinder.Candidate> laneLevel) {
        List<WordLengthFinder.Candidate> out = new ArrayList<>();
        WordLengthFinder.Candidate unit = laneLevel.get(0);
        int span = lanes * unit.wordBits();
        for (int w = WordLengthFinder.MAX_BITS; w >= WordLengthFinder.MIN_BITS && out.size() < SPREAD_CANDIDATES; w--) {
            if (span % w == 0) {
                out.add(new WordLengthFinder.Candidate(w, unit.syncBits(), WordLengthFinder.wholeShare(link, unit.syncBits(), w, lanes), true));
            }
        }
        WordLengthFinder.Candidate first = WordLengthFinder.rank(link, prefix, lanes).get(0);
        if (out.stream().noneMatch(c -> c.wordBits() == first.wordBits() && c.syncBits() == first.syncBits())) {
            out.add(first);
        }
        return out;
    }

    /** Packed bits and their count. */
    record Bits(long[] bits, int count) {
    }

    /**
     * The data bursts' words after the leading word (and length field), before the checksum,
     * values MSB first. A data burst's word count comes from its length field when there is one;
     * (when it claims no more words than the burst carries), otherwise a count within two words
     * or an eighth of the most common one is taken as that one (a bit error next to a burst's
     * end, in the idle run, moves the end seen, by up to a word per lane), so one damaged burst
     * does not shift the rest of the picture.
     */
    static Bits dataBits(List<MergedBurst> merged, int w, boolean msb, BurstFields f, CrcCatalogue.Match crc) {
        int cap = PictureFinder.MAX_PIXELS * 24;
        long[] out = new long[(cap + 63) / 64 + 1];
        int n = 0;
        int header = 1 + Math.max(0, f.lengthWord);
        int crcWords = crc == null ? 0 : (crc.model().width() + w - 1) / w;
        java.util.Map<Integer, Integer> counts = new java.util.HashMap<>();
        for (MergedBurst b : merged) {
            if (f.dataOpcode >= 0 && b.words(w) > 0 && b.word(0, w, msb) == f.dataOpcode) {
                counts.merge(b.words(w), 1, Integer::sum);
            }
        }
        int modal = counts.entrySet().stream().max(java.util.Map.Entry.comparingByValue()).map(java.util.Map.Entry::getKey).orElse(0);
        for (MergedBurst b : merged) {
            if (!isData(b, w, msb, f.dataOpcode, modal)) {
                continue;
            }
            int words = b.words(w);
            if (f.lengthWord >= 0 && words > f.lengthWord) {
                long fromField = b.word(f.lengthWord, w, msb) + f.lengthOffset;
                if (fromField > 0 && fromField <= words + 2) {
                    words = (int) fromField;
                } else if (Math.abs(words - modal) <= Math.max(2, modal / 8)) {
                    words = modal;
                }
            } else if (Math.abs(words - modal) <= Math.max(2, modal / 8)) {
                words = modal;
            }
            int end = words - crcWords;
            for (int q = header; q < end && n + w <= cap; q++) {
                long v = q < b.words(w) ? b.word(q, w, msb) : 0;
                for (int j = w - 1; j >= 0; j--) {
                    if ((v >>> j & 1L) != 0) {
                        out[n >>> 6] |= 1L << n;
                    }
                    n++;
                }
            }
        }
        return new Bits(out, n);
    }

    /** Bit errors tolerated in the leading word of a data burst that has the data bursts' word count. */
    static final int OPCODE_ERRORS = 2;

    /**
     * A data burst: its leading word is the data opcode, or differs from it in at most
     * {@link #OPCODE_ERRORS} bits while the burst has the data bursts' most common word count (a
     * bit error in the leading word would otherwise drop the burst and shift the rest of the
     * picture by its pixels).
     */
    static boolean isData(MergedBurst b, int w, boolean msb, long dataOpcode, int modalWords) {
        if (dataOpcode < 0 || b.words(w) == 0) {
            return false;
        }
        long op = b.word(0, w, msb);
        return op == dataOpcode || b.words(w) == modalWords && Long.bitCount(op ^ dataOpcode) <= OPCODE_ERRORS;
    }

    /** Entropy at the last wire position of a word minus that at the first (positive: the first bit varies less, as an MSB does). */
    private static double entropySlope(List<MergedBurst> merged, int w) {
        double[] h = entropy(merged, w);
        return h.length == 0 ? 0 : h[h.length - 1] - h[0];
    }

    /** Binary entropy of each wire position within a word, over every whole word of every burst (at most 1 M words). */
    static double[] entropy(List<MergedBurst> merged, int w) {
        long[] ones = new long[w];
        long words = 0;
        for (MergedBurst b : merged) {
            int n = b.words(w);
            for (int q = 0; q < n && words < (1 << 20); q++, words++) {
                for (int j = 0; j < w; j++) {
                    if (b.bit(q * w + j)) {
                        ones[j]++;
                    }
                }
            }
        }
        double[] h = new double[w];
        for (int j = 0; j < w && words > 0; j++) {
            double p = ones[j] / (double) words;
            h[j] = p <= 0 || p >= 1 ? 0 : -(p * Math.log(p) + (1 - p) * Math.log(1 - p)) / Math.log(2);
        }
        return h;
    }

    /** The three strongest lags 4..64 of the autocorrelation of lane 0's payload bits (as +1/-1), each {lag, value}. */
    static double[][] bitAutocorrelation(SampledLink link, int syncBits) {
        int cap = 1 << 16;
        double[] x = new double[cap];
        int n = 0;
        for (int b = 0; b < link.bursts() && n < cap; b++) {
            for (int i = link.start()[b] + syncBits; i < link.end()[b] && n < cap; i++) {
                x[n++] = link.bit(0, i) ? 1 : -1;
            }
        }
        if (n < 256) {
            return new double[0][];
        }
        double[] r = Autocorrelation.of(x, n, 64);
        double[][] top = new double[3][];
        for (int t = 0; t < 3; t++) {
            int bestLag = -1;
            for (int lag = 4; lag <= 64; lag++) {
                boolean taken = false;
                for (int u = 0; u < t; u++) {
                    taken |= top[u][0] == lag;
                }
                if (!taken && (bestLag < 0 || r[lag] > r[bestLag])) {
                    bestLag = lag;
                }
            }
            top[t] = new double[] {bestLag, r[bestLag]};
        }
        return top;
    }

    private static double syncShare(SampledLink link, int[][] pre, int s) {
        double share = 1;
        for (int k = 0; k < pre.length; k++) {
            share = Math.min(share, SyncFinder.match(link, k, pre[k], s, 2));
        }
        return share;
    }

    /** Best first, one per (format, line length, framing), at most 12. */
    private static List<PictureCandidate> distinct(List<PictureCandidate> sorted) {
        List<PictureCandidate> out = new ArrayList<>();
        java.util.Set<String> seen = new java.util.HashSet<>();
        for (PictureCandidate p : sorted) {
            if (out.size() < 12 && seen.add(p.format() + "/" + p.lineLength() + "/" + p.hypothesis())) {
                out.add(p);
            }
        }
        return out;
    }
}
