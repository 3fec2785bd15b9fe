package org.lanesift.plugins.packetlink;

import java.util.Arrays;
import org.lanesift.kit.PackedBits;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;

/**
 * Cuts one lane's bits into words: looks for the sync pattern bit by bit, then packs every later
 * bit into a growing buffer (64 bits at a time) and notes the sample time of each word's first
 * bit. Words are read out later with {@link #word}, so the trail at the end of a burst can be cut
 * off first ({@link #dataBits}). With a group size, the pattern is sought again after each group.
 * The pattern matches where at most {@code syncErrors} of its bits differ. With {@code restart},
 * every word boundary is also checked for the pattern after the sync: a burst carries whole
 * words, so the next burst's sync begins on a word boundary of this one; there the buffer is cut,
 * and {@link #feed} stops just after the new sync so that the caller can close this burst and go
 * on with a fresh deserializer ({@link #restartPending}). A sync right after a sync (a filler)
 * makes no empty burst.
 */
final class LaneDeserializer {
    /** Receives a finished group of words (fixed-length grouping). */
    interface GroupSink {
        void group(LaneDeserializer d);
    }

    final int lane;
    final long syncWire;
    final int syncBits;
    final int wordBits;
    final boolean msbFirst;
    final int groupWords;
    final int maxBits;
    final int syncErrors;
    final boolean restart;
    private final GroupSink groups;

    boolean synced;
    long syncFoundFs;
    private long shift;
    private int shiftCount;
    long[] bits = new long[17];
    long[] flagged = new long[17];
    boolean anyFlagged;
    int nbits;
    long[] wordStartFs = new long[128];
    int wordStarts;
    boolean overflow;
    double uiFs;
    long lastBitFs = Long.MIN_VALUE;
    long seekBits;
    /** Bits searched since the last sync was found (or since the start). */
    long unsyncedBits;
    /** Restart mode: bits appended at a time, so a filler sync never makes a whole block be appended again. */
    static final int RESTART_CHUNK_BITS = 4096;
    /** Restart mode: first word boundary of the buffer not yet checked for the sync. */
    private int checkedBits;
    /** Restart mode: {@link #feed} stopped just after a new sync; the caller starts the next burst there. */
    boolean restartPending;
    /** Restart mode: time of the new sync's last bit (the next burst's {@link #syncFoundFs}). */
    long restartSyncFs;
    /** Restart mode: time of the new sync's first bit (where this burst ends and the next one starts). */
    long restartStartFs;

    LaneDeserializer(int lane, long syncWire, int syncBits, int wordBits, boolean msbFirst, int groupWords, int maxBits, GroupSink groups) {
        this(lane, syncWire, syncBits, 0, false, wordBits, msbFirst, groupWords, maxBits, groups);
    }

    LaneDeserializer(int lane, long syncWire, int syncBits, int syncErrors, boolean restart, int wordBits, boolean msbFirst, int groupWords,
                     int maxBits, GroupSink groups) {
        this.lane = lane;
        this.syncWire = syncWire;
        this.syncBits = syncBits;
        this.syncErrors = syncErrors;
        this.restart = restart && syncBits > 0;
        this.wordBits = wordBits;
        this.msbFirst = msbFirst;
        this.groupWords = groupWords;
        this.maxBits = maxBits;
        this.groups = groups;
        this.synced = syncBits == 0;
    }

    /**
     * Starts a burst whose sync another deserializer found ({@link #restartPending}).
     *
     * @param syncFs time of the sync's last bit
     * @param uiFs   unit interval known so far
     */
    void startSynced(long syncFs, double uiFs) {
        synced = true;
        syncFoundFs = syncFs;
        this.uiFs = uiFs;
    }

    /** Whether the low {@code syncBits} bits of {@code x} (wire order) are the sync with at most {@code syncErrors} bits wrong. */
    private boolean isSync(long x) {
        long mask = syncBits == 64 ? -1L : (1L << syncBits) - 1;
        return Long.bitCount((x ^ syncWire) & mask) <= syncErrors;
    }

    /** Starts over: a new burst. */
    void reset() {
        synced = syncBits == 0;
        syncFoundFs = Long.MIN_VALUE;
        shift = 0;
        shiftCount = 0;
        clearWords();
        overflow = false;
        seekBits = 0;
        unsyncedBits = 0;
        checkedBits = 0;
        restartPending = false;
    }

