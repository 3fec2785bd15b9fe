package org.lanesift.plugins.discovery;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;

/**
 * Draws random link formats (seeded) and encodes commands and a picture over them as clock and
 * lane edges: word lengths 4 to 32, both bit orders, single-edge (either edge), double-edge and
 * multiplied clocks, 1 to 4 lanes spread word by word, bit by bit or as independent streams, with
 * or without a sync pattern, with or without a catalogue CRC and a length field, bursts separated
 * by clock pauses or idle runs, command bursts with a leading opcode and data bursts carrying a
 * smooth picture in one of the candidate pixel formats. Invented test data only.
 */
final class LinkFormatGenerator {
    /** One drawn format and what was sent over it. */
    static final class Link {
        int wordBits;
        boolean msbFirst;
        String clocking;
        int slots;
        int lanes;
        LaneDistribution dist;
        boolean[] sync;
        boolean clockStops;
        /** Bursts follow each other with no pause and no idle run (the clock runs throughout). */
        boolean streaming;
        boolean idleLevel;
        CrcModel crc;
        boolean lengthField;
        PixelFormat pixel;
        int width;
        int height;
        int[] pictureRgb;
        long dataOpcode;
        int bitErrors;
        boolean midBurstStart;
        boolean noErrors;
        LinkEdgesInput input;
        /** Per burst, the merged wire bits after the sync (one stream; independent lanes: lane 0's). */
        final List<boolean[]> sentWire = new ArrayList<>();

        /** The words of burst {@code b} as sent, values in the link's bit order. */
        long[] sentWords(int b) {
            boolean[] bits = sentWire.get(b);
            long[] out = new long[bits.length / wordBits];
            for (int q = 0; q < out.length; q++) {
                for (int j = 0; j < wordBits; j++) {
                    if (bits[q * wordBits + j]) {
                        out[q] |= msbFirst ? 1L << (wordBits - 1 - j) : 1L << j;
                    }
                }
            }
            return out;
        }

        /** The sync as discovery can see it: with idle runs, leading idle-level bits look like idle. */
        String visibleSync() {
            StringBuilder s = new StringBuilder();
            boolean leading = !clockStops && !streaming;
            for (boolean b : sync) {
                if (leading && b == idleLevel) {
                    continue;
                }
                leading = false;
                s.append(b ? '1' : '0');
            }
            return s.toString();
        }

        @Override
        public String toString() {
            return "W=" + wordBits + (msbFirst ? " msb" : " lsb") + " " + clocking + " lanes=" + lanes + "/" + dist.label + " sync="
                    + (sync.length == 0 ? "none" : visibleSync()) + (clockStops ? " clock-stops" : streaming ? " streaming" : " idle-runs") + " crc="
                    + (crc == null ? "none" : crc.name()) + (lengthField ? " length-field" : "") + " " + pixel.label + " " + width + "x"
                    + height + (midBurstStart ? " mid-burst start" : "") + " errors=" + bitErrors;
        }
    }

    private final Random r;
    /** Draws which idle-run links stream instead (apart, so that the other draws of a seed stay as they were). */
    private final Random streams;

    LinkFormatGenerator(long seed) {
        r = new Random(seed);
        streams = new Random(seed ^ 0x5157_3E4DL);
    }

    /** Only streaming links from now on. */
    private boolean streamingOnly;

    /** Draws only streaming links (bursts back to back, framed by the sync alone). */
    LinkFormatGenerator streamingOnly() {
        streamingOnly = true;
        return this;
    }

    Link next() {
        while (true) {
            Link l = draw();
            if ((!streamingOnly || l.streaming) && encode(l)) {
                return l;
            }
        }
    }

    /** A format given by hand (seeded content), encoded. */
    Link fixed(int wordBits, boolean msbFirst, String clocking, int lanes, LaneDistribution dist, String syncWire, boolean clockStops,
               CrcModel crc, boolean lengthField, PixelFormat pixel, int width, int height) {
        Link l = shape(wordBits, msbFirst, clocking, lanes, dist, syncWire, crc, lengthField, pixel, width, height);
        l.clockStops = clockStops;
        return encoded(l);
    }

    /**
     * A streaming format given by hand: bursts back to back with no pause and no idle run, framed
     * by the sync alone (which must stand out of the data: 16 bits or more).
     */
    Link fixedStreaming(int wordBits, boolean msbFirst, String clocking, int lanes, LaneDistribution dist, String syncWire, CrcModel crc,
                        boolean lengthField, PixelFormat pixel, int width, int height) {
        Link l = shape(wordBits, msbFirst, clocking, lanes, dist, syncWire, crc, lengthField, pixel, width, height);
        l.streaming = true;
        return encoded(l);
    }

