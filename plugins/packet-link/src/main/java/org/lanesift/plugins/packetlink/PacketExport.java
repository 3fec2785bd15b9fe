package org.lanesift.plugins.packetlink;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;

/**
 * Every packet of the capture, one row each, for {@code <id>-packets.jsonl} and
 * {@code <id>-packets.csv} ({@code docs/packet-export.md}): start and end time (seconds), mode,
 * the lanes its bytes travelled on, data identifier (virtual channel, data type), short or long,
 * word count, the data bytes (both short-packet bytes, or the whole long payload), ECC status and
 * checksum status. Bytes a burst held outside any packet (after an uncorrectable header, a
 * truncated packet or a partial header) are rows of kind {@code unparsed} with those bytes, so no
 * burst byte goes missing. Rows are bounded by a row count and a byte budget; when either runs
 * out, later rows are dropped and the export says so.
 */
final class PacketExport {
    /** Data bytes kept over all rows (the rest is counted, not kept). */
    static final long MAX_DATA_BYTES = 8L << 20;
    private static final NumberStyle NUMBERS = NumberStyle.significant(15);

    /** One row. */
    static final class Row {
        String kind;
        long startFs;
        long endFs;
        String mode;
        int laneMask;
        int dataId = -1;
        boolean longPacket;
        int wordCount;
        byte[] data;
        int eccByte = -1;
        String ecc;
        /** The four header bytes as received, kept when the ECC corrected a bit. */
        byte[] headerReceived;
        int checksumRx = -1;
        int checksumCalc = -1;
        boolean suspect;
        String reason;
    }

    private final int maxRows;
    private final List<Row> rows = new ArrayList<>();
    private long dataBytes;
    long dropped;

    PacketExport(int maxRows) {
        this.maxRows = maxRows;
    }

    /** Adds a row unless a bound is reached (then counts it as dropped). */
    void add(Row r) {
        int n = r.data == null ? 0 : r.data.length;
        if (rows.size() >= maxRows || dataBytes + n > MAX_DATA_BYTES) {
            dropped++;
            return;
        }
        dataBytes += n;
        rows.add(r);
    }

    int size() {
        return rows.size();
    }

    private List<Row> sorted() {
        // low-power packets can be decoded before an earlier high-speed burst has ended on every lane
        List<Row> s = new ArrayList<>(rows);
        s.sort(Comparator.comparingLong(r -> r.startFs));
        return s;
    }

    byte[] jsonl() {
        StringBuilder sb = new StringBuilder(4096);
        List<Row> s = sorted();
        for (int i = 0; i < s.size(); i++) {
            Row r = s.get(i);
            JsonWriter j = JsonWriter.compact().numberStyle(NUMBERS);
            j.beginObject().field("index", i).field("kind", r.kind).field("timeS", r.startFs * 1e-15).field("endS", r.endFs * 1e-15)
                    .field("mode", r.mode).name("lanes").beginArray();
            for (int k = 0; k < 32; k++) {
                if ((r.laneMask >> k & 1) != 0) {
                    j.value(k);
                }
            }
            j.endArray();
            if (r.dataId >= 0) {
                j.field("dataId", hex2(r.dataId)).field("vc", r.dataId >> 6).field("dataType", hex2(r.dataId & 0x3F))
                        .field("dataTypeName", DataTypes.name(r.dataId & 0x3F)).field("long", r.longPacket);
                if (r.longPacket) {
                    j.field("wordCount", r.wordCount);
                }
            }
            j.field("data", CommandLog.hex(r.data));
            if (r.eccByte >= 0) {
                j.field("eccByte", hex2(r.eccByte)).field("ecc", r.ecc);
            }
            if (r.headerReceived != null) {
                j.field("headerReceived", CommandLog.hex(r.headerReceived));
            }
            if (r.longPacket) {
                j.field("checksum", r.checksumRx == r.checksumCalc ? "ok" : "bad").field("checksumReceived", hex4(r.checksumRx))
                        .field("checksumComputed", hex4(r.checksumCalc));
            }
            if (r.reason != null) {
                j.field("reason", r.reason);
            }
            j.field("suspect", r.suspect).endObject();
            sb.append(j.finish()).append('\n');
        }
        if (dropped > 0) {
            JsonWriter j = JsonWriter.compact();
            j.beginObject().field("kind", "export-full").field("rowsDropped", dropped)
                    .field("maxRows", maxRows).field("maxDataBytes", MAX_DATA_BYTES).endObject();
            sb.append(j.finish()).append('\n');
        }
        return sb.toString().getBytes(StandardCharsets.UTF_8);
    }

    byte[] csv() {
        StringBuilder sb = new StringBuilder(4096);
        sb.append("index,kind,time_s,end_s,mode,lanes,data_id,vc,data_type,data_type_name,long,word_count,data_hex,ecc_byte,ecc,"
                + "checksum,checksum_received,checksum_computed,header_received,suspect\n");
        List<Row> s = sorted();
        for (int i = 0; i < s.size(); i++) {
            Row r = s.get(i);
            sb.append(i).append(',').append(r.kind).append(',').append(NUMBERS.format(r.startFs * 1e-15)).append(',')
                    .append(NUMBERS.format(r.endFs * 1e-15)).append(',').append(r.mode).append(',');
            StringBuilder lanes = new StringBuilder();
            for (int k = 0; k < 32; k++) {
                if ((r.laneMask >> k & 1) != 0) {
                    lanes.append(lanes.length() > 0 ? " " : "").append(k);
                }
            }
            sb.append(lanes).append(',');
            if (r.dataId >= 0) {
                sb.append(hex2(r.dataId)).append(',').append(r.dataId >> 6).append(',').append(hex2(r.dataId & 0x3F)).append(',')
                        .append(DataTypes.name(r.dataId & 0x3F)).append(',').append(r.longPacket).append(',')
                        .append(r.longPacket ? String.valueOf(r.wordCount) : "").append(',');
            } else {
                sb.append(",,,,,,");
            }
            sb.append(CommandLog.hex(r.data)).append(',').append(r.eccByte >= 0 ? hex2(r.eccByte) : "").append(',')
                    .append(r.ecc == null ? "" : r.ecc).append(',');
            if (r.longPacket) {
                sb.append(r.checksumRx == r.checksumCalc ? "ok" : "bad").append(',').append(hex4(r.checksumRx)).append(',')
                        .append(hex4(r.checksumCalc));
            } else {
                sb.append(",,");
            }
            sb.append(',').append(CommandLog.hex(r.headerReceived)).append(',').append(r.suspect).append('\n');
        }
        return sb.toString().getBytes(StandardCharsets.UTF_8);
    }

    static int lanes(int[] lane, int from, int to) {
        int m = 0;
        for (int i = from; i < to; i++) {
            m |= 1 << Math.min(31, Math.max(0, lane[i]));
        }
        return m;
    }

    static byte[] copy(byte[] d, int from, int to) {
        return Arrays.copyOfRange(d, from, to);
    }

    private static String hex2(int v) {
        return String.format(Locale.ROOT, "0x%02X", v);
    }

    private static String hex4(int v) {
        return String.format(Locale.ROOT, "0x%04X", v);
    }
}
