package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.condition.EnabledOnOs;
import org.junit.jupiter.api.condition.OS;
import org.junit.jupiter.api.io.TempDir;

/**
 * Issue 18 item 7, end to end: a {@code run} that writes frame pictures, in a child JVM, is sent
 * SIGINT (what Ctrl-C sends) once its first picture is written. The report must say the run was
 * cancelled, and the pictures of complete frames must be kept in {@code --out} and read back as
 * images; no work folder is left behind. (SIGINT through {@code kill -INT}, POSIX; Linux only.)
 */
@EnabledOnOs(OS.LINUX)
class CancelRunTest {
    @Test
    void ctrlCReportsCancelledAndKeepsCompletePictures(@TempDir Path dir) throws Exception {
        // the invented 7:1 link of TransmitterLoopTest, long enough (2000 frames) that the run is still going when signalled
        int frame = TransmitterLoopTest.HT * TransmitterLoopTest.VT;
        TransmitterLoopTest.writeUserCapture(dir.resolve("user.vcd"), 2000 * frame);
        String chain = TransmitterLoopTest.decodeChain("user.vcd");
        Path c = dir.resolve("chain.json");
        Files.writeString(c, chain);
        Path out = dir.resolve("out");
        List<String> cmd = List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(), "-cp",
                System.getProperty("java.class.path"), "org.lanesift.runner.Main", "run", c.toString(), "--out", out.toString(), "-q");
        Process p = new ProcessBuilder(cmd).directory(dir.toFile()).redirectErrorStream(true)
                .redirectOutput(dir.resolve("log.txt").toFile()).start();
        try {
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(120);
            while (p.isAlive() && pictures(out).isEmpty() && System.nanoTime() < deadline) {
                Thread.sleep(20);
            }
            assertTrue(p.isAlive(), "the run ended before it could be interrupted: " + log(dir));
            assertFalse(pictures(out).isEmpty(), "no picture within 120 s: " + log(dir));
            Process kill = new ProcessBuilder("kill", "-INT", Long.toString(p.pid())).inheritIO().start();
            assertEquals(0, kill.waitFor());
            assertTrue(p.waitFor(60, TimeUnit.SECONDS), "the run did not stop after SIGINT");
        } finally {
            p.destroyForcibly();
        }
        String report = Files.readString(out.resolve("report.md"), StandardCharsets.UTF_8);
        assertTrue(report.contains("cancelled"), report);
        assertFalse(report.contains("failed"), report);
        List<Path> kept;
        try (Stream<Path> s = Files.list(out)) {
            kept = s.filter(f -> f.getFileName().toString().matches("panel-frame-\\d{4}\\.png")).sorted().toList();
        }
        assertFalse(kept.isEmpty(), "complete pictures kept: " + log(dir));
        for (Path png : kept) {
            BufferedImage img = ImageIO.read(png.toFile());
            assertNotNull(img, png + " is not a readable picture");
            assertEquals(TransmitterLoopTest.HA, img.getWidth(), png.toString());
        }
        try (Stream<Path> s = Files.list(out)) {
            assertTrue(s.noneMatch(f -> f.getFileName().toString().startsWith(".lanesift-run-")), "work folder left behind");
        }
    }

    /** Pictures written so far, in the work folder or already in place. */
    private static List<Path> pictures(Path out) throws Exception {
        if (!Files.isDirectory(out)) {
            return List.of();
        }
        try (Stream<Path> s = Files.walk(out)) {
            return s.filter(f -> f.getFileName().toString().endsWith(".png")).toList();
        }
    }

    private static String log(Path dir) throws Exception {
        Path l = dir.resolve("log.txt");
        return Files.exists(l) ? Files.readString(l, StandardCharsets.UTF_8) : "";
    }
}
