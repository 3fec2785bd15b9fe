package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitStream;
import org.lanesift.data.WordStream;
import org.lanesift.plugin.OptionException;
import org.lanesift.testkit.StageHarness;

/** The generic framed profile on an invented continuous two-lane link (no line states). */
class FramedLinkTest {
    static final int SYNC = 0x2D4;
    static final int SYNC_BITS = 10;
    static final int WORD = 12;
    static final int GROUP = 6;

    /** Lane bit streams: 37 zero bits, then records of sync + GROUP words per lane, MSB first; values[lane][record][word]. */
    static BitStream lane(int k, int[][] words, int tailBits) {
        List<Boolean> b = new ArrayList<>();
        for (int i = 0; i < 37 + k; i++) {
            b.add(false);
        }
        for (int[] rec : words) {
            for (int j = SYNC_BITS - 1; j >= 0; j--) {
                b.add((SYNC >> j & 1) != 0);
            }
            for (int w : rec) {
                for (int j = WORD - 1; j >= 0; j--) {
                    b.add((w >> j & 1) != 0);
                }
            }
        }
        for (int i = 0; i < tailBits; i++) {
            b.add(true);
        }
        long[] t = new long[b.size()];
        boolean[] v = new boolean[b.size()];
        for (int i = 0; i < t.length; i++) {
            t[i] = 1000 + i * LinkSynth.UI_FS;
            v[i] = b.get(i);
        }
        return LinkSynth.stream("bits" + k, t, v, 0, t.length, 0, t[t.length - 1] + LinkSynth.UI_FS);
    }

    @Test
    void groupedMsbFirstTwoLanesDecodeExactly() {
        Random r = new Random(5);
        int records = 4;
        int[][][] w = new int[2][records][GROUP];
        for (int k = 0; k < 2; k++) {
            for (int rec = 0; rec < records; rec++) {
                for (int i = 0; i < GROUP; i++) {
                    w[k][rec][i] = r.nextInt(1 << WORD);
                }
            }
        }
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("profile", "framed", "lanes", 2, "lpStates", false,
                "syncPattern", "2D4", "syncBits", SYNC_BITS, "wordBits", WORD, "bitOrder", "msb", "groupWords", GROUP));
        BitStream[] l0 = LinkSynth.cut(lane(0, w[0], 5), 90_000_000L);
        BitStream[] l1 = LinkSynth.cut(lane(1, w[1], 5), 40_000_000L);
        h.push("bits0", l0[0]).push("bits1", l1[0]).push("bits1", l1[1]).push("bits0", l0[1]).finish();
        List<Long> got = new ArrayList<>();
        List<Integer> lanes = new ArrayList<>();
        for (WordStream s : h.outputs("packets", WordStream.class)) {
            assertEquals(WORD, s.widthBits());
            for (int i = 0; i < s.count(); i++) {
                got.add(s.values()[i]);
                lanes.add(s.lane()[i]);
            }
        }
        List<Long> want = new ArrayList<>();
        for (int rec = 0; rec < records; rec++) {
            for (int i = 0; i < 2 * GROUP; i++) {
                want.add((long) w[i % 2][rec][i / 2]);
            }
        }
        assertEquals(want, got);
        assertEquals(0, lanes.get(0));
        assertEquals(1, lanes.get(1));
        assertEquals(records, h.annotations("word-group").size());
        assertEquals(2, h.annotations("trailing-bits").size());
        String csv = new String(h.outputs("files", Artifact.class).get(0).content(), StandardCharsets.UTF_8);
        assertEquals(1 + records * 2 * GROUP, csv.split("\n").length);
        assertTrue(csv.split("\n")[1].endsWith(String.format(",0,0,0,%03X,4", w[0][0][0])), csv.split("\n")[1]);
    }

    @Test
    void ungroupedLsbContinuousStreamOnOneLane() {
        int[] words = {0x0A5, 0x1FF, 0x000, 0x123, 0x0F0};
        List<Boolean> b = new ArrayList<>();
        for (int x : new int[] {0, 1, 1, 0}) {
            b.add(x == 1);
        }
        for (int j = 0; j < 8; j++) {
            b.add((0xB8 >> j & 1) != 0);
        }
        for (int x : words) {
            for (int j = 0; j < 9; j++) {
                b.add((x >> j & 1) != 0);
            }
        }
        long[] t = new long[b.size()];
        boolean[] v = new boolean[b.size()];
        for (int i = 0; i < t.length; i++) {
            t[i] = i * LinkSynth.UI_FS;
            v[i] = b.get(i);
        }
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("profile", "framed", "lpStates", false, "wordBits", 9));
        BitStream all = LinkSynth.stream("bits0", t, v, 0, t.length, 0, t[t.length - 1] + 1);
        for (BitStream piece : LinkSynth.cut(all, 17 * LinkSynth.UI_FS)) {
            h.push("bits0", piece);
        }
        h.finish();
        List<Long> got = new ArrayList<>();
        h.outputs("packets", WordStream.class).forEach(s -> {
            for (int i = 0; i < s.count(); i++) {
                got.add(s.values()[i]);
            }
        });
        assertEquals(List.of(0x0A5L, 0x1FFL, 0x000L, 0x123L, 0x0F0L), got);
        assertEquals(1, h.annotations("framed-sync").size());
    }

    // independent lanes with line states: each lane's burst is its own stream of 8-bit words after
    // its own sync byte, and the trail is dropped
    @Test
    void independentLanesWithLineStates() {
        LinkSynth s = new LinkSynth(2).idle(1_000_000_000L);
        byte[] sent = RefCodes.bytes(0x10, 0x20, 0x11, 0x21, 0x12, 0x22);
        s.hs(sent).idle(1_000_000_000L);
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("profile", "framed", "lanes", 2, "laneDistribution", "independent"));
        s.feed(h, 100, false);
        WordStream w = h.outputs("packets", WordStream.class).get(0);
        List<Long> got = new ArrayList<>();
        for (int i = 0; i < w.count(); i++) {
            got.add(w.values()[i]);
        }
        assertEquals(List.of(0x10L, 0x11L, 0x12L, 0x20L, 0x21L, 0x22L), got);
        assertEquals(List.of(0, 0, 0, 1, 1, 1), java.util.Arrays.stream(w.lane()).boxed().toList());
    }

    @Test
    void badOptionsNameTheOption() {
        OptionException e = org.junit.jupiter.api.Assertions.assertThrows(OptionException.class,
                () -> LinkConfig.of(new PacketLinkPlugin().descriptor(), org.lanesift.plugin.OptionValues.validate(
                        new PacketLinkPlugin().descriptor(), Map.of("profile", "framed", "syncPattern", "XYZ"))));
        assertEquals("syncPattern", e.option());
        OptionException d = org.junit.jupiter.api.Assertions.assertThrows(OptionException.class,
                () -> LinkConfig.of(new PacketLinkPlugin().descriptor(), org.lanesift.plugin.OptionValues.validate(
                        new PacketLinkPlugin().descriptor(), Map.of("profile", "dsi", "wordBits", 9))));
        assertEquals("wordBits", d.option());
        assertTrue(d.getMessage().contains("profile 'framed'"));
        OptionException z = org.junit.jupiter.api.Assertions.assertThrows(OptionException.class,
                () -> LinkConfig.of(new PacketLinkPlugin().descriptor(), org.lanesift.plugin.OptionValues.validate(
                        new PacketLinkPlugin().descriptor(), Map.of("profile", "framed", "syncPattern", "1FF", "syncBits", 8))));
        assertEquals("syncPattern", z.option());
    }
}
