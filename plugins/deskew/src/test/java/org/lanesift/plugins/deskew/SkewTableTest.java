package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.StringLength;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class SkewTableTest {

    @Property(tries = 100)
    void writeThenReadGivesTheSameTable(@ForAll @StringLength(min = 1, max = 12) String name,
                                        @ForAll @DoubleRange(min = -1e6, max = 1e6) double offsetPs,
                                        @ForAll @DoubleRange(min = 0, max = 1) double conf) {
        SkewTable t = new SkewTable("clock", List.of(new SkewTable.Entry("clk", 0, 1, "reference", 0),
                new SkewTable.Entry(name.equals("clk") ? "x" : name, offsetPs, conf, "clock-edge", 1234)));
        SkewTable back = SkewTable.parse("t.json", t.toJson());
        assertEquals("clock", back.mode());
        assertEquals(2, back.entries().size());
        SkewTable.Entry e = back.entries().get(1);
        assertEquals(t.entries().get(1).name(), e.name());
        assertEquals(offsetPs, e.offsetPs(), 0.0005 + 1e-12 * Math.abs(offsetPs));
        assertEquals(conf, e.confidence(), 0.0005);
        assertEquals("clock-edge", e.method());
        assertEquals(1234, e.edges());
    }

    @Test
    void aHandWrittenTableNeedsOnlyOffsets(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("probes.json");
        Files.writeString(f, "{\"format\":\"lanesift-skew-table\",\"version\":1,\"channels\":{\"d0p\":{\"offsetPs\":-12.5},"
                + "\"d0n\":{\"offsetPs\":30, \"note\":\"longer cable\"}}}");
        SkewTable t = SkewTable.read(f);
        assertEquals(-12.5, t.get("d0p").offsetPs());
        assertEquals(30.0, t.get("d0n").offsetPs());
        assertEquals("manual", t.get("d0n").method());
        assertEquals(1.0, t.get("d0n").confidence());
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
        "{\"format\":\"other\",\"version\":1,\"channels\":{}}|t.json: /format must be \"lanesift-skew-table\"",
        "{\"format\":\"lanesift-skew-table\",\"version\":2,\"channels\":{}}|/version must be 1",
        "{\"format\":\"lanesift-skew-table\",\"version\":1}|/channels must be an object",
        "{\"format\":\"lanesift-skew-table\",\"version\":1,\"channels\":{\"a\":{\"offsetPs\":\"3\"}}}|/channels/a/offsetPs must be a number",
        "{\"format\":\"lanesift-skew-table\",\"version\":1,\"channels\":{\"a\":{\"offsetPs\":3,\"confidence\":2}}}|/channels/a/confidence must be a number from 0 to 1",
        "{\"format\":\"lanesift-skew-table\",\"version\":1,\"channels\":{\"a/b\":5}}|/channels/a~1b must be an object",
        "{\"format\":\"lanesift-skew-table\",\"version\":1,\"channels\":{\"a\":{\"offsetPs\":1},\"a\":{\"offsetPs\":2}}}|member \"a\" appears twice",
        "[1,2]|expected a JSON object at the top level",
        "{\"format\":\"lanesift-skew-table\",\"version\":1,\"channels\":{\"a\":{\"offsetPs\":01}}}|malformed number '01'",
        "|unexpected end of file"})
    void badTablesSayWhereAndWhat(String text, String expected) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SkewTable.parse("t.json", text == null ? "" : text));
        assertTrue(e.getMessage().contains(expected), e.getMessage());
        assertTrue(e.getMessage().startsWith("t.json"), e.getMessage());
    }

    @Test
    void writtenTablesSayWhereEachOffsetComesFromAndReadBack() {
        SkewTable t = new SkewTable("legs", List.of(new SkewTable.Entry("p", 0, 1, "reference", 10),
                new SkewTable.Entry("n", -27.5, 0.9, "legs-xcorr", 10), new SkewTable.Entry("x", 5, 1, "manual", 0)));
        org.lanesift.json.JsonValue j = org.lanesift.json.JsonReader.parse("t", t.toJson());
        assertEquals("derived: the reference channel: 0 by definition", j.at("/channels/p/offsetPs/source").asString());
        assertEquals("measured: skew-estimate, method legs-xcorr", j.at("/channels/n/offsetPs/source").asString());
        assertEquals("measured: skew-estimate, method legs-xcorr", j.at("/channels/n/confidence/source").asString());
        assertEquals("given: a manual entry", j.at("/channels/x/offsetPs/source").asString());
        assertEquals("ps", j.at("/channels/n/offsetPs/unit").asString());
        SkewTable back = SkewTable.parse("t", t.toJson());
        assertEquals(-27.5, back.get("n").offsetPs(), 1e-9);
        assertEquals(0.9, back.get("n").confidence(), 1e-9);
        // a sourced offset that is not a number is refused like a plain one
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SkewTable.parse("t.json",
                "{\"format\":\"lanesift-skew-table\",\"version\":1,\"channels\":{\"a\":{\"offsetPs\":{\"value\":\"3\",\"source\":\"given\"}}}}"));
        assertTrue(e.getMessage().contains("/channels/a/offsetPs must be a number of picoseconds"), e.getMessage());
    }

    @Test
    void syntaxErrorsGiveLineAndColumn() {
        String text = "{\"format\":\"lanesift-skew-table\",\n\"version\":1,\n\"channels\":{\"a\":{\"offsetPs\":3,}}}";
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SkewTable.parse("t.json", text));
        assertEquals("t.json line 3 column 31 at /channels/a: expected a quoted member name", e.getMessage());
    }

    @Test
    void oversizedFilesAreRefusedBeforeReading(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("big.json");
        Files.write(f, new byte[org.lanesift.json.JsonReader.DEFAULT_MAX_BYTES + 1]);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SkewTable.read(f));
        assertTrue(e.getMessage().contains("expected at most " + org.lanesift.json.JsonReader.DEFAULT_MAX_BYTES + " bytes of JSON"),
                e.getMessage());
    }

    @Test
    void deeplyNestedInputIsRefused() {
        String deep = "[".repeat(10_000);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SkewTable.parse("t.json", deep));
        assertTrue(e.getMessage().contains("nesting"), e.getMessage());
    }
}
