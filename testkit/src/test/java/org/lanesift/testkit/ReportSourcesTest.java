package org.lanesift.testkit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonReader;

/** What {@link ReportSources} counts as a value that needs a source, and what it leaves out. */
class ReportSourcesTest {
    @Test
    void quantitiesNeedASourceCountsAndPlacesDoNot() {
        for (String n : List.of("thresholdVolts", "eyeWidthPs", "ringHz", "phaseUI", "overshootPercent", "loopInductanceH",
                "confidence", "rSquared", "samplePeriodFs", "meanFramePeriodS")) {
            assertTrue(ReportSources.needsSource(n), n);
        }
        for (String n : List.of("edges", "samples", "count", "mean", "index", "version", "startFs", "endFs", "timeS", "firstFs",
                "statsStride", "windowSamples")) {
            assertFalse(ReportSources.needsSource(n), n);
        }
    }

    @Test
    void findsTheUnsourcedMembersOutsideArrays() {
        String json = "{\"edges\": 12, \"eyeHeightMv\": 300.5, \"uiPs\": {\"value\": 1000, \"unit\": \"ps\", \"source\": \"measured\"},"
                + " \"clock\": {\"frequencyHz\": null, \"startFs\": 5, \"duty\": {\"mean\": 0.5}},"
                + " \"rows\": [{\"offsetPs\": 3}], \"a/b\": {\"q\": 2}}";
        assertEquals(List.of("/eyeHeightMv", "/clock/frequencyHz", "/a~1b/q"), ReportSources.unsourced(JsonReader.parse("t", json)));
    }

    @Test
    void walksTheReportsOfAFolderButNotItsInputs(@TempDir Path dir) throws Exception {
        Files.createDirectories(dir.resolve("chains"));
        Files.createDirectories(dir.resolve("run"));
        Files.writeString(dir.resolve("chains/c.json"), "{\"thresholdVolts\": 1}");
        Files.writeString(dir.resolve("run/r.json"), "{\"thresholdVolts\": 1, \"limitVolts\": {\"value\": 2, \"source\":"
                + " \"standard: X (docs/reference-facts.md#lvds-electrical-levels)\"}}");
        Files.writeString(dir.resolve("run/report.md"), "- a: 1 V (standard: Y, docs/reference-facts.md#d-phy-levels-and-states)\n");
        assertEquals(List.of("run/r.json: /thresholdVolts"), ReportSources.unsourcedIn(dir));
        assertEquals(Set.of("lvds-electrical-levels", "d-phy-levels-and-states"), ReportSources.citedAnchors(dir));
    }
}
