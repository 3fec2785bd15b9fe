package org.lanesift.json;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

/** Layout, escaping (RFC 8259 section 7), finite numbers and call-order checks of the writer. */
class JsonWriterTest {

    private static JsonWriter sample(JsonWriter w) {
        return w.beginObject().field("a", 1).name("b").beginArray().value(1).value(2.5).endArray()
                .name("c").beginObjectInline().field("x", 1).field("y", "z").endObject()
                .name("d").beginArrayInline().beginObject().field("k", true).endObject().beginObject().endObject().endArray()
                .name("e").beginObject().endObject().name("f").beginArray().endArray().field("g", (String) null).name("h").nullValue()
                .endObject();
    }

    @Test
    void compactHasNoWhiteSpace() {
        assertEquals("{\"a\":1,\"b\":[1,2.5],\"c\":{\"x\":1,\"y\":\"z\"},\"d\":[{\"k\":true},{}],\"e\":{},\"f\":[],\"g\":null,\"h\":null}",
                sample(JsonWriter.compact()).finish());
    }

    @Test
    void prettyIndentsExpandedContainersOnly() {
        assertEquals("""
                {
                  "a": 1,
                  "b": [
                    1,
                    2.5
                  ],
                  "c": {"x": 1, "y": "z"},
                  "d": [{
                    "k": true
                  }, {}],
                  "e": {},
                  "f": [],
                  "g": null,
                  "h": null
                }""", sample(JsonWriter.pretty()).finish());
    }

    @Test
    void inlineArraysOfNumbers() {
        assertEquals("{\n  \"v\": [1.5, 2],\n  \"n\": [7, 8, 9],\n  \"none\": []\n}",
                JsonWriter.pretty().beginObject().name("v").inlineArray(new double[] {1.5, 2, 3}, 2)
                        .name("n").inlineArray(new long[] {7, 8, 9}, 3).name("none").inlineArray(new long[0], 0).endObject().finish());
    }

    @Test
    void stringsAreEscapedAsRfc8259Section7Says() {
        // section 7: quotation mark, reverse solidus and U+0000..U+001F must be escaped; the rest may stand as is
        assertEquals("\"\\u0000\\u0001\\u001f\\b\\t\\n\\f\\r\\\"\\\\/\u007f\u00e9\u20ac\"",
                JsonWriter.quote("\u0000\u0001\u001f\b\t\n\f\r\"\\/\u007f\u00e9\u20ac"));
        for (char c = 0; c < 0x20; c++) {
            String q = JsonWriter.quote(String.valueOf(c));
            assertEquals(String.valueOf(c), JsonReader.parse("t", q).asString(), q);
            assertEquals(-1, indexOfControl(q), q);
        }
        String grin = new String(Character.toChars(0x1F600));
        assertEquals("\"a" + grin + "b\"", JsonWriter.quote("a" + grin + "b"), "a valid surrogate pair stays one character");
        assertEquals("\"\\ud800x\\udc00\"", JsonWriter.quote("\ud800x\udc00"), "lone surrogates become escapes");
        assertEquals("\"\\udc00\\ud800\"", JsonWriter.quote("\udc00\ud800"), "a reversed pair is two lone surrogates");
        assertEquals("{\"a\\nb\":\"\\t\"}", JsonWriter.compact().beginObject().field("a\nb", "\t").endObject().finish(), "names are escaped too");
    }

    private static int indexOfControl(String s) {
        for (int i = 0; i < s.length(); i++) {
            if (s.charAt(i) < 0x20) {
                return i;
            }
        }
        return -1;
    }

