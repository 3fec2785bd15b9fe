package org.lanesift.runner.capture;

import java.nio.ByteBuffer;

/**
 * Turns interleaved frames of one raw sample format into volts, one tight loop per channel over a
 * whole chunk: {@code volts = (float) (code * gain + offset)} with the code as a double, exactly as
 * docs/capture-raw.md states it. One subclass per format, chosen once per file, so no loop asks
 * which format it reads. Invalid samples (clipped integer codes when the sidecar marks them,
 * non-finite float results) are found from each chunk's extremes first and marked in a second loop
 * only when there are any.
 */
abstract class RawConverter {
    final int channels;
    final double[] gain;
    final double[] offset;
    final boolean markClipped;

    /** Receives the invalid samples of a block. */
    interface Masks {
        /** The mask of channel {@code k}, allocated (cleared) on first use. */
        long[] of(int k);
    }

    RawConverter(RawSidecar sc) {
        this.channels = sc.names.length;
        this.gain = sc.gain;
        this.offset = sc.offset;
        this.markClipped = sc.markClipped;
    }

    /**
     * The converter of a sidecar's format.
     *
     * @param sc checked sidecar
     * @return the converter
     */
    static RawConverter of(RawSidecar sc) {
        return switch (sc.format) {
            case FLOAT32LE -> new Float32(sc);
            case INT16LE, INT16BE -> new Int16(sc);
            case UINT8 -> new Bytes(sc, false);
            case INT8 -> new Bytes(sc, true);
        };
    }

    /**
     * Converts {@code frames} whole frames from the buffer's position (which it advances past them)
     * into {@code volts[k][row ..]}.
     *
     * @param bb     the frames, in the byte order of the format
     * @param frames frames to convert
     * @param volts  one array per channel
     * @param row    index in the arrays of the first frame
     * @param masks  where invalid samples are marked
     */
    abstract void convert(ByteBuffer bb, int frames, float[][] volts, int row, Masks masks);

    static void mark(long[] mask, int r) {
        mask[r >>> 6] |= 1L << r;
    }

    /**
     * float32le: read through a float view, finite check by {@code |v| <= Float.MAX_VALUE} folded
     * into one flag per channel (false for NaN and both infinities; a compare and an AND a sample,
     * where tracking the largest exponent cost a compare-and-select chain that took longer than the
     * copy itself: DEVELOPERS.md, "Float32 finite check of the raw reader"). The frames are taken
     * in tiles of about 32 KB, each spread to every channel while it is still in the first-level
     * cache (one pass per channel over a whole block would read it from memory once per channel). With gain 1 and offset 0 a code is its volts: {@code code + 0f} equals
     * {@code (float) (code * 1.0 + 0.0)} bit for bit (it also turns -0 into +0), without the
     * round trip through a double.
     */
    static final class Float32 extends RawConverter {
        /** Values (frames x channels) per tile: 32 KB of floats. */
        static final int TILE_VALUES = 8192;
        private final float[] tile;
        private final int tileFrames;
        private final boolean[] finite;
        private final boolean[] identity;

        Float32(RawSidecar sc) {
            super(sc);
            tileFrames = Math.max(1, TILE_VALUES / channels);
            tile = new float[tileFrames * channels];
            finite = new boolean[channels];
            identity = new boolean[channels];
            for (int k = 0; k < channels; k++) {
                identity[k] = gain[k] == 1.0 && offset[k] == 0.0;
            }
        }

        @Override
        void convert(ByteBuffer bb, int frames, float[][] volts, int row, Masks masks) {
            java.nio.FloatBuffer fb = bb.asFloatBuffer();
            java.util.Arrays.fill(finite, true);
            float[] in = tile;
            for (int f0 = 0; f0 < frames; f0 += tileFrames) {
                int n = Math.min(tileFrames, frames - f0);
                fb.get(in, 0, n * channels);
                for (int k = 0; k < channels; k++) {
                    float[] out = volts[k];
                    int base = row + f0;
                    boolean ok = finite[k];
                    if (identity[k]) {
                        for (int i = 0, j = k; i < n; i++, j += channels) {
                            float v = in[j] + 0f;
                            out[base + i] = v;
                            ok &= Math.abs(v) <= Float.MAX_VALUE;
                        }
                    } else {
                        double g = gain[k];
                        double o = offset[k];
                        for (int i = 0, j = k; i < n; i++, j += channels) {
                            float v = (float) (in[j] * g + o);
                            out[base + i] = v;
                            ok &= Math.abs(v) <= Float.MAX_VALUE;
                        }
                    }
                    finite[k] = ok;
                }
            }
            bb.position(bb.position() + 4 * frames * channels);
            for (int k = 0; k < channels; k++) {
                if (!finite[k]) {
                    // a NaN or infinite code, or a product too large for a float: invalid
                    float[] out = volts[k];
                    long[] m = masks.of(k);
                    for (int i = 0; i < frames; i++) {
                        if (!Float.isFinite(out[row + i])) {
                            mark(m, row + i);
                        }
                    }
                }
            }
        }
    }