    /**
     * Fills the sync search register with {@code syncBits} bits of the idle level, so a sync
     * pattern that begins with idle-level bits is found when the burst starts at its first
     * non-idle bit.
     *
     * @param level the idle level
     */
    void preload(boolean level) {
        if (!synced) {
            shift = level ? (syncBits == 64 ? -1L : (1L << syncBits) - 1) : 0L;
            shiftCount = syncBits;
        }
    }

    /**
     * Forgets the last {@code n} appended bits (the idle run that ended a burst).
     *
     * @param n bit count
     */
    void dropLastBits(int n) {
        int keep = Math.max(0, nbits - n);
        if (keep < nbits) {
            int w = keep >>> 6;
            long low = (keep & 63) == 0 ? 0L : -1L >>> (64 - (keep & 63));
            bits[w] &= low;
            flagged[w] &= low;
            int end = Math.min(bits.length, BitSets.words(nbits));
            Arrays.fill(bits, w + 1, Math.max(w + 1, end), 0L);
            Arrays.fill(flagged, w + 1, Math.max(w + 1, Math.min(flagged.length, end)), 0L);
        }
        nbits = keep;
        wordStarts = Math.min(wordStarts, (keep + wordBits - 1) / wordBits);
    }

    private void clearWords() {
        Arrays.fill(bits, 0, Math.min(bits.length, (nbits >>> 6) + 2), 0L);
        if (anyFlagged) {
            Arrays.fill(flagged, 0L);
        }
        anyFlagged = false;
        nbits = 0;
        wordStarts = 0;
    }

    /**
     * Feeds bits {@code [from, to)} of a stream.
     *
     * @param s    the stream
     * @param from first bit
     * @param to   end bit, exclusive
     * @return the end of the bits taken: {@code to}, or in restart mode the bit just after a new
     *         sync ({@link #restartPending} set)
     */
    int feed(BitStream s, int from, int to) {
        if (s.unitIntervalFs() > 0) {
            uiFs = s.unitIntervalFs();
        }
        if (to > from) {
            lastBitFs = s.timesFs()[to - 1];
        }
        int i = from;
        long[] v = s.values();
        while (i < to) {
            if (!synced) {
                long mask = syncBits == 64 ? -1L : (1L << syncBits) - 1;
                while (i < to) {
                    long bit = (v[i >>> 6] >>> i) & 1L;
                    shift = (shift >>> 1) | (bit << (syncBits - 1));
                    i++;
                    seekBits++;
                    unsyncedBits++;
                    if (++shiftCount >= syncBits && (syncErrors == 0 ? (shift & mask) == syncWire : isSync(shift))) {
                        synced = true;
                        unsyncedBits = 0;
                        syncFoundFs = s.timesFs()[i - 1];
                        break;
                    }
                }
                continue;
            }
            int n = to - i;
            if (restart) {
                n = Math.min(n, RESTART_CHUNK_BITS); // bounds the bits fed again after a filler sync
            }
            if (groupWords > 0) {
                n = Math.min(n, groupWords * wordBits - nbits);
            }
            if (nbits + n > maxBits) {
                n = maxBits - nbits;
                overflow = true;
            }
            if (n <= 0) {
                if (overflow) {
                    return to;
                }
            } else {
                int before = nbits;
                append(s, i, n);
                i += n;
                if (restart) {
                    int end = nextSync(s, i - n, before);
                    if (restartPending) {
                        return end;
                    }
                    if (end >= 0) {
                        i = end; // a filler sync: the bits after it go into the emptied buffer again
                        continue;
                    }
                }
            }
            if (groupWords > 0 && nbits == groupWords * wordBits) {
                groups.group(this);
                clearWords();
                synced = syncBits == 0;
                shift = 0;
                shiftCount = 0;
            }
            if (overflow) {
                return to;
            }
        }
        return to;
    }

