package org.lanesift.kit;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;

/**
 * Splits bit-packed logic samples (one byte per sample time, bit k = channel k, as a logic
 * analyser or the device stream packs them) into one bit-packed array per channel, in the
 * {@link org.lanesift.data.BitSets} layout of {@code LogicBlock}. Eight samples at a time with an
 * 8x8 bit-matrix transpose in one {@code long} (the three-step exchange of Hacker's Delight,
 * section 7-3, "Transposing a Bit Matrix"); no per-sample branch on the channel or the format.
 * A 16-bit word of 16 channels is two such bytes: {@link #deinterleave} separates them first.
 */
public final class PackedLogic {
    private static final VarHandle LE64 = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);

    private PackedLogic() {
    }

    /**
     * Transposes the 8x8 bit matrix whose row j is byte j of {@code x}.
     *
     * @param x eight rows of eight bits
     * @return afterwards byte k, bit j = old byte j, bit k
     */
    public static long transpose8(long x) {
        long t = (x ^ (x >>> 7)) & 0x00AA00AA00AA00AAL;
        x = x ^ t ^ (t << 7);
        t = (x ^ (x >>> 14)) & 0x0000CCCC0000CCCCL;
        x = x ^ t ^ (t << 14);
        t = (x ^ (x >>> 28)) & 0x00000000F0F0F0F0L;
        x = x ^ t ^ (t << 28);
        return x;
    }

    /**
     * Splits {@code n} samples into {@code out[k]} for channel (bit) k; a null entry skips that
     * channel, so any subset of the eight can be taken.
     *
     * @param b   samples, one byte each
     * @param n   count
     * @param out up to eight arrays of at least {@code ceil(n/64)} words, overwritten, or null
     */
    public static void split(byte[] b, int n, long[][] out) {
        if (out.length > 8) {
            throw new IllegalArgumentException("a byte holds 8 channels, asked for " + out.length);
        }
        long[][] o = new long[8][];
        System.arraycopy(out, 0, o, 0, out.length);
        int words = (n + 63) >>> 6;
        int fullWords = n >>> 6;
        long[] o0 = o[0], o1 = o[1], o2 = o[2], o3 = o[3], o4 = o[4], o5 = o[5], o6 = o[6], o7 = o[7];
        // whole words: eight 8x8 transposes make 64 samples of every channel, kept in registers
        for (int w = 0; w < fullWords; w++) {
            long a0 = 0, a1 = 0, a2 = 0, a3 = 0, a4 = 0, a5 = 0, a6 = 0, a7 = 0;
            int base = w << 6;
            for (int k = 0; k < 8; k++) {
                long t = transpose8((long) LE64.get(b, base + 8 * k));
                int sh = 8 * k;
                a0 |= (t & 0xFFL) << sh;
                a1 |= (t >>> 8 & 0xFFL) << sh;
                a2 |= (t >>> 16 & 0xFFL) << sh;
                a3 |= (t >>> 24 & 0xFFL) << sh;
                a4 |= (t >>> 32 & 0xFFL) << sh;
                a5 |= (t >>> 40 & 0xFFL) << sh;
                a6 |= (t >>> 48 & 0xFFL) << sh;
                a7 |= (t >>> 56) << sh;
            }
            if (o0 != null) {
                o0[w] = a0;
            }
            if (o1 != null) {
                o1[w] = a1;
            }
            if (o2 != null) {
                o2[w] = a2;
            }
            if (o3 != null) {
                o3[w] = a3;
            }
            if (o4 != null) {
                o4[w] = a4;
            }
            if (o5 != null) {
                o5[w] = a5;
            }
            if (o6 != null) {
                o6[w] = a6;
            }
            if (o7 != null) {
                o7[w] = a7;
            }
        }
        if (fullWords == words) {
            return;
        }
        // the last, partial word, sample by sample
        for (int c = 0; c < 8; c++) {
            if (o[c] == null) {
                continue;
            }
            long word = 0;
            for (int i = fullWords << 6; i < n; i++) {
                word |= (long) (b[i] >>> c & 1) << i;
            }
            o[c][fullWords] = word;
        }
    }

    /**
     * Separates the two bytes of {@code n} 16-bit words into one byte per sample each, so each half
     * can be {@linkplain #split split}: {@code low} gets bits 0-7 (channels 0-7), {@code high} bits
     * 8-15 (channels 8-15).
     *
     * @param b            the words, {@code 2n} bytes
     * @param n            words
     * @param littleEndian true when the first byte of a word holds bits 0-7
     * @param low          at least {@code n} bytes, overwritten
     * @param high         at least {@code n} bytes, overwritten
     */
    public static void deinterleave(byte[] b, int n, boolean littleEndian, byte[] low, byte[] high) {
        byte[] first = littleEndian ? low : high;
        byte[] second = littleEndian ? high : low;
        for (int i = 0, j = 0; i < n; i++, j += 2) {
            first[i] = b[j];
            second[i] = b[j + 1];
        }
    }
}
