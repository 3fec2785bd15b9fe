package org.lanesift.plugins.packetlink;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The replayable init sequence as a C header ({@code <id>-init.h}, layout in
 * {@code docs/init-sequence.md}): the link configuration as macros, the init commands as one
 * byte table and the frame-window commands (column and page address) of the first frame as a
 * second, with the memory writes summarised in macros. Each record keeps the packet's mode
 * (low power or high speed), its data identifier (virtual channel and data type, so short or long,
 * DCS or generic) and its data bytes as sent, so a replay re-encodes the captured packet exactly;
 * and the wait after it in whole microseconds, rounded up so that a replay never waits less than
 * the captured host did.
 */
final class InitHeader {
    /** Record flag: sent in low-power (escape) mode; otherwise in a high-speed burst. */
    static final int FLAG_LP = 0x01;
    /** Record flag: long packet; otherwise short. */
    static final int FLAG_LONG = 0x02;
    /** Record flag: a DCS data type; otherwise generic (or another host-to-panel command). */
    static final int FLAG_DCS = 0x04;
    /** Flags byte that ends a table. */
    static final int END = 0x80;
    /** Largest wait a record holds, microseconds (four bytes). */
    static final long MAX_WAIT_US = 0xFFFF_FFFFL;
    private static final long FS_PER_US = 1_000_000_000L;

    private final String id;
    private final CommandLog log;
    private final LinkFacts facts;

    InitHeader(String id, CommandLog log, LinkFacts facts) {
        this.id = id;
        this.log = log;
        this.facts = facts;
    }

    /**
     * Wait for replay in whole microseconds: the measured time rounded up, so a replay never waits
     * less than the capture did (12.4 us becomes 13 us, exactly 12 us stays 12); capped at
     * {@link #MAX_WAIT_US}.
     */
    static long replayWaitUs(long delayFs) {
        if (delayFs <= 0) {
            return 0;
        }
        long us = delayFs / FS_PER_US + (delayFs % FS_PER_US == 0 ? 0 : 1);
        return Math.min(MAX_WAIT_US, us);
    }

    static boolean isRead(int dt) {
        int d = dt & 0x3F;
        return d == DataTypes.DCS_READ || d == DataTypes.GENERIC_READ_0 || d == DataTypes.GENERIC_READ_1 || d == DataTypes.GENERIC_READ_2;
    }

    static boolean isFrameCommand(CommandLog.Entry e) {
        return DataTypes.isDcs(e.dataType) && (e.cmd == DcsCommands.COLUMN_ADDRESS || e.cmd == DcsCommands.PAGE_ADDRESS
                || DcsCommands.isMemoryWrite(e.cmd));
    }

    static int flags(CommandLog.Entry e) {
        return ("lp".equals(e.mode) ? FLAG_LP : 0) | (e.longPacket ? FLAG_LONG : 0) | (DataTypes.isDcs(e.dataType) ? FLAG_DCS : 0);
    }

    /** Indices into the log of the init records (every command but reads and frame commands). */
    List<Integer> initRecords() {
        List<Integer> out = new ArrayList<>();
        for (int i = 0; i < log.entries.size(); i++) {
            CommandLog.Entry e = log.entries.get(i);
            if (!isRead(e.dataType) && !isFrameCommand(e) && e.data != null) {
                out.add(i);
            }
        }
        return out;
    }

    /** Indices of the frame-window commands of the first frame: those before the first memory write. */
    List<Integer> windowRecords() {
        List<Integer> out = new ArrayList<>();
        for (int i = 0; i < log.entries.size(); i++) {
            CommandLog.Entry e = log.entries.get(i);
            if (e.isMemoryWrite()) {
                break;
            }
            if (isFrameCommand(e) && e.data != null) {
                out.add(i);
            }
        }
        return out;
    }

    /** Time from the end of entry {@code i} to the start of the next listed record, or of the next command after the last. */
    private long waitFs(List<Integer> list, int k) {
        int i = list.get(k);
        CommandLog.Entry e = log.entries.get(i);
        int next = k + 1 < list.size() ? list.get(k + 1) : i + 1;
        if (next >= log.entries.size()) {
            return 0;
        }
        return Math.max(0, log.entries.get(next).startFs - e.endFs);
    }