    /**
     * int16le and int16be: read through a short view in the sidecar's byte order. The sidecar's
     * gain limit keeps every code's volts finite, so only clipped codes can be invalid.
     */
    static final class Int16 extends RawConverter {
        private short[] scratch = new short[0];

        Int16(RawSidecar sc) {
            super(sc);
        }

        @Override
        void convert(ByteBuffer bb, int frames, float[][] volts, int row, Masks masks) {
            int values = frames * channels;
            if (scratch.length < values) {
                scratch = new short[values];
            }
            short[] in = scratch;
            bb.asShortBuffer().get(in, 0, values);
            bb.position(bb.position() + 2 * values);
            for (int k = 0; k < channels; k++) {
                float[] out = volts[k];
                double g = gain[k];
                double o = offset[k];
                int lo = Integer.MAX_VALUE;
                int hi = Integer.MIN_VALUE;
                for (int i = 0, j = k; i < frames; i++, j += channels) {
                    int c = in[j];
                    out[row + i] = (float) (c * g + o);
                    lo = Math.min(lo, c);
                    hi = Math.max(hi, c);
                }
                if (markClipped && (lo == Short.MIN_VALUE || hi == Short.MAX_VALUE)) {
                    long[] m = masks.of(k);
                    for (int i = 0, j = k; i < frames; i++, j += channels) {
                        int c = in[j];
                        if (c == Short.MIN_VALUE || c == Short.MAX_VALUE) {
                            mark(m, row + i);
                        }
                    }
                }
            }
        }
    }

    /**
     * uint8 and int8: one 256-entry table of volts per channel, computed once with the same
     * arithmetic, so the loop is a lookup per sample; the frames are copied out of the (direct)
     * read buffer in tiles of 16 KB, each spread to every channel while it is in the first-level
     * cache. The table is indexed in offset-binary order
     * (an int8 byte with its top bit flipped), so both formats have their end codes at 0 and 255.
     */
    static final class Bytes extends RawConverter {
        /** Bytes (frames x channels) per tile: 16 KB. */
        static final int TILE_VALUES = 16384;
        private final float[][] table;
        private final int flip;
        private final byte[] tile;
        private final int tileFrames;

        Bytes(RawSidecar sc, boolean signed) {
            super(sc);
            tileFrames = Math.max(1, TILE_VALUES / channels);
            tile = new byte[tileFrames * channels];
            this.flip = signed ? 0x80 : 0;
            table = new float[channels][256];
            for (int k = 0; k < channels; k++) {
                for (int u = 0; u < 256; u++) {
                    int b = u ^ flip;
                    double code = signed ? (byte) b : b;
                    table[k][u] = (float) (code * gain[k] + offset[k]);
                    if (!Float.isFinite(table[k][u])) {
                        // the sidecar's gain and offset limits rule this out
                        throw new IllegalStateException("raw sidecar checks let through a gain giving " + table[k][u] + " V");
                    }
                }
            }
        }

        @Override
        void convert(ByteBuffer bb, int frames, float[][] volts, int row, Masks masks) {
            byte[] in = tile;
            int f = flip;
            for (int f0 = 0; f0 < frames; f0 += tileFrames) {
                int n = Math.min(tileFrames, frames - f0);
                bb.get(in, 0, n * channels);
                for (int k = 0; k < channels; k++) {
                    float[] out = volts[k];
                    float[] t = table[k];
                    int base = row + f0;
                    int lo = 255;
                    int hi = 0;
                    for (int i = 0, j = k; i < n; i++, j += channels) {
                        int u = (in[j] & 0xff) ^ f;
                        out[base + i] = t[u];
                        lo = Math.min(lo, u);
                        hi = Math.max(hi, u);
                    }
                    if (markClipped && (lo == 0 || hi == 255)) {
                        long[] m = masks.of(k);
                        for (int i = 0, j = k; i < n; i++, j += channels) {
                            int u = (in[j] & 0xff) ^ f;
                            if (u == 0 || u == 255) {
                                mark(m, base + i);
                            }
                        }
                    }
                }
            }
        }
    }
}
