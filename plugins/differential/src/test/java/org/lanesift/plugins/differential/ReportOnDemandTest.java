package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.chain.BlockSink;
import org.lanesift.chain.Chain;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.plugin.PluginRegistry;

/**
 * The level report ({@code report} output) is made only when something reads it. Skipping it is
 * invisible from outside except in time, so this checks what must not change: a host sink that does
 * not want the report gets none, and the edges and every annotation (level checks and the level
 * summary, made in the same finishing step) are the same as when the report is made.
 */
class ReportOnDemandTest {
    /** What one run gave. */
    private record Run(List<Artifact> reports, List<String> notes, long[] edgeTimes) {
    }

    private static Run run(boolean wantReport) {
        PluginRegistry reg = PluginRegistry.discover(ReportOnDemandTest.class.getClassLoader());
        List<Artifact> reports = new ArrayList<>();
        List<Block> edges = new ArrayList<>();
        List<String> notes = new ArrayList<>();
        BlockSink sink = new BlockSink() {
            @Override
            public void accept(String instanceId, String output, Block block) {
                if (block instanceof Artifact a) {
                    reports.add(a);
                } else if (block instanceof Edges) {
                    edges.add(block);
                }
            }

            @Override
            public boolean wants(String instanceId, String output) {
                return wantReport || !"report".equals(output);
            }
        };
        Chain c = Chain.builder(reg)
                .input("p", DataKind.ANALOG).input("n", DataKind.ANALOG)
                .add("rx0", "differential", Map.of("mode", "pair", "name", "lane0"))
                .wire("p", "rx0.p").wire("n", "rx0.n")
                .outputs(sink)
                .annotations((src, a) -> notes.add(src + ":" + a.kind() + ":" + a.label()))
                .build();
        ChainAndOptionsTest.pushLegs(c, ChainAndOptionsTest.legs());
        return new Run(reports, notes, TestSignals.times(edges.stream().map(Edges.class::cast).toList()));
    }

    @Test
    void aHostThatDoesNotWantTheReportGetsNoneAndEverythingElseIsTheSame() {
        Run with = run(true);
        Run without = run(false);
        assertEquals(1, with.reports().size(), "a host that wants the report gets it");
        assertEquals("rx0-levels.json", with.reports().get(0).fileName());
        assertTrue(without.reports().isEmpty(), "a host that does not want the report gets none");
        assertTrue(with.edgeTimes().length > 1000, "edges came out: " + with.edgeTimes().length);
        assertArrayEquals(with.edgeTimes(), without.edgeTimes(), "the same edges");
        assertEquals(with.notes(), without.notes(), "the same annotations");
        assertFalse(with.notes().stream().noneMatch(n -> n.startsWith("rx0:level-summary")), "the level summary is still annotated");
    }
}
