package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.condition.EnabledOnOs;
import org.junit.jupiter.api.condition.OS;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.testkit.Poll;

/**
 * Issue 18 item 7, end to end: a {@code run} that writes pictures, in a child JVM, is sent SIGINT
 * (what Ctrl-C sends). The report must say the run was cancelled, the pictures must be kept in
 * {@code --out} and read back as images, and no work folder is left behind. Two moments: after the
 * first frame picture (complete frames kept), and before any picture was encoded, so that the first
 * picture is encoded while the JVM shuts down (an eye diagram is drawn when its stage finishes);
 * the second is the case in which an encoder that opens a disk cache (and so registers a shutdown
 * hook) fails with "Shutdown in progress". (SIGINT through {@code kill -INT}, POSIX; Linux only.)
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
        Process p = startRun(dir, c, out);
        try {
            Poll.until(Duration.ofSeconds(120), "the first picture", () -> !p.isAlive() || !pictures(out).isEmpty());
            assertTrue(p.isAlive(), "the run ended before it could be interrupted: " + log(dir));
            assertFalse(pictures(out).isEmpty(), "no picture within 120 s: " + log(dir));
            interrupt(p);
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

    /**
     * SIGINT while a long raw capture is folded into an eye diagram and its second channel written
     * as CSV: the signal is sent once that CSV has appeared in the work folder (the run is then past
     * its set-up and inside the decode), and the eye picture is only ever encoded when the eye stage
     * finishes, that is after the signal, during shutdown.
     */
    @Test
    void ctrlCBeforeAnyPictureStillWritesThePicture(@TempDir Path dir) throws Exception {
        Path cap = dir.resolve("long.bin");
        // int8, two channels: 'sig' a 100 MHz square wave at 1 GS/s (5 samples high, 5 low) for the first
        // 2^20 frames, then 0 (a sparse file: nothing is written for the rest); 'mon' 0 throughout
        long frames = 400_000_000L;
        try (java.io.RandomAccessFile f = new java.io.RandomAccessFile(cap.toFile(), "rw")) {
            byte[] head = new byte[2 << 20];
            for (int k = 0; k < head.length / 2; k++) {
                head[2 * k] = (byte) ((k / 5) % 2 == 0 ? 100 : -100);
            }
            f.write(head);
            f.setLength(2 * frames);
        }
        Files.writeString(dir.resolve("long.bin.json"), "{\"rateHz\": 1e9, \"format\": \"int8\", \"channels\": ["
                + "{\"name\": \"sig\", \"gain\": 0.002}, {\"name\": \"mon\", \"gain\": 0.002}]}\n");
        Path c = dir.resolve("chain.json");
        Files.writeString(c, "{\"nodes\": [\n"
                + " {\"id\": \"cap\", \"plugin\": \"raw\", \"options\": {\"file\": \"long.bin\"}},\n"
                + " {\"id\": \"eye\", \"plugin\": \"eye-diagram\", \"options\": {\"bitRateHz\": 2e8, \"rangeMv\": [-300, 300]}}],\n"
                + " \"wires\": [{\"from\": \"cap.sig\", \"to\": \"eye.signal\"}],\n"
                // cap.mon is a by-product (an unwired output of an instance that feeds another): asked for here
                + " \"outputs\": [\"standard\", \"by-products\"]}\n");
        Path out = dir.resolve("out");
        Process p = startRun(dir, c, out);
        try {
            Poll.until(Duration.ofSeconds(120), "the run writing cap-mon.csv", () -> !p.isAlive() || monitorCsvStarted(out));
            assertTrue(p.isAlive(), "the run ended before it could be interrupted: " + log(dir));
            assertTrue(pictures(out).isEmpty(), "no picture is encoded before the eye stage finishes");
            interrupt(p);
        } finally {
            p.destroyForcibly();
        }
        String report = Files.readString(out.resolve("report.md"), StandardCharsets.UTF_8);
        assertTrue(report.contains("cancelled"), report);
        assertFalse(report.contains("failed"), report);
        assertFalse(report.contains("while stopping"), "nothing may fail while the run stops: " + report);
        BufferedImage eye = ImageIO.read(out.resolve("eye-eye.png").toFile());
        assertNotNull(eye, "the eye picture of what was folded is kept: " + log(dir));
        assertTrue(Files.size(out.resolve("cap-mon.csv")) > 0);
        try (Stream<Path> s = Files.list(out)) {
            assertTrue(s.noneMatch(f -> f.getFileName().toString().startsWith(".lanesift-run-")), "work folder left behind");
        }
    }

    /** Sends SIGINT, as Ctrl-C does, and waits for the process to end. */
    /** Starts {@code lanesift run CHAIN --out OUT -q} in a child JVM, its output to log.txt in {@code dir}. */
    private static Process startRun(Path dir, Path chain, Path out) throws Exception {
        List<String> cmd = List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(), "-cp",
                System.getProperty("java.class.path"), "org.lanesift.runner.Main", "run", chain.toString(), "--out", out.toString(), "-q");
        return new ProcessBuilder(cmd).directory(dir.toFile()).redirectErrorStream(true).redirectOutput(dir.resolve("log.txt").toFile()).start();
    }

    private static void interrupt(Process p) throws Exception {
        Process kill = new ProcessBuilder("kill", "-INT", Long.toString(p.pid())).inheritIO().start();
        assertEquals(0, kill.waitFor());
        assertTrue(p.waitFor(60, TimeUnit.SECONDS), "the run did not stop after SIGINT");
    }

    private static boolean monitorCsvStarted(Path out) {
        if (!Files.isDirectory(out)) {
            return false;
        }
        try (Stream<Path> s = Files.walk(out)) {
            return s.anyMatch(f -> f.getFileName().toString().equals("cap-mon.csv") && f.toFile().length() > 0);
        } catch (java.io.IOException | java.io.UncheckedIOException e) {
            return false; // the work folder moved or went while it was listed
        }
    }

    /** Pictures written so far, in the work folder or already in place. */
    private static List<Path> pictures(Path out) {
        if (!Files.isDirectory(out)) {
            return List.of();
        }
        try (Stream<Path> s = Files.walk(out)) {
            return s.filter(f -> f.getFileName().toString().endsWith(".png")).toList();
        } catch (java.io.IOException | java.io.UncheckedIOException e) {
            return List.of(); // the work folder moved or went while it was listed
        }
    }

    private static String log(Path dir) throws Exception {
        Path l = dir.resolve("log.txt");
        return Files.exists(l) ? Files.readString(l, StandardCharsets.UTF_8) : "";
    }
}
