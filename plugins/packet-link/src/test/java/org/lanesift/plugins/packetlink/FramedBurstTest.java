package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.lanesift.data.BitStream;
import org.lanesift.data.WordStream;
import org.lanesift.testkit.StageHarness;

/**
 * The framed profile on burst links without line states: the clock stops between bursts
 * ({@code burstGap}), the lanes idle at one level ({@code idleBits}), or the bursts follow each
 * other with no pause at all and only their sync marks them ({@code syncRestart}); every burst has
 * its own sync and its own length, and every burst must come out whole wherever the blocks are cut.
 */
class FramedBurstTest {
    private static final int SYNC = 0xB8; // LSB first: 0 0 0 1 1 1 0 1, begins with idle-level bits
    /** A 24-bit sync for the links cut at their syncs (invented; long enough to stand out of the data). */
    private static final int LONG_SYNC = 0x5A3C96;

    /** The four kinds of burst link. */
    enum Kind {
        /** The clock stops between bursts. */
        CLOCK_STOPS,
        /** The clock runs on through idle runs of zeros between bursts. */
        IDLE_RUNS,
        /** Bursts back to back, the sync repeated at each. */
        STREAMING,
        /** Streaming, some syncs with one or two wrong bits, the capture starting inside the first burst. */
        STREAMING_DAMAGED,
        /** Streaming, and between some bursts the sync sent over and over as a filler (up to 400 times). */
        STREAMING_FILLER
    }

    /** One lane: bursts of sync + words LSB first; between bursts a pause or an idle run of zeros, or nothing. */
    private static BitStream lane(int k, List<int[]> bursts, int wordBits, Kind kind, int sync, int syncBits, int idleRun) {
        List<Boolean> v = new ArrayList<>();
        List<Long> t = new ArrayList<>();
        long now = 5_000_000L;
        boolean idles = kind == Kind.IDLE_RUNS;
        for (int b = 0; b < bursts.size(); b++) {
            int[] words = bursts.get(b);
            if (kind == Kind.CLOCK_STOPS) {
                now += 400 * LinkSynth.UI_FS;
            } else if (idles) {
                for (int i = 0; i < idleRun; i++) {
                    v.add(false);
                    t.add(now);
                    now += LinkSynth.UI_FS;
                }
            }
            int damage = kind == Kind.STREAMING_DAMAGED && b % 2 == k ? (b % 5 == 2 ? 0b1 : b % 5 == 4 ? 0b100000010000 : 0) : 0;
            int fillers = kind == Kind.STREAMING_FILLER && b % 3 == 1 ? b * 37 % 400 : 0;
            for (int j = 0; j < syncBits * (1 + fillers); j++) {
                v.add(((sync ^ damage) >> (j % syncBits) & 1) != 0);
                t.add(now);
                now += LinkSynth.UI_FS;
            }
            for (int q = k; q < words.length; q += 2) {
                for (int j = 0; j < wordBits; j++) {
                    v.add((words[q] >> j & 1) != 0);
                    t.add(now);
                    now += LinkSynth.UI_FS;
                }
            }
        }
        for (int i = 0; i < (idles ? idleRun : 0); i++) {
            v.add(false);
            t.add(now);
            now += LinkSynth.UI_FS;
        }
        // a capture that starts inside the first burst, after its sync
        int from = kind == Kind.STREAMING_DAMAGED ? syncBits + 3 * wordBits + 5 : 0;
        long[] ta = t.stream().mapToLong(Long::longValue).toArray();
        boolean[] va = new boolean[v.size()];
        for (int i = 0; i < va.length; i++) {
            va[i] = v.get(i);
        }
        return LinkSynth.stream("bits" + k, ta, va, from, ta.length, ta[from], now);
    }

    private static List<int[]> bursts(int wordBits, int count) {
        Random r = new Random(20);
        List<int[]> bursts = new ArrayList<>();
        for (int b = 0; b < count; b++) {
            int[] w = new int[2 * (1 + r.nextInt(30))];
            for (int q = 0; q < w.length; q++) {
                // the last word ends in a 1 so its end is visible against the idle level
                w[q] = r.nextInt(1 << wordBits) | (q >= w.length - 2 ? 1 << (wordBits - 1) : 0);
            }
            bursts.add(w);
        }
        return bursts;
    }

    @ParameterizedTest(name = "clock stops {0}, cut every {1} UI")
    @CsvSource({"true, 37", "true, 5000", "false, 41", "false, 3000"})
    void everyBurstOfEveryLengthComesOutWhole(boolean clockStops, int cutUi) {
        int wordBits = 10;
        List<int[]> bursts = bursts(wordBits, 40);
        Map<String, Object> opts = clockStops
                ? Map.of("profile", "framed", "lanes", 2, "lpStates", false, "wordBits", wordBits, "burstGap", "100ns", "dropTrail", false)
                : Map.of("profile", "framed", "lanes", 2, "lpStates", false, "wordBits", wordBits, "idleBits", 40, "dropTrail", false);
        Kind kind = clockStops ? Kind.CLOCK_STOPS : Kind.IDLE_RUNS;
        StageHarness h = run(opts, lane(0, bursts, wordBits, kind, SYNC, 8, 60), lane(1, bursts, wordBits, kind, SYNC, 8, 60), cutUi);
        assertWhole(h, bursts, 0);
    }

