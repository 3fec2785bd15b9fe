package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.File;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.jar.Attributes;
import java.util.jar.JarEntry;
import java.util.jar.JarOutputStream;
import java.util.jar.Manifest;
import java.util.stream.Stream;
import javax.tools.JavaCompiler;
import javax.tools.ToolProvider;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.lanesift.testkit.ExternalTool;

/**
 * The class-data archive of the {@code ./lanesift} launcher (DEVELOPERS.md, "Cold start"), on a
 * copy of the launcher in a folder of its own whose jar is a small probe program (so no build
 * runs): the archive is made from the class lists of the two example runs (the example chain, and
 * a double-edge capture the launcher writes), holds a class of an old class-file version
 * (picocli's, major version 49) and a lambda's old interface, is checked and then used; a failed
 * example run leaves the marker and no archive, is not retried for the same jar, and the command
 * still runs; an archive changed after it was checked (truncated) is never
 * mapped, and is made again.
 */
class LauncherArchiveTest {
    /** The probe: the example run and the command; loads an old-version class and a lambda of an old interface. */
    private static final String PROBE = """
            import java.nio.file.*;
            public class Probe {
                public static void main(String[] args) throws Exception {
                    String log = System.getenv("PROBE_LOG");
                    if (log != null) {
                        Files.writeString(Path.of(log), String.join(" ", args) + "\\n",
                                StandardOpenOption.CREATE, StandardOpenOption.APPEND);
                    }
                    if (args.length > 0 && args[0].equals(System.getenv("PROBE_FAIL"))) {
                        System.exit(1);
                    }
                    Class.forName("picocli.CommandLine$Command");
                    picocli.CommandLine.IVersionProvider v = () -> new String[] {"probe 1"};
                    System.out.println(v.getVersion()[0] + " " + String.join(" ", args));
                }
            }
            """;

    @TempDir
    Path root;
    Path target;
    Path log;

    @BeforeEach
    void copyLauncherAndProbe() throws Exception {
        ExternalTool.require("bash");
        Files.copy(Path.of("../lanesift"), root.resolve("lanesift"), StandardCopyOption.COPY_ATTRIBUTES);
        Path examples = Files.createDirectories(root.resolve("plugins/differential/examples"));
        Files.copy(Path.of("../plugins/differential/examples/clock-lane.json"), examples.resolve("clock-lane.json"));
        Path scripts = Files.createDirectories(root.resolve("bench/scripts"));
        Files.copy(Path.of("../bench/scripts/ddr-chain.json"), scripts.resolve("ddr-chain.json"));
        target = Files.createDirectories(root.resolve("dist/target"));
        Files.writeString(target.resolve("lanesift.sources"), ""); // no sources here: the jar is never stale
        probeJar(target.resolve("lanesift.jar"));
        log = root.resolve("probe.log");
    }

    @Test
    void archiveHoldsTheOldClassesOfTheExampleRunAndIsUsed() throws Exception {
        assertEquals("probe 1 run x\n", launch(Map.of(), "run", "x"));
        assertTrue(Files.size(target.resolve("lanesift.jsa")) > 0);
        assertEquals(Long.toString(Files.size(target.resolve("lanesift.jsa"))),
                Files.readString(target.resolve("lanesift.jsa.bytes")).strip());
        assertFalse(Files.exists(target.resolve("lanesift.jsa.failed")));
        List<String> calls = Files.readAllLines(log);
        assertEquals(4, calls.size(), calls::toString); // the example runs, the check start, the command
        assertTrue(calls.get(0).matches("run \\S+/plugins/differential/examples/clock-lane\\.json --out \\S+ --quiet"), calls::toString);
        assertTrue(calls.get(1).matches("run (\\S+)/ddr-chain\\.json --outputs binary,artifacts,annotations --out \\1/ddr --quiet"),
                calls::toString);
        assertEquals(List.of("--version", "run x"), calls.subList(2, 4));

        Path classes = root.resolve("classes.txt");
        launch(Map.of("LANESIFT_JAVA_OPTS", "-Xlog:class+load:file=" + classes), "run", "y");
        String loaded = Files.readString(classes);
        for (String c : List.of("Probe", "picocli.CommandLine$Command", "picocli.CommandLine$IVersionProvider")) {
            assertTrue(loaded.contains(" " + c + " source: shared objects file"), c + " not from the archive:\n" + loaded);
        }
        assertEquals(calls.size() + 1, Files.readAllLines(log).size(), "the archive is made once per jar");
    }

