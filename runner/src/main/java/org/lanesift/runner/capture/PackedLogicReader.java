package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import org.lanesift.data.DataKind;
import org.lanesift.data.LogicBlock;
import org.lanesift.kit.PackedLogic;
import org.lanesift.plugin.PortSpec;
import org.lanesift.time.Femtos;

/**
 * Streams a packed logic capture (one sample word after another, each bit a channel; see
 * {@link PackedLogicSidecar}) as one LOGIC block per named channel per span. Memory is one read
 * buffer of a block's words, two byte arrays of a block's samples for 16-bit words, and the
 * blocks themselves (new per block, or lent where the engine allows it, see {@link BlockArrays}); whole blocks are unpacked with {@link PackedLogic} (no per-sample branch on
 * format or channel). The next block is read on a second thread while the current one is decoded
 * ({@link ReadAhead}), unless that is turned off or the capture is one block.
 */
final class PackedLogicReader implements CaptureReader {
    private final Path file;
    private final PackedLogicSidecar sc;
    private final FileChannel ch;
    private final long samples;
    private final int blockSamples;
    private final double periodFs;
    private final long startFs;
    private final byte[] buf;
    private final byte[] low;
    private final byte[] high;
    private final List<PortSpec> ports = new ArrayList<>();
    private final BlockArrays arrays;
    /** Samples handed out (the caller's thread). */
    private long pos;
    /** Next sample to read (by one read at a time, see {@link ReadAhead}). */
    private long readPos;
    private final ReadAhead<Span> spans;

    PackedLogicReader(Path file, PackedLogicSidecar sc, int blockSamples, boolean headerOnly) throws IOException {
        this(file, sc, blockSamples, headerOnly, ReadAhead.allowed());
    }

    /**
     * @param readAhead whether the next block may be read on a second thread while this one is
     *                  decoded ({@link ReadAhead}; never for a capture of one block)
     */
    PackedLogicReader(Path file, PackedLogicSidecar sc, int blockSamples, boolean headerOnly, boolean readAhead) throws IOException {
        this.file = file;
        this.sc = sc;
        long size;
        try {
            size = Files.size(file);
        } catch (NoSuchFileException e) {
            throw new CaptureFormatException(file, 0, "file not found");
        }
        int w = sc.word.bytes;
        if (size % w != 0) {
            throw new CaptureFormatException(file, 0, size + " bytes is not a whole number of " + sc.word.text + " sample words;"
                    + " expected a multiple of " + w + " bytes (" + (size % w) + " byte left over after " + size / w + " words)");
        }
        this.samples = size / w;
        this.blockSamples = blockSamples;
        this.periodFs = Femtos.periodFs(sc.rateHz);
        this.startFs = Femtos.fromSeconds(sc.startTimeS);
        for (int k = 0; k < sc.names.length; k++) {
            ports.add(PortSpec.of(sc.names[k], DataKind.LOGIC, "bit " + sc.bits[k] + " of the " + sc.word.text + " word"));
        }
        this.ch = headerOnly ? null : FileChannel.open(file, StandardOpenOption.READ);
        int cap = headerOnly ? 0 : (int) Math.min(blockSamples, samples);
        this.buf = new byte[cap * w];
        this.low = w == 2 ? new byte[cap] : buf;
        this.high = w == 2 ? new byte[cap] : null;
        this.arrays = new BlockArrays(sc.names.length, blockSamples);
        this.spans = new ReadAhead<>(file.getFileName().toString(), readAhead && !headerOnly && samples > blockSamples, arrays,
                this::read, () -> readPos < samples);
    }

    @Override
    public List<PortSpec> ports() {
        return ports;
    }

    @Override
    public List<String> units() {
        return Collections.nCopies(ports.size(), "");
    }

    @Override
    public long done() {
        return pos;
    }

    @Override
    public long total() {
        return samples;
    }

    double periodFs() {
        return periodFs;
    }

    /** One block of every channel, unpacked, not yet handed out. */
    private record Span(long first, int n, long[][] bits) {
    }

    @Override
    public boolean next(Out out) throws IOException {
        Span s = spans.next();
        if (s == null) {
            return false;
        }
        long blockStart = startFs + Math.round(s.first * periodFs);
        for (int k = 0; k < s.bits.length; k++) {
            out.emit(k, new LogicBlock(sc.names[k], s.first, blockStart, periodFs, s.bits[k], s.n, null));
        }
        pos = s.first + s.n;
        return true;
    }

    /** Reads and unpacks the block at {@link #readPos} into the arrays of the set being filled. */
    private Span read() throws IOException {
        int n = (int) Math.min(blockSamples, samples - readPos);
        int bytes = n * sc.word.bytes;
        ByteBuffer bb = ByteBuffer.wrap(buf, 0, bytes);
        while (bb.hasRemaining()) {
            if (ch.read(bb) < 0) {
                throw new CaptureFormatException(file, 0, "the file shrank while reading; expected " + samples + " sample words");
            }
        }
        if (sc.word.bytes == 2) {
            PackedLogic.deinterleave(buf, n, sc.word.littleEndian, low, high);
        }
        long[][] lowOut = new long[8][];
        long[][] highOut = new long[8][];
        long[][] chan = new long[sc.names.length][];
        boolean anyHigh = false;
        for (int k = 0; k < chan.length; k++) {
            chan[k] = arrays.bits(k, n);
            int bit = sc.bits[k];
            if (bit < 8) {
                lowOut[bit] = chan[k];
            } else {
                highOut[bit - 8] = chan[k];
                anyHigh = true;
            }
        }
        PackedLogic.split(low, n, lowOut);
        if (anyHigh) {
            PackedLogic.split(high, n, highOut);
        }
        Span s = new Span(readPos, n, chan);
        readPos += n;
        return s;
    }

    @Override
    public void lend(boolean[] perChannel) {
        arrays.lend(perChannel);
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
