package org.lanesift.runner.link;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.plugin.InputFormatException;
import org.lanesift.plugin.OptionException;
import org.lanesift.runner.capture.InspectReport;

class LinkPairsTest {
    static final Set<String> KNOWN = new LinkedHashSet<>(List.of("CH1", "CH2", "CH3", "CH4", "CH5", "CH6"));

    @Test
    void mapOptionKeepsTheOrderGivenAndRefusesBadEntries() {
        List<LinkChains.Pair> p = LinkPairs.parseOption(" CLK=CH3,CH4;D0=CH1,CH2  D1=CH6,CH5 ", KNOWN);
        assertEquals(List.of(new LinkChains.Pair("CLK", "CH3", "CH4"), new LinkChains.Pair("D0", "CH1", "CH2"),
                new LinkChains.Pair("D1", "CH6", "CH5")), p);
        assertEquals("--map CLK=CH3,CH4,CH5: expected NAME=P,N (a pair name, then the P and N channels), such as CLK=CH1,CH2,"
                + " or NAME=CH for one channel of a logic capture",
                assertThrows(OptionException.class, () -> LinkPairs.parseOption("CLK=CH3,CH4,CH5", KNOWN)).getMessage());
        // one channel: a lane of a logic capture (sift refuses it for a capture with analog legs)
        assertEquals(List.of(new LinkChains.Pair("CLK", "CH3", "")), LinkPairs.parseOption("CLK=CH3", KNOWN));
        assertEquals("--map D0=CH3,CH5: channel 'CH3' is already in pair CLK",
                assertThrows(OptionException.class, () -> LinkPairs.parseOption("CLK=CH3,CH4 D0=CH3,CH5", KNOWN)).getMessage());
        assertEquals("--map 0D=CH1,CH2: pair name '0D': expected a letter, then letters, digits or '_'",
                assertThrows(OptionException.class, () -> LinkPairs.parseOption("0D=CH1,CH2", KNOWN)).getMessage());
    }

    @Test
    void mapFileErrorsNameTheLine(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("m.map");
        Files.writeString(f, "# clock first\nCLK=CH1,CH2\n\nD0=CH3,CH7\n");
        List<LinkChains.Pair> into = new ArrayList<>();
        InputFormatException e = assertThrows(InputFormatException.class, () -> LinkPairs.parseFile(f, KNOWN, into));
        assertEquals(f + ":4: no channel 'CH7' in the capture (it has CH1, CH2, CH3, CH4, CH5, CH6)", e.getMessage());
        assertThrows(InputFormatException.class, () -> LinkPairs.parseFile(dir.resolve("absent.map"), KNOWN, new ArrayList<>()));
    }

    @Test
    void stemsDropOnlyAPOrNEnding() {
        assertEquals("D0", LinkPairs.stem("D0_P"));
        assertEquals("D0", LinkPairs.stem("D0N"));
        assertEquals("CLK", LinkPairs.stem("CLK+"));
        assertNull(LinkPairs.stem("CH1"));
    }

    static InspectReport.Channel analog(String name, double min, double max) {
        return new InspectReport.Channel(name, "ANALOG", "V", 1000L, 0L, null, null, null, 10L, null, 1e-6, 1e9, min, max,
                min, max, (min + max) / 2, 0.01, null, null);
    }

    @Test
    void findPutsTheClockPairFirstWithPFirstAndTheDataPairsInNameOrder() {
        List<InspectReport.Channel> ch = new ArrayList<>();
        for (String n : new String[] {"L1_P", "L1_N", "HCK_N", "HCK_P", "L0_P", "L0_N"}) {
            ch.add(analog(n, 0, 1.2));
        }
        InspectReport r = new InspectReport("c.csv", "csv", ch, List.of(new InspectReport.Pair("L1_N", "L1_P", 0.9, -0.9),
                new InspectReport.Pair("HCK_N", "HCK_P", -0.99, -0.99), new InspectReport.Pair("L0_P", "L0_N", 0.9, -0.9)),
                List.of(new InspectReport.Clock("HCK_P", 1e8, 0.001, "HCK_N")));
        assertEquals(List.of(new LinkChains.Pair("HCK", "HCK_P", "HCK_N"), new LinkChains.Pair("L0", "L0_P", "L0_N"),
                new LinkChains.Pair("L1", "L1_P", "L1_N")), LinkPairs.find(r));
        InspectReport noClock = new InspectReport("c.csv", "csv", ch, List.of(), List.of());
        InputFormatException e = assertThrows(InputFormatException.class, () -> LinkPairs.find(noClock));
        assertEquals(true, e.getMessage().startsWith("c.csv: found no differential pair that carries a regular clock"), e.getMessage());
    }
}
