package org.lanesift.plugins.packetlink;

import java.util.Arrays;
import java.util.Locale;
import java.util.function.Consumer;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.WordStream;
import org.lanesift.time.Femtos;

/**
 * Turns merged burst bytes into packets, annotations, command log entries and frames, and emits
 * the bytes as an 8-bit {@link WordStream} with per-byte flags ({@link #FLAG_PACKET_START} and
 * the others below, on top of the host's suspect and gap flags).
 */
final class DsiDecoder implements PacketParser.Listener {
    /** First header byte of a packet. */
    static final byte FLAG_PACKET_START = 4;
    /** One of the four header bytes. */
    static final byte FLAG_HEADER = 8;
    /** Header byte of a packet whose header had one bit corrected. */
    static final byte FLAG_ECC_CORRECTED = 16;
    /** Payload or checksum byte of a packet whose checksum did not match (payload kept). */
    static final byte FLAG_CHECKSUM_BAD = 32;
    /** Byte left unparsed (after an uncorrectable header, a truncated packet, or a partial header). */
    static final byte FLAG_UNPARSED = 64;

    private final String id;
    private final Consumer<WordStream> words;
    private final Consumer<Annotation> notes;
    final CommandLog log;
    final FrameAssembler frames;
    final LinkFacts facts;
    final PacketExport export;
    long packetCount;
    long eccCorrected;
    long eccUncorrectable;
    long checksumBad;

    private byte[] data;
    private long[] startFs;
    private long[] endFs;
    private byte[] flags;
    private int[] lanes;
    private String mode;
    private String track;

    DsiDecoder(String id, CommandLog log, FrameAssembler frames, LinkFacts facts, PacketExport export, Consumer<WordStream> words,
               Consumer<Annotation> notes) {
        this.id = id;
        this.export = export;
        this.facts = facts;
        this.log = log;
        this.frames = frames;
        this.words = words;
        this.notes = notes;
    }

    /**
     * Decodes one burst.
     *
     * @param d     bytes in wire order (lanes merged)
     * @param s     start time of each byte
     * @param e     end time of each byte
     * @param lane  lane of each byte
     * @param f     flags per byte (suspect and gap already set); decoder flags are added
     * @param n     byte count
     * @param lp    true for low-power data (escape mode), false for a high-speed burst
     */
    void burst(byte[] d, long[] s, long[] e, int[] lane, byte[] f, int n, boolean lp) {
        data = d;
        startFs = s;
        endFs = e;
        flags = f;
        lanes = lane;
        mode = lp ? "lp" : "hs";
        track = lp ? "packets.lp" : "packets";
        if (!lp) {
            facts.hsBytes(s, e, n);
        }
        PacketParser.parse(d, 0, n, this);
        if (n > 0) {
            long[] values = new long[n];
            for (int i = 0; i < n; i++) {
                values[i] = d[i] & 0xFF;
            }
            // the arrays belong to this burst: hand them on without copying when they fit exactly
            words.accept(new WordStream(id + "." + mode, s[0], Math.max(s[0], e[n - 1]), n, 8, values,
                    fit(s, n), fit(e, n), lane.length == n ? lane : Arrays.copyOf(lane, n), f.length == n ? f : Arrays.copyOf(f, n)));
        }
    }

    private static long[] fit(long[] a, int n) {
        return a.length == n ? a : Arrays.copyOf(a, n);
    }

    private boolean suspect(int from, int to) {
        for (int i = from; i < to; i++) {
            if ((flags[i] & WordStream.FLAG_SUSPECT) != 0) {
                return true;
            }
        }
        return false;
    }

