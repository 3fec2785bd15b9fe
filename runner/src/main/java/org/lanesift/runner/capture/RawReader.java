package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PortSpec;
import org.lanesift.time.Femtos;

/**
 * Streams an interleaved raw binary capture described by a {@link RawSidecar}: whole chunks of
 * frames are read into one reused direct buffer and converted by the format's {@link RawConverter}; the
 * block arrays are new per block, or lent (two sets used in turn, see {@link BlockArrays}) where the
 * engine allows it. Unless turned off (the source's {@code readAhead} option, the system property
 * {@code lanesift.readAhead=false}) or the window is one block, the next block is read and
 * converted on a second thread while the caller decodes the current one ({@link ReadAhead}); the
 * blocks, and any error reading them, are the same either way. With the {@code differences} option
 * ({@link LegDifferences}) each chunk's channels are converted into scratch arrays first and the
 * outputs (pairs of legs as differences, other channels as they are) are written from them.
 */
final class RawReader implements CaptureReader {
    /** Bytes read at a time (whole frames, at least one). */
    static final int READ_BYTES = 1 << 20;
    private final Path file;
    private final RawSidecar sc;
    private final FileChannel ch;
    private final long frames;
    private final long first;
    private final int nch;
    private final int frame;
    private final int framesPerBlock;
    private final double periodFs;
    private final long startFs;
    private final ByteBuffer bb;
    private final RawConverter converter;
    private final BlockArrays arrays;
    /** Frames handed out (the caller's thread). */
    private long pos;
    /** Next frame to read (by one read at a time, see {@link ReadAhead}). */
    private long readPos;
    private final ReadAhead<Span> spans;
    private final List<PortSpec> ports = new ArrayList<>();
    private final List<String> units = new ArrayList<>();
    /** The outputs: the channels, or pairs of legs read as differences ({@link LegDifferences}). */
    private final LegDifferences outs;
    /** With differences: every channel of one read chunk, converted, before the outputs are filled. */
    private final float[][] legs;
    /** With differences: every channel's invalid samples of one read chunk, or null entries for none. */
    private final long[][] legMasks;

    RawReader(Path file, RawSidecar sc, int blockSamples, boolean headerOnly) throws IOException {
        this(file, sc, blockSamples, headerOnly, 0, 0, ReadAhead.allowed());
    }

    /**
     * A reader of frames {@code [firstFrame, firstFrame + frameCount)} (to the end when the count
     * is 0), with the sample indices and times of the whole capture.
     *
     * @param readAhead whether the next block may be read on a second thread while this one is
     *                  decoded ({@link ReadAhead}; never for a window of one block)
     */
    RawReader(Path file, RawSidecar sc, int blockSamples, boolean headerOnly, long firstFrame, long frameCount, boolean readAhead)
            throws IOException {
        this(file, sc, blockSamples, headerOnly, firstFrame, frameCount, readAhead, READ_BYTES, "");
    }