    /** The example run fails, or the start that must use the new archive fails. */
    @ParameterizedTest
    @CsvSource({"run, plugins", "--version, run"})
    void aFailedStepLeavesTheMarkerAndTheCommandRuns(String failing, String command) throws Exception {
        assertEquals("probe 1 " + command + "\n", launch(Map.of("PROBE_FAIL", failing), command));
        assertTrue(Files.exists(target.resolve("lanesift.jsa.failed")));
        assertFalse(Files.exists(target.resolve("lanesift.jsa")));
        assertFalse(Files.exists(target.resolve("lanesift.jsa.bytes")));
        try (Stream<Path> s = Files.list(target)) {
            assertEquals(List.of(), s.map(p -> p.getFileName().toString()).filter(n -> n.contains(".tmp")).toList());
        }
        int calls = Files.readAllLines(log).size();
        assertEquals("probe 1 " + command + "\n", launch(Map.of("PROBE_FAIL", failing), command));
        assertEquals(calls + 1, Files.readAllLines(log).size(), "not retried for the same jar");
        assertFalse(Files.exists(target.resolve("lanesift.jsa")));
    }

    @Test
    void aTruncatedArchiveIsNeverMappedAndIsMadeAgain() throws Exception {
        launch(Map.of(), "--version");
        int calls = Files.readAllLines(log).size();
        long size = Files.size(target.resolve("lanesift.jsa"));
        truncate(target.resolve("lanesift.jsa"));
        Path classes = root.resolve("classes.txt");
        assertEquals("probe 1 run z\n", launch(Map.of("LANESIFT_JAVA_OPTS", "-Xlog:class+load:file=" + classes), "run", "z"));
        assertTrue(Files.readAllLines(log).size() > calls + 1, "made again");
        assertEquals(size, Files.size(target.resolve("lanesift.jsa")));
        assertEquals(Long.toString(size), Files.readString(target.resolve("lanesift.jsa.bytes")).strip());
        assertTrue(Files.readString(classes).contains(" Probe source: shared objects file"));
    }

    @Test
    void aTruncatedArchiveThatIsNotMadeAgainIsNotUsed() throws Exception {
        launch(Map.of(), "--version");
        truncate(target.resolve("lanesift.jsa"));
        Files.writeString(target.resolve("lanesift.jsa.failed"), ""); // as if making it again had failed
        int calls = Files.readAllLines(log).size();
        Path classes = root.resolve("classes.txt");
        assertEquals("probe 1 run z\n", launch(Map.of("LANESIFT_JAVA_OPTS", "-Xlog:class+load:file=" + classes), "run", "z"));
        assertEquals(calls + 1, Files.readAllLines(log).size(), "not made again");
        // the JDK's own archive may serve JDK classes; the probe can only come from the jar
        assertTrue(Files.readString(classes).contains(" Probe source: file:"), "the truncated archive was mapped");
    }

    /** Keeps the first half (at most 1 MiB) of a file, written anew as a copy tool or a full disk would leave it. */
    private static void truncate(Path file) throws IOException {
        byte[] head = new byte[(int) Math.min(Files.size(file) / 2, 1 << 20)];
        try (InputStream in = Files.newInputStream(file)) {
            assertEquals(head.length, in.readNBytes(head, 0, head.length));
        }
        Files.delete(file); // read-only after the dump
        Files.write(file, head);
    }

