package org.lanesift.runner.capture;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;

/**
 * The raw reader's conversion as it was before the bulk converters: one sample at a time with a
 * switch on the format per sample. Kept only as the oracle of {@link RawReaderOracleTest}.
 */
final class PerSampleRawOracle {
    private PerSampleRawOracle() {
    }

    /** Volts and invalid masks of frames {@code [first, first + n)} of a whole file's bytes. */
    static Result convert(RawSidecar sc, byte[] file, long first, int n) {
        int nch = sc.names.length;
        int frame = sc.frameBytes();
        ByteBuffer bb = ByteBuffer.wrap(file, (int) (first * frame), n * frame);
        bb.order(sc.format == RawSidecar.Format.INT16BE ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN);
        float[][] v = new float[nch][n];
        long[][] inv = new long[nch][];
        boolean clip = sc.markClipped;
        for (int row = 0; row < n; row++) {
            for (int k = 0; k < nch; k++) {
                double code;
                boolean bad;
                switch (sc.format) {
                    case UINT8 -> {
                        int c = bb.get() & 0xff;
                        code = c;
                        bad = clip && (c == 0 || c == 255);
                    }
                    case INT8 -> {
                        int c = bb.get();
                        code = c;
                        bad = clip && (c == -128 || c == 127);
                    }
                    case INT16LE, INT16BE -> {
                        int c = bb.getShort();
                        code = c;
                        bad = clip && (c == Short.MIN_VALUE || c == Short.MAX_VALUE);
                    }
                    default -> {
                        float f = bb.getFloat();
                        code = f;
                        bad = !Float.isFinite(f);
                    }
                }
                float volts = (float) (code * sc.gain[k] + sc.offset[k]);
                v[k][row] = volts;
                if (bad || !Float.isFinite(volts)) {
                    if (inv[k] == null) {
                        inv[k] = new long[(n + 63) >>> 6];
                    }
                    inv[k][row >>> 6] |= 1L << row;
                }
            }
        }
        return new Result(v, inv);
    }

    /** Per channel: volts, and the invalid mask or null. */
    record Result(float[][] volts, long[][] invalid) {
    }
}
