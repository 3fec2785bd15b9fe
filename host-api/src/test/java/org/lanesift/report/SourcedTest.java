package org.lanesift.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.json.JsonWriter;

class SourcedTest {
    @Test
    void writesValueUnitAndSourceAndReadsBack() {
        JsonWriter w = JsonWriter.compact().beginObject();
        Sourced.of(12.5, "ps", Source.measured("TIE against a least-squares clock")).field(w, "tieRmsPs");
        new Sourced(1e-12, null, Source.assumed("common practice")).field(w, "ber");
        Sourced.of(247, "mV", Source.standard("ANSI/TIA/EIA-644-A, from memory", "lvds-electrical-levels")).field(w, "vodMin");
        JsonValue v = JsonReader.parse("test", w.endObject().finish());
        assertEquals(12.5, v.at("/tieRmsPs/value").asDouble());
        assertEquals("ps", v.at("/tieRmsPs/unit").asString());
        assertEquals("measured: TIE against a least-squares clock", v.at("/tieRmsPs/source").asString());
        assertEquals(null, v.at("/ber/unit"));
        assertEquals("assumed by default: common practice", v.at("/ber/source").asString());
        assertEquals("standard: ANSI/TIA/EIA-644-A, from memory (docs/reference-facts.md#lvds-electrical-levels)",
                v.at("/vodMin/source").asString());
    }

    @Test
    void aStandardWithoutItsAnchorIsRefused() {
        assertThrows(IllegalArgumentException.class, () -> Source.standard("TIA-644", ""));
        assertThrows(IllegalArgumentException.class, () -> Source.standard("TIA-644", "#lvds"));
    }

    @Test
    void markdownLineNamesTheSource() {
        assertEquals("- clock: 75 MHz (measured: on CLK_P)\n",
                new Sourced(75e6, "Hz", Source.measured("on CLK_P")).markdown("clock", "75 MHz"));
        assertEquals("derived", Source.derived("").text());
    }

    @Test
    void kindIsReadBackFromTheText() {
        for (Source.Kind k : Source.Kind.values()) {
            assertEquals(k, Source.Kind.of(new Source(k, "how").text()));
            assertEquals(k, Source.Kind.of(new Source(k, "").text()));
        }
        assertEquals(null, Source.Kind.of("ANSI/TIA/EIA-644-A"));
        assertEquals(null, Source.Kind.of("measuredly"));
    }
}
