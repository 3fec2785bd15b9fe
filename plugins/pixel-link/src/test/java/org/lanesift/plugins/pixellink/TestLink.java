package org.lanesift.plugins.pixellink;

import java.util.ArrayList;
import java.util.List;
import java.util.function.IntUnaryOperator;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;

/**
 * Test-only 7:1 serialiser: makes the bit streams a multiplied-clock sampler would deliver for a
 * video source, using its own copy of the slot tables (transcribed from docs/reference-facts.md#pixel-link-clock-and-slot-mappings), so
 * that the plugin's JSON tables are checked, not reused.
 *
 * <p>Source layout (common practice): each line starts at the HS leading edge: sync, back porch,
 * active, front porch; each frame starts at the VS leading edge (coincident with an HS leading
 * edge): sync lines, back porch lines, active lines, front porch lines.
 */
final class TestLink {
    // docs/reference-facts.md#pixel-link-clock-and-slot-mappings (JEIDA-59-1999, Open LVDS Display Interface 0.95, VESA Notebook Panel Standard 2007)
    static final String[][] VESA24 = {
        {"G0", "R5", "R4", "R3", "R2", "R1", "R0"},
        {"B1", "B0", "G5", "G4", "G3", "G2", "G1"},
        {"DE", "VS", "HS", "B5", "B4", "B3", "B2"},
        {"0", "B7", "B6", "G7", "G6", "R7", "R6"}};
    static final String[][] JEIDA24 = {
        {"G2", "R7", "R6", "R5", "R4", "R3", "R2"},
        {"B3", "B2", "G7", "G6", "G5", "G4", "G3"},
        {"DE", "VS", "HS", "B7", "B6", "B5", "B4"},
        {"0", "B1", "B0", "G1", "G0", "R1", "R0"}};
    static final String[][] BITS18 = {
        {"G0", "R5", "R4", "R3", "R2", "R1", "R0"},
        {"B1", "B0", "G5", "G4", "G3", "G2", "G1"},
        {"DE", "VS", "HS", "B5", "B4", "B3", "B2"}};

    /** Video timing in pixels and lines. */
    record Video(int hActive, int hFront, int hSync, int hBack, int vActive, int vFront, int vSync, int vBack,
                 boolean hsHigh, boolean vsHigh, boolean withSync) {
        int hTotal() {
            return hActive + hFront + hSync + hBack;
        }

        int vTotal() {
            return vActive + vFront + vSync + vBack;
        }

        long frameClocks() {
            return (long) hTotal() * vTotal();
        }
    }

    /** Image content of source frame f at (x, y), 0xRRGGBB. */
    interface Image {
        int rgb(long frame, int x, int y);
    }

    static final Image PATTERN = (f, x, y) -> {
        int r = (x * 7 + y * 3 + (int) f * 29) & 0xFF;
        int g = (x ^ (y * 5)) & 0xFF;
        int b = (x * y + (int) f * 11 + 0x40) & 0xFF;
        return r << 16 | g << 8 | b;
    };

    /** Source word at pixel index p: rgb | DE<<24 | HS<<25 | VS<<26 (levels as on the wire). */
    static int word(Video v, Image img, long p) {
        long fc = v.frameClocks();
        long f = Math.floorDiv(p, fc);
        long inFrame = p - f * fc;
        int ln = (int) (inFrame / v.hTotal());
        int h = (int) (inFrame % v.hTotal());
        boolean hs = h < v.hSync();
        boolean vs = ln < v.vSync();
        int ax = h - v.hSync() - v.hBack();
        int ay = ln - v.vSync() - v.vBack();
        boolean de = ax >= 0 && ax < v.hActive() && ay >= 0 && ay < v.vActive();
        int w = de ? img.rgb(f, ax, ay) : 0;
        if (de) {
            w |= 1 << 24;
        }
        if (v.withSync()) {
            if (hs == v.hsHigh()) {
                w |= 1 << 25;
            }
            if (vs == v.vsHigh()) {
                w |= 1 << 26;
            }
        }
        return w;
    }

    /** Bit of source word w that a slot name carries (8-bit colour; 6-bit tables take the top six). */
    static boolean bitOf(int w, String name, int colourBits) {
        switch (name) {
            case "0":
                return false;
            case "DE":
                return (w & (1 << 24)) != 0;
            case "HS":
                return (w & (1 << 25)) != 0;
            case "VS":
                return (w & (1 << 26)) != 0;
            default:
                break;
        }
        int shift = switch (name.charAt(0)) {
            case 'R' -> 16;
            case 'G' -> 8;
            default -> 0;
        };
        int k = name.charAt(1) - '0';
        int c = (w >>> shift) & 0xFF;
        if (colourBits == 6) {
            c >>= 2;
        }
        return ((c >>> k) & 1) != 0;
    }

    /** The colour a decoder should show for a source colour, given the table depth (18-bit: 6 bits replicated). */
    static int expected(int rgb, int colourBits) {
        if (colourBits == 8) {
            return rgb & 0xFFFFFF;
        }
        int out = 0;
        for (int sh = 0; sh <= 16; sh += 8) {
            int c6 = ((rgb >>> sh) & 0xFF) >> 2;
            out |= ((c6 << 2) | (c6 >> 4)) << sh;
        }
        return out;
    }

