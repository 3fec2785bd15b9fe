package org.lanesift.json;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The examples of RFC 8259 ("The JavaScript Object Notation (JSON) Data Interchange Format",
 * IETF, December 2017). Source: RFC 8259 section 13 (Examples) and section 7 (Strings); the
 * texts are reproduced from memory of the RFC, the expected values are what the RFC says they
 * hold.
 */
class Rfc8259ExamplesTest {
    /** RFC 8259 section 13, first example: an object with a nested object and an array. */
    static final String IMAGE = """
                  {
                    "Image": {
                        "Width":  800,
                        "Height": 600,
                        "Title":  "View from 15th Floor",
                        "Thumbnail": {
                            "Url":    "http://www.example.com/image/481989943",
                            "Height": 125,
                            "Width":  100
                        },
                        "Animated" : false,
                        "IDs": [116, 943, 234, 38793]
                      }
                  }
            """;

    /** RFC 8259 section 13, second example: an array of two objects. */
    static final String PLACES = """
                  [
                    {
                       "precision": "zip",
                       "Latitude":  37.7668,
                       "Longitude": -122.3959,
                       "Address":   "",
                       "City":      "SAN FRANCISCO",
                       "State":     "CA",
                       "Zip":       "94107",
                       "Country":   "US"
                    },
                    {
                       "precision": "zip",
                       "Latitude":  37.371991,
                       "Longitude": -122.026020,
                       "Address":   "",
                       "City":      "SUNNYVALE",
                       "State":     "CA",
                       "Zip":       "94085",
                       "Country":   "US"
                    }
                  ]
            """;

    @Test
    void theImageObject() {
        JsonValue root = JsonReader.parse("image.json", IMAGE);
        JsonValue image = root.get("Image");
        assertEquals(List.of("Width", "Height", "Title", "Thumbnail", "Animated", "IDs"), List.copyOf(image.members().keySet()),
                "members keep text order");
        assertEquals(800, image.get("Width").asDouble());
        assertEquals(600, image.get("Height").asDouble());
        assertEquals("View from 15th Floor", image.get("Title").asString());
        assertEquals("http://www.example.com/image/481989943", image.get("Thumbnail").get("Url").asString());
        assertEquals(125, image.get("Thumbnail").get("Height").asDouble());
        assertEquals(100, image.get("Thumbnail").get("Width").asDouble());
        assertFalse(image.get("Animated").asBoolean());
        assertEquals(List.of(116.0, 943.0, 234.0, 38793.0), image.get("IDs").elements().stream().map(JsonValue::asDouble).toList());
        // positions: "Image" value opens on line 2, the IDs array on line 12 (lines of the text above)
        assertEquals(2, image.line());
        assertEquals(12, image.get("IDs").line());
        assertEquals(IMAGE.lines().toList().get(11).indexOf('[') + 1, image.get("IDs").column());
    }

    @Test
    void theArrayOfPlaces() {
        JsonValue root = JsonReader.parse("places.json", PLACES);
        assertEquals(2, root.elements().size());
        JsonValue sf = root.elements().get(0);
        JsonValue sv = root.elements().get(1);
        assertEquals(37.7668, sf.get("Latitude").asDouble());
        assertEquals(-122.3959, sf.get("Longitude").asDouble());
        assertEquals("", sf.get("Address").asString());
        assertEquals("SAN FRANCISCO", sf.get("City").asString());
        assertEquals("94107", sf.get("Zip").asString(), "a zip code written as a string stays a string");
        assertEquals(37.371991, sv.get("Latitude").asDouble());
        assertEquals(-122.026020, sv.get("Longitude").asDouble());
        assertEquals("-122.026020", sv.get("Longitude").numberText(), "the number's text is kept as written");
        assertEquals("SUNNYVALE", sv.get("City").asString());
    }

    /** RFC 8259 section 13: "Here are three small JSON texts containing only values". */
    @Test
    void theThreeSmallTexts() {
        assertEquals("Hello world!", JsonReader.parse("a", "\"Hello world!\"").asString());
        assertEquals(42, JsonReader.parse("b", "42").asDouble());
        assertTrue(JsonReader.parse("c", "true").asBoolean());
    }

    /**
     * RFC 8259 section 7: a string with only a reverse solidus may be written "\u005C"; one with
     * only the G clef character (U+1D11E) as "\uD834\uDD1E".
     */
    @Test
    void theStringEscapesOfSection7() {
        assertEquals("\\", JsonReader.parse("s", "\"\\u005C\"").asString());
        String clef = JsonReader.parse("s", "\"\\uD834\\uDD1E\"").asString();
        assertEquals(1, clef.codePointCount(0, clef.length()));
        assertEquals(0x1D11E, clef.codePointAt(0));
        // the writer spells the G clef as the character itself (UTF-8 in the file), which RFC 8259 allows
        assertEquals("\"" + new String(Character.toChars(0x1D11E)) + "\"", JsonWriter.quote(clef));
    }

    /** Writing what was read and reading it again gives the same values, in both layouts. */
    @Test
    void examplesSurviveWritingAndReading() {
        for (String text : new String[] {IMAGE, PLACES}) {
            JsonValue v = JsonReader.parse("x", text);
            assertEquals(v, JsonReader.parse("compact", JsonWriter.compact().value(v).finish()));
            assertEquals(v, JsonReader.parse("pretty", JsonWriter.pretty().value(v).finish()));
        }
        assertEquals("{\"Image\":{\"Width\":800,\"Height\":600,\"Title\":\"View from 15th Floor\",\"Thumbnail\":"
                + "{\"Url\":\"http://www.example.com/image/481989943\",\"Height\":125,\"Width\":100},\"Animated\":false,"
                + "\"IDs\":[116,943,234,38793]}}", JsonReader.parse("x", IMAGE).toString());
    }
}