    /**
     * Restart mode: checks the word boundaries whose sync-long span the last append completed.
     * On a match at boundary {@code p > 0} the buffer is cut at {@code p} and the stream index
     * just after the sync is returned; a match at {@code p = 0} (a sync right after the sync) is
     * dropped and the search goes on.
     *
     * @param s       the stream
     * @param first   stream index of the first bit of the last append
     * @param before  buffer position of that bit
     * @return the stream index just after a new sync ({@link #restartPending} set, or after a
     *         filler sync, the bits from there to be fed again), or -1
     */
    private int nextSync(BitStream s, int first, int before) {
        while (checkedBits + syncBits <= nbits) {
            int p = checkedBits;
            if (!isSync(PackedBits.get64(bits, p))) {
                checkedBits += wordBits;
                continue;
            }
            int end = first + (p + syncBits - before);
            long[] t = s.timesFs();
            long syncFs = t[end - 1];
            int startIdx = first + (p - before);
            long startFs = startIdx >= first ? t[startIdx] : syncFs - Math.round((syncBits - 1) * (uiFs > 0 ? uiFs : 0));
            if (p == 0) {
                // a sync right after the sync: the burst starts after it
                dropLastBits(nbits);
                checkedBits = 0;
                syncFoundFs = syncFs;
                return end;
            }
            dropLastBits(nbits - p);
            restartPending = true;
            restartSyncFs = syncFs;
            restartStartFs = startFs;
            return end;
        }
        return -1;
    }


    private void append(BitStream s, int i, int n) {
        int need = BitSets.words(nbits + n) + 1;
        if (need > bits.length) {
            int cap = Math.max(need, bits.length * 2);
            bits = Arrays.copyOf(bits, cap);
            flagged = Arrays.copyOf(flagged, cap);
        }
        PackedBits.append(s.values(), i, bits, nbits, n);
        if (BitSets.any(s.flagged(), i, i + n)) {
            PackedBits.append(s.flagged(), i, flagged, nbits, n);
            anyFlagged = true;
        }
        long[] t = s.timesFs();
        int rem = nbits % wordBits;
        int j = rem == 0 ? 0 : wordBits - rem;
        int starts = j < n ? (n - j + wordBits - 1) / wordBits : 0;
        if (wordStarts + starts > wordStartFs.length) {
            wordStartFs = Arrays.copyOf(wordStartFs, Math.max(wordStarts + starts, wordStartFs.length * 2));
        }
        for (; j < n; j += wordBits) {
            wordStartFs[wordStarts++] = t[i + j];
        }
        nbits += n;
    }

    /** Number of bits before the trail: the final run of equal bits is the trail (MIPI D-PHY, from memory). */
    int dataBits() {
        return nbits == 0 ? 0 : PackedBits.finalRunStart(bits, nbits);
    }

    /** Number of complete words in the buffer. */
    int completeWords() {
        return nbits / wordBits;
    }

    /**
     * Word {@code k} of the buffer.
     *
     * @param k word index
     * @return its value, first wire bit in bit 0 ({@code lsb}) or in the top bit ({@code msb})
     */
    long word(int k) {
        long x = PackedBits.get64(bits, k * wordBits);
        if (wordBits < 64) {
            x &= (1L << wordBits) - 1;
        }
        if (msbFirst) {
            x = Long.reverse(x) >>> (64 - wordBits);
        }
        return x;
    }

    /** Whether any bit of word {@code k} was flagged by the sampler. */
    boolean wordFlagged(int k) {
        return anyFlagged && BitSets.any(flagged, k * wordBits, Math.min(nbits, (k + 1) * wordBits));
    }

    /** Time of the first bit of word {@code k}. */
    long wordStart(int k) {
        return wordStartFs[k];
    }

    /** Time just after the last bit of word {@code k}. */
    long wordEnd(int k) {
        if (k + 1 < wordStarts) {
            return wordStartFs[k + 1];
        }
        return wordStartFs[k] + Math.round(wordBits * (uiFs > 0 ? uiFs : 0));
    }

    /**
     * Drops the first {@code words} complete words, keeping the bits after them (continuous links).
     *
     * @param words number of words to drop
     */
    void dropWords(int words) {
        if (words <= 0) {
            return;
        }
        int drop = words * wordBits;
        int keep = nbits - drop;
        long[] nb = new long[Math.max(17, BitSets.words(keep) + 2)];
        if (keep > 0) {
            PackedBits.append(bits, drop, nb, 0, keep);
        }
        if (anyFlagged) {
            long[] nf = new long[nb.length];
            if (keep > 0) {
                PackedBits.append(flagged, drop, nf, 0, keep);
            }
            flagged = nf;
        } else {
            flagged = new long[nb.length];
        }
        bits = nb;
        System.arraycopy(wordStartFs, words, wordStartFs, 0, wordStarts - words);
        wordStarts -= words;
        nbits = keep;
    }
}
