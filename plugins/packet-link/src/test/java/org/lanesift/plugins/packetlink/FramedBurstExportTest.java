package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.data.Artifact;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.JsonScan;
import org.lanesift.testkit.StageHarness;

/**
 * The framed profile's {@code <id>-bursts.jsonl} (docs/framed-link.md): one line per burst between
 * low-power states, its words in wire order with lane and flags, so a replay tool can send each
 * burst again. An invented two-lane link with two bursts of different lengths (LinkSynth).
 */
class FramedBurstExportTest {

    @Test
    void everyBurstIsOneLineWithItsWordsAndLanes() {
        byte[] first = RefCodes.bytes(0x10, 0x20, 0x11, 0x21, 0x12, 0x22);
        byte[] second = RefCodes.bytes(0x7E, 0x81, 0x00, 0xFF);
        LinkSynth s = new LinkSynth(2).idle(1_000_000_000L);
        s.hs(first).idle(3_000_000_000L).hs(second).idle(1_000_000_000L);
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("profile", "framed", "lanes", 2));
        s.feed(h, 1000, false);
        String jsonl = h.outputs("files", Artifact.class).stream().filter(a -> a.fileName().equals("dut-bursts.jsonl")).findFirst()
                .map(a -> new String(a.content(), StandardCharsets.UTF_8)).orElseThrow();
        String[] lines = jsonl.split("\n");
        assertEquals(2, lines.length, jsonl);
        byte[][] sent = {first, second};
        double lastEnd = -1;
        for (int b = 0; b < 2; b++) {
            JsonValue v = JsonScan.parse("dut-bursts.jsonl line " + (b + 1), lines[b]);
            assertEquals("burst", v.get("kind").asString());
            assertEquals(b, v.get("burst").asDouble());
            assertEquals(8, v.get("wordBits").asDouble());
            List<String> words = new ArrayList<>();
            List<Integer> lanes = new ArrayList<>();
            List<String> want = new ArrayList<>();
            List<Integer> wantLanes = new ArrayList<>();
            for (int i = 0; i < sent[b].length; i++) {
                want.add(String.format("%02X", sent[b][i] & 0xFF));
                wantLanes.add(i % 2); // word k on lane k mod 2
            }
            v.get("words").elements().forEach(w -> words.add(w.asString()));
            v.get("lanes").elements().forEach(l -> lanes.add((int) l.asDouble()));
            assertEquals(want, words);
            assertEquals(wantLanes, lanes);
            assertEquals(sent[b].length, v.get("count").asDouble());
            double start = v.get("startS").asDouble();
            assertEquals(true, start > lastEnd, "bursts in time order");
            lastEnd = v.get("endS").asDouble();
        }
    }
}
