package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.testkit.BitsKeeper;

/**
 * The sampler sends a lane's per-bit margins only when a receiver of that lane reads them
 * (host-api {@code StageContext.wantsBitMargins}), and nothing else it makes depends on it: with
 * one lane going to a receiver that reads margins and the other to one that does not, the reader
 * gets exactly the margins of a run where everyone gets them, the other gets none, and the bits,
 * flags, findings and report are those of that run. The links carry jitter, a clock glitch, a
 * dropout, an unknown span and, in one case, a lane skewed so far that its slot is ambiguous (a
 * judgement made from the margins themselves).
 */
class MarginsOnDemandTest {
    /** Each input is pushed in this many pieces, so the sampler emits many blocks and reuses its margin arrays. */
    private static final int PIECES = 12;
    /** Each input in one piece: the sampler's first block holds every bit of the link. */
    private static final int WHOLE = 1;

    private record Outcome(List<List<BitStream>> lanes, List<String> annotations, String report) {
    }

    /** Runs the sampler with lane k going to a receiver that reads margins when {@code reads[k]}. */
    private static Outcome run(Map<String, Object> options, int parts, Edges[] in, boolean... reads) {
        PluginRegistry reg = new PluginRegistry().add(new DualEdgePlugin());
        BitsKeeper[] keepers = new BitsKeeper[reads.length];
        ChainBuilder b = Chain.builder(reg).add("rx", DualEdgePlugin.ID, options);
        b.input("c", DataKind.EDGES).wire("c", "rx.clock");
        for (int k = 0; k < reads.length; k++) {
            keepers[k] = new BitsKeeper("test.lane" + k, reads[k]);
            reg.add(keepers[k]);
            b.input("d" + k, DataKind.EDGES).wire("d" + k, "rx.lane" + k).add("k" + k, "test.lane" + k).wire("rx.bits" + k, "k" + k + ".in");
        }
        List<String> notes = new ArrayList<>();
        String[] report = new String[1];
        b.annotations((src, a) -> notes.add(src + " " + a));
        b.outputs((id, port, blk) -> report[0] = new String(((Artifact) blk).content(), StandardCharsets.UTF_8));
        List<List<Edges>> pieces = new ArrayList<>();
        for (Edges e : in) {
            long[] cuts = new long[parts - 1];
            for (int j = 1; j < parts; j++) {
                cuts[j - 1] = e.startFs() + (e.endFs() - e.startFs()) / parts * j;
            }
            pieces.add(Run.cut(e, cuts));
        }
        try (Chain c = b.build()) {
            for (int j = 0; j < parts; j++) {
                c.push("c", pieces.get(0).get(j));
                for (int k = 0; k < reads.length; k++) {
                    c.push("d" + k, pieces.get(k + 1).get(j));
                }
            }
            c.finish();
        }
        List<List<BitStream>> lanes = new ArrayList<>();
        for (BitsKeeper k : keepers) {
            lanes.add(k.kept());
        }
        return new Outcome(lanes, notes, report[0]);
    }

    /** Everything of one lane but its margins, bit by bit. */
    private static String bits(List<BitStream> blocks) {
        StringBuilder sb = new StringBuilder();
        for (BitStream b : blocks) {
            sb.append(b.channel()).append(' ').append(b.startFs()).append(' ').append(b.endFs()).append(' ').append(b.unitIntervalFs())
                    .append(' ').append(b.causes()).append('\n');
            for (int i = 0; i < b.count(); i++) {
                sb.append(b.bit(i) ? '1' : '0').append(b.timesFs()[i]).append(',').append(b.clockEdge()[i]).append(',')
                        .append(BitSets.get(b.falling(), i) ? 'f' : 'r').append(b.slotOf(i)).append(b.isFlagged(i) ? '!' : '.');
            }
            sb.append('\n');
        }
        return sb.toString();
    }

