package org.lanesift.runner.output;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.BitStream;

/**
 * The run's outputs ask for the per-bit margins only when a selected writer reads them: the bits
 * CSV does, the packed binary form does not, and what the binary form writes does not depend on
 * them. A bits CSV handed bits without margins fails as a bug, never with empty columns.
 */
class BitMarginsOutputTest {
    private static final List<String> RESULTS = List.of("rx.bits0", "rx.bits1", "rx.report");

    @TempDir
    Path tmp;

    private boolean reads(List<String> names, String output) throws Exception {
        try (RunOutputs o = new RunOutputs(tmp.resolve("o" + java.util.Objects.hashCode(names) + output), "test", OutputSelection.of(names, RESULTS, List.of()))) {
            return o.readsBitMargins("rx", output);
        }
    }

    @Test
    void onlyASelectedBitsCsvReadsTheMargins() throws Exception {
        assertTrue(reads(null, "bits0"), "the standard forms include the bits CSV");
        assertTrue(reads(List.of("csv"), "bits0"));
        assertTrue(reads(List.of("binary", "csv"), "bits1"));
        assertFalse(reads(List.of("binary"), "bits0"), "the binary form has no margins");
        assertFalse(reads(List.of("binary", "vcd", "artifacts", "annotations"), "bits1"));
        assertFalse(reads(List.of("none"), "bits0"));
        assertFalse(reads(List.of("csv", "rx.bits0"), "bits1"), "an output left out is not written at all");
        assertTrue(reads(List.of("csv", "rx.bits0"), "bits0"));
    }

    private static BitStream withoutMargins(BitStream b) {
        return new BitStream(b.channel(), b.startFs(), b.endFs(), b.count(), b.values(), b.timesFs(), b.clockEdge(), b.falling(),
                b.slot(), null, null, b.flagged(), b.unitIntervalFs(), b.causes());
    }

    @Test
    void theBinaryFormIsTheSameWithOrWithoutMargins() throws Exception {
        List<BitStream> blocks = BitsBinaryRoundTripTest.randomBlocks(23, 1, 64, 65, 3000);
        Path with = tmp.resolve("with.bits");
        Path without = tmp.resolve("without.bits");
        try (BitsBinaryWriter a = new BitsBinaryWriter(with); BitsBinaryWriter b = new BitsBinaryWriter(without)) {
            for (BitStream s : blocks) {
                a.write(s);
                b.write(withoutMargins(s));
            }
        }
        assertArrayEquals(Files.readAllBytes(with), Files.readAllBytes(without));
        assertEquals(3130, BinaryOutputs.bits(without).count());
    }

    @Test
    void aBitsCsvHandedBitsWithoutMarginsFailsAsABug() throws Exception {
        BitStream bare = withoutMargins(BitsBinaryRoundTripTest.randomBlocks(5, 10).get(0));
        try (RunOutputs o = new RunOutputs(tmp.resolve("csv"), "test", OutputSelection.of(List.of("csv"), RESULTS, List.of()))) {
            IllegalStateException e = assertThrows(IllegalStateException.class, () -> o.accept("rx", "bits0", bare));
            assertTrue(e.getMessage().contains("carries no setup margins"), e.getMessage());
        }
    }
}
