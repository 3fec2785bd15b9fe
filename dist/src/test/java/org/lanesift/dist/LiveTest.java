package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
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
        List<org.lanesift.json.JsonValue> ann = Files.readAllLines(out.resolve("decoded").resolve("annotations.jsonl")).stream()
                .map(l -> org.lanesift.json.JsonReader.parse("annotations.jsonl", l)).toList();
        assertTrue(ann.stream().anyMatch(a -> a.get("kind").asString().equals("stream-gap")), "the dropped frame is reported as a gap");
        assertTrue(Files.exists(out.resolve("decoded").resolve("signals.vcd")));
        // the edge decode saw the gap on both channels and reset across it
        List<org.lanesift.json.JsonValue> activity = ann.stream().filter(a -> a.get("kind").asString().equals("logic-activity")).toList();
        long activityWithGap = activity.stream().filter(a -> org.lanesift.testkit.JsonScan.members(a).stream()
                .anyMatch(m -> m.value().isString() && m.value().asString().contains("1 gaps"))).count();
        assertEquals(2, activityWithGap, activity.toString());
    }
}
