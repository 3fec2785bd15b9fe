package org.lanesift.json;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** Faults are refused with the source, line, column and what was expected (RFC 8259 grammar). */
class JsonReaderTest {

    private static JsonParseException fault(String text) {
        return assertThrows(JsonParseException.class, () -> JsonReader.parse("t.json", text));
    }

    @ParameterizedTest(name = "[{index}] {3}")
    @CsvSource(delimiter = '|', quoteCharacter = '`', value = {
        "``|1:1||unexpected end of file, expected a value",
        "`   `|1:4||unexpected end of file, expected a value",
        "`{\"a\":1,}`|1:8||expected a quoted member name",
        "`[1,2,]`|1:6|/2|expected a value, found ']'",
        "`{'a':1}`|1:2||expected a quoted member name",
        "`{\"a\" 1}`|1:6|/a|expected ':' after member name \"a\"",
        "`{\"a\":1 \"b\":2}`|1:8|/a|expected ',' or '}' in an object, found '\"'",
        "`[1 2]`|1:4|/0|expected ',' or ']' in an array, found '2'",
        "`[1] x`|1:5||expected the end of the file after the top-level value, found 'x'",
        "`tru`|1:1||expected 'true'",
        "`nul`|1:1||expected 'null'",
        "`NaN`|1:1||expected a value, found 'N'",
        "`01`|1:1||malformed number '01'",
        "`-`|1:1||malformed number '-'",
        "`+1`|1:1||expected a value, found '+'",
        "`1.`|1:1||malformed number '1.'",
        "`.5`|1:1||expected a value, found '.'",
        "`1e`|1:1||malformed number '1e'",
        "`1e+`|1:1||malformed number '1e+'",
        "`1e400`|1:1||number '1e400' is too large for a double",
        "`\"abc`|1:1||unterminated string",
        "`\"a\\x\"`|1:3||unknown escape '\\x'; expected one of \\\" \\\\ \\/ \\b \\f \\n \\r \\t \\uXXXX",
        "`\"\\u12G4\"`|1:2||bad \\u escape, expected four hex digits",
        "`\"\\u+123\"`|1:2||bad \\u escape, expected four hex digits",
        "`\"\\u12\"`|1:2||bad \\u escape, expected four hex digits",
        "`{\"a\":1,\"a\":2}`|1:8|/a|member \"a\" appears twice; expected each name once in an object",
        "`/* no */ 1`|1:1||expected a value, found '/'"})
    void faultsNamePlaceAndExpectation(String text, String place, String pointer, String reason) {
        JsonParseException e = fault(text == null ? "" : text);
        String p = pointer == null ? "" : pointer;
        String[] lc = place.split(":");
        assertEquals("t.json line " + lc[0] + " column " + lc[1] + " at " + (p.isEmpty() ? "the top level" : p) + ": " + reason,
                e.getMessage());
        assertEquals(p, e.pointer());
        assertEquals("t.json", e.source());
        assertEquals(reason, e.reason());
        assertEquals(place, e.line() + ":" + e.column());
    }

    @Test
    void thePointerNamesTheMemberOrElementAtFault() {
        JsonParseException dup = fault("{\"nodes\": [{\"id\": 1}, {\"id\": 1, \"a/b~\": {\"x\": [0, tru]}}]}");
        assertEquals("/nodes/1/a~1b~0/x/1", dup.pointer(), dup.getMessage());
        JsonParseException twice = fault("{\"nodes\": [{\"id\": 1, \"id\": 2}]}");
        assertEquals("/nodes/0/id", twice.pointer());
        JsonParseException after = fault("{\"a\": [1, {\"b\": 2}], \"c\": 3} 4");
        assertEquals("", after.pointer());
        assertTrue(after.getMessage().contains(" at the top level: "), after.getMessage());
    }

    @Test
    void aTextOverTheSizeLimitIsRefusedBeforeParsing() {
        String big = "[" + "0,".repeat(JsonReader.DEFAULT_MAX_BYTES / 2) + "0]";
        JsonParseException e = fault(big);
        assertEquals("t.json line 1 column 1 at the top level: the text has " + big.length() + " characters; expected at most "
                + JsonReader.DEFAULT_MAX_BYTES + " characters of JSON", e.getMessage());
        String fits = "\"" + "x".repeat(JsonReader.DEFAULT_MAX_BYTES - 2) + "\"";
        assertEquals(JsonReader.DEFAULT_MAX_BYTES - 2, JsonReader.parse("t", fits).asString().length());
    }

