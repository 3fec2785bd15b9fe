package org.lanesift.runner.capture;

import java.util.Arrays;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.WordStream;

/**
 * A VCD vector of 2 to 64 bits: each value held between two changes becomes one word; a value
 * with x or z digits is flagged suspect, the first value after {@code $dumpon} gap-before.
 */
final class VcdVector extends VcdSignal {
    private long value;
    private boolean suspect = true;
    private boolean gapNext;
    private boolean curGap;
    private long valueSince;
    private boolean hasValue;
    private long[] wv = new long[8];
    private long[] ws = new long[8];
    private long[] we = new long[8];
    private byte[] wf = new byte[8];
    private int words;

    VcdVector(int index, int width, String path, String code) {
        super(index, width, path, code);
    }

    @Override
    DataKind dataKind() {
        return DataKind.WORDS;
    }

    @Override
    String help(double realPeriodFs) {
        return width + "-bit vector '" + path + "' as words";
    }

    @Override
    void start(long timeFs) {
        valueSince = timeFs;
    }

    @Override
    void dumpOff(long timeFs) {
        set(timeFs, 0, true);
    }

    @Override
    void dumpOn() {
        gapNext = true;
    }

    /**
     * A value change.
     *
     * @param timeFs time, fs
     * @param v      the value, x and z digits as 0
     * @param xz     whether any digit was x or z
     */
    void set(long timeFs, long v, boolean xz) {
        boolean keepGap = hasValue && timeFs == valueSince && curGap;
        if (hasValue && timeFs > valueSince) {
            addWord(value, valueSince, timeFs, flags());
        }
        hasValue = true;
        value = v;
        suspect = xz;
        valueSince = timeFs;
        curGap = keepGap || gapNext;
        gapNext = false;
    }

    private byte flags() {
        return (byte) ((suspect ? WordStream.FLAG_SUSPECT : 0) | (curGap ? WordStream.FLAG_GAP_BEFORE : 0));
    }

    @Override
    Block take(long spanStartFs, long endFs, boolean last, double realPeriodFs) {
        if (last && hasValue && endFs > valueSince) {
            addWord(value, valueSince, endFs, flags());
        }
        WordStream w = new WordStream(port(), spanStartFs, endFs, words, width, wv, ws, we, new int[words], wf);
        int n = Math.max(8, Math.min(words, 1 << 16));
        wv = new long[n];
        ws = new long[n];
        we = new long[n];
        wf = new byte[n];
        words = 0;
        return w;
    }

    private void addWord(long v, long s, long e, byte f) {
        if (words == wv.length) {
            int n = words * 2;
            wv = Arrays.copyOf(wv, n);
            ws = Arrays.copyOf(ws, n);
            we = Arrays.copyOf(we, n);
            wf = Arrays.copyOf(wf, n);
        }
        wv[words] = v;
        ws[words] = s;
        we[words] = e;
        wf[words] = f;
        words++;
    }
}