    byte[] bytes() {
        String sym = symbol(id);
        String up = sym.toUpperCase(Locale.ROOT);
        List<Integer> init = initRecords();
        List<Integer> window = windowRecords();
        StringBuilder sb = new StringBuilder(8192);
        sb.append("/* Display init sequence decoded by lanesift packet-link, instance ").append(safe(id)).append(".\n")
                .append(" * Layout (docs/init-sequence.md): each table is a run of records\n")
                .append(" *   flags, data_id, count_lo, count_hi, data[count], wait_us (4 bytes, little-endian)\n")
                .append(" * ended by a flags byte of ").append(up).append("_END. data_id = (virtual channel << 6) | data type;\n")
                .append(" * data = both data bytes of a short packet, or the payload of a long one, as sent.\n")
                .append(" * wait_us: time from the end of this packet to the start of the next record's packet in the capture,\n")
                .append(" * rounded UP to whole microseconds, so a replay never waits less than the captured host did.\n")
                .append(" * Check the sequence against the panel controller's data sheet: a capture shows what one host sent,\n")
                .append(" * not what the panel requires. Handle display flex cables with ESD precautions.\n */\n")
                .append("#ifndef ").append(up).append("_INIT_H\n#define ").append(up).append("_INIT_H\n\n#include <stdint.h>\n\n");
        // a table the including file does not use must not trip -Wall -Werror (unused static const)
        sb.append("#if defined(__GNUC__)\n#define ").append(up).append("_MAYBE_UNUSED __attribute__((unused))\n#else\n#define ")
                .append(up).append("_MAYBE_UNUSED\n#endif\n\n");
        sb.append("/* Link configuration seen in the capture */\n");
        define(sb, up + "_LINK_LANES", String.valueOf(facts.lanes), "data lanes");
        double rate = facts.hsBitRateHz();
        define(sb, up + "_LINK_HS_BIT_RATE_HZ", Double.isFinite(rate) ? Math.round(rate) + "UL" : "0UL",
                Double.isFinite(rate) ? "per lane, mean over every high-speed byte" : "no high-speed burst seen");
        define(sb, up + "_LINK_PIXEL_BITS", String.valueOf(facts.pixelBits),
                facts.pixelBits == 0 ? "no pixel format seen" : "bits per pixel (set_pixel_format or pixel packets)");
        String mode = facts.frameMode();
        define(sb, up + "_LINK_VIDEO_MODE", mode.equals("video") ? "1" : mode.equals("command") ? "0" : "(-1)",
                "1 video mode, 0 command mode (memory writes), -1 no frames seen");
        sb.append('\n');
        define(sb, up + "_LP", hex(FLAG_LP), "flag: sent in low-power (escape) mode, else high speed");
        define(sb, up + "_LONG", hex(FLAG_LONG), "flag: long packet, else short");
        define(sb, up + "_DCS", hex(FLAG_DCS), "flag: DCS data type, else generic or other");
        define(sb, up + "_END", hex(END), "flags byte that ends a table");
        sb.append("\n/* Init: every command outside the frame writes, in capture order */\n");
        sb.append("static const uint8_t ").append(sym).append("_init[] ").append(up).append("_MAYBE_UNUSED = {\n");
        table(sb, init);
        sb.append("};\n");
        define(sb, up + "_INIT_RECORDS", String.valueOf(init.size()), null);
        sb.append("\n/* Frame window of the first frame (column and page address); the pixel data follows as memory writes */\n");
        sb.append("static const uint8_t ").append(sym).append("_frame_window[] ").append(up).append("_MAYBE_UNUSED = {\n");
        table(sb, window);
        sb.append("};\n");
        define(sb, up + "_FRAME_WINDOW_RECORDS", String.valueOf(window.size()), null);
        frameSummary(sb, up);
        List<String> reads = new ArrayList<>();
        for (CommandLog.Entry e : log.entries) {
            if (isRead(e.dataType)) {
                reads.add(e.name);
            }
        }
        if (!reads.isEmpty()) {
            sb.append("/* left out (reads need a bus turnaround and a reply): ").append(safe(String.join(", ", reads))).append(" */\n");
        }
        if (log.overflow) {
            sb.append("/* the command log was full (maxLogEntries): later commands are missing */\n");
        }
        sb.append("\n#endif\n");
        return sb.toString().getBytes(StandardCharsets.UTF_8);
    }

