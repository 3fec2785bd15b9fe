package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.JsonScan;

/**
 * The README's find-format workflow runs as written on the bundled capture
 * (examples/strip/strip.vcd): every {@code ./lanesift} command of the section is taken from the
 * README and run in order, a relative path resolved against the repository when it names a file
 * there and against a fresh folder otherwise (the commands' own outputs). The found format is the
 * one the capture was written with (StripCapture in the discovery plugin's tests).
 */
class FindFormatReadmeTest {
    static final Path ROOT = Path.of("..");

    @TempDir
    Path tmp;

    static List<String> commands() throws Exception {
        String readme = Files.readString(ROOT.resolve("README.md"), StandardCharsets.UTF_8);
        int from = readme.indexOf("### find-format");
        String section = readme.substring(from, readme.indexOf("\n### ", from + 1));
        List<String> out = new ArrayList<>();
        for (String line : section.lines().toList()) {
            if (line.strip().startsWith("./lanesift ")) {
                out.add(line.strip().substring("./lanesift ".length()));
            }
        }
        return out;
    }

    private String[] resolve(String command) {
        List<String> args = new ArrayList<>(Arrays.asList(command.split("\\s+")));
        for (int i = 1; i < args.size(); i++) {
            String a = args.get(i);
            boolean path = args.get(i - 1).equals("--capture") || args.get(i - 1).equals("--out")
                    || args.get(0).equals("run") && i == 1;
            if (path) {
                Path repo = ROOT.resolve(a);
                args.set(i, (Files.exists(repo) ? repo : tmp.resolve(a)).toAbsolutePath().toString());
            }
        }
        return args.toArray(new String[0]);
    }

    @Test
    void theReadmeWorkflowRunsAsWrittenOnTheBundledCapture() throws Exception {
        List<String> commands = commands();
        assertEquals(List.of("find-format", "run"), commands.stream().map(c -> c.split(" ")[0]).toList(), commands::toString);
        for (String c : commands) {
            EndToEndTest.Cli r = EndToEndTest.cli(resolve(c));
            assertEquals(0, r.code(), () -> c + "\n" + r);
        }
        Path found = tmp.resolve("found");
        JsonValue h = JsonScan.parse("hypotheses", Files.readString(found.resolve("discovery-hypotheses.json")));
        assertEquals("double-edge", h.at("/clocking/best").asString());
        assertEquals("00011101", h.at("/sync/wire").asString());
        assertEquals(8, h.at("/framings/0/wordBits").asDouble());
        assertEquals("lsb", h.at("/framings/0/bitOrder").asString());
        assertEquals("CRC-16/MCRF4XX", h.at("/checksum/model").asString());
        assertEquals(48, h.at("/pictures/0/lineLength").asDouble());
        assertEquals("rgb565", h.at("/pictures/0/format").asString());
        assertTrue(Files.size(found.resolve("discovery-pictures.png")) > 0);
        List<String> words = Files.readAllLines(tmp.resolve("decoded").resolve("words-words.csv"));
        assertTrue(words.size() > 100, "words: " + words.size());
    }
}