    /**
     * {@code syncRestart} on each kind of burst link: at every burst boundary (pause or idle run)
     * and at every sync on a word boundary the word alignment starts over, so every burst comes
     * out whole; on the damaged stream with {@code syncErrors = 2} too, apart from the first
     * burst, whose sync the capture missed.
     */
    @ParameterizedTest(name = "{0}, cut every {1} UI")
    @CsvSource({"CLOCK_STOPS, 37", "CLOCK_STOPS, 5000", "IDLE_RUNS, 41", "IDLE_RUNS, 3000", "STREAMING, 43", "STREAMING, 4000",
            "STREAMING_DAMAGED, 29", "STREAMING_DAMAGED, 2500", "STREAMING_FILLER, 31", "STREAMING_FILLER, 30000"})
    void syncRestartGivesEveryBurstWholeOnEveryKindOfLink(Kind kind, int cutUi) {
        int wordBits = 10;
        List<int[]> bursts = bursts(wordBits, 60);
        Map<String, Object> opts = new java.util.HashMap<>(Map.of("profile", "framed", "lanes", 2, "lpStates", false,
                "wordBits", wordBits, "dropTrail", false, "syncRestart", true, "syncPattern", Integer.toHexString(LONG_SYNC), "syncBits", 24));
        switch (kind) {
            case CLOCK_STOPS -> opts.put("burstGap", "100ns");
            case IDLE_RUNS -> opts.put("idleBits", 40);
            case STREAMING_DAMAGED -> opts.put("syncErrors", 2);
            default -> { }
        }
        StageHarness h = run(opts, lane(0, bursts, wordBits, kind, LONG_SYNC, 24, 60), lane(1, bursts, wordBits, kind, LONG_SYNC, 24, 60),
                cutUi);
        assertWhole(h, bursts, kind == Kind.STREAMING_DAMAGED ? 1 : 0);
    }

    /** Without syncRestart a streaming link is one endless word stream: the bursts of other lengths are not cut. */
    @org.junit.jupiter.api.Test
    void withoutSyncRestartAStreamIsOneRunOfWords() {
        int wordBits = 10;
        List<int[]> bursts = bursts(wordBits, 10);
        Map<String, Object> opts = Map.of("profile", "framed", "lanes", 2, "lpStates", false, "wordBits", wordBits, "dropTrail", false,
                "syncPattern", Integer.toHexString(LONG_SYNC), "syncBits", 24);
        StageHarness h = run(opts, lane(0, bursts, wordBits, Kind.STREAMING, LONG_SYNC, 24, 0),
                lane(1, bursts, wordBits, Kind.STREAMING, LONG_SYNC, 24, 0), 100000);
        assertEquals(0, h.annotations("hs-burst").size());
    }

    @org.junit.jupiter.api.Test
    void syncRestartNeedsASyncAndNoLineStates() {
        assertRefused(Map.of("profile", "framed", "syncRestart", true), "option 'syncRestart' cuts bursts of links without line states");
        assertRefused(Map.of("profile", "framed", "lpStates", false, "syncRestart", true, "syncPattern", "", "syncBits", 0),
                "option 'syncRestart' needs a sync pattern");
        assertRefused(Map.of("profile", "framed", "lpStates", false, "syncErrors", 2),
                "option 'syncErrors' (2) must be below a quarter of 'syncBits' (8)");
        assertRefused(Map.of("syncRestart", true), "option 'syncRestart' belongs to profile 'framed'");
    }

    private static void assertRefused(Map<String, Object> opts, String why) {
        org.lanesift.plugin.InputException e = org.junit.jupiter.api.Assertions.assertThrows(org.lanesift.plugin.InputException.class,
                () -> StageHarness.of(new PacketLinkPlugin(), opts));
        org.junit.jupiter.api.Assertions.assertTrue(e.getMessage().contains(why), e.getMessage());
    }

    private static StageHarness run(Map<String, Object> opts, BitStream l0, BitStream l1, int cutUi) {
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), opts);
        List<BitStream> p0 = pieces(l0, cutUi * LinkSynth.UI_FS);
        List<BitStream> p1 = pieces(l1, cutUi * LinkSynth.UI_FS);
        for (int i = 0; i < Math.max(p0.size(), p1.size()); i++) {
            if (i < p0.size()) {
                h.push("bits0", p0.get(i));
            }
            if (i < p1.size()) {
                h.push("bits1", p1.get(i));
            }
        }
        h.finish();
        return h;
    }

    /** Bursts {@code first..} came out, one word stream each, every word as sent. */
    private static void assertWhole(StageHarness h, List<int[]> bursts, int first) {
        List<WordStream> out = h.outputs("packets", WordStream.class);
        assertEquals(bursts.size() - first, out.size(), "one word stream per burst");
        assertEquals(bursts.size() - first, h.annotations("hs-burst").size());
        assertEquals(0, h.annotations("hs-sync-missing").size());
        for (int b = first; b < bursts.size(); b++) {
            WordStream s = out.get(b - first);
            long[] got = java.util.Arrays.copyOf(s.values(), s.count());
            long[] want = java.util.Arrays.stream(bursts.get(b)).asLongStream().toArray();
            org.junit.jupiter.api.Assertions.assertArrayEquals(want, got, "burst " + b);
        }
    }

    private static List<BitStream> pieces(BitStream s, long everyFs) {
        List<BitStream> out = new ArrayList<>();
        BitStream rest = s;
        long at = s.startFs() + everyFs;
        while (at < rest.endFs()) {
            BitStream[] two = LinkSynth.cut(rest, at);
            out.add(two[0]);
            rest = two[1];
            at += everyFs;
        }
        out.add(rest);
        return out;
    }
}
