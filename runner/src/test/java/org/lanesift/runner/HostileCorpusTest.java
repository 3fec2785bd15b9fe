package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.lanesift.json.JsonWriter;

/**
 * The hostile-input corpus of issue 18 ({@code src/test/resources/hostile}, listed in
 * {@code CASES.tsv}): every bad capture or sidecar gives exit code 2 and one short printable line
 * that names the file and the place (line or JSON pointer) and says what was expected, through
 * {@code inspect} and through {@code run}; every odd-but-valid capture decodes, with the expected
 * number of samples. Together with the older corpora (bad/capture, bad/chain) it holds well over
 * 250 cases.
 */
class HostileCorpusTest {
    static final Path DIR = Path.of("src/test/resources/hostile");

    @TempDir
    Path tmp;

    /** One line of CASES.tsv. */
    record Case(String file, boolean bad, String options, String place, String words) {
        @Override
        public String toString() {
            return file;
        }
    }

    static List<Case> cases() throws Exception {
        List<Case> out = new ArrayList<>();
        for (String ln : Files.readAllLines(DIR.resolve("CASES.tsv"), StandardCharsets.UTF_8)) {
            if (ln.isBlank() || ln.startsWith("#")) {
                continue;
            }
            String[] f = ln.split("\t", -1);
            out.add(new Case(f[0], f[1].equals("bad"), f[2], f[3], f[4]));
        }
        return out;
    }

    static Stream<Case> bad() throws Exception {
        return cases().stream().filter(Case::bad);
    }

    static Stream<Case> odd() throws Exception {
        return cases().stream().filter(c -> !c.bad());
    }

    private static String plugin(String file) {
        return file.endsWith(".vcd") ? "vcd" : file.endsWith(".bin") ? "raw" : "csv";
    }

    private Path chain(Case c) throws Exception {
        StringBuilder o = new StringBuilder("\"file\": " + JsonWriter.quote(DIR.resolve(c.file()).toAbsolutePath().toString()));
        if (!c.options().equals("-")) {
            for (String kv : c.options().split(",")) {
                String[] p = kv.split("=", 2);
                o.append(", ").append(JsonWriter.quote(p[0])).append(": ").append(p[1]);
            }
        }
        Path ch = tmp.resolve("chain.json");
        Files.writeString(ch, "{\"nodes\": [{\"id\": \"cap\", \"plugin\": \"" + plugin(c.file()) + "\", \"options\": {" + o + "}}]}");
        return ch;
    }

    private static Cli timed(String... args) {
        return assertTimeoutPreemptively(Duration.ofSeconds(30), () -> Cli.run(args));
    }

    private static void oneGoodLine(Case c, Cli r, String how) {
        assertEquals(2, r.code(), () -> how + ": " + r);
        assertEquals(1, r.errLines().size(), () -> how + ": " + r);
        String line = r.errLines().get(0);
        assertTrue(line.contains(c.file()), () -> how + ": the line should name " + c.file() + ": " + line);
        if (!c.place().equals("-")) {
            assertTrue(line.contains(c.place()), () -> how + ": the line should name " + c.place() + ": " + line);
        }
        if (!c.words().equals("-")) {
            assertTrue(line.contains(c.words()), () -> how + ": the line should say '" + c.words() + "': " + line);
        }
        assertFalse(line.contains("internal error") || line.contains("Exception") || line.contains("\tat "), () -> how + ": " + line);
        assertTrue(line.length() < 600, () -> how + ": line of " + line.length() + " characters");
        assertTrue(line.chars().noneMatch(ch -> ch < 0x20 || ch == 0x7f), () -> how + ": control character in " + line);
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("bad")
    void eachBadInputExitsTwoWithOneLineNamingFileAndPlace(Case c) throws Exception {
        oneGoodLine(c, timed("run", chain(c).toString(), "--out", tmp.resolve("out").toString(), "-q"), "run");
        if (c.options().equals("-")) {
            oneGoodLine(c, timed("inspect", DIR.resolve(c.file()).toString()), "inspect");
        }
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("odd")
    void eachOddButValidInputDecodes(Case c) throws Exception {
        Path out = tmp.resolve("out");
        Cli r = timed("run", chain(c).toString(), "--out", out.toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        assertTrue(Files.readString(out.resolve("report.md")).contains("- status: completed"));
        if (c.words().equals("transitions")) {
            assertTrue(Files.size(out.resolve("signals.vcd")) > 0, "the edges are in signals.vcd");
        } else {
            String[] pn = c.words().split("=");
            List<String> rows = Files.readAllLines(out.resolve("cap-" + pn[0] + ".csv"));
            assertEquals(Integer.parseInt(pn[1]), rows.size() - 1, () -> "samples of " + pn[0] + ": " + rows);
        }
    }

    @Test
    void theCorpusAndItsListAgreeAndItIsLargeEnough() throws Exception {
        Set<String> listed = cases().stream().map(Case::file).collect(Collectors.toCollection(TreeSet::new));
        Set<String> present;
        try (Stream<Path> s = Files.list(DIR)) {
            present = s.map(p -> p.getFileName().toString()).filter(n -> !n.equals("CASES.tsv") && !(n.endsWith(".bin.json")))
                    .collect(Collectors.toCollection(TreeSet::new));
        }
        assertEquals(present, listed);
        long older;
        try (Stream<String> a = Files.lines(Path.of("src/test/resources/bad/capture/CASES.txt"));
             Stream<String> b = Files.lines(Path.of("src/test/resources/bad/chain/EXPECTED.tsv"))) {
            older = Stream.concat(a, b).filter(l -> !l.isBlank() && !l.startsWith("#")).count();
        }
        assertTrue(cases().size() + older >= 250, "cases: " + (cases().size() + older));
    }
}