    /**
     * As above, reading {@code readBytes} at a time (rounded down to whole frames, at least one;
     * tests cut the reads at odd sizes), with the outputs the {@code differences} option names
     * ({@link LegDifferences}; blank: every channel).
     */
    RawReader(Path file, RawSidecar sc, int blockSamples, boolean headerOnly, long firstFrame, long frameCount, boolean readAhead,
              int readBytes, String differences) throws IOException {
        this.file = file;
        this.sc = sc;
        this.nch = sc.names.length;
        this.frame = sc.frameBytes();
        long size;
        CaptureFormatException.requireRegular(file);
        try {
            size = Files.size(file);
        } catch (NoSuchFileException e) {
            throw new CaptureFormatException(file, 0, "file not found");
        }
        long left = size % frame;
        if (left != 0) {
            throw new CaptureFormatException(file, 0, size + " bytes is not a whole number of frames: " + left
                    + " bytes left over after " + (size / frame) + " frames of " + frame + " bytes (" + nch + " channel"
                    + (nch == 1 ? "" : "s") + " x " + sc.format.text + "); expected a multiple of " + frame);
        }
        long all = size / frame;
        if (firstFrame > all) {
            throw new CaptureFormatException(file, 0, "option firstFrame = " + firstFrame + " is past the end of the capture ("
                    + all + " frames)");
        }
        this.first = firstFrame;
        // frameCount may be as large as Long.MAX_VALUE: "to the end", never an overflow to nothing
        this.frames = frameCount == 0 || frameCount >= all - firstFrame ? all : firstFrame + frameCount;
        if (!Femtos.spanFits(Femtos.fromSeconds(sc.startTimeS), Femtos.periodFs(sc.rateHz), all)) {
            throw new CaptureFormatException(sc.path, 0, "/rateHz: " + all + " frames at " + sc.rateHz + " samples per second last "
                    + String.format(java.util.Locale.ROOT, "%.4g", all / sc.rateHz) + " s; expected a capture that ends within "
                    + String.format(java.util.Locale.ROOT, "%.0f", Femtos.MAX_SECONDS) + " s of its origin (times are femtoseconds in 64 bits)");
        }
        this.pos = firstFrame;
        this.readPos = firstFrame;
        this.framesPerBlock = Math.max(1, Math.min(blockSamples, CsvReader.MAX_SPAN_VALUES / nch));
        this.periodFs = Femtos.periodFs(sc.rateHz);
        this.startFs = Femtos.fromSeconds(sc.startTimeS);
        this.outs = LegDifferences.parse(differences, sc.names);
        for (int o = 0; o < outs.names.length; o++) {
            int k = outs.first[o];
            ports.add(PortSpec.of(outs.names[o], DataKind.ANALOG, outs.second[o] >= 0 ? outs.help[o]
                    : "raw channel " + k + " (" + sc.format.text + " x " + sc.gain[k] + " V + " + sc.offset[k] + " V)"));
            units.add("V");
        }
        // buffers sized to the work: a short capture gets a short read buffer and short blocks
        long readFrames = Math.max(1, Math.min((long) framesPerBlock, this.frames - firstFrame));
        int chunkFrames = (int) Math.min(readFrames, Math.max(1, readBytes / frame));
        // a direct buffer: the channel reads into it without a copy through a temporary one
        this.bb = headerOnly ? ByteBuffer.allocate(0) : ByteBuffer.allocateDirect(chunkFrames * frame);
        bb.order(sc.format == RawSidecar.Format.INT16BE ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN);
        this.converter = headerOnly ? null : RawConverter.of(sc);
        this.arrays = new BlockArrays(outs.names.length, framesPerBlock);
        boolean diff = outs.any() && !headerOnly;
        this.legs = diff ? new float[nch][chunkFrames] : null;
        this.legMasks = diff ? new long[nch][] : null;
        this.ch = headerOnly ? null : FileChannel.open(file, StandardOpenOption.READ);
        if (ch != null) {
            ch.position(firstFrame * frame);
        }
        this.spans = new ReadAhead<>(file.getFileName().toString(), readAhead && !headerOnly && this.frames - firstFrame > framesPerBlock,
                arrays, this::read, () -> readPos < this.frames);
    }

    @Override
    public List<PortSpec> ports() {
        return ports;
    }

    @Override
    public List<String> units() {
        return units;
    }

    @Override
    public long done() {
        return pos - first;
    }

    @Override
    public long total() {
        return frames - first;
    }

    double periodFs() {
        return periodFs;
    }

    long startFs() {
        return startFs;
    }

    int blockFrames() {
        return framesPerBlock;
    }

    @Override
    public void lend(boolean[] perChannel) {
        arrays.lend(perChannel);
    }

    /** One block of every channel, read and converted, not yet handed out. */
    private record Span(long first, int n, float[][] volts, long[][] invalid) {
    }

    @Override
    public boolean next(Out out) throws IOException {
        Span s = spans.next();
        if (s == null) {
            return false;
        }
        long blockStart = startFs + Math.round(s.first * periodFs);
        for (int o = 0; o < s.volts.length; o++) {
            out.emit(o, new AnalogBlock(outs.names[o], s.first, blockStart, periodFs, s.volts[o], s.n, s.invalid[o]));
        }
        pos = s.first + s.n;
        return true;
    }

    /** Reads and converts the block at {@link #readPos} into the arrays of the set being filled. */
    private Span read() throws IOException {
        int n = (int) Math.min(framesPerBlock, frames - readPos);
        int nout = outs.names.length;
        float[][] v = new float[nout][];
        for (int o = 0; o < nout; o++) {
            v[o] = arrays.volts(o, n);
        }
        long[][] inv = new long[nout][];
        RawConverter.Masks masks = k -> inv[k] != null ? inv[k] : (inv[k] = arrays.mask(k, n));
        int row = 0;
        while (row < n) {
            bb.clear();
            bb.limit((int) Math.min(bb.capacity(), (long) (n - row) * frame));
            while (bb.hasRemaining()) {
                if (ch.read(bb) < 0) {
                    throw new CaptureFormatException(file, 0, "the file shrank while reading; expected " + frames + " frames");
                }
            }
            bb.flip();
            int got = bb.remaining() / frame;
            if (legs == null) {
                converter.convert(bb, got, v, row, masks);
            } else {
                // the chunk's channels into scratch arrays (still in cache), then the outputs from them
                Arrays.fill(legMasks, null);
                int words = BitSets.words(got);
                converter.convert(bb, got, legs, 0, k -> legMasks[k] != null ? legMasks[k] : (legMasks[k] = new long[words]));
                outs.fill(legs, legMasks, got, v, row, masks);
            }
            row += got;
        }
        Span s = new Span(readPos, n, v, inv);
        readPos += n;
        return s;
    }

    /** The read-ahead of this reader (for tests). */
    ReadAhead<?> readAhead() {
        return spans;
    }

    @Override
    public void close() throws IOException {
        spans.close();
        if (ch != null) {
            ch.close();
        }
    }
}
