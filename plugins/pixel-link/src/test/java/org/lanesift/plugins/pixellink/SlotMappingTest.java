package org.lanesift.plugins.pixellink;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.ChainException;
import org.lanesift.plugin.OptionException;
import org.lanesift.testkit.StageHarness;

class SlotMappingTest {

    private static List<List<String>> rows(String[][] t) {
        return Arrays.stream(t).map(List::of).toList();
    }

    /**
     * The built-in JSON tables against the tables transcribed from
     * docs/reference-facts.md#pixel-link-clock-and-slot-mappings, whose
     * sources are JEIDA-59-1999, Open LVDS Display Interface 0.95 and VESA Notebook Panel
     * Standard 2007.
     */
    @Test
    void builtInTablesMatchTheTranscribedTables() {
        assertEquals(rows(TestLink.VESA24), SlotMapping.builtIn("vesa-24").lanes());
        assertEquals(rows(TestLink.JEIDA24), SlotMapping.builtIn("jeida-24").lanes());
        assertEquals(rows(TestLink.BITS18), SlotMapping.builtIn("bits-18").lanes());
        assertEquals(8, SlotMapping.builtIn("vesa-24").colourBits());
        assertEquals(8, SlotMapping.builtIn("jeida-24").colourBits());
        assertEquals(6, SlotMapping.builtIn("bits-18").colourBits());
        assertEquals(3, SlotMapping.builtIn("bits-18").laneCount());
        assertEquals(4, SlotMapping.builtIn("vesa-24").laneCount());
    }

    /**
     * Same check straight from the text of docs/reference-facts.md#pixel-link-clock-and-slot-mappings,
     * found by walking up from the module to the repository root (the test never leaves the repository).
     */
    @Test
    void builtInTablesMatchReferenceFactsText() throws Exception {
        Path facts = null;
        for (Path p = Path.of("").toAbsolutePath(); p != null; p = p.getParent()) {
            Path c = p.resolve("docs").resolve("reference-facts.md");
            if (Files.isRegularFile(c) && Files.isRegularFile(p.resolve("pom.xml"))) {
                facts = c;
                break;
            }
        }
        assertTrue(facts != null, "docs/reference-facts.md not found above " + Path.of("").toAbsolutePath());
        String text = Files.readString(facts);
        // 18-bit line: "lane 0 = G0 R5 ...; lane 1 = ...; lane 2 = ..."
        assertEquals(rows(TestLink.BITS18), lanesOf(lineStarting(text, "- 18-bit"), 0));
        List<List<String>> vesa = new ArrayList<>(rows(TestLink.BITS18));
        vesa.addAll(lanesOf(lineStarting(text, "- 24-bit VESA"), 3));
        assertEquals(vesa, SlotMapping.builtIn("vesa-24").lanes());
        assertEquals(lanesOf(lineStarting(text, "- 24-bit JEIDA"), 0), SlotMapping.builtIn("jeida-24").lanes());
    }

    private static String lineStarting(String text, String prefix) {
        for (String l : text.split("\n")) {
            if (l.trim().startsWith(prefix)) {
                return l;
            }
        }
        throw new AssertionError("docs/reference-facts.md has no line starting with " + prefix);
    }

    private static List<List<String>> lanesOf(String line, int firstLane) {
        Matcher m = Pattern.compile("lane (\\d) = ([A-Z0-9 ]+)").matcher(line);
        List<List<String>> out = new ArrayList<>();
        int expect = firstLane;
        while (m.find()) {
            assertEquals(expect++, Integer.parseInt(m.group(1)));
            out.add(List.of(m.group(2).trim().split(" +")));
        }
        assertTrue(!out.isEmpty(), line);
        return out;
    }

    /** 18-bit: 6-bit colours widened by bit replication (common practice): R5 lands on bits 7 and 1 of red. */
    @Test
    void sixBitColoursAreReplicated() {
        assertEquals((1 << 23) | (1 << 17), SlotMapping.contribution("R5", 6));
        assertEquals(1 << 2, SlotMapping.contribution("B0", 6));
        assertEquals((1 << 14) | (1 << 8), SlotMapping.contribution("G4", 6));
        // full scale stays full scale, zero stays zero
        int[][] t = SlotMapping.builtIn("bits-18").lookupTables(false);
        int all = t[0][127] | t[1][127] | (t[2][127] & 0xFFFFFF);
        assertEquals(0xFFFFFF, all);
        assertEquals(0, t[0][0] | t[1][0] | t[2][0]);
    }

    @Test
    void reverseSlotsSwapsSlotOrder() {
        int[][] fwd = SlotMapping.builtIn("vesa-24").lookupTables(false);
        int[][] rev = SlotMapping.builtIn("vesa-24").lookupTables(true);
        for (int s = 0; s < 7; s++) {
            assertEquals(fwd[2][1 << s], rev[2][1 << (6 - s)]);
        }
        assertEquals(SlotMapping.DE, fwd[2][1]);
        assertEquals(SlotMapping.DE, rev[2][1 << 6]);
    }

