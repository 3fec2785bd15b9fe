package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.junit.jupiter.api.Test;

/** {@code lanesift plugins} as text and as JSON (docs/cli-json.md). */
class PluginsCommandTest {
    @Test
    void textListsPortsWithKindsAndOptionsWithRanges() {
        Cli r = Cli.run("plugins");
        assertEquals(0, r.code(), r::toString);
        String out = r.out();
        assertTrue(out.contains("fake-threshold  Fake threshold  (version 0.1.0)"), out);
        assertTrue(out.contains("  inputs:  in (ANALOG)\n  outputs: out (LOGIC)"), out);
        assertTrue(out.contains("thresholdVolts  number [V], default 0.5, range -10 to 10 V: decision level"), out);
        assertTrue(out.contains("file  text, required: the text file"), out);
        // a required text option without default: ports are listed with a placeholder value
        assertTrue(out.contains("fake-lines  Fake line reader"), out);
    }

    @Test
    void controlCharactersInChoicesAreShownEscaped() {
        assertEquals("\\t|;", PluginsCommand.visible("\t|;"));
    }

    @Test
    void jsonHasEveryFieldTheDocsPromise() throws Exception {
        Cli r = Cli.run("plugins", "--json");
        assertEquals(0, r.code(), r::toString);
        JsonValue root = JsonReader.parse("plugins --json", r.out());
        assertEquals("1", root.get("format").numberText());
        JsonValue wave = null;
        for (JsonValue p : root.get("plugins").elements()) {
            if (p.get("id").asString().equals("fake-wave")) {
                wave = p;
            }
        }
        assertTrue(wave != null, r::toString);
        assertEquals("Fake waveform source", wave.get("name").asString());
        assertEquals("9.9.9", wave.get("version").asString());
        assertEquals(0, wave.get("inputs").elements().size());
        assertEquals(7, wave.get("outputs").elements().size());
        assertEquals("frame", wave.at("/outputs/5/name").asString());
        assertEquals("FRAME", wave.at("/outputs/5/kind").asString());
        JsonValue period = wave.at("/options/2");
        assertEquals("periodPs", period.get("name").asString());
        assertEquals("number", period.get("type").asString());
        assertEquals("ps", period.get("unit").asString());
        assertEquals(1000.0, period.get("default").asDouble());
        assertEquals(1.0, period.get("min").asDouble());
        assertEquals(1e9, period.get("max").asDouble());
        assertEquals(false, period.get("required").asBoolean());
        assertEquals("sample period", period.get("help").asString());
        JsonValue samples = wave.at("/options/0");
        assertEquals("200", samples.get("default").numberText(), "an integer default is written as an integer");
    }
}