    private static Link shape(int wordBits, boolean msbFirst, String clocking, int lanes, LaneDistribution dist, String syncWire,
                              CrcModel crc, boolean lengthField, PixelFormat pixel, int width, int height) {
        Link l = new Link();
        l.wordBits = wordBits;
        l.msbFirst = msbFirst;
        l.clocking = clocking;
        l.slots = clocking.startsWith("single") ? 1 : clocking.equals("double-edge") ? 2 : 4;
        l.lanes = lanes;
        l.dist = dist;
        l.sync = new boolean[syncWire.length()];
        for (int i = 0; i < syncWire.length(); i++) {
            l.sync[i] = syncWire.charAt(i) == '1';
        }
        l.crc = crc;
        l.lengthField = lengthField;
        l.pixel = pixel;
        l.width = width;
        l.height = height;
        l.noErrors = true;
        return l;
    }

    private Link encoded(Link l) {
        if (!encode(l)) {
            throw new IllegalArgumentException("no chunk size fits " + l);
        }
        return l;
    }

    private Link draw() {
        Link l = new Link();
        l.lanes = 1 + r.nextInt(4);
        l.dist = l.lanes == 1 ? LaneDistribution.SINGLE
                : new LaneDistribution[] {LaneDistribution.WORD, LaneDistribution.BIT, LaneDistribution.INDEPENDENT}[r.nextInt(3)];
        l.clockStops = r.nextBoolean() && !streamingOnly;
        String[] clk = {"single-edge-rising", "single-edge-falling", "double-edge", "multiplied-4"};
        l.clocking = clk[r.nextInt(l.clockStops ? 3 : 4)];
        l.slots = l.clocking.startsWith("single") ? 1 : l.clocking.equals("double-edge") ? 2 : 4;
        do {
            l.wordBits = 4 + r.nextInt(29);
        } while (l.clockStops && l.wordBits % l.slots != 0);
        l.msbFirst = r.nextBoolean();
        l.idleLevel = r.nextBoolean();
        boolean withSync = !l.clockStops || r.nextInt(3) > 0; // idle runs need a sync to show where a burst starts
        do {
            int len = withSync ? 8 + r.nextInt(17) : 0;
            if (l.clockStops) {
                len = len / l.slots * l.slots;
            }
            l.sync = new boolean[len];
            for (int i = 0; i < len; i++) {
                l.sync[i] = r.nextBoolean();
            }
        } while (withSync && l.visibleSync().length() < 6);
        List<CrcModel> fit = new ArrayList<>();
        for (CrcModel m : CrcCatalogue.MODELS) {
            if (m.width() % l.wordBits == 0) {
                fit.add(m);
            }
        }
        l.crc = !fit.isEmpty() && r.nextBoolean() ? fit.get(r.nextInt(fit.size())) : null;
        l.lengthField = l.wordBits >= 10 && r.nextBoolean();
        l.pixel = PixelFormat.values()[r.nextInt(PixelFormat.values().length)];
        l.width = 32 + r.nextInt(49);
        l.height = Math.max(18, 1500 / l.width);
        l.midBurstStart = r.nextInt(4) == 0;
        if (!l.clockStops && (streamingOnly || streams.nextInt(4) == 0) && l.wordBits % l.slots == 0) {
            // streaming: framed by the sync alone, which must stand out of the data: 16 to 24 bits; with no pause
            // there is no room for padding, so a burst fills whole clock periods (as where the clock pauses)
            l.streaming = true;
            l.sync = new boolean[(16 + streams.nextInt(9)) / l.slots * l.slots];
            for (int i = 0; i < l.sync.length; i++) {
                l.sync[i] = streams.nextBoolean();
            }
        }
        return l;
    }

    // ------------------------------------------------------------------ content