    @Override
    public void packet(int off, int header, int ecc, int pOff, int pLen, int rx, int calc) {
        packetCount++;
        int di = header & 0xFF;
        int vc = di >> 6;
        int dt = di & 0x3F;
        boolean isLong = rx >= 0;
        int end = isLong ? pOff + pLen + 2 : off + 4;
        // on several lanes neighbouring bytes travel side by side: the packet spans the earliest start
        // of its first bytes and the latest end of its last bytes (at most 4 lanes)
        long t0 = Long.MAX_VALUE;
        long t1 = Long.MIN_VALUE;
        for (int i = off; i < Math.min(end, off + 4); i++) {
            t0 = Math.min(t0, startFs[i]);
        }
        for (int i = Math.max(off, end - 4); i < end; i++) {
            t1 = Math.max(t1, endFs[i]);
        }
        int status = Ecc.status(ecc);
        flags[off] |= FLAG_PACKET_START;
        for (int i = off; i < off + 4; i++) {
            flags[i] |= FLAG_HEADER;
            if (status != Ecc.OK) {
                flags[i] |= FLAG_ECC_CORRECTED;
            }
        }
        boolean bad = isLong && rx != calc;
        if (bad) {
            for (int i = pOff; i < end; i++) {
                flags[i] |= FLAG_CHECKSUM_BAD;
            }
        }
        boolean sus = suspect(off, end);
        String dtName = DataTypes.name(dt);
        Annotation.Builder pb = Annotation.on(track, "packet").span(t0, t1)
                .label(dtName + (isLong ? " " + pLen + " bytes" : "") + (vc != 0 ? " vc" + vc : ""))
                .severity(sus ? Severity.WARNING : Severity.INFO)
                .field("vc", Field.integer(vc, "")).field("dataType", Field.enumValue(dtName))
                .field("dataTypeCode", Field.integer(dt, "")).field("long", Field.text(Boolean.toString(isLong)));
        if (isLong) {
            pb.field("wordCount", Field.integer(pLen, "B"));
        } else {
            pb.field("data", Field.bytes(new byte[] {(byte) (header >> 8), (byte) (header >> 16)}));
        }
        pb.field("mode", Field.enumValue(mode));
        if (!DataTypes.isKnown(dt)) {
            pb.field("raw", Field.bytes(Arrays.copyOfRange(data, off, end)));
        }
        notes.accept(pb.build());
        PacketExport.Row row = new PacketExport.Row();
        row.kind = "packet";
        row.startFs = t0;
        row.endFs = t1;
        row.mode = mode;
        row.laneMask = PacketExport.lanes(lanes, off, end);
        row.dataId = di;
        row.longPacket = isLong;
        row.wordCount = pLen;
        row.data = isLong ? PacketExport.copy(data, pOff, pOff + pLen) : new byte[] {(byte) (header >> 8), (byte) (header >> 16)};
        row.eccByte = data[off + 3] & 0xFF;
        row.ecc = status == Ecc.OK ? "ok" : status == Ecc.CORRECTED_HEADER_BIT ? "corrected-header-bit" : "corrected-ecc-bit";
        if (status != Ecc.OK) {
            row.headerReceived = PacketExport.copy(data, off, off + 4);
        }
        row.checksumRx = rx;
        row.checksumCalc = calc;
        row.suspect = sus;
        export.add(row);
        if (status == Ecc.CORRECTED_HEADER_BIT || status == Ecc.CORRECTED_ECC_BIT) {
            eccCorrected++;
            int bit = Ecc.bit(ecc);
            notes.accept(Annotation.on(track, "ecc-corrected").span(t0, startFs[off + 3]).severity(Severity.WARNING)
                    .label(bit < 24 ? "header bit " + bit + " corrected" : "ECC bit " + (bit - 24) + " corrected")
                    .field("bit", Field.integer(bit, "")).field("dataType", Field.enumValue(dtName)).build());
        }
        if (bad) {
            checksumBad++;
            notes.accept(Annotation.on(track, "checksum-mismatch").span(t0, t1).severity(Severity.ERROR)
                    .label(String.format(Locale.ROOT, "checksum %04X received, %04X computed; payload kept, marked", rx, calc))
                    .field("received", Field.integer(rx, "")).field("computed", Field.integer(calc, ""))
                    .field("dataType", Field.enumValue(dtName)).build());
        }
        if (DataTypes.isCommand(dt)) {
            command(off, header, status, dt, vc, pOff, pLen, isLong, bad, sus, t0, t1);
        } else if (dt == DataTypes.VSYNC_START || dt == DataTypes.VSYNC_END || dt == DataTypes.HSYNC_START || dt == DataTypes.HSYNC_END) {
            frames.sync(dt, t0, t1);
        } else if (DataTypes.isPixels(dt)) {
            facts.pixelType(dt);
            frames.pixels(dt, data, pOff, pLen, t0, t1, sus || bad);
        }
    }

