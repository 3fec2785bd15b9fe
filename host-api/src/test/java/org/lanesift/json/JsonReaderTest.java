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

    @ParameterizedTest(name = "[{index}] {2}")
    @CsvSource(delimiter = '|', quoteCharacter = '`', value = {
        "``|1:1|unexpected end of file, expected a value",
        "`   `|1:4|unexpected end of file, expected a value",
        "`{\"a\":1,}`|1:8|expected a quoted member name",
        "`[1,2,]`|1:6|expected a value, found ']'",
        "`{'a':1}`|1:2|expected a quoted member name",
        "`{\"a\" 1}`|1:6|expected ':' after member name \"a\"",
        "`{\"a\":1 \"b\":2}`|1:8|expected ',' or '}' in an object, found '\"'",
        "`[1 2]`|1:4|expected ',' or ']' in an array, found '2'",
        "`[1] x`|1:5|expected the end of the file after the top-level value, found 'x'",
        "`tru`|1:1|expected 'true'",
        "`nul`|1:1|expected 'null'",
        "`NaN`|1:1|expected a value, found 'N'",
        "`01`|1:1|malformed number '01'",
        "`-`|1:1|malformed number '-'",
        "`+1`|1:1|expected a value, found '+'",
        "`1.`|1:1|malformed number '1.'",
        "`.5`|1:1|expected a value, found '.'",
        "`1e`|1:1|malformed number '1e'",
        "`1e+`|1:1|malformed number '1e+'",
        "`1e400`|1:1|number '1e400' is too large for a double",
        "`\"abc`|1:1|unterminated string",
        "`\"a\\x\"`|1:3|unknown escape '\\x'; expected one of \\\" \\\\ \\/ \\b \\f \\n \\r \\t \\uXXXX",
        "`\"\\u12G4\"`|1:2|bad \\u escape, expected four hex digits",
        "`\"\\u+123\"`|1:2|bad \\u escape, expected four hex digits",
        "`\"\\u12\"`|1:2|bad \\u escape, expected four hex digits",
        "`{\"a\":1,\"a\":2}`|1:8|member \"a\" appears twice",
        "`/* no */ 1`|1:1|expected a value, found '/'"})
    void faultsNamePlaceAndExpectation(String text, String place, String reason) {
        JsonParseException e = fault(text == null ? "" : text);
        assertEquals("t.json:" + place + ": " + reason, e.getMessage());
        assertEquals("t.json", e.source());
        assertEquals(reason, e.reason());
        assertEquals(place, e.line() + ":" + e.column());
    }

    @Test
    void linesAndColumnsCountFromOne() {
        JsonParseException e = fault("{\n  \"a\": 1,\n  \"b\": [1,\n        2,,]\n}");
        assertEquals(4, e.line());
        assertEquals(11, e.column());
        JsonParseException crlf = fault("[1,\r\n  x]");
        assertEquals("t.json:2:3: expected a value, found 'x'", crlf.getMessage());
    }

    @Test
    void aDuplicateIsReportedWhereItsNameStands() {
        JsonParseException e = fault("{\"k\": [1,\n2],\n  \"k\": {\n}}");
        assertEquals("t.json:3:3: member \"k\" appears twice", e.getMessage());
    }

    @Test
    void rawControlCharactersInStringsAreRefused() {
        assertEquals("t.json:1:4: control character U+000A in a string (write it as an escape)", fault("\"ab\nc\"").getMessage());
        assertEquals("t.json:1:2: control character U+0000 in a string (write it as an escape)", fault("\"\u0000\"").getMessage());
        assertEquals("t.json:1:2: control character U+001F in a string (write it as an escape)", fault("\"\u001f\"").getMessage());
        assertEquals("\u007f", JsonReader.parse("t", "\"\u007f\"").asString(), "DEL is not a control character in RFC 8259");
    }

    @Test
    void nestingIsLimited() {
        String ok = "[".repeat(64) + "]".repeat(64);
        assertEquals(JsonValue.Kind.ARRAY, JsonReader.parse("t", ok).kind());
        JsonParseException e = fault("[".repeat(65) + "]".repeat(65));
        assertEquals("t.json:1:65: nesting deeper than 64 levels", e.getMessage());
        JsonParseException deep = fault("{\"a\":".repeat(100_000));
        assertTrue(deep.reason().startsWith("nesting deeper"), deep.getMessage());
        assertThrows(JsonParseException.class, () -> JsonReader.parse("t", "[[[1]]]", 2));
        assertEquals(3, JsonReader.parse("t", "[[[1]]]", 3).elements().get(0).elements().get(0).column());
    }

    @Test
    void whiteSpaceIsOnlyTheFourOfTheGrammar() {
        assertEquals(1.0, JsonReader.parse("t", " \t\r\n1 \t\r\n").asDouble());
        assertEquals("t.json:1:1: expected a value, found U+00A0", fault("\u00a01").getMessage());
        assertEquals("t.json:1:1: expected a value, found U+000C", fault("\f1").getMessage());
    }

    @Test
    void aByteOrderMarkIsSkipped() {
        assertEquals(2.0, JsonReader.parse("t", "\uFEFF[2]").elements().get(0).asDouble());
        assertEquals("t.json:1:3: expected the end of the file after the top-level value, found ']'", fault("\uFEFF[]]").getMessage());
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
    void accessorsRefuseTheWrongKind() {
        JsonValue v = JsonReader.parse("t", "{\"a\": \"35\"}");
        IllegalStateException e = assertThrows(IllegalStateException.class, () -> v.get("a").asDouble());
        assertEquals("expected number, this is \"35\"", e.getMessage());
        assertEquals("\"35\"", v.get("a").describe());
        assertEquals("an object", v.describe());
        assertEquals(null, v.get("b"));
    }
}
