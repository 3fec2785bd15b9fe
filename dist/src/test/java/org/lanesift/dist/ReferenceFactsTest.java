package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * Reference facts live in the repository: every section of {@code reference-facts.md} cited anywhere
 * in the source tree (code, tests, resources, docs) names a section that exists in
 * {@code docs/reference-facts.md}, and nothing cites the design document that stays outside the
 * repository. The tree is found by walking up from this module to the directory that holds the
 * parent pom and docs/; nothing outside it is read.
 */
class ReferenceFactsTest {
    private static final Pattern CITE = Pattern.compile("reference-facts\\.md#([A-Za-z0-9_-]*)");
    private static final Pattern HEADING = Pattern.compile("^#{1,6} +(.+?) *$", Pattern.MULTILINE);
    private static final Set<String> TEXT = Set.of("java", "md", "json", "v", "xml", "properties", "txt", "tsv", "jsh", "sh");

    static Path repositoryRoot() {
        for (Path p = Path.of("").toAbsolutePath(); p != null; p = p.getParent()) {
            if (Files.isRegularFile(p.resolve("pom.xml")) && Files.isRegularFile(p.resolve("docs/reference-facts.md"))) {
                return p;
            }
        }
        throw new IllegalStateException("no repository root with docs/reference-facts.md above " + Path.of("").toAbsolutePath());
    }

    /** The anchor a Markdown renderer derives from a heading: lower case, punctuation dropped, spaces to '-'. */
    static String anchorOf(String heading) {
        return heading.toLowerCase(Locale.ROOT).replaceAll("[^a-z0-9 _-]", "").trim().replace(' ', '-');
    }

    static Set<String> anchors(String markdown) {
        Set<String> out = new TreeSet<>();
        Matcher m = HEADING.matcher(markdown);
        while (m.find()) {
            out.add(anchorOf(m.group(1)));
        }
        return out;
    }

    @Test
    void anchorsFollowTheHeadings() {
        assertEquals("dsi-packets-ecc-and-checksum", anchorOf("DSI packets, ECC and checksum"));
        assertEquals("d-phy-levels-and-states", anchorOf("D-PHY levels and states"));
        assertEquals(Set.of("a-b", "c"), anchors("# A b\ntext # not a heading\n## C\n"));
    }

    @Test
    void everyCitedAnchorExists() throws IOException {
        Path root = repositoryRoot();
        Set<String> known = anchors(Files.readString(root.resolve("docs/reference-facts.md"), StandardCharsets.UTF_8));
        assertTrue(known.contains("lvds-electrical-levels") && known.size() >= 9, known::toString);
        String outside = "DESIGN" + ".md";
        List<String> missing = new ArrayList<>();
        List<String> outsideCites = new ArrayList<>();
        int cites = 0;
        try (Stream<Path> files = Files.walk(root)) {
            for (Path f : files.filter(f -> sourceFile(root.relativize(f), f)).toList()) {
                String text = Files.readString(f, StandardCharsets.UTF_8);
                Matcher m = CITE.matcher(text);
                while (m.find()) {
                    cites++;
                    if (!known.contains(m.group(1))) {
                        missing.add(root.relativize(f) + ": #" + m.group(1));
                    }
                }
                if (text.contains(outside)) {
                    outsideCites.add(root.relativize(f).toString());
                }
            }
        }
        assertEquals(List.of(), missing, "cited anchors that docs/reference-facts.md does not have; known: " + known);
        assertEquals(List.of(), outsideCites, "files that cite a document outside the repository");
        assertTrue(cites >= 30, "expected the code, tests and docs to cite the facts at least 30 times, found " + cites);
    }

    /** A text file of the tree, not under build output, version control or a run's output folder. */
    private static boolean sourceFile(Path relative, Path f) {
        for (Path part : relative) {
            String s = part.toString();
            if (s.equals("target") || s.equals(".git") || s.equals("node_modules") || s.startsWith("lanesift-")) {
                return false;
            }
        }
        String n = f.getFileName().toString();
        int dot = n.lastIndexOf('.');
        return Files.isRegularFile(f) && dot > 0 && TEXT.contains(n.substring(dot + 1));
    }
}