    @Test
    void filesAreReadAsStrictUtf8WithinTheSizeLimit(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir) throws Exception {
        java.nio.file.Path ok = java.nio.file.Files.writeString(dir.resolve("ok.json"), "{\"\u00b5\": 1}");
        assertEquals(1.0, JsonReader.read(ok, "ok.json").get("\u00b5").asDouble());
        java.nio.file.Path latin = java.nio.file.Files.write(dir.resolve("latin.json"), new byte[] {'[', '\n', '"', (byte) 0xb5, '"', ']'});
        JsonParseException e = assertThrows(JsonParseException.class, () -> JsonReader.read(latin, "latin.json"));
        assertEquals("latin.json line 2 column 2 at the top level: byte 0xB5 is not UTF-8; expected a UTF-8 text", e.getMessage());
        java.nio.file.Path big = dir.resolve("big.json");
        try (var ch = java.nio.channels.FileChannel.open(big, java.nio.file.StandardOpenOption.CREATE_NEW,
                java.nio.file.StandardOpenOption.WRITE)) {
            ch.write(java.nio.ByteBuffer.wrap(new byte[] {' '}), JsonReader.DEFAULT_MAX_BYTES);
        }
        JsonParseException b = assertThrows(JsonParseException.class, () -> JsonReader.read(big, "big.json"));
        assertEquals("big.json line 1 column 1 at the top level: the file has more than " + JsonReader.DEFAULT_MAX_BYTES
                + " bytes; expected at most " + JsonReader.DEFAULT_MAX_BYTES + " bytes of JSON", b.getMessage());
        assertThrows(java.nio.file.NoSuchFileException.class, () -> JsonReader.read(dir.resolve("none.json"), "none.json"));
    }

    @Test
    void linesAndColumnsCountFromOne() {
        JsonParseException e = fault("{\n  \"a\": 1,\n  \"b\": [1,\n        2,,]\n}");
        assertEquals(4, e.line());
        assertEquals(11, e.column());
        JsonParseException crlf = fault("[1,\r\n  x]");
        assertEquals("t.json line 2 column 3 at /1: expected a value, found 'x'", crlf.getMessage());
    }

    @Test
    void aDuplicateIsReportedWhereItsNameStands() {
        JsonParseException e = fault("{\"k\": [1,\n2],\n  \"k\": {\n}}");
        assertEquals("t.json line 3 column 3 at /k: member \"k\" appears twice; expected each name once in an object", e.getMessage());
    }

    @Test
    void rawControlCharactersInStringsAreRefused() {
        assertEquals("t.json line 1 column 4 at the top level: control character U+000A in a string (write it as an escape)", fault("\"ab\nc\"").getMessage());
        assertEquals("t.json line 1 column 2 at the top level: control character U+0000 in a string (write it as an escape)", fault("\"\u0000\"").getMessage());
        assertEquals("t.json line 1 column 2 at the top level: control character U+001F in a string (write it as an escape)", fault("\"\u001f\"").getMessage());
        assertEquals("\u007f", JsonReader.parse("t", "\"\u007f\"").asString(), "DEL is not a control character in RFC 8259");
    }

    @Test
    void nestingIsLimited() {
        String ok = "[".repeat(64) + "]".repeat(64);
        assertEquals(JsonValue.Kind.ARRAY, JsonReader.parse("t", ok).kind());
        JsonParseException e = fault("[".repeat(65) + "]".repeat(65));
        assertEquals("t.json line 1 column 65 at " + "/0".repeat(64) + ": nesting deeper than 64 levels; expected at most 64"
                + " objects and arrays inside one another", e.getMessage());
        JsonParseException deep = fault("{\"a\":".repeat(100_000));
        assertTrue(deep.reason().startsWith("nesting deeper"), deep.getMessage());
        assertThrows(JsonParseException.class, () -> JsonReader.parse("t", "[[[1]]]", 2));
        assertEquals(3, JsonReader.parse("t", "[[[1]]]", 3).elements().get(0).elements().get(0).column());
    }

    @Test
    void whiteSpaceIsOnlyTheFourOfTheGrammar() {
        assertEquals(1.0, JsonReader.parse("t", " \t\r\n1 \t\r\n").asDouble());
        assertEquals("t.json line 1 column 1 at the top level: expected a value, found U+00A0", fault("\u00a01").getMessage());
        assertEquals("t.json line 1 column 1 at the top level: expected a value, found U+000C", fault("\f1").getMessage());
    }

    @Test
    void aByteOrderMarkIsSkipped() {
        assertEquals(2.0, JsonReader.parse("t", "\uFEFF[2]").elements().get(0).asDouble());
        assertEquals("t.json line 1 column 3 at the top level: expected the end of the file after the top-level value, found ']'", fault("\uFEFF[]]").getMessage());
    }

