package org.lanesift.kit;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;

/**
 * {@link PackedLogic#split} as it was before the byte-transpose rewrite (per-byte shifts into eight
 * accumulators, the last partial word bit by bit), kept verbatim as the oracle of
 * {@code PackedLogicSplitOracleTest}. Test code only.
 */
final class OldByteShiftPackedLogic {
    private static final VarHandle LE64 = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);

    private OldByteShiftPackedLogic() {
    }

    private static long transpose8(long x) {
        return PackedLogic.transpose8(x);
    }

    static void split(byte[] b, int n, long[][] out) {
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

}
