package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.TreeSet;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.examples.demo.LongCapture;
import org.lanesift.runner.Main;

/**
 * The demo pixel link through the real plugins, decoded in one pass and in segments on two threads
 * ({@code run --jobs 2}, many seams): every output file is the same, pictures and timing included.
 */
class SegmentsTest {
    @TempDir
    Path dir;

    private static int run(String... args) {
        ByteArrayOutputStream e = new ByteArrayOutputStream();
        int code = Main.run(args, new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8),
                new PrintStream(e, true, StandardCharsets.UTF_8));
        assertEquals(0, code, e.toString(StandardCharsets.UTF_8));
        return code;
    }

    @Test
    void segmentsGiveTheOutputsOfOnePass() throws Exception {
        LongCapture.write(dir.resolve("long.bin"), 2 * LongCapture.FRAME_BYTES);
        Path chain = dir.resolve("chain.json");
        Files.copy(Path.of("..", "examples", "chains", "segments-pixel-link.json"), chain);
        run("--quiet", "run", chain.toString(), "--out", dir.resolve("one").toString());
        // 2 x 528,000 frames in segments of 262,144 (blocks of 65,536, margins of two blocks): 5 segments, 4 seams
        run("--quiet", "run", chain.toString(), "--out", dir.resolve("two").toString(), "--jobs", "2", "--segment-frames", "262144");
        TreeSet<String> files = names(dir.resolve("one"));
        assertEquals(files, names(dir.resolve("two")));
        assertTrue(files.contains("panel-frame-0001.png") && files.contains("panel-timing.json"), files.toString());
        for (String f : files) {
            Path a = dir.resolve("one").resolve(f);
            Path b = dir.resolve("two").resolve(f);
            if (f.equals("report.md")) {
                assertEquals(withoutRunLine(a), withoutRunLine(b), f);
            } else if (f.equals("signals.vcd")) {
                List<String> x = Files.readAllLines(a);
                List<String> y = Files.readAllLines(b);
                assertEquals(x.subList(3, x.size()), y.subList(3, y.size()), f + " after its $date");
            } else {
                assertArrayEquals(Files.readAllBytes(a), Files.readAllBytes(b), f);
            }
        }
    }

    @Test
    void aChainWithCalibrationInputsIsRefusedForSegmentsByName() throws Exception {
        LongCapture.write(dir.resolve("long.bin"), LongCapture.FRAME_BYTES);
        // a calibration (here a leg skew estimate feeding the correction) covers the whole capture: no segments
        Path chain = dir.resolve("calibrated.json");
        Files.writeString(chain, "{\"nodes\": [{\"id\": \"cap\", \"plugin\": \"raw\", \"options\": {\"file\": \"long.bin\"}},"
                + " {\"id\": \"est\", \"plugin\": \"skew-estimate\", \"options\": {\"mode\": \"legs\"}},"
                + " {\"id\": \"fix\", \"plugin\": \"deskew\", \"options\": {\"channels\": 2, \"tables\": 1}}],"
                + " \"wires\": [{\"from\": \"cap.CLK_P\", \"to\": \"est.p\"}, {\"from\": \"cap.CLK_N\", \"to\": \"est.n\"},"
                + " {\"from\": \"cap.CLK_P\", \"to\": \"fix.in0\"}, {\"from\": \"cap.CLK_N\", \"to\": \"fix.in1\"},"
                + " {\"from\": \"est.table\", \"to\": \"fix.table0\"}]}");
        ByteArrayOutputStream e = new ByteArrayOutputStream();
        int code = Main.run(new String[] {"--quiet", "run", chain.toString(), "--out", dir.resolve("x").toString(), "--jobs", "2"},
                new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8), new PrintStream(e, true, StandardCharsets.UTF_8));
        String err = e.toString(StandardCharsets.UTF_8);
        assertEquals(2, code, err);
        assertTrue(err.contains("instance 'fix' has calibration input 'table0'") && err.contains("without --jobs"), err);
    }

    private static TreeSet<String> names(Path d) throws Exception {
        try (Stream<Path> s = Files.list(d)) {
            return s.map(p -> p.getFileName().toString()).filter(n -> !n.startsWith(".")).collect(
                    java.util.stream.Collectors.toCollection(TreeSet::new));
        }
    }

    /** The report without the line that gives the start time and duration of the run. */
    private static List<String> withoutRunLine(Path report) throws Exception {
        return Files.readAllLines(report).stream().filter(l -> !l.contains(", started ")).toList();
    }
}
