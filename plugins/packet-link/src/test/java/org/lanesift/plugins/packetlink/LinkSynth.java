package org.lanesift.plugins.packetlink;

import org.lanesift.kit.LineState;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.testkit.StageHarness;

/**
 * Test-only generator of a D-PHY-like multi-lane link: the two single-ended legs of every data
 * lane (low-power states and high-speed bursts, with a little noise) and the bit streams a
 * double-edge sampler would give for the same lanes. Levels follow docs/reference-facts.md#d-phy-levels-and-states (from
 * memory): LP high 1.2 V, LP low 0 V, HS common mode 0.2 V with +/-0.1 V per leg.
 *
 * <p>A high-speed burst: LP-11, LP-01, LP-00, HS-zero, sync byte B8, the lane's bytes (byte k on
 * lane k mod N) LSB first, the trail (inverse of the last bit) up to a common end, LP-11. A few
 * random bits are also delivered just before and after each burst, as a sampler on a running clock
 * would, to check they are ignored. Low-power data: escape entry, the low-power data command
 * 11100001, bytes LSB first as spaced one-hot marks, exit mark, LP-11 (lane 0 only).
 */
final class LinkSynth {
    static final double SAMPLE_FS = 10_000_000;  // 10 ns: 100 MS/s for the legs
    static final long UI_FS = 2_000_000;           // 2 ns: 500 Mbit/s per lane
    static final long LPX_FS = 100_000_000;        // 100 ns per low-power state

    private record Seg(LineState state, long startFs, long endFs, boolean[] bits, long bitsStartFs) {
    }

    private final int lanes;
    private final List<List<Seg>> segs = new ArrayList<>();
    private final List<List<long[]>> bitTimes = new ArrayList<>();
    private final List<List<boolean[]>> bitVals = new ArrayList<>();
    /** Spans {@code [from, to)} per lane in which the bits come flagged, as a sampler flags low margins. */
    private final List<List<long[]>> flagSpans = new ArrayList<>();
    /** The bits delivered just before and after a burst come flagged (a transition into LP-01 lands at any clock phase). */
    boolean flagAroundBursts;
    private final Random rnd = new Random(42);
    long nowFs;
    double noiseVolts = 0.005;
    /** Duration of the linear ramp between low-power levels (0: instant). */
    long edgeFs;

    LinkSynth(int lanes) {
        this.lanes = lanes;
        for (int k = 0; k < lanes; k++) {
            segs.add(new ArrayList<>());
            bitTimes.add(new ArrayList<>());
            bitVals.add(new ArrayList<>());
            flagSpans.add(new ArrayList<>());
        }
        nowFs = 0;
    }

    private void seg(int lane, LineState s, long start, long end) {
        segs.get(lane).add(new Seg(s, start, end, null, 0));
    }

    /** Stays in LP-11 on every lane. */
    LinkSynth idle(long fs) {
        for (int k = 0; k < lanes; k++) {
            seg(k, LineState.LP11, nowFs, nowFs + fs);
        }
        nowFs += fs;
        return this;
    }

    /** One high-speed burst carrying {@code bytes}. */
    LinkSynth hs(byte[] bytes) {
        long t = nowFs;
        for (int k = 0; k < lanes; k++) {
            seg(k, LineState.LP01, t, t + LPX_FS);
            seg(k, LineState.LP00, t + LPX_FS, t + 2 * LPX_FS);
        }
        long hsStart = alignUp(t + 2 * LPX_FS);
        int maxLaneBytes = (bytes.length + lanes - 1) / lanes;
        int zeros = 24;
        int trailMin = 16;
        int totalBits = zeros + 8 + maxLaneBytes * 8 + trailMin;
        long hsEnd = hsStart + totalBits * UI_FS;
        for (int k = 0; k < lanes; k++) {
            boolean[] b = new boolean[totalBits];
            int pos = zeros;
            for (int j = 0; j < 8; j++) {
                b[pos++] = (0xB8 >> j & 1) != 0;
            }
            for (int i = k; i < bytes.length; i += lanes) {
                for (int j = 0; j < 8; j++) {
                    b[pos++] = (bytes[i] >> j & 1) != 0;
                }
            }
            boolean trail = !b[pos - 1];
            while (pos < totalBits) {
                b[pos++] = trail;
            }
            segs.get(k).add(new Seg(LineState.HS, hsStart, hsEnd, b, hsStart));
            // what a sampler on a running clock delivers: junk around the burst, then the burst
            addBits(k, randomBits(40), hsStart - 40 * UI_FS);
            addBits(k, b, hsStart);
            addBits(k, randomBits(40), hsEnd);
            if (flagAroundBursts) {
                flagBits(k, hsStart - 40 * UI_FS, hsStart);
                flagBits(k, hsEnd, hsEnd + 40 * UI_FS);
            }
            seg(k, LineState.LP11, hsEnd, hsEnd + LPX_FS);
        }
        nowFs = hsEnd + LPX_FS;
        return this;
    }

