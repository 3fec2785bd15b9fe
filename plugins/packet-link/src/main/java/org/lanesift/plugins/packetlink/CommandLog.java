package org.lanesift.plugins.packetlink;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;

/**
 * Every command seen on the link, in order, with its time and parameters; and the exports built
 * from it: the full log as JSON and CSV, and the folded init sequence as JSON and as a C array
 * (layout in {@code docs/init-sequence.md}).
 *
 * <p>The delay after a command is measured from the end of its packet to the start of the next
 * command's packet (0 when they overlap, as bytes of neighbouring packets can on several lanes). Folding: a run of memory writes (start + continues) becomes one entry; then a
 * block of one to eight entries repeated back to back (such as column address, page address,
 * memory write in every frame) is kept once with its repeat count.
 */
final class CommandLog {
    /** One command. */
    /** Numbers in the CSV as in the JSON: nine significant digits. */
    private static final NumberStyle CSV_NUMBER = NumberStyle.significant(9);

    static final class Entry {
        long startFs;
        long endFs;
        String mode;
        int vc;
        int dataType;
        int cmd;
        String name;
        byte[] params;
        int payloadBytes;
        String meaning;
        boolean checksumBad;
        boolean eccCorrected;
        /** Sent as a long packet. */
        boolean longPacket;
        /** Data bytes as sent (both short-packet bytes, or the long payload); null for memory writes. */
        byte[] data;
        int packets = 1;
        int repeat = 1;
        int period = 1;
        long delayFs = -1;

        boolean isMemoryWrite() {
            return DataTypes.isDcs(dataType) && DcsCommands.isMemoryWrite(cmd);
        }

        boolean sameAs(Entry o) {
            if (dataType != o.dataType || cmd != o.cmd || vc != o.vc) {
                return false;
            }
            return isMemoryWrite() || Arrays.equals(params, o.params);
        }
    }

    final List<Entry> entries = new ArrayList<>();
    private final int max;
    boolean overflow;

    CommandLog(int max) {
        this.max = max;
    }

    /**
     * Adds a command in time order (a low-power packet on one lane can be decoded before a
     * high-speed burst that started earlier, whose lanes are merged only when all have ended);
     * returns false (and drops it) when the log is full.
     */
    boolean add(Entry e) {
        if (entries.size() >= max) {
            overflow = true;
            int last = entries.size() - 1;
            if (last >= 0 && e.startFs >= entries.get(last).startFs) {
                delay(entries.get(last), e);
            }
            return false;
        }
        int at = entries.size();
        while (at > 0 && entries.get(at - 1).startFs > e.startFs) {
            at--;
        }
        entries.add(at, e);
        if (at > 0) {
            delay(entries.get(at - 1), e);
        }
        if (at + 1 < entries.size()) {
            delay(e, entries.get(at + 1));
        }
        return true;
    }

    private static void delay(Entry prev, Entry next) {
        // commands in one burst on several lanes may overlap by a few bytes: no delay then
        prev.delayFs = Math.max(0, next.startFs - prev.endFs);
    }

    /** The folded init sequence. */
    List<Entry> folded() {
        List<Entry> runs = new ArrayList<>();
        for (int i = 0; i < entries.size(); i++) {
            Entry e = entries.get(i);
            if (e.isMemoryWrite() && !runs.isEmpty()) {
                Entry last = runs.get(runs.size() - 1);
                if (last.isMemoryWrite() && last.vc == e.vc && e.cmd == DcsCommands.MEMORY_WRITE_CONTINUE) {
                    last.payloadBytes += e.payloadBytes;
                    last.packets++;
                    last.endFs = e.endFs;
                    last.delayFs = e.delayFs;
                    continue;
                }
            }
            runs.add(copy(e));
        }
        for (Entry r : runs) {
            if (r.isMemoryWrite()) {
                // the meaning of a folded run describes the whole run, as payloadBytes does
                r.meaning = r.payloadBytes + " bytes of pixel data" + (r.packets > 1 ? " in " + r.packets + " packets" : "");
            }
        }
        List<Entry> out = new ArrayList<>();
        int i = 0;
        while (i < runs.size()) {
            int bestL = 0;
            int bestReps = 1;
            for (int len = 1; len <= 8 && i + 2 * len <= runs.size(); len++) {
                int reps = 1;
                while (i + (reps + 1) * len <= runs.size() && blockEquals(runs, i, i + reps * len, len)) {
                    reps++;
                }
                if (reps >= 2 && reps * len > bestReps * Math.max(1, bestL)) {
                    bestL = len;
                    bestReps = reps;
                }
            }
            if (bestL == 0) {
                out.add(runs.get(i));
                i++;
                continue;
            }
            for (int k = 0; k < bestL; k++) {
                Entry e = runs.get(i + k);
                e.repeat = bestReps;
                e.period = bestL;
                if (k == bestL - 1) {
                    // the delay after the folded block is the one after its last repetition
                    e.delayFs = runs.get(i + bestReps * bestL - 1).delayFs;
                }
                out.add(e);
            }
            i += bestReps * bestL;
        }
        return out;
    }

