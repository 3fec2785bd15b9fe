package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Issue 18 item 4: a named pipe, a device or a directory given where a file is read (chain file,
 * capture, sidecar) is refused with one line and exit code 2, never opened (opening a pipe waits for
 * a writer; a device never ends).
 */
class NotAFileTest {
    @TempDir
    Path tmp;

    @BeforeEach
    void unix() {
        assumeTrue(Files.exists(Path.of("/dev/null")), "a Unix system");
    }

    private Path fifo(String name) throws Exception {
        Path p = tmp.resolve(name);
        Process mk = new ProcessBuilder("mkfifo", p.toString()).start();
        assumeTrue(mk.waitFor() == 0, "mkfifo is available");
        return p;
    }

    private static Cli run(String... args) {
        return assertTimeoutPreemptively(Duration.ofSeconds(30), () -> Cli.run(args));
    }

    private Path chainReading(String plugin, Path file) throws Exception {
        Path c = tmp.resolve("c.json");
        Files.writeString(c, "{\"nodes\": [{\"id\": \"cap\", \"plugin\": \"" + plugin + "\", \"options\": {\"file\": \""
                + file + "\"}}]}");
        return c;
    }

    private static void oneLine(Cli r, String named, String what) {
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        String line = r.errLines().get(0);
        assertTrue(line.contains(named), () -> "should name " + named + ": " + line);
        assertTrue(line.contains(what + ", not a regular file; expected a file"), line);
    }

    @Test
    void aPipeAsChainFile() throws Exception {
        Path p = fifo("chain.json");
        oneLine(run("run", p.toString(), "--out", tmp.resolve("o").toString(), "-q"), "chain.json", "a pipe, device or socket");
    }

    @ParameterizedTest
    @ValueSource(strings = {"csv", "vcd", "raw"})
    void aPipeAsCapture(String plugin) throws Exception {
        Path p = fifo("cap." + (plugin.equals("raw") ? "bin" : plugin));
        if (plugin.equals("raw")) {
            Files.writeString(tmp.resolve("cap.bin.json"), "{\"rateHz\": 1e6, \"format\": \"uint8\", \"channels\": [{\"name\": \"a\"}]}");
        }
        oneLine(run("run", chainReading(plugin, p).toString(), "--out", tmp.resolve("o").toString(), "-q"), "cap.", "a pipe, device or socket");
        oneLine(run("inspect", p.toString()), "cap.", "a pipe, device or socket");
    }

    @Test
    void aPipeAsSidecarAndADirectoryAsCapture() throws Exception {
        Path bin = tmp.resolve("cap.bin");
        Files.write(bin, new byte[16]);
        fifo("cap.bin.json");
        oneLine(run("run", chainReading("raw", bin).toString(), "--out", tmp.resolve("o").toString(), "-q"), "cap.bin.json",
                "a pipe, device or socket");
        Path dir = tmp.resolve("folder.csv");
        Files.createDirectories(dir);
        oneLine(run("run", chainReading("csv", dir).toString(), "--out", tmp.resolve("o2").toString(), "-q"), "folder.csv", "a directory");
    }

    @Test
    void aDeviceAsCapture() throws Exception {
        oneLine(run("run", chainReading("csv", Path.of("/dev/zero")).toString(), "--out", tmp.resolve("o").toString(), "-q"),
                "zero", "a pipe, device or socket");
    }

    /** Issue 18 item 5: a NUL in a file option (chain file, --input, --set) is bad input, exit 2, naming where. */
    @Test
    void aNulInAFileOptionIsBadInput() throws Exception {
        Path c = tmp.resolve("nul.json");
        Files.writeString(c, "{\"nodes\": [{\"id\": \"cap\", \"plugin\": \"csv\", \"options\": {\"file\": \"a\\u0000b.csv\"}}]}");
        Cli r = run("run", c.toString(), "--out", tmp.resolve("o").toString(), "-q");
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        assertTrue(r.errLines().get(0).contains("nul.json") && r.errLines().get(0).contains("/nodes/0/options/file")
                && r.errLines().get(0).contains("NUL character at position 2"), r::toString);
        Path ok = chainReading("csv", tmp.resolve("x.csv"));
        Cli in = run("run", ok.toString(), "--out", tmp.resolve("o").toString(), "-q", "--input", "cap=a\0b.csv");
        assertEquals(2, in.code(), in::toString);
        assertTrue(in.errLines().get(0).startsWith("--input cap=a\\x00b.csv: the path has a NUL character"), in::toString);
        Cli set = run("run", ok.toString(), "--out", tmp.resolve("o").toString(), "-q", "--set", "cap.file=a\0b.csv");
        assertEquals(2, set.code(), set::toString);
        assertTrue(set.errLines().get(0).startsWith("--set cap.file=a\\x00b.csv: the path has a NUL character"), set::toString);
    }
}
