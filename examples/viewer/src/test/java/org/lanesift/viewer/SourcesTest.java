package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.ChainSpec;
import org.lanesift.plugin.InputFormatException;

/** The viewer picks a capture's reader by host-api's one rule (extension, then content). */
class SourcesTest {
    @TempDir
    Path dir;

    @Test
    void aCaptureWithAnUnknownExtensionIsPlacedByItsContent() throws Exception {
        Path csv = Files.writeString(dir.resolve("bench-log.export"), "t,a\n0,1\n");
        ChainSpec s = Sources.captureOnly(csv);
        assertEquals(1, s.nodes().size());
        assertEquals("csv", s.nodes().get(0).plugin());
        assertEquals(csv.toAbsolutePath().toString(), s.nodes().get(0).options().get("file"));

        Path vcd = Files.writeString(dir.resolve("dump.out"), "\n$timescale 1ns $end\n");
        assertEquals("vcd", Sources.captureOnly(vcd).nodes().get(0).plugin());
    }

    @Test
    void theSourceNodeTakesTheOpenedCaptureAndItsReader() throws Exception {
        Path vcd = Files.writeString(dir.resolve("lane.vcd"), "$timescale 1ns $end\n");
        ChainSpec chain = new ChainSpec(List.of(
                new ChainSpec.Node("src", "csv", Map.of("file", "old.csv", "separator", ";")),
                new ChainSpec.Node("rx", "differential", Map.of())),
                List.of(new ChainSpec.Wire("src.ch0", "rx.in")));
        ChainSpec bound = Sources.withCapture(chain, vcd);
        ChainSpec.Node src = bound.nodes().get(0);
        assertEquals("vcd", src.plugin());
        assertEquals(Map.of("file", vcd.toAbsolutePath().toString()), src.options(), "the csv reader's separator is dropped");
        assertEquals(chain.nodes().get(1), bound.nodes().get(1));
    }

    @Test
    void aCaptureThatCannotBePlacedNamesTheFileAndTheKnownExtensions() throws Exception {
        Path odd = Files.write(dir.resolve("mystery.xyz"), new byte[] {0, 1, 2, 3});
        InputFormatException e = assertThrows(InputFormatException.class, () -> Sources.captureOnly(odd));
        assertTrue(e.getMessage().startsWith("mystery.xyz: cannot tell the capture format; known extensions: .csv"), e.getMessage());
        InputFormatException gone = assertThrows(InputFormatException.class, () -> Sources.captureOnly(dir.resolve("gone.csv")));
        assertEquals("gone.csv: file not found", gone.getMessage());
    }
}
