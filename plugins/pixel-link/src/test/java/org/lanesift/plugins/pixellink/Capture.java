package org.lanesift.plugins.pixellink;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.data.BitStream;
import org.lanesift.data.FindingRef;
import org.lanesift.testkit.StageHarness;

/** Test helper: runs a synthetic link through the plugin alone, block by block. */
final class Capture {
    TestLink.Video video;
    TestLink.Image image = TestLink.PATTERN;
    String[][] table = TestLink.VESA24;
    int colourBits = 8;
    boolean reverse;
    boolean dual;
    long firstPixel;
    long pixels;
    double periodFs = 1e15 / 25.175e6;
    int blockClocks = 800;
    long flagClock = -1;
    /** Clock index after which the clock stops for stopFs (0 = never). */
    long stopAfterClock = -1;
    long stopFs;
    /** Whether the bits after the stop name a clock-dropout finding of a sampler as its cause, as dual-edge does. */
    boolean stopNamed;
    /** Lanes not pushed at all. */
    java.util.Set<String> silentLanes = java.util.Set.of();
    /** Optional re-cutting of each lane block (bit counts). */
    java.util.function.IntUnaryOperator recut;
    Map<String, Object> options = new HashMap<>();
    /** Relative change of the clock period per clock period (0 = steady clock). */
    double driftPerClock;
    /** Changes source words (pixel index, word) before serialising. */
    Hook hook;

    /** Rewrites one source word. */
    interface Hook {
        int word(long pixel, int w);
    }

    Capture(TestLink.Video v) {
        this.video = v;
    }

    StageHarness run() {
        Map<String, Object> opts = new HashMap<>(options);
        if (dual) {
            opts.put("dual", true);
        }
        StageHarness h = StageHarness.of(new PixelLinkPlugin(), opts);
        int perLink = table.length;
        List<String> names = TestLink.laneNames(perLink, dual);
        int ppc = dual ? 2 : 1;
        long clocks = pixels / ppc;
        long firstClock = firstPixel / ppc;
        for (long c = 0; c < clocks; c += blockClocks) {
            int n = (int) Math.min(blockClocks, clocks - c);
            int[] words = new int[n * ppc];
            for (int i = 0; i < n * ppc; i++) {
                long p = firstPixel + c * ppc + i;
                words[i] = TestLink.word(video, image, p);
                if (hook != null) {
                    words[i] = hook.word(p, words[i]);
                }
            }
            double per = periodFs;
            double drift = driftPerClock;
            List<BitStream> lanes = TestLink.serialise(words, n, firstClock + c, x -> per * (x + drift * x * x / 2), table,
                    colourBits, reverse, dual, flagClock, names);
            if (stopAfterClock >= 0) {
                lanes = lanes.stream().map(b -> shiftAfter(b, stopAfterClock, stopFs, stopNamed)).toList();
            }
            for (BitStream b : lanes) {
                if (silentLanes.contains(b.channel())) {
                    continue;
                }
                if (recut != null) {
                    for (BitStream piece : TestLink.split(b, recut)) {
                        h.push(b.channel(), piece);
                    }
                } else {
                    h.push(b.channel(), b);
                }
            }
        }
        h.finish();
        return h;
    }

    /**
     * The clock stops after a given clock period: later bit times move by a pause. When
     * {@code named}, the blocks with bits after the pause name the sampler's clock-dropout finding
     * over the pause (from the time the next clock period was due).
     */
    static BitStream shiftAfter(BitStream b, long clock, long pauseFs, boolean named) {
        long[] t = b.timesFs().clone();
        boolean any = false;
        long due = Long.MAX_VALUE;
        for (int i = 0; i < b.count(); i++) {
            if (b.clockEdge()[i] > clock) {
                due = Math.min(due, t[i]);
                t[i] += pauseFs;
                any = true;
            }
        }
        List<FindingRef> causes = !named || !any ? List.of()
                : List.of(new FindingRef("sampler", "clock-dropout", due, FindingRef.Effect.CLOCK_BREAK, due, due + pauseFs));
        long start = b.clockEdge()[0] > clock ? b.startFs() + pauseFs : b.startFs();
        long end = any ? b.endFs() + pauseFs : b.endFs();
        return new BitStream(b.channel(), start, end, b.count(), b.values(), t, b.clockEdge(), b.falling(), b.slot(), b.setupFs(),
                b.holdFs(), b.flagged(), b.unitIntervalFs(), causes);
    }

    /** Expected decoded picture of source frame f. */
    int[] expectedFrame(long f) {
        int w = video.hActive();
        int hgt = video.vActive();
        int[] out = new int[w * hgt];
        for (int y = 0; y < hgt; y++) {
            for (int x = 0; x < w; x++) {
                out[y * w + x] = TestLink.expected(image.rgb(f, x, y), colourBits);
            }
        }
        return out;
    }
}
