package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.runner.Main;

/**
 * The demo's output files stay byte-identical: every file the demo writes is either listed with
 * its SHA-256 in {@code demo-digests.sha256} (test resources) and must match it, or is one of the
 * {@link #VARYING} files, whose text holds the output folder, a date or a run time. A new file, a
 * missing file or a changed byte fails the test; an intended change updates the list (see its
 * header) and says why in the commit.
 */
class DemoDigestTest {
    /**
     * Files that differ from run to run: reports hold the folder and the run time, VCD files hold
     * the date of the run. Chain files name their files relative to themselves, so they are fixed.
     */
    static final Pattern VARYING = Pattern.compile("(.*/)?report\\.md|.*\\.vcd");

    @Test
    void demoOutputsMatchTheListedDigests(@TempDir Path dir) throws Exception {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int code = Main.run(new String[] {"demo", "--out", dir.toString()}, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(out, true, StandardCharsets.UTF_8));
        assertEquals(0, code, () -> out.toString(StandardCharsets.UTF_8));

        Map<String, String> want = listed();
        Map<String, String> got = new TreeMap<>();
        List<String> varying = new ArrayList<>();
        try (Stream<Path> files = Files.walk(dir)) {
            for (Path f : files.filter(Files::isRegularFile).toList()) {
                String rel = dir.relativize(f).toString().replace('\\', '/');
                if (VARYING.matcher(rel).matches()) {
                    varying.add(rel);
                } else {
                    got.put(rel, sha256(f));
                }
            }
        }
        assertEquals(want.keySet(), got.keySet(), "the set of demo files with a fixed content");
        List<String> wrong = new ArrayList<>();
        for (Map.Entry<String, String> e : want.entrySet()) {
            if (!e.getValue().equals(got.get(e.getKey()))) {
                wrong.add(e.getKey() + " is " + got.get(e.getKey()) + ", listed " + e.getValue());
            }
        }
        assertEquals(List.of(), wrong, "demo files whose bytes changed");
        assertTrue(varying.contains("report.md") && got.containsKey("chains/pixel-3-decode.json"), varying::toString);
        assertEquals(8, varying.size(), () -> "files that vary between runs: " + varying);
        List<String> doubled = new ArrayList<>();
        for (String rel : got.keySet()) {
            if (DoubledWords.find(rel) != null) {
                doubled.add(rel + " (" + DoubledWords.find(rel) + ")");
            }
        }
        for (String rel : varying) {
            if (DoubledWords.find(rel) != null) {
                doubled.add(rel + " (" + DoubledWords.find(rel) + ")");
            }
        }
        assertEquals(List.of(), doubled, "demo output names with a doubled word");
    }

    /** Reads {@code demo-digests.sha256}: "HEX  relative/path" lines, '#' comments. */
    static Map<String, String> listed() throws IOException {
        Map<String, String> m = new TreeMap<>();
        try (InputStream in = DemoDigestTest.class.getResourceAsStream("/demo-digests.sha256")) {
            if (in == null) {
                throw new IllegalStateException("demo-digests.sha256 is missing from the test resources");
            }
            int n = 0;
            for (String line : new String(in.readAllBytes(), StandardCharsets.UTF_8).split("\n")) {
                n++;
                if (line.isBlank() || line.startsWith("#")) {
                    continue;
                }
                String[] f = line.split("  ", 2);
                if (f.length != 2 || !f[0].matches("[0-9a-f]{64}")) {
                    throw new IllegalStateException("demo-digests.sha256 line " + n + ": expected 'HEX  path', got '" + line + "'");
                }
                m.put(f[1], f[0]);
            }
        }
        return m;
    }

    static String sha256(Path f) throws Exception {
        MessageDigest md = MessageDigest.getInstance("SHA-256");
        byte[] buf = new byte[1 << 16];
        try (InputStream in = Files.newInputStream(f)) {
            for (int r; (r = in.read(buf)) > 0; ) {
                md.update(buf, 0, r);
            }
        }
        return HexFormat.of().formatHex(md.digest());
    }
}
