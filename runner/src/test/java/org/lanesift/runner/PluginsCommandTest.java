package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
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
        JsonNode root = new ObjectMapper().readTree(r.out());
        assertEquals(1, root.get("format").asInt());
        JsonNode wave = null;
        for (JsonNode p : root.get("plugins")) {
            if (p.get("id").asText().equals("fake-wave")) {
                wave = p;
            }
        }
        assertTrue(wave != null, r::toString);
        assertEquals("Fake waveform source", wave.get("name").asText());
        assertEquals("9.9.9", wave.get("version").asText());
        assertEquals(0, wave.get("inputs").size());
        assertEquals(7, wave.get("outputs").size());
        assertEquals("frame", wave.at("/outputs/5/name").asText());
        assertEquals("FRAME", wave.at("/outputs/5/kind").asText());
        JsonNode period = wave.at("/options/2");
        assertEquals("periodPs", period.get("name").asText());
        assertEquals("number", period.get("type").asText());
        assertEquals("ps", period.get("unit").asText());
        assertEquals(1000.0, period.get("default").asDouble());
        assertEquals(1.0, period.get("min").asDouble());
        assertEquals(1e9, period.get("max").asDouble());
        assertEquals(false, period.get("required").asBoolean());
        assertEquals("sample period", period.get("help").asText());
        JsonNode samples = wave.at("/options/0");
        assertTrue(samples.get("default").isIntegralNumber());
        assertEquals(200, samples.get("default").asLong());
    }
}
