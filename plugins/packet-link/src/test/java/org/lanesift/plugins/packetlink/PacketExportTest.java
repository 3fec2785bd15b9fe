package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.lanesift.data.WordStream;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.JsonScan;
import org.lanesift.testkit.StageHarness;

/**
 * The per-packet export ({@code docs/packet-export.md}): every burst byte is in exactly one row.
 * The test rebuilds the wire bytes from the rows alone (data identifier, data or word count, ECC
 * byte, payload, received checksum; the received header where the ECC corrected it) and compares
 * them with the bytes on the packets output, burst by burst. The capture has a header with one
 * flipped bit, a payload with one flipped bit and two bytes after the last packet of a burst; its
 * packets are built with RefCodes (docs/reference-facts.md#dsi-packets-ecc-and-checksum).
 */
class PacketExportTest {

    @Test
    void everyByteOfEveryBurstIsInTheExport() {
        byte[] b = RefCodes.cat(DsiBurstTest.settingsBurst(), RefCodes.bytes(0x55, 0x66)); // two bytes that make no header
        b[1] ^= 0x04; // header bit 10 of set_pixel_format: corrected by the ECC
        b[DsiBurstTest.B0_PAYLOAD + 2] ^= 0x10; // payload bit of the 0xB0 write: checksum bad
        StageHarness h = DsiBurstTest.run(DsiBurstTest.scenario(b), 65536, false);
        String jsonl = DsiBurstTest.file(h, "dut-packets.jsonl");
        List<JsonValue> rows = new ArrayList<>();
        int n = 0;
        for (String line : jsonl.split("\n")) {
            rows.add(JsonScan.parse("dut-packets.jsonl line " + (++n), line));
        }
        // rows are in time order and every packet annotation has its row
        assertEquals(h.annotations("packet").size(), rows.stream().filter(r -> r.get("kind").asString().equals("packet")).count());
        for (int i = 1; i < rows.size(); i++) {
            assertTrue(rows.get(i).get("timeS").asDouble() >= rows.get(i - 1).get("timeS").asDouble(), "row " + i);
        }
        // rebuild the wire bytes of all bursts from the rows; compare with the packets output
        ByteArrayOutputStream rebuilt = new ByteArrayOutputStream();
        for (JsonValue r : rows) {
            rebuilt.writeBytes(wire(r));
        }
        ByteArrayOutputStream sent = new ByteArrayOutputStream();
        for (WordStream w : h.outputs("packets", WordStream.class)) {
            for (int i = 0; i < w.count(); i++) {
                sent.write((int) w.values()[i]);
            }
        }
        assertEquals(HexFormat.of().formatHex(sent.toByteArray()), HexFormat.of().formatHex(rebuilt.toByteArray()));

        JsonValue fmt = rows.stream().filter(r -> r.get("data").asString().equals("3A 77")).findFirst().orElseThrow();
        assertEquals("corrected-header-bit", fmt.get("ecc").asString());
        assertEquals("0x15", fmt.get("dataId").asString());
        assertEquals("hs", fmt.get("mode").asString());
        assertEquals(List.of(0.0, 1.0), fmt.get("lanes").elements().stream().map(JsonValue::asDouble).toList());
        JsonValue b0 = rows.stream().filter(r -> r.get("data").asString().startsWith("B0 ")).findFirst().orElseThrow();
        assertEquals("bad", b0.get("checksum").asString());
        assertEquals(4.0, b0.get("wordCount").asDouble());
        assertEquals("ok", b0.get("ecc").asString());
        JsonValue left = rows.stream().filter(r -> r.get("kind").asString().equals("unparsed")).findFirst().orElseThrow();
        assertEquals("55 66", left.get("data").asString());
        assertEquals("leftover", left.get("reason").asString());
        // LP packets travel on lane 0 only
        JsonValue reset = rows.get(0);
        assertEquals("lp", reset.get("mode").asString());
        assertEquals(List.of(0.0), reset.get("lanes").elements().stream().map(JsonValue::asDouble).toList());

        // the CSV has the same rows and columns a spreadsheet reads
        String[] csv = DsiBurstTest.file(h, "dut-packets.csv").split("\n");
        assertEquals(rows.size() + 1, csv.length);
        int cols = csv[0].split(",", -1).length;
        for (String line : csv) {
            assertEquals(cols, line.split(",", -1).length, line);
        }
        assertTrue(csv[0].startsWith("index,kind,time_s,end_s,mode,lanes,data_id,"), csv[0]);
    }

    /** The bytes a row stands for, as they were on the wire. */
    static byte[] wire(JsonValue r) {
        byte[] data = hex(r.get("data").asString());
        if (r.get("kind").asString().equals("unparsed")) {
            return data;
        }
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        if (r.members().containsKey("headerReceived")) {
            o.writeBytes(hex(r.get("headerReceived").asString()));
        } else {
            o.write(Integer.decode(r.get("dataId").asString()));
            if (r.get("long").asBoolean()) {
                int wc = (int) r.get("wordCount").asDouble();
                o.write(wc & 0xFF);
                o.write(wc >> 8);
            } else {
                o.writeBytes(data);
            }
            o.write(Integer.decode(r.get("eccByte").asString()));
        }
        if (r.get("long").asBoolean()) {
            o.writeBytes(data);
            int c = Integer.decode(r.get("checksumReceived").asString());
            o.write(c & 0xFF);
            o.write(c >> 8);
        }
        return o.toByteArray();
    }

    static byte[] hex(String s) {
        return s.isEmpty() ? new byte[0] : HexFormat.ofDelimiter(" ").parseHex(s);
    }
}