    /** Low-power data transmission of {@code bytes} on lane 0; other lanes stay in LP-11. */
    LinkSynth lpdt(byte[] bytes) {
        long t = nowFs;
        LineState[] entry = {LineState.LP10, LineState.LP00, LineState.LP01, LineState.LP00};
        for (LineState s : entry) {
            seg(0, s, t, t + LPX_FS);
            t += LPX_FS;
        }
        int cmd = LaneStateTracker.ESC_LPDT;
        List<Boolean> bits = new ArrayList<>();
        for (int j = 7; j >= 0; j--) {
            bits.add((cmd >> j & 1) != 0);
        }
        for (byte x : bytes) {
            for (int j = 0; j < 8; j++) {
                bits.add((x >> j & 1) != 0);
            }
        }
        for (boolean bit : bits) {
            seg(0, bit ? LineState.LP10 : LineState.LP01, t, t + LPX_FS);
            seg(0, LineState.LP00, t + LPX_FS, t + 2 * LPX_FS);
            t += 2 * LPX_FS;
        }
        seg(0, LineState.LP10, t, t + LPX_FS);
        t += LPX_FS;
        for (int k = 1; k < lanes; k++) {
            seg(k, LineState.LP11, nowFs, t);
        }
        nowFs = t;
        return idle(LPX_FS);
    }

    /** Appends an arbitrary line-state sequence on one lane (others stay LP-11). */
    LinkSynth states(int lane, LineState... states) {
        long t = nowFs;
        for (LineState s : states) {
            seg(lane, s, t, t + LPX_FS);
            t += LPX_FS;
        }
        for (int k = 0; k < lanes; k++) {
            if (k != lane) {
                seg(k, LineState.LP11, nowFs, t);
            }
        }
        nowFs = t;
        return this;
    }

    /** Bits of {@code lane} sampled in {@code [fromFs, toFs)} come flagged. */
    LinkSynth flagBits(int lane, long fromFs, long toFs) {
        flagSpans.get(lane).add(new long[] {fromFs, toFs});
        return this;
    }

    /** Start of the last burst's high-speed bits (after HS-zero: the sync byte starts 24 UI later). */
    long lastHsStartFs() {
        List<Seg> l = segs.get(0);
        for (int i = l.size() - 1; i >= 0; i--) {
            if (l.get(i).state == LineState.HS) {
                return l.get(i).bitsStartFs;
            }
        }
        throw new IllegalStateException("no burst yet");
    }

    private static long alignUp(long t) {
        return (t + UI_FS - 1) / UI_FS * UI_FS;
    }

    private boolean[] randomBits(int n) {
        boolean[] b = new boolean[n];
        for (int i = 0; i < n; i++) {
            b[i] = rnd.nextBoolean();
        }
        return b;
    }

    private void addBits(int lane, boolean[] b, long startFs) {
        long[] t = new long[b.length];
        for (int i = 0; i < b.length; i++) {
            t[i] = startFs + i * UI_FS;
        }
        bitTimes.get(lane).add(t);
        bitVals.get(lane).add(b);
    }

    /** The legs of a lane over the whole capture. */
    float[][] legs(int lane) {
        int n = (int) Math.ceil(nowFs / SAMPLE_FS);
        float[] p = new float[n];
        float[] m = new float[n];
        Random r = new Random(100 + lane);
        List<Seg> list = segs.get(lane);
        int si = 0;
        for (int i = 0; i < n; i++) {
            long t = Math.round(i * SAMPLE_FS);
            while (si < list.size() - 1 && t >= list.get(si).endFs) {
                si++;
            }
            Seg s = list.get(si);
            if (t < s.startFs || t >= s.endFs) {
                // gaps never occur in this generator except after the last segment
                s = new Seg(LineState.LP11, t, t + 1, null, 0);
            }
            float vp;
            float vn;
            switch (s.state) {
                case LP11 -> { vp = 1.2f; vn = 1.2f; }
                case LP10 -> { vp = 1.2f; vn = 0f; }
                case LP01 -> { vp = 0f; vn = 1.2f; }
                case LP00 -> { vp = 0f; vn = 0f; }
                case HS -> {
                    int bi = (int) ((t - s.bitsStartFs) / UI_FS);
                    boolean bit = s.bits != null && s.bits[Math.min(bi, s.bits.length - 1)];
                    vp = bit ? 0.3f : 0.1f;
                    vn = bit ? 0.1f : 0.3f;
                }
                default -> { vp = 0.7f; vn = 0.7f; }
            }
            if (edgeFs > 0 && si > 0 && t - s.startFs < edgeFs && s.state != LineState.HS && list.get(si - 1).state != LineState.HS) {
                float[] prev = levels(list.get(si - 1).state);
                double a = (t - s.startFs) / (double) edgeFs;
                vp = (float) (prev[0] + (vp - prev[0]) * a);
                vn = (float) (prev[1] + (vn - prev[1]) * a);
            }
            p[i] = vp + (float) (r.nextGaussian() * noiseVolts);
            m[i] = vn + (float) (r.nextGaussian() * noiseVolts);
        }
        return new float[][] {p, m};
    }

