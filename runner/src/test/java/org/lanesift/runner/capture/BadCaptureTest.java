package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.lanesift.capture.Captures;
import org.lanesift.plugin.PluginProvider;

/**
 * Every file of the bad-capture corpus (src/test/resources/bad/capture, expectations in CASES.txt)
 * must fail with a {@link CaptureFormatException} that names the file, the line or JSON pointer
 * and what was expected, both through {@link Inspector} and through the source plugin run by the
 * chain engine, within a time limit. Huge inputs (a header of 10^9 columns, an over-long line, an
 * over-long token) are written at run time into a temporary directory.
 */
class BadCaptureTest {
    static final Path DIR = Path.of("src/test/resources/bad/capture");

    record Case(String file, Map<String, String> options, String named, long line, String pointer, String words) {
        @Override
        public String toString() {
            return file;
        }
    }

    static List<Case> cases() throws IOException {
        List<Case> out = new ArrayList<>();
        for (String ln : Files.readAllLines(DIR.resolve("CASES.txt"))) {
            if (ln.isBlank() || ln.startsWith("#")) {
                continue;
            }
            String[] f = ln.split(" \\| ", 6);
            Map<String, String> opts = new HashMap<>();
            if (!f[1].equals("-")) {
                for (String kv : f[1].split(",")) {
                    String[] p = kv.split("=", 2);
                    opts.put(p[0], p[1]);
                }
            }
            out.add(new Case(f[0], opts, f[2], Long.parseLong(f[3]), f[4].equals("-") ? null : f[4], f[5]));
        }
        return out;
    }

    static Stream<Case> corpus() throws IOException {
        return cases().stream();
    }

    @Test
    void corpusAndExpectationsAgree() throws IOException {
        Set<String> listed = new HashSet<>();
        for (Case c : cases()) {
            listed.add(c.file());
            listed.add(c.file() + ".json");
        }
        List<String> files;
        try (Stream<Path> s = Files.list(DIR)) {
            files = s.map(p -> p.getFileName().toString()).filter(n -> !n.equals("CASES.txt")).sorted().toList();
        }
        for (String f : files) {
            assertTrue(listed.contains(f), f + " is in the corpus but not in CASES.txt");
        }
        assertTrue(cases().size() >= 15, "at least 15 bad captures");
    }

    private static CaptureFormatException find(Throwable t) {
        for (Throwable x = t; x != null; x = x.getCause()) {
            if (x instanceof CaptureFormatException e) {
                return e;
            }
        }
        return null;
    }

    private static void check(Case c, Throwable t, String how) {
        CaptureFormatException e = find(t);
        if (e == null) {
            fail(how + " of " + c.file() + ": expected a CaptureFormatException, got " + t, t);
        }
        String msg = e.getMessage();
        assertEquals(c.named(), e.file().getFileName().toString(), how + ": file named in " + msg);
        assertEquals(c.line(), e.line(), how + ": line of " + msg);
        if (c.line() > 0 && c.pointer() != null) {
            // refused by the JSON reader: its shape, with line, column and pointer, as for every JSON input
            String shape = java.util.regex.Pattern.quote(c.named() + " line " + c.line() + " column ") + "[0-9]+"
                    + java.util.regex.Pattern.quote(" at " + c.pointer() + ": ") + ".*";
            assertTrue(msg.matches(shape), how + ": '" + msg + "' should match '" + shape + "'");
        } else {
            String prefix = c.named() + (c.line() > 0 ? " line " + c.line() + ": " : ": ") + (c.pointer() == null ? "" : c.pointer() + ": ");
            assertTrue(msg.startsWith(prefix), how + ": '" + msg + "' should start with '" + prefix + "'");
        }
        assertTrue(msg.contains(c.words()), how + ": '" + msg + "' should say '" + c.words() + "'");
        assertTrue(msg.length() < 400 && !msg.contains("\n"), how + ": one short line, got '" + msg + "'");
    }