    private static boolean blockEquals(List<Entry> l, int a, int b, int len) {
        for (int k = 0; k < len; k++) {
            if (!l.get(a + k).sameAs(l.get(b + k))) {
                return false;
            }
        }
        return true;
    }

    private static Entry copy(Entry e) {
        Entry c = new Entry();
        c.startFs = e.startFs;
        c.endFs = e.endFs;
        c.mode = e.mode;
        c.vc = e.vc;
        c.dataType = e.dataType;
        c.cmd = e.cmd;
        c.name = e.name;
        c.params = e.params;
        c.payloadBytes = e.payloadBytes;
        c.meaning = e.meaning;
        c.checksumBad = e.checksumBad;
        c.eccCorrected = e.eccCorrected;
        c.longPacket = e.longPacket;
        c.data = e.data;
        c.packets = e.packets;
        c.delayFs = e.delayFs;
        return c;
    }

    // ---------------------------------------------------------------- exports

    byte[] json(String id) {
        JsonWriter j = JsonWriter.pretty().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull();
        j.beginObject().field("format", "lanesift-command-log/1").field("instance", id).field("truncated", overflow);
        j.name("commands").beginArray();
        writeEntries(j, entries);
        j.endArray().name("initSequence").beginArray();
        writeEntries(j, folded());
        j.endArray().endObject();
        return (j.finish() + "\n").getBytes(StandardCharsets.UTF_8);
    }

    private static void writeEntries(JsonWriter j, List<Entry> list) {
        for (int i = 0; i < list.size(); i++) {
            Entry e = list.get(i);
            j.beginObjectInline().field("index", i).field("timeS", e.startFs * 1e-15).field("mode", e.mode).field("vc", e.vc)
                    .field("dataType", String.format(Locale.ROOT, "0x%02X", e.dataType))
                    .field("dataTypeName", DataTypes.name(e.dataType))
                    .field("command", e.cmd < 0 ? null : String.format(Locale.ROOT, "0x%02X", e.cmd))
                    .field("name", e.name).field("params", hex(e.params)).field("paramCount", e.params == null ? 0 : e.params.length);
            if (e.isMemoryWrite()) {
                j.field("payloadBytes", e.payloadBytes).field("packets", e.packets);
            }
            j.field("meaning", e.meaning).name("delayToNextMs");
            if (e.delayFs < 0) {
                j.nullValue();
            } else {
                j.value(e.delayFs * 1e-12);
            }
            if (e.repeat > 1) {
                j.field("repeat", e.repeat).field("repeatBlock", e.period);
            }
            if (e.checksumBad) {
                j.field("checksumBad", true);
            }
            if (e.eccCorrected) {
                j.field("eccCorrected", true);
            }
            j.endObject();
        }
    }

    byte[] csv() {
        StringBuilder sb = new StringBuilder(4096);
        sb.append("index,time_s,mode,vc,data_type,data_type_name,command,name,param_count,params_hex,delay_to_next_ms,flags\n");
        for (int i = 0; i < entries.size(); i++) {
            Entry e = entries.get(i);
            sb.append(i).append(',').append(CSV_NUMBER.format(e.startFs * 1e-15)).append(',').append(e.mode).append(',').append(e.vc).append(',')
                    .append(String.format(Locale.ROOT, "0x%02X", e.dataType)).append(',').append(DataTypes.name(e.dataType)).append(',')
                    .append(e.cmd < 0 ? "" : String.format(Locale.ROOT, "0x%02X", e.cmd)).append(',').append(e.name).append(',')
                    .append(e.isMemoryWrite() ? e.payloadBytes : e.params == null ? 0 : e.params.length).append(',')
                    .append(hex(e.params)).append(',')
                    .append(e.delayFs < 0 ? "" : CSV_NUMBER.format(e.delayFs * 1e-12)).append(',');
            String f = (e.checksumBad ? "checksum-bad " : "") + (e.eccCorrected ? "ecc-corrected " : "");
            sb.append(f.trim()).append('\n');
        }
        return sb.toString().getBytes(StandardCharsets.UTF_8);
    }

    static String hex(byte[] b) {
        if (b == null) {
            return "";
        }
        StringBuilder sb = new StringBuilder(b.length * 3);
        for (int i = 0; i < b.length; i++) {
            if (i > 0) {
                sb.append(' ');
            }
            sb.append(Character.toUpperCase(Character.forDigit(b[i] >> 4 & 15, 16))).append(Character.toUpperCase(Character.forDigit(b[i] & 15, 16)));
        }
        return sb.toString();
    }
}