    private void frameSummary(StringBuilder sb, String up) {
        // per frame (from each write_memory_start to the next): pixel bytes and packets
        List<long[]> frames = new ArrayList<>();
        for (CommandLog.Entry e : log.entries) {
            if (!e.isMemoryWrite()) {
                continue;
            }
            if (e.cmd == DcsCommands.MEMORY_WRITE || frames.isEmpty()) {
                frames.add(new long[2]);
            }
            long[] f = frames.get(frames.size() - 1);
            f[0] += e.payloadBytes;
            f[1]++;
        }
        long[] first = frames.isEmpty() ? new long[2] : frames.get(0);
        boolean uneven = frames.stream().anyMatch(f -> f[0] != first[0]);
        define(sb, up + "_FRAME_WRITES", String.valueOf(frames.size()), "frames written with memory writes in the capture");
        define(sb, up + "_FRAME_PIXEL_BYTES", String.valueOf(first[0]),
                "pixel bytes written for the first frame" + (uneven ? " (later frames wrote other amounts)" : ""));
        define(sb, up + "_FRAME_WRITE_PACKETS", String.valueOf(first[1]), "memory-write packets of the first frame");
    }

    private void table(StringBuilder sb, List<Integer> list) {
        for (int k = 0; k < list.size(); k++) {
            CommandLog.Entry e = log.entries.get(list.get(k));
            byte[] d = e.data;
            long waitFs = waitFs(list, k);
            long us = replayWaitUs(waitFs);
            sb.append(String.format(Locale.ROOT, "    0x%02X, 0x%02X, 0x%02X, 0x%02X,", flags(e), e.vc << 6 | e.dataType, d.length & 0xFF,
                    d.length >> 8 & 0xFF));
            for (byte b : d) {
                sb.append(String.format(Locale.ROOT, " 0x%02X,", b & 0xFF));
            }
            sb.append(String.format(Locale.ROOT, " 0x%02X, 0x%02X, 0x%02X, 0x%02X,", us & 0xFF, us >> 8 & 0xFF, us >> 16 & 0xFF, us >> 24 & 0xFF));
            sb.append(" /* ").append(safe(e.name)).append(", ").append(e.mode).append(' ').append(e.longPacket ? "long" : "short")
                    .append(' ').append(DataTypes.isDcs(e.dataType) ? "DCS" : DataTypes.isGenericWrite(e.dataType) ? "generic" : "other")
                    .append(e.vc != 0 ? ", vc " + e.vc : "");
            if (us > 0) {
                sb.append(String.format(Locale.ROOT, ", then wait %d us (measured %.3f us)", us, waitFs / 1e9));
            }
            if (us == MAX_WAIT_US) {
                sb.append(", capped");
            }
            if (e.checksumBad) {
                sb.append(", checksum failed in the capture");
            }
            sb.append(" */\n");
        }
        sb.append(String.format(Locale.ROOT, "    0x%02X /* end */\n", END));
    }

    private static void define(StringBuilder sb, String name, String value, String comment) {
        sb.append("#define ").append(name).append(' ').append(value);
        if (comment != null) {
            sb.append(" /* ").append(comment).append(" */");
        }
        sb.append('\n');
    }

    private static String hex(int v) {
        return String.format(Locale.ROOT, "0x%02X", v);
    }

    static String symbol(String id) {
        String s = id.replaceAll("[^A-Za-z0-9_]", "_");
        return s.isEmpty() || Character.isDigit(s.charAt(0)) ? "_" + s : s;
    }

    private static String safe(String s) {
        return s.replace("*/", "* /").replace("\n", " ");
    }
}
