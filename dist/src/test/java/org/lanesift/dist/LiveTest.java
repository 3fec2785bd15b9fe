package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.runner.Main;

/** {@code lanesift live} with the simulated device: capture to the spool and decode a chain behind it. */
class LiveTest {
    @Test
    void simulatedDeviceDecodesLiveAndTheDroppedFrameIsAGap(@TempDir Path dir) throws Exception {
        Path chain = dir.resolve("live.json");
        Files.writeString(chain, "{\"nodes\":[{\"id\":\"dev\",\"plugin\":\"spool\",\"options\":{\"dir\":\"unused\",\"channels\":2}},"
                + "{\"id\":\"edges\",\"plugin\":\"logic-edges\",\"options\":{\"channels\":2}}],"
                + "\"wires\":[{\"from\":\"dev.ch0\",\"to\":\"edges.in0\"},{\"from\":\"dev.ch1\",\"to\":\"edges.in1\"}]}");
        Path out = dir.resolve("cap");
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        ByteArrayOutputStream e = new ByteArrayOutputStream();
        int code = Main.run(new String[] {"live", "--simulate", "--sim-mb", "2", "--sim-faults", "drop=100", "--chain", chain.toString(),
            "--out", out.toString(), "--quiet"}, new PrintStream(o, true, StandardCharsets.UTF_8), new PrintStream(e, true, StandardCharsets.UTF_8));
        String all = o.toString(StandardCharsets.UTF_8) + e.toString(StandardCharsets.UTF_8);
        assertEquals(0, code, all);
        assertTrue(Files.exists(out.resolve("spool.closed")), all);
        String ann = Files.readString(out.resolve("decoded").resolve("annotations.jsonl"));
        assertTrue(ann.contains("\"kind\":\"stream-gap\""), "the dropped frame is reported as a gap");
        assertTrue(Files.exists(out.resolve("decoded").resolve("signals.vcd")));
        // the edge decode saw the gap on both channels and reset across it
        long activityWithGap = ann.lines().filter(l -> l.contains("\"kind\":\"logic-activity\"") && l.contains("1 gaps")).count();
        assertEquals(2, activityWithGap, ann.lines().filter(l -> l.contains("logic-activity")).toList().toString());
    }
}