    private boolean encode(Link l) {
        int w = l.wordBits;
        long mask = w == 64 ? -1L : (1L << w) - 1;
        long[] opcodes = new long[3 + r.nextInt(3)];
        for (int i = 0; i < opcodes.length; i++) {
            long v;
            boolean dup;
            do {
                v = r.nextLong() & mask;
                dup = false;
                for (int j = 0; j < i; j++) {
                    dup |= opcodes[j] == v;
                }
            } while (dup);
            opcodes[i] = v;
        }
        l.dataOpcode = opcodes[0];
        long[] pixels = picture(l);
        int bpp = l.pixel.bitsPerPixel;
        int crcWords = l.crc == null ? 0 : l.crc.width() / w;
        int streams = l.dist == LaneDistribution.INDEPENDENT ? l.lanes : 1;
        int wordsPerLaneUnit = l.dist == LaneDistribution.WORD ? l.lanes : 1;
        // chunk size: whole words, and whole words per lane
        int chunk = 24 + r.nextInt(64);
        int limit = chunk + 4096;
        while (chunk < limit && ((long) chunk * bpp % w != 0 || ((long) chunk * bpp / w + 1 + (l.lengthField ? 1 : 0) + crcWords) % wordsPerLaneUnit != 0
                || (l.dist == LaneDistribution.BIT && (((long) chunk * bpp + (1 + (l.lengthField ? 1 : 0) + crcWords) * (long) w) % (l.lanes * (long) w) != 0)))) {
            chunk++;
        }
        if (chunk >= limit) {
            return false; // no chunk of whole words splits evenly over these lanes: draw another format
        }
        List<List<boolean[]>> bursts = new ArrayList<>(); // per burst, per stream: wire bits
        int p = 0;
        int commandsLeft = 10 + r.nextInt(8);
        int chunksTotal = (pixels.length + chunk - 1) / chunk;
        int chunkCount = 0;
        while (chunkCount < chunksTotal || commandsLeft > 0) {
            boolean command = commandsLeft > 0 && (bursts.isEmpty() || chunkCount >= chunksTotal || r.nextInt(3) == 0);
            List<boolean[]> per = new ArrayList<>();
            int params = r.nextInt(6);
            for (int st = 0; st < streams; st++) {
                long[] words;
                if (command) {
                    int n = 1 + (l.lengthField ? 1 : 0) + params;
                    while ((n + crcWords) % wordsPerLaneUnit != 0
                            || (l.dist == LaneDistribution.BIT && ((long) (n + crcWords) * w) % (l.lanes * (long) w) != 0)) {
                        n++;
                    }
                    words = new long[n];
                    words[0] = opcodes[1 + r.nextInt(opcodes.length - 1)];
                    for (int q = 1; q < n; q++) {
                        words[q] = r.nextLong() & mask;
                    }
                } else {
                    long[] bits = new long[(chunk * bpp + 63) / 64];
                    for (int i = 0; i < chunk; i++) {
                        long v = pixels[p % pixels.length];
                        p++;
                        for (int j = 0; j < bpp; j++) {
                            int at = i * bpp + j;
                            if ((v >>> (bpp - 1 - j) & 1L) != 0) {
                                bits[at >>> 6] |= 1L << at;
                            }
                        }
                    }
                    int dw = chunk * bpp / w;
                    int head = 1 + (l.lengthField ? 1 : 0);
                    words = new long[head + dw];
                    words[0] = l.dataOpcode;
                    for (int q = 0; q < dw; q++) {
                        long v = 0;
                        for (int j = 0; j < w; j++) {
                            int at = q * w + j;
                            v = v << 1 | (bits[at >>> 6] >>> at & 1L);
                        }
                        words[head + q] = v;
                    }
                    chunkCount++;
                }
                if (l.lengthField) {
                    words[1] = words.length - 2;
                }
                per.add(wire(l, words));
            }
            if (command) {
                commandsLeft--;
            }
            bursts.add(per);
            l.sentWire.add(per.get(0));
        }
        edges(l, bursts);
        return true;
    }

    private boolean[] wire(Link l, long[] words) {
        int w = l.wordBits;
        int crcBits = l.crc == null ? 0 : l.crc.width();
        boolean[] out = new boolean[words.length * w + crcBits];
        for (int q = 0; q < words.length; q++) {
            for (int j = 0; j < w; j++) {
                int bit = l.msbFirst ? w - 1 - j : j;
                out[q * w + j] = (words[q] >>> bit & 1L) != 0;
            }
        }
        if (l.crc != null) {
            int n = words.length * w;
            long[] packed = new long[(n + 63) / 64 + 1];
            for (int i = 0; i < n; i++) {
                if (out[i]) {
                    packed[i >>> 6] |= 1L << i;
                }
            }
            long c = l.crc.of(packed, 0, n);
            for (int j = 0; j < crcBits; j++) {
                int bit = l.crc.refout() ? j : crcBits - 1 - j;
                out[n + j] = (c >>> bit & 1L) != 0;
            }
        }
        return out;
    }

