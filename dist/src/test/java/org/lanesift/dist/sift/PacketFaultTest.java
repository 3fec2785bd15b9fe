package org.lanesift.dist.sift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;

/**
 * The packet link of the fault suite: the test tree's own capture generator (jitter, noise,
 * ringing, skews; PacketLinkCapture) through {@code lanesift sift}, every plugin of the three
 * chains. Clean, the decode gives no warning and no error; with one payload bit of one long write
 * flipped after its checksum was computed (CRC-16/MCRF4XX, docs/reference-facts.md#dsi-packets-ecc-and-checksum),
 * exactly one {@code checksum-mismatch}, on that packet, and no other warning or error: the
 * command decoded from that packet is information referring to the mismatch. Each case prints its
 * row of the suite table.
 */
class PacketFaultTest {
    private static final String[] LEGS = {"CKP", "CKN", "D0P", "D0N", "D1P", "D1N"};

    /** Warnings and errors of the decode pass: "kind@start_fs". */
    private static List<String> findings(Path out) throws Exception {
        List<String> f = new ArrayList<>();
        for (String line : Files.readAllLines(out.resolve("decode/annotations.jsonl"))) {
            JsonValue a = JsonReader.parse("annotations.jsonl", line);
            if (!a.get("severity").asString().equals("info")) {
                f.add(a.get("kind").asString() + "@" + a.get("start_fs").numberText());
            }
        }
        return f;
    }

    @Test
    void cleanPacketLinkHasNoFindingAndAChecksumErrorIsFoundOnceOnItsPacket(@TempDir Path dir) throws Exception {
        PacketLinkCapture clean = new PacketLinkCapture();
        Path cap = dir.resolve("clean.csv");
        clean.write(cap, LEGS, 9313);
        SiftTest.Run r = SiftTest.lanesift("sift", "--capture", cap.toString(), "--out", dir.resolve("c").toString(), "--quiet");
        assertEquals(0, r.code(), r.err());
        List<String> none = findings(dir.resolve("c"));
        System.out.println("SUITE | test-tree packet link (jitter, noise, ringing) | clean | none | 0 | - | others: " + none);
        assertEquals(List.of(), none);

        PacketLinkCapture bad = new PacketLinkCapture();
        bad.corruptCommand = 5; // commands 2, 5, 8, ... are long writes
        Path capBad = dir.resolve("checksum.csv");
        bad.write(capBad, LEGS, 9313);
        assertEquals(0x39, bad.commands.get(5).dataType());
        r = SiftTest.lanesift("sift", "--capture", capBad.toString(), "--out", dir.resolve("b").toString(), "--quiet");
        assertEquals(0, r.code(), r.err());
        List<String> f = findings(dir.resolve("b"));
        List<String> mismatch = f.stream().filter(s -> s.startsWith("checksum-mismatch@")).toList();
        // the packet of the sixth command: its command annotation, in decode order, starts where the mismatch does
        List<String> commandStarts = new ArrayList<>();
        List<JsonValue> commands = new ArrayList<>();
        for (String line : Files.readAllLines(dir.resolve("b/decode/annotations.jsonl"))) {
            JsonValue a = JsonReader.parse("annotations.jsonl", line);
            if (a.get("kind").asString().equals("command")) {
                commandStarts.add(a.get("start_fs").numberText());
                commands.add(a);
            }
        }
        System.out.println("SUITE | test-tree packet link | payload bit flipped in command 5 | checksum-mismatch | " + mismatch.size()
                + " | " + (mismatch.isEmpty() ? "-" : String.format("%.4f us", Long.parseLong(mismatch.get(0).split("@")[1]) * 1e-9))
                + " | others: " + f.stream().filter(s -> !s.startsWith("checksum-mismatch@")).map(s -> s.split("@")[0]).toList());
        assertEquals(1, mismatch.size(), f.toString());
        assertEquals(mismatch, f, "the checksum-mismatch and no other warning or error");
        assertEquals(clean.commands.size(), commandStarts.size(), "every command decoded, the bad one marked");
        long at = Long.parseLong(mismatch.get(0).split("@")[1]);
        assertTrue(at >= Long.parseLong(commandStarts.get(5)) && at < Long.parseLong(commandStarts.get(6)),
                "mismatch at " + at + " fs, command 5 at " + commandStarts.get(5) + ", command 6 at " + commandStarts.get(6));
        // the bad packet's command: information naming the mismatch as its cause (and when it was found)
        JsonValue badCommand = commands.get(5);
        assertEquals("info", badCommand.get("severity").asString());
        assertTrue(badCommand.get("label").asString().endsWith("(payload suspect, consequence: see the checksum-mismatch finding at "
                + org.lanesift.time.Femtos.format(at) + ")"), badCommand.get("label").asString());
    }
}
