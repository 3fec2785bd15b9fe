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
 * ({@code burstGap}) or the lanes idle at one level ({@code idleBits}); every burst has its own
 * sync and its own length, and every burst must come out whole wherever the blocks are cut.
 */
class FramedBurstTest {
    private static final int SYNC = 0xB8; // LSB first: 0 0 0 1 1 1 0 1, begins with idle-level bits

    /** One lane: bursts of sync + words LSB first; between bursts a pause or an idle run of zeros. */
    private static BitStream lane(int k, List<int[]> bursts, int wordBits, boolean clockStops, int idleRun) {
        List<Boolean> v = new ArrayList<>();
        List<Long> t = new ArrayList<>();
        long now = 5_000_000L;
        for (int[] words : bursts) {
            if (clockStops) {
                now += 400 * LinkSynth.UI_FS;
            } else {
                for (int i = 0; i < idleRun; i++) {
                    v.add(false);
                    t.add(now);
                    now += LinkSynth.UI_FS;
                }
            }
            for (int j = 0; j < 8; j++) {
                v.add((SYNC >> j & 1) != 0);
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
        for (int i = 0; i < (clockStops ? 0 : idleRun); i++) {
            v.add(false);
            t.add(now);
            now += LinkSynth.UI_FS;
        }
        long[] ta = t.stream().mapToLong(Long::longValue).toArray();
        boolean[] va = new boolean[v.size()];
        for (int i = 0; i < va.length; i++) {
            va[i] = v.get(i);
        }
        return LinkSynth.stream("bits" + k, ta, va, 0, ta.length, 0, now);
    }

    @ParameterizedTest(name = "clock stops {0}, cut every {1} UI")
    @CsvSource({"true, 37", "true, 5000", "false, 41", "false, 3000"})
    void everyBurstOfEveryLengthComesOutWhole(boolean clockStops, int cutUi) {
        Random r = new Random(20);
        int wordBits = 10;
        List<int[]> bursts = new ArrayList<>();
        for (int b = 0; b < 40; b++) {
            int[] w = new int[2 * (1 + r.nextInt(30))];
            for (int q = 0; q < w.length; q++) {
                // the last word ends in a 1 so its end is visible against the idle level
                w[q] = r.nextInt(1 << wordBits) | (q >= w.length - 2 ? 1 << (wordBits - 1) : 0);
            }
            bursts.add(w);
        }
        Map<String, Object> opts = clockStops
                ? Map.of("profile", "framed", "lanes", 2, "lpStates", false, "wordBits", wordBits, "burstGap", "100ns", "dropTrail", false)
                : Map.of("profile", "framed", "lanes", 2, "lpStates", false, "wordBits", wordBits, "idleBits", 40, "dropTrail", false);
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), opts);
        BitStream l0 = lane(0, bursts, wordBits, clockStops, 60);
        BitStream l1 = lane(1, bursts, wordBits, clockStops, 60);
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
        List<WordStream> out = h.outputs("packets", WordStream.class);
        assertEquals(bursts.size(), out.size(), "one word stream per burst");
        assertEquals(bursts.size(), h.annotations("hs-burst").size());
        assertEquals(0, h.annotations("hs-sync-missing").size());
        for (int b = 0; b < bursts.size(); b++) {
            WordStream s = out.get(b);
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