    private static String margins(List<BitStream> blocks) {
        StringBuilder sb = new StringBuilder();
        for (BitStream b : blocks) {
            sb.append(Arrays.toString(Arrays.copyOf(b.setupFs(), b.count()))).append(Arrays.toString(Arrays.copyOf(b.holdFs(), b.count())));
        }
        return sb.toString();
    }

    private static void check(Map<String, Object> options, int parts, Edges[] in) {
        int lanes = in.length - 1;
        boolean[] yes = new boolean[lanes];
        boolean[] alternate = new boolean[lanes];
        for (int k = 0; k < lanes; k++) {
            yes[k] = true;
            alternate[k] = k % 2 == 0;
        }
        Outcome all = run(options, parts, in, yes);
        Outcome mixed = run(options, parts, in, alternate);
        Outcome none = run(options, parts, in, new boolean[lanes]);
        assertNotNull(all.report());
        for (int k = 0; k < lanes; k++) {
            List<BitStream> a = all.lanes().get(k);
            // cut inputs give several blocks (the first holds the first min(searchBits, 8192) points), so the reused margin arrays are crossed
            assertTrue(parts == 1 || a.size() > parts / 2, "lane " + k + ": a block per piece or so, got " + a.size());
            assertTrue(a.stream().allMatch(BitStream::hasMargins), "lane " + k + ": its receiver reads them");
            assertTrue(none.lanes().get(k).stream().noneMatch(BitStream::hasMargins), "nobody reads lane " + k + "'s margins");
            assertEquals(bits(a), bits(mixed.lanes().get(k)), "lane " + k);
            assertEquals(bits(a), bits(none.lanes().get(k)), "lane " + k);
            if (alternate[k]) {
                assertTrue(mixed.lanes().get(k).stream().allMatch(BitStream::hasMargins), "lane " + k + "'s receiver reads them");
                assertEquals(margins(a), margins(mixed.lanes().get(k)), "lane " + k);
            } else {
                assertTrue(mixed.lanes().get(k).stream().noneMatch(BitStream::hasMargins), "lane " + k + "'s receiver does not");
            }
        }
        assertEquals(all.annotations(), mixed.annotations());
        assertEquals(all.annotations(), none.annotations());
        assertEquals(all.report(), mixed.report());
        assertEquals(all.report(), none.report());
    }

    @Test
    void ddrMarginsOnlyWhereRead() {
        Edges[] in = SplitInvarianceTest.ddrLink();
        Outcome all = run(Map.of("lanes", 2, "searchBits", 300), PIECES, in, true, true);
        assertTrue(all.annotations().stream().anyMatch(a -> a.contains("margin-low")), "flagged runs are annotated");
        check(Map.of("lanes", 2, "searchBits", 300), PIECES, in);
        check(Map.of("lanes", 2, "autoPhase", false, "searchBits", 300), PIECES, in);
        check(Map.of("lanes", 2, "searchBits", 300), WHOLE, in);
    }

    @Test
    void multipliedMarginsOnlyWhereRead() {
        check(Map.of("lanes", 2, "mode", "multiplied", "searchBits", 300), PIECES, SplitInvarianceTest.sevenLink());
    }

    @Test
    void aLaneWhoseSlotIsAmbiguousIsJudgedTheSameWithoutItsMarginsSent() {
        // the judgement is made from the margins of the lane's first bits (DualEdgeStage.judgeLaneSkew)
        LinkSim sim = DecodableCaptureTest.link(0.61);
        Edges[] in = {sim.clock(), sim.lane(0), sim.lane(1), sim.lane(2)};
        Outcome all = run(DecodableCaptureTest.SEVEN, WHOLE, in, true, true, true);
        assertEquals(1, all.annotations().stream().filter(a -> a.contains("lane-skew-ambiguous")).count(), all.annotations().toString());
        check(DecodableCaptureTest.SEVEN, WHOLE, in);
    }
}