    private static PluginProvider provider(Path p) {
        return switch (Captures.pluginFor(p)) {
            case "csv" -> new CsvSource();
            case "vcd" -> new VcdSource();
            default -> new RawSource();
        };
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("corpus")
    void inspectNamesFileLineAndExpectation(Case c) {
        Path p = DIR.resolve(c.file());
        Throwable t = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> {
            try {
                Inspector.inspect(p, c.options());
                return null;
            } catch (RuntimeException e) {
                return e;
            }
        });
        check(c, t, "inspect");
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("corpus")
    void sourcePluginNamesFileLineAndExpectation(Case c) {
        Path p = DIR.resolve(c.file());
        Map<String, Object> o = new HashMap<>(c.options());
        o.put("file", p.toString());
        Throwable t = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> {
            try {
                Collected.run(provider(p), o);
                return null;
            } catch (RuntimeException e) {
                return e;
            }
        });
        check(c, t, "source plugin");
    }

    /** A header line of 10^9 columns (10^9 - 1 commas, 1 GB): refused after reading 1 MiB, in bounded memory. */
    @Test
    void headerOfABillionColumns(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("billion-columns.csv");
        byte[] chunk = new byte[1 << 20];
        Arrays.fill(chunk, (byte) ',');
        long commas = 1_000_000_000L - 1;
        try (FileChannel ch = FileChannel.open(f, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE)) {
            long left = commas;
            while (left > 0) {
                ByteBuffer bb = ByteBuffer.wrap(chunk, 0, (int) Math.min(chunk.length, left));
                left -= bb.remaining();
                while (bb.hasRemaining()) {
                    ch.write(bb);
                }
            }
            ch.write(ByteBuffer.wrap("\n1\n2\n".getBytes(StandardCharsets.US_ASCII)));
        }
        try {
            assertEquals(1_000_000_000L - 1 + 5, Files.size(f));
            Case c = new Case("billion-columns.csv", Map.of(), "billion-columns.csv", 1, null,
                    "longer than 1048576 bytes; expected a header of at most 4096 columns");
            Throwable t = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> {
                try {
                    Inspector.inspect(f, Map.of());
                    return null;
                } catch (RuntimeException e) {
                    return e;
                }
            });
            check(c, t, "inspect");
            Throwable t2 = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> {
                try {
                    Collected.run(new CsvSource(), Map.of("file", f.toString()));
                    return null;
                } catch (RuntimeException e) {
                    return e;
                }
            });
            check(c, t2, "source plugin");
        } finally {
            Files.deleteIfExists(f);
        }
    }

    /** A data line of 2 MiB in the middle of a good file. */
    @Test
    void overLongDataLine(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("long-line.csv");
        StringBuilder sb = new StringBuilder("Time,CH1\n0,1\n1e-9,2\n2e-9,");
        sb.append("1".repeat(2 << 20)).append("\n3e-9,4\n");
        Files.writeString(f, sb);
        Case c = new Case("long-line.csv", Map.of(), "long-line.csv", 4, null, "line longer than 1048576 bytes");
        Throwable t = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> {
            try {
                Collected.run(new CsvSource(), Map.of("file", f.toString()));
                return null;
            } catch (RuntimeException e) {
                return e;
            }
        });
        check(c, t, "source plugin");
    }

    /** A VCD comment that is one token of 2 MiB. */
    @Test
    void overLongVcdToken(@TempDir Path dir) throws IOException {
        Path f = dir.resolve("long-token.vcd");
        Files.writeString(f, "$timescale 1ns $end\n$comment\n" + "a".repeat(2 << 20) + "\n$end\n");
        Case c = new Case("long-token.vcd", Map.of(), "long-token.vcd", 3, null, "token longer than 65536 bytes");
        Throwable t = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> {
            try {
                Inspector.inspect(f, Map.of());
                return null;
            } catch (RuntimeException e) {
                return e;
            }
        });
        check(c, t, "inspect");
    }
}