    /**
     * Serialises clocks into one bit stream per lane.
     *
     * @param words       per clock, the source word (for dual: words[2c] odd pixel, words[2c+1] even pixel)
     * @param clocks      number of clock periods
     * @param firstClock  clock index of the first
     * @param periodFs    pixel clock period
     * @param table       slot table
     * @param colourBits  6 or 8
     * @param reverse     send slots in reverse order
     * @param dual        two pixels per clock (odd lanes first, then even lanes)
     * @param flagClock   clock index whose bits are flagged, or -1
     * @param names       lane names
     * @return per lane, one stream
     */
    static List<BitStream> serialise(int[] words, int clocks, long firstClock, double periodFs, String[][] table, int colourBits,
                                     boolean reverse, boolean dual, long flagClock, List<String> names) {
        return serialise(words, clocks, firstClock, c -> c * periodFs, table, colourBits, reverse, dual, flagClock, names);
    }

    /** Time of the start of clock period c, fs (a real number of clock periods allowed). */
    interface ClockTime {
        double startFs(double c);
    }

    static List<BitStream> serialise(int[] words, int clocks, long firstClock, ClockTime ct, String[][] table, int colourBits,
                                     boolean reverse, boolean dual, long flagClock, List<String> names) {
        double periodFs = ct.startFs(firstClock + 1) - ct.startFs(firstClock);
        int perLink = table.length;
        int links = dual ? 2 : 1;
        List<BitStream> out = new ArrayList<>();
        for (int lane = 0; lane < perLink * links; lane++) {
            int link = lane / perLink;
            String[] slots = table[lane % perLink];
            int n = clocks * 7;
            long[] values = new long[BitSets.words(n)];
            long[] flagged = new long[BitSets.words(n)];
            long[] times = new long[n];
            long[] edges = new long[n];
            byte[] slot = new byte[n];
            long[] setup = new long[n];
            long[] hold = new long[n];
            double ui = periodFs / 7;
            for (int c = 0; c < clocks; c++) {
                int w = words[dual ? 2 * c + link : c];
                long clock = firstClock + c;
                for (int s = 0; s < 7; s++) {
                    int i = c * 7 + s;
                    String name = slots[reverse ? 6 - s : s];
                    if (bitOf(w, name, colourBits)) {
                        values[i >>> 6] |= 1L << i;
                    }
                    times[i] = Math.round(ct.startFs(clock + (s + 0.5) / 7.0));
                    edges[i] = clock;
                    slot[i] = (byte) s;
                    setup[i] = Math.round(ui / 2);
                    hold[i] = Math.round(ui / 2);
                    if (clock == flagClock) {
                        flagged[i >>> 6] |= 1L << i;
                    }
                }
            }
            long start = Math.round(ct.startFs(firstClock));
            long end = Math.round(ct.startFs(firstClock + clocks));
            out.add(new BitStream(names.get(lane), start, end, n, values, times, edges, new long[BitSets.words(n)], slot,
                    setup, hold, flagged, ui));
        }
        return out;
    }

    /** Copies bits [from, from + n) of a stream into a new stream. */
    static BitStream slice(BitStream b, int from, int n) {
        long[] values = new long[BitSets.words(n)];
        long[] flagged = new long[BitSets.words(n)];
        for (int i = 0; i < n; i++) {
            if (b.bit(from + i)) {
                values[i >>> 6] |= 1L << i;
            }
            if (b.isFlagged(from + i)) {
                flagged[i >>> 6] |= 1L << i;
            }
        }
        long[] times = java.util.Arrays.copyOfRange(b.timesFs(), from, from + n);
        long start = n == 0 ? b.startFs() : times[0];
        long end = from + n < b.count() ? b.timesFs()[from + n] : b.endFs();
        return new BitStream(b.channel(), Math.max(start, b.startFs()), Math.max(end, Math.max(start, b.startFs())), n, values,
                times, java.util.Arrays.copyOfRange(b.clockEdge(), from, from + n), new long[BitSets.words(n)],
                java.util.Arrays.copyOfRange(b.slot(), from, from + n), java.util.Arrays.copyOfRange(b.setupFs(), from, from + n),
                java.util.Arrays.copyOfRange(b.holdFs(), from, from + n), flagged, b.unitIntervalFs());
    }

    /** Cuts a stream into pieces of the given bit counts (cycled; the last takes the rest). */
    static List<BitStream> split(BitStream b, IntUnaryOperator sizeOfPiece) {
        List<BitStream> out = new ArrayList<>();
        int pos = 0;
        int k = 0;
        while (pos < b.count()) {
            int len = Math.min(Math.max(1, sizeOfPiece.applyAsInt(k++)), b.count() - pos);
            out.add(slice(b, pos, len));
            pos += len;
        }
        return out;
    }

    static List<String> laneNames(int perLink, boolean dual) {
        List<String> l = new ArrayList<>();
        for (int i = 0; i < perLink; i++) {
            l.add(dual ? "odd" + i : "lane" + i);
        }
        if (dual) {
            for (int i = 0; i < perLink; i++) {
                l.add("even" + i);
            }
        }
        return l;
    }
}