    @Test
    void nonFiniteNumbersAreRefusedNamingTheMember() {
        IllegalArgumentException a = assertThrows(IllegalArgumentException.class, () -> JsonWriter.compact().beginObject()
                .name("capture").beginObject().field("ok", 1.0).field("overshootPercent", Double.NaN));
        assertEquals("JSON cannot hold NaN (at /capture/overshootPercent)", a.getMessage());
        IllegalArgumentException b = assertThrows(IllegalArgumentException.class, () -> JsonWriter.pretty().beginObject()
                .name("v").beginArray().value(1.0).value(Double.POSITIVE_INFINITY));
        assertEquals("JSON cannot hold Infinity (at /v/1)", b.getMessage());
        IllegalArgumentException c = assertThrows(IllegalArgumentException.class, () -> JsonWriter.pretty().beginObject()
                .name("w/~").beginArrayInline().beginObject().endObject().beginObject().field("x", Double.NEGATIVE_INFINITY));
        assertEquals("JSON cannot hold -Infinity (at /w~1~0/1/x)", c.getMessage());
        IllegalArgumentException d = assertThrows(IllegalArgumentException.class, () -> JsonWriter.compact().value(Double.NaN));
        assertEquals("JSON cannot hold NaN (at the top level)", d.getMessage());
        assertThrows(IllegalArgumentException.class, () -> NumberStyle.significant(9).format(Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> JsonValue.number(Double.POSITIVE_INFINITY));
    }

    @Test
    void nonFiniteAsNullWritesNull() {
        assertEquals("[null,null,null,1.5]", JsonWriter.compact().nonFiniteAsNull().beginArray().value(Double.NaN)
                .value(Double.POSITIVE_INFINITY).value(Double.NEGATIVE_INFINITY).value(1.5).endArray().finish());
    }

    @Test
    void callsOutOfOrderAreRefused() {
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().beginArray().name("a"));
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().beginObject().value(1));
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().beginObject().name("a").name("b"));
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().beginObject().name("a").endObject());
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().beginObject().endArray());
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().endObject());
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().value(1).value(2));
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().beginArray().endArray().beginArray());
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().beginArray().finish());
        assertThrows(IllegalStateException.class, () -> JsonWriter.compact().finish());
        assertEquals("[1", JsonWriter.compact().beginArray().value(1).toString(), "toString shows the text so far");
        assertEquals("\"x\"", JsonWriter.pretty().value("x").finish());
    }

    @Test
    void shortestNumbersReadBackExactly() {
        NumberStyle s = NumberStyle.shortest();
        assertEquals("0", s.format(0.0));
        assertEquals("0", s.format(-0.0));
        assertEquals("12", s.format(12.0));
        assertEquals("-7", s.format(-7.0));
        assertEquals("123456789012345", s.format(123456789012345.0));
        assertEquals("1.0e15", s.format(1e15));
        assertEquals("0.1", s.format(0.1));
        assertEquals("1.5e-7", s.format(1.5e-7));
        assertEquals("4.9e-324", s.format(Double.MIN_VALUE));
        assertEquals("1.7976931348623157e308", s.format(Double.MAX_VALUE));
    }

    @Test
    void significantDigitsDropTrailingZeros() {
        NumberStyle s = NumberStyle.significant(9);
        assertEquals("0.274999976", s.format(0.27499997615814209));
        assertEquals("1.5e-07", s.format(1.5e-7));
        assertEquals("120.5", s.format(120.5));
        assertEquals("123456790", s.format(123456789.5), "no point: nothing to trim");
        assertEquals("1e+20", s.format(1.00000000001e20));
        assertEquals("-0.000123", s.format(-0.000123));
        assertEquals("0.666666667", s.format(2.0 / 3));
        assertEquals("4000", s.format(4000.0), "whole numbers are exact");
        assertEquals("1e+15", s.format(1e15));
        assertEquals("3.14", NumberStyle.significant(3).format(Math.PI));
        assertThrows(IllegalArgumentException.class, () -> NumberStyle.significant(0));
        assertThrows(IllegalArgumentException.class, () -> NumberStyle.significant(18));
    }

    @Test
    void fixedDecimals() {
        NumberStyle s = NumberStyle.decimals(6);
        assertEquals("59.940476", s.format(59.94047619));
        assertEquals("60.000000", s.format(60));
        assertEquals("25175000.000010", s.format(25175000.00001));
        assertEquals("-0.500000", s.format(-0.5));
        assertEquals("3", NumberStyle.decimals(0).format(2.5), "half-up");
        assertEquals("[1.50,2.00,3]", JsonWriter.compact().numberStyle(NumberStyle.decimals(2)).beginArray().value(1.5).value(2.0)
                .value(3L).endArray().finish(), "integers are not styled");
        assertThrows(IllegalArgumentException.class, () -> NumberStyle.decimals(-1));
    }
}
