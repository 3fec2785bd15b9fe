package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.lanesift.data.LogicBlock;

class PackedLogicReaderTest {
    @TempDir
    Path dir;

    /**
     * 16-bit words in either byte order, read in blocks that do not divide the file: every sample
     * of every named bit (of both bytes) is the bit of the word, and times follow the rate.
     */
    @ParameterizedTest
    @CsvSource({"logic16le, 100", "logic16be, 64", "logic16le, 5000"})
    void everyNamedBitOfEveryWordInEitherByteOrder(String format, int blockSamples) throws IOException {
        Random r = new Random(format.hashCode() + blockSamples);
        int n = 1234;
        int[] word = new int[n];
        byte[] b = new byte[2 * n];
        boolean le = format.endsWith("le");
        for (int i = 0; i < n; i++) {
            word[i] = r.nextInt(1 << 16);
            b[2 * i] = (byte) (le ? word[i] : word[i] >>> 8);
            b[2 * i + 1] = (byte) (le ? word[i] >>> 8 : word[i]);
        }
        Path f = dir.resolve("cap.bin");
        Files.write(f, b);
        Files.writeString(dir.resolve("cap.bin.json"), "{\"rateHz\": 2e8, \"format\": \"" + format + "\", \"startTimeS\": 1e-6,"
                + " \"channels\": [{\"name\": \"hi\", \"bit\": 13}, {\"name\": \"lo\", \"bit\": 2}, {\"name\": \"top\", \"bit\": 15}]}");
        int[] bits = {13, 2, 15};
        List<List<LogicBlock>> got = List.of(new ArrayList<>(), new ArrayList<>(), new ArrayList<>());
        try (PackedLogicReader rd = new PackedLogicReader(f, PackedLogicSidecar.read(dir.resolve("cap.bin.json")), blockSamples, false)) {
            assertEquals(n, rd.total());
            while (rd.next((c, blk) -> got.get(c).add((LogicBlock) blk))) {
                // collected
            }
        }
        for (int k = 0; k < 3; k++) {
            int i = 0;
            for (LogicBlock blk : got.get(k)) {
                assertEquals(i, blk.firstIndex());
                // 200 MS/s: 5 ns = 5e6 fs per sample, after the 1 us start
                assertEquals(1_000_000_000L + 5_000_000L * i, blk.startFs());
                for (int j = 0; j < blk.length(); j++, i++) {
                    assertEquals((word[i] >>> bits[k] & 1) != 0, blk.get(j), "sample " + i + " bit " + bits[k]);
                }
            }
            assertEquals(n, i);
        }
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
        "{\"rateHz\": 1e6, \"format\": \"logic8\", \"channels\": [{\"name\": \"a\", \"bit\": 8}]}"
                + "|/channels/0/bit: expected a whole number from 0 to 7 (the bit of the logic8 word), found 8",
        "{\"rateHz\": 1e6, \"format\": \"logic8\", \"channels\": [{\"name\": \"a\", \"bit\": 1}, {\"name\": \"b\", \"bit\": 1}]}"
                + "|/channels/1/bit: bit 1 is already named by another channel",
        "{\"rateHz\": 0, \"format\": \"logic8\", \"channels\": [{\"name\": \"a\", \"bit\": 1}]}"
                + "|/rateHz: expected a positive number of samples per second, found 0",
        "{\"rateHz\": 1e6, \"format\": \"logic8\", \"channels\": [{\"name\": \"a\", \"bit\": 1, \"gain\": 2}]}"
                + "|/channels/0/gain: unknown field; expected one of bit, name"})
    void badSidecarsNameTheFieldAndWhatWasExpected(String json, String message) throws IOException {
        Path s = dir.resolve("x.bin.json");
        Files.writeString(s, json);
        CaptureFormatException e = assertThrows(CaptureFormatException.class, () -> PackedLogicSidecar.read(s));
        assertEquals("x.bin.json: " + message, e.getMessage());
        assertTrue(PackedLogicSidecar.declaresPacked(s), "the format alone marks the capture as packed logic");
    }
}