    @Test
    void numbersFollowTheGrammar() {
        String[] good = {"0", "-0", "12", "-12", "0.5", "1.25e3", "1E-3", "1e+3", "123456789012345678901234567890", "4.9e-324", "1e-400"};
        double[] want = {0, -0.0, 12, -12, 0.5, 1250, 0.001, 1000, 1.2345678901234568e29, Double.MIN_VALUE, 0};
        for (int i = 0; i < good.length; i++) {
            JsonValue v = JsonReader.parse("t", good[i]);
            assertEquals(want[i], v.asDouble(), good[i]);
            assertEquals(good[i], v.numberText());
        }
    }

    @Test
    void escapesDecode() {
        assertEquals("\" \\ / \b \f \n \r \t \u00e9 \u20ac", JsonReader.parse("t", "\"\\\" \\\\ \\/ \\b \\f \\n \\r \\t \\u00E9 \\u20aC\"").asString());
        // a lone surrogate escape is grammatical (RFC 8259 section 8.2 leaves its meaning open): kept as is
        assertEquals("\ud800", JsonReader.parse("t", "\"\\ud800\"").asString());
    }

    @Test
    void valuesKnowWhereTheyBegin() {
        JsonValue v = JsonReader.parse("t", "{\n  \"a\": [true,\n    null, \"x\", -1.5]\n}");
        JsonValue a = v.get("a");
        assertEquals("1:1", v.line() + ":" + v.column());
        assertEquals("2:8", a.line() + ":" + a.column());
        assertEquals("2:9", a.elements().get(0).line() + ":" + a.elements().get(0).column());
        assertEquals("3:5", a.elements().get(1).line() + ":" + a.elements().get(1).column());
        assertEquals("3:11", a.elements().get(2).line() + ":" + a.elements().get(2).column());
        assertEquals("3:16", a.elements().get(3).line() + ":" + a.elements().get(3).column());
    }

    @Test
    void pointersLeadToValues() {
        JsonValue v = JsonReader.parse("t", "{\"a/b\": {\"~\": [10, 20]}, \"c\": [{\"d\": true}]}");
        assertEquals(20.0, v.at("/a~1b/~0/1").asDouble());
        assertEquals(true, v.at("/c/0/d").asBoolean());
        assertEquals(v, v.at(""));
        assertEquals(null, v.at("/c/1"));
        assertEquals(null, v.at("/c/01"));
        assertEquals(null, v.at("/a~1b/~0/1/x"));
        assertThrows(IllegalArgumentException.class, () -> v.at("c"));
    }

    @Test
    void accessorsRefuseTheWrongKind() {
        JsonValue v = JsonReader.parse("t", "{\"a\": \"35\"}");
        IllegalStateException e = assertThrows(IllegalStateException.class, () -> v.get("a").asDouble());
        assertEquals("expected number, this is \"35\"", e.getMessage());
        assertEquals("\"35\"", v.get("a").describe());
        assertEquals("an object", v.describe());
        assertEquals(null, v.get("b"));
    }

    /**
     * Issue 18: the size limit counts bytes read, so a device that reports size 0 and never ends
     * ({@code /dev/zero}) is refused, and a named pipe or a directory is refused before it is
     * opened (opening a pipe waits for a writer).
     */
    @org.junit.jupiter.api.Test
    void onlyRegularFilesAreReadAndTheLimitCountsBytesRead(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir)
            throws Exception {
        org.junit.jupiter.api.Assumptions.assumeTrue(java.nio.file.Files.exists(java.nio.file.Path.of("/dev/zero")), "a Unix system");
        var zero = org.junit.jupiter.api.Assertions.assertThrows(org.lanesift.plugin.InputFormatException.class,
                () -> JsonReader.read(java.nio.file.Path.of("/dev/zero"), "/dev/zero"));
        assertEquals("/dev/zero: a pipe, device or socket, not a regular file; expected a file (pipes, devices and "
                + "directories are not read as files)", zero.getMessage());
        var d = org.junit.jupiter.api.Assertions.assertThrows(org.lanesift.plugin.InputFormatException.class,
                () -> JsonReader.read(dir, "tables"));
        assertEquals(true, d.getMessage().startsWith("tables: a directory, not a regular file"), d.getMessage());
        java.nio.file.Path fifo = dir.resolve("pipe.json");
        Process mk = new ProcessBuilder("mkfifo", fifo.toString()).start();
        org.junit.jupiter.api.Assumptions.assumeTrue(mk.waitFor() == 0, "mkfifo is available");
        var p = org.junit.jupiter.api.Assertions.assertTimeoutPreemptively(java.time.Duration.ofSeconds(20),
                () -> org.junit.jupiter.api.Assertions.assertThrows(org.lanesift.plugin.InputFormatException.class,
                        () -> JsonReader.read(fifo, "pipe.json")));
        assertEquals(true, p.getMessage().startsWith("pipe.json: a pipe, device or socket, not a regular file"), p.getMessage());
    }
}