    private void command(int off, int header, int status, int dt, int vc, int pOff, int pLen, boolean isLong, boolean bad, boolean sus,
                         long t0, long t1) {
        byte[] bytes;
        if (isLong) {
            bytes = null;
        } else {
            int count = switch (dt) {
                case DataTypes.GENERIC_SHORT_WRITE_1, DataTypes.GENERIC_READ_1, DataTypes.DCS_SHORT_WRITE_0, DataTypes.DCS_READ -> 1;
                case DataTypes.GENERIC_SHORT_WRITE_2, DataTypes.GENERIC_READ_2, DataTypes.DCS_SHORT_WRITE_1, DataTypes.SET_MAX_RETURN -> 2;
                default -> 0;
            };
            bytes = new byte[count];
            if (count > 0) {
                bytes[0] = (byte) (header >> 8);
            }
            if (count > 1) {
                bytes[1] = (byte) (header >> 16);
            }
        }
        CommandLog.Entry e = new CommandLog.Entry();
        e.startFs = t0;
        e.endFs = t1;
        e.mode = mode;
        e.vc = vc;
        e.dataType = dt;
        e.checksumBad = bad;
        e.eccCorrected = status != Ecc.OK;
        e.longPacket = isLong;
        boolean firstIsCommand = DataTypes.isDcs(dt) || DataTypes.isGenericWrite(dt);
        byte[] src = isLong ? data : bytes;
        int so = isLong ? pOff : 0;
        int sn = isLong ? pLen : bytes.length;
        if (firstIsCommand && sn > 0) {
            e.cmd = src[so] & 0xFF;
            so++;
            sn--;
        } else {
            e.cmd = -1;
        }
        boolean dcs = DataTypes.isDcs(dt);
        if (dcs) {
            e.name = DcsCommands.name(e.cmd);
            e.meaning = DcsCommands.describe(e.cmd, src, so, sn);
        } else if (e.cmd >= 0) {
            e.name = String.format(Locale.ROOT, "generic-0x%02X", e.cmd);
            e.meaning = "";
        } else {
            e.name = DataTypes.name(dt);
            e.meaning = dt == DataTypes.SET_MAX_RETURN && sn >= 2 ? "maximum " + ((src[so] & 0xFF) | (src[so + 1] & 0xFF) << 8) + " bytes" : "";
        }
        boolean memWrite = dcs && DcsCommands.isMemoryWrite(e.cmd);
        e.payloadBytes = sn;
        e.params = memWrite ? null : Arrays.copyOfRange(src, so, so + sn);
        if (memWrite) {
            facts.memoryWrites = true;
        } else {
            // the data bytes as sent, for an exact replay: both short-packet bytes, or the whole payload
            e.data = isLong ? Arrays.copyOfRange(data, pOff, pOff + pLen) : new byte[] {(byte) (header >> 8), (byte) (header >> 16)};
        }
        if (dcs && e.cmd == DcsCommands.PIXEL_FORMAT && sn >= 1 && DcsCommands.bitsPerPixel(src[so]) != 0) {
            facts.pixelBits = DcsCommands.bitsPerPixel(src[so]);
        }
        if (dt == DataTypes.DCS_READ) {
            e.name = "read " + e.name;
        }
        log.add(e);
        if (dcs && dt != DataTypes.DCS_READ) {
            frames.command(e.cmd, src, so, sn, t0, t1, sus || bad);
        }
        // a bad checksum is found once, by the checksum-mismatch finding on this packet: the command
        // decoded from it is that finding's consequence, information referring to it
        Annotation.Builder b = Annotation.on("commands", "command").span(t0, t1)
                .label(e.name + (e.meaning.isEmpty() ? "" : ": " + e.meaning)
                        + (bad ? " (payload suspect, consequence: see the checksum-mismatch finding at " + Femtos.format(t0) + ")" : ""))
                .severity(!bad && sus ? Severity.WARNING : Severity.INFO)
                .field("name", Field.enumValue(e.name)).field("vc", Field.integer(vc, "")).field("mode", Field.enumValue(mode));
        if (e.cmd >= 0) {
            b.field("command", Field.integer(e.cmd, ""));
        }
        if (!memWrite) {
            b.field("params", Field.bytes(e.params));
        } else {
            b.field("payloadBytes", Field.integer(sn, "B"));
        }
        if (bad) {
            b.field("checksumBad", Field.text("true"));
        }
        notes.accept(b.build());
    }

    @Override
    public void stopped(int off, int remaining, int reason) {
        for (int i = off; i < off + remaining; i++) {
            flags[i] |= FLAG_UNPARSED;
        }
        long t0 = startFs[off];
        long t1 = endFs[off + remaining - 1];
        PacketExport.Row row = new PacketExport.Row();
        row.kind = "unparsed";
        row.startFs = t0;
        row.endFs = t1;
        row.mode = mode;
        row.laneMask = PacketExport.lanes(lanes, off, off + remaining);
        row.data = PacketExport.copy(data, off, off + remaining);
        row.suspect = suspect(off, off + remaining);
        row.reason = switch (reason) {
            case PacketParser.STOP_UNCORRECTABLE -> "header-uncorrectable";
            case PacketParser.STOP_TRUNCATED -> "packet-truncated";
            default -> "leftover";
        };
        export.add(row);
        switch (reason) {
            case PacketParser.STOP_UNCORRECTABLE -> {
                eccUncorrectable++;
                notes.accept(Annotation.on(track, "ecc-uncorrectable").span(t0, t1).severity(Severity.ERROR)
                        .label("header with two or more bit errors; " + remaining + " bytes of the burst not parsed")
                        .field("header", Field.bytes(Arrays.copyOfRange(data, off, off + 4)))
                        .field("bytesLost", Field.integer(remaining, "B")).build());
            }
            case PacketParser.STOP_TRUNCATED -> notes.accept(Annotation.on(track, "packet-truncated").span(t0, t1).severity(Severity.ERROR)
                    .label("long packet runs past the end of the burst; " + remaining + " bytes kept raw")
                    .field("raw", Field.bytes(Arrays.copyOfRange(data, off, off + Math.min(remaining, 64))))
                    .field("bytesLost", Field.integer(remaining, "B")).build());
            default -> notes.accept(Annotation.on(track, "burst-leftover").span(t0, t1).severity(Severity.WARNING)
                    .label(remaining + " bytes after the last packet do not make a header")
                    .field("raw", Field.bytes(Arrays.copyOfRange(data, off, off + remaining))).build());
        }
    }
}