    @Test
    void duplicatedBitIsRejectedNamingBothPlaces(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("dup.json");
        Files.writeString(f, """
                {"name": "mine", "colourBits": 6, "lanes": [
                  ["G0", "R5", "R4", "R3", "R2", "R1", "R0"],
                  ["B1", "B0", "G5", "G4", "G3", "G2", "R3"],
                  ["DE", "VS", "HS", "B5", "B4", "B3", "B2"]]}""");
        OptionException e = assertThrows(OptionException.class, () -> SlotMapping.load(f));
        assertEquals("mappingFile", e.option());
        assertTrue(e.getMessage().contains("/lanes/1/6 (lane 1, slot 6)"), e.getMessage());
        assertTrue(e.getMessage().contains("R3 is duplicated"), e.getMessage());
        assertTrue(e.getMessage().contains("/lanes/0/3 (lane 0, slot 3)"), e.getMessage());
        assertTrue(e.getMessage().contains(f.toString()), e.getMessage());
    }

    @Test
    void missingBitIsRejected(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("missing.json");
        Files.writeString(f, """
                {"name": "mine", "colourBits": 6, "lanes": [
                  ["G0", "R5", "R4", "R3", "R2", "R1", "R0"],
                  ["B1", "B0", "G5", "G4", "G3", "-", "G1"],
                  ["DE", "VS", "HS", "B5", "B4", "B3", "B2"]]}""");
        OptionException e = assertThrows(OptionException.class, () -> SlotMapping.load(f));
        assertTrue(e.getMessage().contains("bit G2 is missing"), e.getMessage());
    }

    @Test
    void malformedTablesAreRejectedWithPlace(@TempDir Path dir) throws Exception {
        Map<String, String> cases = Map.of(
                "{\"name\": \"x\", \"colourBits\": 6, \"lanes\": [[\"G0\"]]}", "/lanes/0 (lane 0) must be an array of exactly 7",
                "{\"name\": \"x\", \"colourBits\": 7, \"lanes\": []}", "/colourBits must be 6 or 8",
                "{\"name\": \"x\", \"colourBits\": 6, \"lanes\": [[\"G0\",\"R5\",\"R4\",\"R3\",\"R2\",\"R1\",\"R7\"]]}",
                "/lanes/0/6 (lane 0, slot 6): 'R7' is not a bit name",
                "{\"name\": \"x\", \"colourBits\": 6,\n \"lanes\": [}", "line 2 column 12 at /lanes/0: expected a value",
                "{\"colourBits\": 6, \"lanes\": []}", "/name is required");
        int k = 0;
        for (Map.Entry<String, String> c : cases.entrySet()) {
            Path f = dir.resolve("t" + k++ + ".json");
            Files.writeString(f, c.getKey());
            OptionException e = assertThrows(OptionException.class, () -> SlotMapping.load(f), c.getKey());
            assertTrue(e.getMessage().contains(c.getValue()), e.getMessage());
        }
        OptionException e = assertThrows(OptionException.class, () -> SlotMapping.load(dir.resolve("absent.json")));
        assertTrue(e.getMessage().contains("no such mapping file")
                && e.getMessage().contains("looked in folder " + dir.toAbsolutePath().normalize()), e.getMessage());
    }

    /** A bad table named in a chain gives a chain error pointing at the option, not a stack trace. */
    @Test
    void badTableThroughThePluginNamesTheOption(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("dup.json");
        Files.writeString(f, "{\"name\": \"x\", \"colourBits\": 6, \"lanes\": [[\"G0\",\"G0\",\"R4\",\"R3\",\"R2\",\"R1\",\"R0\"]]}");
        ChainException e = assertThrows(ChainException.class,
                () -> StageHarness.of(new PixelLinkPlugin(), Map.of("mappingFile", f.toString())));
        assertTrue(e.getMessage().contains("mappingFile"), e.getMessage());
        assertTrue(e.getMessage().contains("lane 0, slot 1"), e.getMessage());
    }

    /** A user table is data: a 4-lane table written by hand decodes like the built-in one. */
    @Test
    void userTableDecodes(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("jeida.json");
        StringBuilder sb = new StringBuilder("{\"format\": \"lanesift-slot-map/1\", \"name\": \"my-jeida\", \"colourBits\": 8, \"lanes\": [");
        for (int l = 0; l < 4; l++) {
            sb.append(l == 0 ? "" : ",").append('[');
            for (int s = 0; s < 7; s++) {
                sb.append(s == 0 ? "" : ",").append('"').append(TestLink.JEIDA24[l][s]).append('"');
            }
            sb.append(']');
        }
        Files.writeString(f, sb.append("]}").toString());
        SlotMapping m = SlotMapping.load(f);
        assertEquals(rows(TestLink.JEIDA24), m.lanes());
        assertEquals(Arrays.deepToString(SlotMapping.builtIn("jeida-24").lookupTables(false)),
                Arrays.deepToString(m.lookupTables(false)));
    }
}
