package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Every malformed chain file under {@code bad/chain/} must give exit code 2 and exactly one line
 * on stderr that names the file and the JSON pointer or line, and says what was expected; no
 * stack trace, no hang. {@code bad/chain/EXPECTED.tsv} says what each line must contain.
 */
class BadChainCorpusTest {
    @TempDir
    Path tmp;

    static Path dir() throws URISyntaxException {
        return Path.of(BadChainCorpusTest.class.getResource("/bad/chain/EXPECTED.tsv").toURI()).getParent();
    }

    static List<String[]> expected() throws IOException, URISyntaxException {
        return Files.readAllLines(dir().resolve("EXPECTED.tsv"), StandardCharsets.UTF_8).stream()
                .filter(l -> !l.isBlank() && !l.startsWith("#")).map(l -> l.split("\t")).toList();
    }

    static Stream<Arguments> corpus() throws IOException, URISyntaxException {
        return expected().stream().map(a -> Arguments.of(a[0], a[1], a.length > 2 ? a[2] : a[0]));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("corpus")
    void exitsWithTwoAndOneLineNamingFileAndPlace(String file, String fragment, String named) throws Exception {
        Path chain = dir().resolve(file);
        Path out = tmp.resolve("out");
        Cli r = assertTimeoutPreemptively(Duration.ofSeconds(20),
                () -> Cli.run("run", chain.toString(), "--out", out.toString(), "--quiet"));
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        String line = r.errLines().get(0);
        assertTrue(line.contains(named), () -> "line should name " + named + ": " + line);
        assertTrue(line.contains(fragment), () -> "line should contain '" + fragment + "': " + line);
        assertFalse(line.contains("Exception") || line.contains("\tat ") || line.contains("internal error"), line);
        assertTrue(line.length() < 600, () -> "line too long: " + line.length());
        assertEquals("", r.out(), "nothing on stdout");
    }

    @Test
    void everyChainFileInTheCorpusHasAnExpectation() throws Exception {
        Set<String> listed = expected().stream().map(a -> a[0]).collect(Collectors.toCollection(TreeSet::new));
        Set<String> present;
        try (Stream<Path> s = Files.list(dir())) {
            present = s.map(p -> p.getFileName().toString()).filter(n -> n.endsWith(".json"))
                    .collect(Collectors.toCollection(TreeSet::new));
        }
        assertEquals(present, listed);
        assertTrue(listed.size() >= 12, "at least 12 bad chain files");
    }

    @Test
    void debugAddsTheStackTraceAfterTheSameLine() throws Exception {
        Path chain = dir().resolve("cycle.json");
        Cli plain = Cli.run("run", chain.toString(), "--out", tmp.resolve("a").toString());
        Cli debug = Cli.run("--debug", "run", chain.toString(), "--out", tmp.resolve("b").toString());
        assertEquals(2, debug.code());
        assertEquals(plain.errLines().get(0), debug.errLines().get(0));
        assertTrue(debug.err().contains("\tat "), debug::toString);
    }
}