    private static float[] levels(LineState st) {
        return switch (st) {
            case LP11 -> new float[] {1.2f, 1.2f};
            case LP10 -> new float[] {1.2f, 0f};
            case LP01 -> new float[] {0f, 1.2f};
            default -> new float[] {0f, 0f};
        };
    }

    /** All bits of a lane, sorted, as one stream. */
    BitStream bits(int lane) {
        List<long[]> ts = bitTimes.get(lane);
        List<boolean[]> vs = bitVals.get(lane);
        int n = 0;
        for (long[] t : ts) {
            n += t.length;
        }
        long[] times = new long[n];
        boolean[] vals = new boolean[n];
        int o = 0;
        for (int c = 0; c < ts.size(); c++) {
            System.arraycopy(ts.get(c), 0, times, o, ts.get(c).length);
            System.arraycopy(vs.get(c), 0, vals, o, vs.get(c).length);
            o += ts.get(c).length;
        }
        boolean[] flags = new boolean[n];
        for (int i = 0; i < n; i++) {
            for (long[] span : flagSpans.get(lane)) {
                flags[i] |= times[i] >= span[0] && times[i] < span[1];
            }
        }
        return stream("bits" + lane, times, vals, flags, 0, n, 0, nowFs);
    }

    static BitStream stream(String ch, long[] times, boolean[] vals, int from, int to, long startFs, long endFs) {
        return stream(ch, times, vals, null, from, to, startFs, endFs);
    }

    static BitStream stream(String ch, long[] times, boolean[] vals, boolean[] flags, int from, int to, long startFs, long endFs) {
        int n = to - from;
        long[] v = new long[BitSets.words(n)];
        long[] fall = new long[BitSets.words(n)];
        long[] edge = new long[n];
        long[] setup = new long[n];
        long[] hold = new long[n];
        long[] flagged = new long[BitSets.words(n)];
        for (int i = 0; i < n; i++) {
            BitSets.set(v, i, vals[from + i]);
            if (flags != null && flags[from + i]) {
                BitSets.set(flagged, i, true);
                hold[i] = UI_FS / 20; // a low hold margin, as the sampler would report it
            }
            edge[i] = times[from + i] / UI_FS;
            BitSets.set(fall, i, (edge[i] & 1) == 1);
            setup[i] = UI_FS / 2;
            if (!BitSets.get(flagged, i)) {
                hold[i] = UI_FS / 2;
            }
        }
        return new BitStream(ch, startFs, endFs, n, v, Arrays.copyOfRange(times, from, to), edge, fall, null, setup, hold,
                flagged, UI_FS);
    }

    /** Cuts a stream at a time: bits before and bits at or after. */
    static BitStream[] cut(BitStream s, long atFs) {
        long[] t = s.timesFs();
        int k = Lane.firstAtOrAfter(t, 0, s.count(), atFs);
        boolean[] vals = new boolean[s.count()];
        boolean[] flags = new boolean[s.count()];
        for (int i = 0; i < s.count(); i++) {
            vals[i] = s.bit(i);
            flags[i] = s.isFlagged(i);
        }
        return new BitStream[] {stream(s.channel(), t, vals, flags, 0, k, s.startFs(), atFs),
            stream(s.channel(), t, vals, flags, k, s.count(), atFs, Math.max(atFs, s.endFs()))};
    }

    /**
     * Pushes the whole capture into a harness, legs in blocks of {@code blockSamples}, each lane's
     * bits cut at the same block boundaries and pushed after (or, with {@code bitsFirst}, before) the legs.
     */
    void feed(StageHarness h, int blockSamples, boolean bitsFirst) {
        float[][][] legs = new float[lanes][][];
        BitStream[] rest = new BitStream[lanes];
        for (int k = 0; k < lanes; k++) {
            legs[k] = legs(k);
            rest[k] = bits(k);
        }
        int n = legs[0][0].length;
        for (int pos = 0; pos < n; pos += blockSamples) {
            int len = Math.min(blockSamples, n - pos);
            long start = Math.round(pos * SAMPLE_FS);
            long end = pos + len >= n ? Math.max(nowFs, Math.round(n * SAMPLE_FS)) : Math.round((pos + len) * SAMPLE_FS);
            BitStream[] now = new BitStream[lanes];
            for (int k = 0; k < lanes; k++) {
                BitStream[] c = cut(rest[k], end);
                now[k] = c[0];
                rest[k] = c[1];
            }
            if (bitsFirst) {
                for (int k = 0; k < lanes; k++) {
                    h.push("bits" + k, now[k]);
                }
            }
            for (int k = 0; k < lanes; k++) {
                h.push("lane" + k + "p", new AnalogBlock("lane" + k + "p", pos, start, SAMPLE_FS, Arrays.copyOfRange(legs[k][0], pos, pos + len), len, null));
                h.push("lane" + k + "n", new AnalogBlock("lane" + k + "n", pos, start, SAMPLE_FS, Arrays.copyOfRange(legs[k][1], pos, pos + len), len, null));
            }
            if (!bitsFirst) {
                for (int k = 0; k < lanes; k++) {
                    h.push("bits" + k, now[k]);
                }
            }
        }
        h.finish();
    }
}
