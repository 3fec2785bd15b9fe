package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.lanesift.json.JsonReader;

/**
 * One JSON policy: the same faulty text given as a chain file, as a raw capture's sidecar and as
 * a skew table is refused by the command line with exit code 2 and one stderr line that carries
 * the same "FILE line L column C at POINTER: what was expected" part in all three places.
 */
class JsonPolicyTest {
    @TempDir
    Path tmp;

    /** A fault, its text, and the part of the message every kind of file must show. */
    static Stream<Arguments> faults() {
        String deep = "{\"a\": " + "[".repeat(64) + "]".repeat(64) + "}";
        String huge = "{\"a\": \"" + "x".repeat(JsonReader.DEFAULT_MAX_BYTES) + "\"}";
        return Stream.of(
                Arguments.of("duplicate key", "{\"a\": 1,\n \"a\": 2}",
                        " line 2 column 2 at /a: member \"a\" appears twice; expected each name once in an object"),
                Arguments.of("trailing garbage", "{\"a\": 1}\n}",
                        " line 2 column 1 at the top level: expected the end of the file after the top-level value, found '}'"),
                Arguments.of("too deep", deep, " line 1 column 70 at /a" + "/0".repeat(63)
                        + ": nesting deeper than 64 levels; expected at most 64 objects and arrays inside one another"),
                Arguments.of("too large", huge,  " line 1 column 1 at the top level: the file has more than " + JsonReader.DEFAULT_MAX_BYTES
                        + " bytes; expected at most " + JsonReader.DEFAULT_MAX_BYTES + " bytes of JSON"));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("faults")
    void chainFileSidecarAndSkewTableAreRefusedAlike(String fault, String text, String shape) throws IOException {
        Files.writeString(tmp.resolve("pair.csv"), "time (s),P (V),N (V)\n0,1.3,1.1\n1e-9,1.1,1.3\n2e-9,1.3,1.1\n");
        Files.write(tmp.resolve("cap.bin"), new byte[4]);

        Path chain = Files.writeString(tmp.resolve("bad-chain.json"), text);
        Files.writeString(tmp.resolve("cap.bin.json"), text);
        Path raw = Files.writeString(tmp.resolve("raw.json"),
                "{\"nodes\": [{\"id\": \"cap\", \"plugin\": \"raw\", \"options\": {\"file\": \"cap.bin\"}}]}");
        Files.writeString(tmp.resolve("skew.json"), text);
        Path skew = Files.writeString(tmp.resolve("skew-chain.json"), """
                {"nodes": [{"id": "cap", "plugin": "csv", "options": {"file": "pair.csv"}},
                           {"id": "dsk", "plugin": "deskew", "options": {"offsetsFile": "%s"}}],
                 "wires": [{"from": "cap.P", "to": "dsk.in0"}]}
                """.formatted(tmp.resolve("skew.json").toString().replace("\\", "\\\\")));

        List<String> names = List.of("bad-chain.json", "cap.bin.json", "skew.json");
        List<Path> chains = List.of(chain, raw, skew);
        for (int i = 0; i < chains.size(); i++) {
            EndToEndTest.Cli r = EndToEndTest.cli("run", chains.get(i).toString(), "--out", tmp.resolve("out" + i).toString(), "-q");
            assertEquals(2, r.code(), () -> fault + ": " + r);
            assertEquals(1, r.errLines().size(), r::toString);
            String line = r.errLines().get(0);
            String want = names.get(i) + shape;
            assertTrue(line.contains(want), () -> fault + ": the line should contain '" + want + "': " + line);
            assertTrue(line.length() < 600, () -> "one short line: " + line.length());
        }
    }
}
