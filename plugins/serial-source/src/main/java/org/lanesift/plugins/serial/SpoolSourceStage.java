package org.lanesift.plugins.serial;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Properties;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.LogicBlock;
import org.lanesift.kit.PackedLogic;
import org.lanesift.plugin.StageContext;

/** The running {@code spool} source. */
final class SpoolSourceStage implements org.lanesift.plugin.Stage {
    private static final long POLL_MS = 20;
    private static final String[] CHANNEL_NAMES = {"ch0", "ch1", "ch2", "ch3", "ch4", "ch5", "ch6", "ch7"};
    private final StageContext ctx;
    private final Path dir;
    private final boolean follow;
    /** Following: how long the spool may stay unchanged before the source gives up. */
    private final long idleLimitNanos;
    private final int channels;
    private final int blockSamples;
    private final byte[] chunk = new byte[1 << 16];
    private SpoolHeader header;
    private SpoolDecoder decoder;
    private SpoolReader reader;
    private double periodFs;
    private long lastClosedEpochMs = -1;
    /** The segment whose close marker {@link #lastClosedEpochMs} was read from, or -1. */
    private int closeReadFor = -1;
    private long lastPosWrite;
    private boolean done;
    private long startSample;

    SpoolSourceStage(StageContext ctx, Path dir) {
        this.ctx = ctx;
        this.dir = dir;
        this.follow = ctx.options().getBoolean("follow");
        this.idleLimitNanos = (long) (ctx.options().getDouble("followIdleSeconds") * 1e9);
        this.channels = ctx.options().getInt("channels");
        this.blockSamples = ctx.options().getInt("blockSamples");
        if (!follow && !Files.isRegularFile(dir.resolve(SpoolFiles.HEADER))) {
            throw new DeviceException("spool " + dir + ": no " + SpoolFiles.HEADER + " there; expected a spool directory written by 'lanesift live'");
        }
    }

    private boolean start() throws IOException, InterruptedException {
        long waitStart = System.nanoTime();
        // following a capture: wait for the header, and for the final one (after the identification
        // exchange) rather than the provisional rate written before it
        while (!Files.isRegularFile(dir.resolve(SpoolFiles.HEADER))
                || (follow && SpoolHeader.isProvisional(dir) && !Files.exists(dir.resolve(SpoolFiles.CLOSED)))) {
            if (ctx.isCancelled()) {
                return false;
            }
            if (System.nanoTime() - waitStart > idleLimitNanos) {
                throw new DeviceException("spool " + dir + ": no final " + SpoolFiles.HEADER + " after "
                        + String.format(java.util.Locale.ROOT, "%.3g", idleLimitNanos / 1e9) + " s; stopped waiting for the capture to start "
                        + "(option followIdleSeconds; docs/spool.md)");
            }
            Thread.sleep(POLL_MS);
        }
        header = SpoolHeader.read(dir);
        if (header.channels() < channels) {
            throw new DeviceException("spool " + dir + ": holds " + header.channels() + " channels but option 'channels' asks for " + channels);
        }
        periodFs = 1e15 / header.rateHz();
        double startFs = ctx.options().getTime("start").toFs(periodFs, Double.NaN);
        if (!(startFs >= 0)) {
            throw new DeviceException("option 'start' of plugin 'spool': expected a time from 0, got " + ctx.options().getTime("start"));
        }
        startSample = (long) Math.ceil(startFs / periodFs - 1e-9);
        decoder = new SpoolDecoder(header, blockSamples, new SpoolDecoder.Out() {
            @Override
            public void samples(long firstIndex, byte[] b, int n) {
                emit(firstIndex, b, n);
            }

            @Override
            public void annotate(Annotation a) {
                ctx.annotate(a);
            }
        });
        decoder.dropBefore(startSample);
        reader = new SpoolReader(dir, follow, POLL_MS, ctx::isCancelled, idleLimitNanos);
        return true;
    }

    private void emit(long firstIndex, byte[] b, int n) {
        long[][] out = new long[channels][(n + 63) >>> 6];
        PackedLogic.split(b, n, out);
        long startFs = Math.round(firstIndex * periodFs);
        for (int c = 0; c < channels; c++) {
            if (ctx.isConnected(c)) {
                ctx.emit(c, new LogicBlock(CHANNEL_NAMES[c], firstIndex, startFs, periodFs, out[c], n, null));
            }
        }
    }

    @Override
    public boolean produce() throws Exception {
        if (done) {
            return false;
        }
        if (header == null && !start()) {
            done = true;
            return false;
        }
        SpoolReader.Event e = reader.read(chunk);
        switch (e) {
            case SEGMENT_START -> {
                Properties info = reader.segmentInfo();
                long opened = parse(info.getProperty("openedEpochMs"));
                decoder.beginSegment(reader.segment(), opened, lastClosedEpochMs);
                if (startSample > 0) {
                    seek();
                }
                if (reader.segment() > 1) {
                    ctx.annotate(Annotation.on(SpoolDecoder.TRACK, "stream-segment").severity(Severity.INFO)
                            .label("segment " + reader.segment() + " (" + info.getProperty("reason", "?") + ")")
                            .number("segment", reader.segment(), "").build());
                }
            }
            case DATA -> decoder.feed(chunk, 0, reader.lastCount());
            case IDLE -> decoder.flush(); // the device paused: hand on what is decoded instead of holding it
            case END -> {
                decoder.endSegment();
                done = true;
                finishSummary();
            }
            default -> throw new IllegalStateException();
        }
        trackClose();
        ctx.progress(decoder.samples(), -1);
        writePosition(false);
        return !done;
    }