    /**
     * A smooth picture like a drawn screen: per component a gradient, three soft round blobs, one
     * flat rectangle and a little noise.
     */
    private long[] picture(Link l) {
        int[] d = l.pixel.depths();
        int w = l.width;
        int h = l.height;
        long[] raw = new long[w * h];
        l.pictureRgb = new int[raw.length];
        double[][] k = new double[3][16];
        for (double[] c : k) {
            for (int i = 0; i < c.length; i++) {
                c[i] = r.nextDouble();
            }
        }
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                int[] c = new int[3];
                for (int ch = 0; ch < 3; ch++) {
                    double[] q = k[ch];
                    double v = 0.3 + 0.3 * q[0] * x / w + 0.3 * q[1] * y / h;
                    for (int b = 0; b < 3; b++) {
                        double cx = q[2 + 3 * b] * w;
                        double cy = q[3 + 3 * b] * h;
                        double rad = 4 + 14 * q[4 + 3 * b];
                        double dd = ((x - cx) * (x - cx) + (y - cy) * (y - cy)) / (rad * rad);
                        v += (b % 2 == 0 ? 0.3 : -0.25) * Math.exp(-dd);
                    }
                    if (x > q[11] * w && x < q[11] * w + 10 + 20 * q[12] && y > q[13] * h && y < q[13] * h + 6 + 12 * q[14]) {
                        v += 0.15;
                    }
                    v += 0.02 * (r.nextDouble() - 0.5);
                    int max = (1 << d[ch]) - 1;
                    c[ch] = Math.max(0, Math.min(max, (int) Math.round(v * max)));
                }
                raw[y * w + x] = l.pixel.raw(c[0], c[1], c[2]);
                l.pictureRgb[y * w + x] = l.pixel.rgb(raw[y * w + x]);
            }
        }
        return raw;
    }

    // ------------------------------------------------------------------ wire: lanes, bursts, clock, edges

    private void edges(Link l, List<List<boolean[]>> bursts) {
        int n = l.lanes;
        int s = l.slots;
        // per lane: the slot stream (bits) and, for each slot, whether the clock runs there
        List<boolean[]> laneBursts = new ArrayList<>();
        List<List<boolean[]>> perLane = new ArrayList<>();
        for (int k = 0; k < n; k++) {
            perLane.add(new ArrayList<>());
        }
        for (List<boolean[]> b : bursts) {
            for (int k = 0; k < n; k++) {
                boolean[] mine;
                if (l.dist == LaneDistribution.INDEPENDENT) {
                    mine = b.get(k);
                } else if (l.dist == LaneDistribution.BIT) {
                    boolean[] all = b.get(0);
                    mine = new boolean[all.length / n];
                    for (int i = 0; i < mine.length; i++) {
                        mine[i] = all[i * n + k];
                    }
                } else {
                    boolean[] all = b.get(0);
                    int w = l.wordBits;
                    int words = all.length / w;
                    mine = new boolean[(words / n) * w];
                    for (int q = k, o = 0; q < words; q += n, o += w) {
                        System.arraycopy(all, q * w, mine, o, w);
                    }
                }
                boolean[] withSync = new boolean[l.sync.length + mine.length];
                System.arraycopy(l.sync, 0, withSync, 0, l.sync.length);
                System.arraycopy(mine, 0, withSync, l.sync.length, mine.length);
                perLane.get(k).add(withSync);
            }
        }
        double periodFs = 1e6 * (2 + r.nextInt(8)); // 2 to 9 ns
        double jitter = 0.04;
        // slot streams
        int bursts0 = bursts.size();
        List<Long> rising = new ArrayList<>();
        List<boolean[]> laneSlots = new ArrayList<>();
        int total = 0;
        int[] burstSlots = new int[bursts0];
        int[] gapSlots = new int[bursts0];
        for (int b = 0; b < bursts0; b++) {
            int len = 0;
            for (int k = 0; k < n; k++) {
                len = Math.max(len, perLane.get(k).get(b).length);
            }
            burstSlots[b] = (len + s - 1) / s * s;
            gapSlots[b] = l.clockStops ? 0 : (150 + r.nextInt(150)) / s * s;
            if (l.streaming) {
                gapSlots[b] = 0;
            }
            total += burstSlots[b] + gapSlots[b];
        }
        int lead = l.clockStops || l.streaming ? 0 : 120 / s * s;
        total += lead;
        for (int k = 0; k < n; k++) {
            boolean[] v = new boolean[total];
            Arrays.fill(v, l.idleLevel);
            int at = lead;
            for (int b = 0; b < bursts0; b++) {
                at += gapSlots[b];
                boolean[] src = perLane.get(k).get(b);
                System.arraycopy(src, 0, v, at, src.length);
                at += burstSlots[b];
            }
            laneSlots.add(v);
        }
        // bit errors: a few flips inside bursts
        int flips = l.noErrors ? 0 : r.nextInt(4);
        for (int e = 0; e < flips; e++) {
            int k = r.nextInt(n);
            int i = r.nextInt(total);
            laneSlots.get(k)[i] = !laneSlots.get(k)[i];
        }
        l.bitErrors = flips;
        // rising edges: one per period; in clock-stop mode a pause after each burst
        long[] slotLaunch = new long[total];
        long t = 1_000_000_000L;
        int slot = 0;
        List<Integer> burstEndSlot = new ArrayList<>();
        for (int b = 0; b < bursts0; b++) {
            int periods = (gapSlots[b] + burstSlots[b] + (b == 0 ? lead : 0)) / s;
            for (int p = 0; p < periods; p++) {
                rising.add(t);
                for (int j = 0; j < s; j++) {
                    double ph = launchPhase(l.clocking, j, s) + jitter / s * (r.nextDouble() * 2 - 1);
                    slotLaunch[slot++] = t + Math.round(ph * periodFs);
                }
                t += Math.round(periodFs);
            }
            burstEndSlot.add(slot);
            if (l.clockStops) {
                t += Math.round(periodFs * (20 + r.nextInt(40)));
            }
        }
        int skipPeriods = 0;
        if (l.midBurstStart) {
            skipPeriods = (lead + gapSlots[0]) / s + 1 + r.nextInt(Math.max(1, burstSlots[0] / s - 1));
        }
        int firstSlot = skipPeriods * s;
        long t0 = rising.get(skipPeriods) - Math.round(periodFs / 2);
        long[] rise = new long[rising.size() - skipPeriods];
        long[] fall = new long[rise.length];
        for (int i = 0; i < rise.length; i++) {
            rise[i] = rising.get(i + skipPeriods);
            fall[i] = rise[i] + Math.round(periodFs / 2);
        }
        boolean[] init = new boolean[n];
        long[][] le = new long[n][];
        int[] lc = new int[n];
        String[] names = new String[n];
        for (int k = 0; k < n; k++) {
            boolean[] v = laneSlots.get(k);
            long[] e = new long[total + 2 * bursts0 + 2];
            int m = 0;
            boolean level = firstSlot > 0 ? v[firstSlot - 1] : l.idleLevel;
            init[k] = level;
            int nextEnd = 0;
            for (int i = firstSlot; i < total; i++) {
                while (l.clockStops && nextEnd < burstEndSlot.size() && burstEndSlot.get(nextEnd) <= i) {
                    // clock paused: the lane went to its idle level one period after the last bit
                    if (level != l.idleLevel && i > firstSlot) {
                        long at = slotLaunch[burstEndSlot.get(nextEnd) - 1] + Math.round(periodFs);
                        if (at > t0 && at < slotLaunch[i]) {
                            e[m++] = at;
                            level = l.idleLevel;
                        }
                    }
                    nextEnd++;
                }
                if (v[i] != level && slotLaunch[i] > t0) {
                    e[m++] = slotLaunch[i];
                    level = v[i];
                } else if (v[i] != level) {
                    init[k] = v[i];
                    level = v[i];
                }
            }
            Arrays.sort(e, 0, m);
            le[k] = e;
            lc[k] = m;
            names[k] = "D" + k;
        }
        l.input = new LinkEdgesInput("CLK", rise, rise.length, fall, fall.length, names, init, le, lc);
    }

    /** Where slot j's bit is launched, as a fraction of the period after the rising edge that samples it (or its period). */
    private static double launchPhase(String clocking, int j, int s) {
        return switch (clocking) {
            case "single-edge-rising" -> -0.5;
            case "single-edge-falling" -> 0.0;
            case "double-edge" -> j == 0 ? -0.25 : 0.25;
            default -> j / (double) s;
        };
    }
}