    /**
     * The double-edge capture the launcher writes for its second example run decodes, through the
     * chain that run uses (bench/scripts/ddr-chain.json), to the bits it was written from: lane j
     * carries bit j of the 16-bit LFSR (taps 0xB400, seed 44257), one value per clock edge.
     */
    @Test
    void theExampleCaptureDecodesToItsBits(@TempDir Path dir) throws Exception {
        ExternalTool.run(dir, java.time.Duration.ofMinutes(1), List.of("bash", "-c",
                "source <(sed -n '/^ddr_example() {/,/^}$/p' \"$0\") && ddr_example \"$1\" 4000",
                Path.of("../lanesift").toAbsolutePath().toString(), dir.toString()));
        Files.copy(Path.of("../bench/scripts/ddr-chain.json"), dir.resolve("ddr-chain.json"));
        java.io.ByteArrayOutputStream o = new java.io.ByteArrayOutputStream();
        java.io.PrintStream ps = new java.io.PrintStream(o, true, StandardCharsets.UTF_8);
        assertEquals(0, org.lanesift.runner.ChainRun.of(dir.resolve("ddr-chain.json")).out(dir.resolve("out")).quiet(true)
                .run(ps, ps), o.toString(StandardCharsets.UTF_8));
        int lfsr = 44257;
        StringBuilder[] expected = {new StringBuilder(), new StringBuilder(), new StringBuilder()};
        for (int s = 1; s < 4000; s += 2) {
            lfsr = (lfsr >>> 1) ^ (-(lfsr & 1) & 0xB400);
            for (int j = 0; j < 3; j++) {
                expected[j].append((lfsr >> j) & 1);
            }
        }
        for (int j = 0; j < 3; j++) {
            List<String> rows = Files.readAllLines(dir.resolve("out/rx-bits" + j + "-bits.csv"));
            StringBuilder bits = new StringBuilder();
            for (String row : rows.subList(1, rows.size())) {
                bits.append(row.split(",", 3)[1]);
            }
            assertTrue(bits.length() >= 1990, "lane " + j + ": " + bits.length() + " bits of 2000 clock edges");
            assertEquals(expected[j].substring(0, bits.length()), bits.toString(), "lane " + j);
        }
    }

    /** Runs the copied launcher with the test's JDK first on the PATH; returns standard output. */
    private String launch(Map<String, String> env, String... args) throws IOException, InterruptedException {
        List<String> cmd = new ArrayList<>(List.of("bash", root.resolve("lanesift").toString()));
        cmd.addAll(List.of(args));
        ProcessBuilder pb = new ProcessBuilder(cmd).directory(root.toFile());
        Path err = root.resolve("stderr.txt");
        pb.redirectError(err.toFile());
        pb.environment().put("PATH", Path.of(System.getProperty("java.home"), "bin") + File.pathSeparator + System.getenv("PATH"));
        pb.environment().put("PROBE_LOG", log.toString());
        pb.environment().remove("LANESIFT_JAVA_OPTS");
        pb.environment().putAll(env);
        Process p = pb.start();
        p.getOutputStream().close();
        byte[] out = p.getInputStream().readAllBytes();
        if (!p.waitFor(3, TimeUnit.MINUTES)) {
            p.destroyForcibly();
            throw new AssertionError("the launcher did not finish in 3 minutes");
        }
        assertEquals(0, p.exitValue(), Files.readString(err));
        assertEquals("", Files.readString(err));
        return new String(out, StandardCharsets.UTF_8);
    }

    /** The probe compiled against picocli, in a jar with picocli's two classes it uses (class-file major version 49). */
    private static void probeJar(Path jar) throws IOException {
        Path src = Files.createTempDirectory("probe");
        try {
            Path picocli = Path.of(classFileUrl("picocli/CommandLine.class").replaceFirst("^jar:file:", "").replaceFirst("!.*$", ""));
            Files.writeString(src.resolve("Probe.java"), PROBE);
            JavaCompiler javac = ToolProvider.getSystemJavaCompiler();
            assertEquals(0, javac.run(null, null, null, "-d", src.toString(), "-cp", picocli.toString(),
                    src.resolve("Probe.java").toString()));
            Manifest m = new Manifest();
            m.getMainAttributes().put(Attributes.Name.MANIFEST_VERSION, "1.0");
            m.getMainAttributes().put(Attributes.Name.MAIN_CLASS, "Probe");
            try (JarOutputStream out = new JarOutputStream(Files.newOutputStream(jar), m)) {
                add(out, "Probe.class", Files.readAllBytes(src.resolve("Probe.class")));
                for (String c : List.of("picocli/CommandLine$Command.class", "picocli/CommandLine$IVersionProvider.class")) {
                    try (InputStream in = LauncherArchiveTest.class.getClassLoader().getResourceAsStream(c)) {
                        byte[] b = in.readAllBytes();
                        assertEquals(49, ((b[6] & 0xff) << 8) | (b[7] & 0xff), c + ": class-file major version");
                        add(out, c, b);
                    }
                }
            }
        } finally {
            try (Stream<Path> s = Files.walk(src)) {
                s.sorted(java.util.Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    private static String classFileUrl(String name) {
        return LauncherArchiveTest.class.getClassLoader().getResource(name).toString();
    }

    private static void add(JarOutputStream out, String name, byte[] bytes) throws IOException {
        out.putNextEntry(new JarEntry(name));
        out.write(bytes);
        out.closeEntry();
    }
}
