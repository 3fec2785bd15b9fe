package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/** Every worked example in docs/probe.md is the tool's real output (cautions block left out there). */
class ProbeDocTest {
    @Test
    void examplesInTheDocsMatchTheTool() throws Exception {
        Path doc = Path.of("..", "..", "docs", "probe.md");
        String text = Files.readString(doc);
        Matcher m = Pattern.compile("```\\n\\$ lanesift probe ([^\\n]*)\\n(.*?)\\n```", Pattern.DOTALL).matcher(text);
        int n = 0;
        while (m.find()) {
            ProbeToolTest.Run r = ProbeToolTest.run(m.group(1).trim().split("\\s+"));
            assertEquals(0, r.code(), m.group(1) + ": " + r.err());
            String out = r.out().split("\nCautions")[0].stripTrailing();
            assertEquals(m.group(2).stripTrailing(), out, "example '" + m.group(1) + "' in " + doc);
            n++;
        }
        assertTrue(n >= 5, "examples found: " + n);
        assertTrue(text.contains(ProbeTool.CAUTIONS), "the cautions block is shown in full once");
        assertTrue(text.contains(ProbeTool.HAZARD), "the hazard block above extra-low voltage is shown in full");
    }
}
