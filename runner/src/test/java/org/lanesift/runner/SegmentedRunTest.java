package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code run --jobs}: a raw capture decoded in segments on two threads gives the same files as one
 * pass; a stage that keeps state longer than it declares is caught at a seam; chains that cannot
 * be cut are refused, naming the instance, wire or option.
 */
class SegmentedRunTest {
    @TempDir
    Path dir;
    Path bin;

    /** 200,000 frames of two channels, random NRZ at 7.3 samples per bit, 1 GS/s, uint8. */
    @BeforeEach
    void capture() throws Exception {
        bin = dir.resolve("cap.bin");
        int n = 200_000;
        ByteBuffer bb = ByteBuffer.allocate(2 * n).order(ByteOrder.LITTLE_ENDIAN);
        Random r = new Random(3);
        boolean a = false;
        boolean b = true;
        for (int i = 0; i < n; i++) {
            if (i % 73 < 10 && r.nextInt(5) == 0) {
                a = !a;
            }
            if (r.nextInt(9) == 0) {
                b = !b;
            }
            bb.put((byte) (a ? 200 : 20)).put((byte) (b ? 210 : 30));
        }
        Files.write(bin, bb.array());
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e9, \"format\": \"uint8\", \"markClipped\": false,"
                + " \"channels\": [{\"name\": \"A\", \"gain\": 0.004}, {\"name\": \"B\", \"gain\": 0.004}]}");
    }

    private Path chain(String name, String nodes, String wires) throws Exception {
        Path c = dir.resolve(name);
        Files.writeString(c, "{\"nodes\": [{\"id\": \"cap\", \"plugin\": \"raw\", \"options\": {\"file\": \"" + bin
                + "\", \"blockSamples\": 4096}}, " + nodes + "], \"wires\": [" + wires + "]}");
        return c;
    }

    private Path edgesChain(boolean lie) throws Exception {
        return chain("edges.json", "{\"id\": \"ea\", \"plugin\": \"fake-edges\", \"options\": {\"lie\": " + lie + "}},"
                        + " {\"id\": \"eb\", \"plugin\": \"fake-edges\"}",
                "{\"from\": \"cap.A\", \"to\": \"ea\"}, {\"from\": \"cap.B\", \"to\": \"eb\"}");
    }

    @Test
    void segmentsOnTwoThreadsWriteTheFilesOfOnePass() throws Exception {
        Path c = edgesChain(false);
        Cli one = Cli.run("--quiet", "run", c.toString(), "--out", dir.resolve("one").toString());
        assertEquals(0, one.code(), one.toString());
        Cli two = Cli.run("--quiet", "run", c.toString(), "--out", dir.resolve("two").toString(), "--jobs", "2",
                "--segment-frames", "20000");
        assertEquals(0, two.code(), two.toString());
        List<String> a = Files.readAllLines(dir.resolve("one/signals.vcd"));
        List<String> b = Files.readAllLines(dir.resolve("two/signals.vcd"));
        assertTrue(a.size() > 10_000, "value changes: " + a.size());
        assertEquals(a.subList(3, a.size()), b.subList(3, b.size()), "the VCD after its $date");
        assertArrayEquals(Files.readAllBytes(dir.resolve("one/annotations.jsonl")), Files.readAllBytes(dir.resolve("two/annotations.jsonl")));
        assertTrue(Files.readAllLines(dir.resolve("one/annotations.jsonl")).size() > 1000);
    }

    @Test
    void aStageKeepingStateLongerThanDeclaredIsCaughtAtASeam() throws Exception {
        Cli two = Cli.run("--quiet", "run", edgesChain(true).toString(), "--out", dir.resolve("two").toString(), "--jobs", "2",
                "--segment-frames", "20000");
        assertEquals(2, two.code(), two.toString());
        String msg = two.errLines().get(0);
        assertTrue(msg.contains("disagree on output 'ea.out'") && msg.contains("decode without --jobs"), msg);
    }

    @Test
    void chainsThatCannotBeCutAreRefusedByName() throws Exception {
        Cli logic = Cli.run("--quiet", "run", chain("t.json", "{\"id\": \"th\", \"plugin\": \"fake-threshold\"}",
                "{\"from\": \"cap.A\", \"to\": \"th\"}").toString(), "--out", dir.resolve("x").toString(), "--jobs", "2");
        assertEquals(2, logic.code(), logic.toString());
        assertTrue(logic.err().contains("instance 'th' (fake-threshold) takes analog data from 'cap.A'")
                && logic.err().contains("does not declare"), logic.err());

        Cli zero = Cli.run("--quiet", "run", edgesChain(false).toString(), "--out", dir.resolve("y").toString(), "--jobs", "0");
        assertEquals(2, zero.code(), zero.toString());
        assertTrue(zero.err().contains("--jobs 0"), zero.err());

        Cli negative = Cli.run("--quiet", "run", edgesChain(false).toString(), "--out", dir.resolve("n").toString(),
                "--segment-frames", "-5");
        assertEquals(2, negative.code(), negative.toString());
        assertTrue(negative.err().contains("--segment-frames -5"), negative.err());

        Cli tiny = Cli.run("--quiet", "run", edgesChain(false).toString(), "--out", dir.resolve("z").toString(), "--jobs", "2",
                "--segment-frames", "100");
        assertEquals(2, tiny.code(), tiny.toString());
        assertTrue(tiny.err().contains("shorter than twice the margin"), tiny.err());

        Path csv = dir.resolve("c.csv");
        Files.writeString(csv, "time,A\n0,0\n1e-9,1\n");
        Path cc = dir.resolve("csv.json");
        Files.writeString(cc, "{\"nodes\": [{\"id\": \"cap\", \"plugin\": \"csv\", \"options\": {\"file\": \"" + csv + "\"}}], \"wires\": []}");
        Cli fromCsv = Cli.run("--quiet", "run", cc.toString(), "--out", dir.resolve("w").toString(), "--jobs", "2");
        assertEquals(2, fromCsv.code(), fromCsv.toString());
        assertTrue(fromCsv.err().contains("needs a raw binary capture") && fromCsv.err().contains("'cap' is 'csv'"), fromCsv.err());
    }
}
