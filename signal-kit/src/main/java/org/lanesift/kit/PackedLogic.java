package org.lanesift.kit;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;

/**
 * Splits bit-packed logic samples (one byte per sample time, bit k = channel k, as a logic
 * analyser or the device stream packs them) into one bit-packed array per channel, in the
 * {@link org.lanesift.data.BitSets} layout of {@code LogicBlock}. Eight samples at a time with an
 * 8x8 bit-matrix transpose in one {@code long} (the three-step exchange of Hacker's Delight,
 * section 7-3, "Transposing a Bit Matrix"), then the same exchange on bytes to gather 64 samples
 * per channel in one word; no per-sample branch on the channel or the format.
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
     * <p>Per 64 samples: eight 8x8 bit transposes (byte k of the k-th result holds 8 samples of
     * channel k), then one 8x8 <em>byte</em> transpose of those eight words in three exchange steps
     * (32-, 16-, 8-bit lanes), which leaves channel k's 64 samples in word k. A last partial word
     * goes through the same steps with its missing bytes read as zero.
     *
     * @param b   samples, one byte each
     * @param n   count
     * @param out up to eight arrays of at least {@code ceil(n/64)} words, overwritten, or null
     */
    public static void split(byte[] b, int n, long[][] out) {
        if (out.length > 8) {
            throw new IllegalArgumentException("a byte holds 8 channels, asked for " + out.length);
        }
        long[][] o = out.length == 8 ? out : java.util.Arrays.copyOf(out, 8);
        int words = (n + 63) >>> 6;
        int fullWords = n >>> 6;
        for (int w = 0; w < fullWords; w++) {
            int base = w << 6;
            splitWord(transpose8((long) LE64.get(b, base)), transpose8((long) LE64.get(b, base + 8)),
                    transpose8((long) LE64.get(b, base + 16)), transpose8((long) LE64.get(b, base + 24)),
                    transpose8((long) LE64.get(b, base + 32)), transpose8((long) LE64.get(b, base + 40)),
                    transpose8((long) LE64.get(b, base + 48)), transpose8((long) LE64.get(b, base + 56)), o, w);
        }
        if (fullWords == words) {
            return;
        }
        // the last, partial word: the bytes that exist, zeros after them
        long[] t = new long[8];
        int base = fullWords << 6;
        for (int i = base; i < n; i++) {
            int j = i - base;
            t[j >>> 3] |= (b[i] & 0xFFL) << ((j & 7) << 3);
        }
        splitWord(transpose8(t[0]), transpose8(t[1]), transpose8(t[2]), transpose8(t[3]),
                transpose8(t[4]), transpose8(t[5]), transpose8(t[6]), transpose8(t[7]), o, fullWords);
    }

    private static final long LO32 = 0x00000000FFFFFFFFL;
    private static final long LO16 = 0x0000FFFF0000FFFFL;
    private static final long LO8 = 0x00FF00FF00FF00FFL;

    /**
     * Transposes the 8x8 byte matrix whose row k is {@code tk} (byte c of row k: 8 samples of
     * channel c) and stores row c, channel c's 64 samples, as word {@code w} of {@code o[c]}.
     */
    private static void splitWord(long t0, long t1, long t2, long t3, long t4, long t5, long t6, long t7,
                                  long[][] o, int w) {
        // 32-bit lanes: rows k and k+4
        long u0 = (t0 & LO32) | (t4 << 32);
        long u4 = (t0 >>> 32) | (t4 & ~LO32);
        long u1 = (t1 & LO32) | (t5 << 32);
        long u5 = (t1 >>> 32) | (t5 & ~LO32);
        long u2 = (t2 & LO32) | (t6 << 32);
        long u6 = (t2 >>> 32) | (t6 & ~LO32);
        long u3 = (t3 & LO32) | (t7 << 32);
        long u7 = (t3 >>> 32) | (t7 & ~LO32);
        // 16-bit lanes: rows k and k+2
        long v0 = (u0 & LO16) | ((u2 & LO16) << 16);
        long v2 = ((u0 >>> 16) & LO16) | (u2 & ~LO16);
        long v1 = (u1 & LO16) | ((u3 & LO16) << 16);
        long v3 = ((u1 >>> 16) & LO16) | (u3 & ~LO16);
        long v4 = (u4 & LO16) | ((u6 & LO16) << 16);
        long v6 = ((u4 >>> 16) & LO16) | (u6 & ~LO16);
        long v5 = (u5 & LO16) | ((u7 & LO16) << 16);
        long v7 = ((u5 >>> 16) & LO16) | (u7 & ~LO16);
        // 8-bit lanes: rows k and k+1
        store(o[0], w, (v0 & LO8) | ((v1 & LO8) << 8));
        store(o[1], w, ((v0 >>> 8) & LO8) | (v1 & ~LO8));
        store(o[2], w, (v2 & LO8) | ((v3 & LO8) << 8));
        store(o[3], w, ((v2 >>> 8) & LO8) | (v3 & ~LO8));
        store(o[4], w, (v4 & LO8) | ((v5 & LO8) << 8));
        store(o[5], w, ((v4 >>> 8) & LO8) | (v5 & ~LO8));
        store(o[6], w, (v6 & LO8) | ((v7 & LO8) << 8));
        store(o[7], w, ((v6 >>> 8) & LO8) | (v7 & ~LO8));
    }

    private static void store(long[] to, int w, long x) {
        if (to != null) {
            to[w] = x;
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