    /**
     * At the start of a segment, replaying from {@code start}: passes over what lies before it
     * without reading it, the whole segment if it ends before the start, else up to the last
     * indexed frame that begins at or before it (framed), or to the start sample (raw).
     */
    private void seek() throws IOException {
        int seg = reader.segment();
        boolean closed = Files.exists(SpoolFiles.segmentClosed(dir, seg));
        long size = Files.size(SpoolFiles.segment(dir, seg));
        if (!header.framed()) {
            decoder.skipRaw(0); // applies the segment-start rules; the index after them is the segment's first
            long base = decoder.expectedIndex();
            long skip = Math.max(0, Math.min(startSample - base, size));
            decoder.skipRaw(reader.skipTo(skip));
            return;
        }
        Path idx = SpoolFiles.index(dir, seg);
        if (!Files.exists(idx)) {
            return;
        }
        byte[] rec = new byte[SpoolWriter.INDEX_RECORD];
        boolean first = true;
        long seekOffset = -1;
        long seekIndex = -1;
        long end = -1;
        try (java.io.InputStream in = new java.io.BufferedInputStream(Files.newInputStream(idx), 1 << 16)) {
            while (in.readNBytes(rec, 0, rec.length) == rec.length) {
                if (rec[0] != SpoolWriter.REC_FRAME) {
                    continue;
                }
                long sampleIndex = Framing.u64(rec, 24);
                long offset = Framing.u64(rec, 8);
                int samples = Framing.u32(rec, 16) - Framing.HEADER - 8 - Framing.TRAILER;
                if (first) {
                    first = false;
                    decoder.enterSegment(sampleIndex);
                }
                long at = sampleIndex + decoder.shift();
                // a repeated or late frame (behind what came before it) is no place to resume at
                if (at >= end && at <= startSample && offset > seekOffset) {
                    seekOffset = offset;
                    seekIndex = at;
                }
                end = Math.max(end, at + samples);
            }
        }
        if (first) {
            return; // nothing indexed yet: read the segment from its start
        }
        if (closed && end <= startSample && end >= 0) {
            // the whole segment lies before the start: continue as if it had been read
            decoder.resumeAt(size, end);
            reader.skipTo(size);
        } else if (seekOffset > 0) {
            decoder.resumeAt(seekOffset, seekIndex);
            reader.skipTo(seekOffset);
        }
    }

    /**
     * Notes when the current segment was closed, for the wall-clock gap to the next one. The close
     * marker is written once, atomically, so it is read once per segment; before that only its
     * presence is checked (it used to be read again after every chunk of a closed segment).
     */
    private void trackClose() throws IOException {
        int seg = reader.segment();
        if (seg <= 0 || seg == closeReadFor) {
            return;
        }
        Path closed = SpoolFiles.segmentClosed(dir, seg);
        if (Files.exists(closed)) {
            lastClosedEpochMs = parse(SpoolFiles.read(closed).getProperty("closedEpochMs"));
            closeReadFor = seg;
        }
    }

    private void finishSummary() {
        if (reader.unclosed()) {
            ctx.annotate(Annotation.on(SpoolDecoder.TRACK, "spool-unclosed").severity(Severity.WARNING)
                    .label("the capture never closed this spool; everything written was read").build());
        }
        long endFs = Math.round(decoder.samples() * periodFs);
        ctx.annotate(Annotation.on(SpoolDecoder.TRACK, "spool-summary").span(0, 0).severity(Severity.INFO)
                .label(decoder.samples() + " samples, " + decoder.gaps() + " gaps, " + decoder.corruptRuns() + " corrupt runs")
                .number("bytes", reader.consumed(), "B").number("samples", decoder.samples(), "samples")
                .number("gaps", decoder.gaps(), "").number("corruptRuns", decoder.corruptRuns(), "")
                .number("duplicates", decoder.duplicates(), "").number("reordered", decoder.reordered(), "")
                .number("overlaps", decoder.overlaps(), "").number("seqJumps", decoder.seqJumps(), "").number("segments", reader.segment(), "")
                .number("samplesSpanFs", endFs, "fs").build());
        writePosition(true);
    }

    private void writePosition(boolean force) {
        if (!follow) {
            return;
        }
        long now = System.nanoTime();
        if (!force && now - lastPosWrite < 200_000_000L) {
            return;
        }
        lastPosWrite = now;
        try {
            Path tmp = dir.resolve(SpoolFiles.DECODE_POS + ".tmp");
            Files.writeString(tmp, reader.consumed() + " " + decoder.samples() + (done ? " done" : "") + "\n", StandardCharsets.US_ASCII);
            Files.move(tmp, dir.resolve(SpoolFiles.DECODE_POS), StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
        } catch (IOException ignored) {
            // the position file only feeds the live status line
        }
    }

    private static long parse(String s) {
        try {
            return s == null ? -1 : Long.parseLong(s.trim());
        } catch (NumberFormatException e) {
            return -1;
        }
    }

    @Override
    public void close() {
        if (reader != null) {
            reader.close();
        }
    }
}
