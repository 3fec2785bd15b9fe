package org.lanesift.plugins.discovery;

import java.util.List;

/**
 * The outcome of discovery: for each parameter of the link the ranked candidates with their
 * evidence, and the best hypothesis as a whole.
 *
 * @param clocking        how the link is clocked
 * @param clockConfidence 0..1
 * @param link            the sampled bits and bursts
 * @param syncBits        sync length in bits (0: none found)
 * @param syncWire        the sync's bits in wire order, '0'/'1', lane 0
 * @param syncShare       share of bursts that start with the sync on every lane (up to two bit errors)
 * @param prefixBits      length of the bursts' common prefix
 * @param wordLengths     word-length candidates, best first (framing of the best lane distribution)
 * @param framings        every framing hypothesis tried, best first
 * @param best            the best framing
 * @param pictures        candidate pictures, best first
 * @param bitAutocorrelation strongest lags of the payload bit stream's autocorrelation, with their values
 * @param entropyPerPosition entropy (bits) of each wire position within a word, best framing
 * @param restart         how the generated chain restarts at every sync, for a streaming link
 *                        with a sync; null otherwise (the bursts are cut at pauses or idle runs)
 */
record Hypotheses(Clocking clocking, double clockConfidence, SampledLink link, int syncBits, String syncWire, double syncShare,
                         int prefixBits, List<WordLengthFinder.Candidate> wordLengths, List<Framing> framings, Framing best,
                         List<PictureCandidate> pictures, double[][] bitAutocorrelation, double[] entropyPerPosition,
                         SyncTolerance.Choice restart) {

    /**
     * One framing hypothesis and what it explains.
     *
     * @param distribution lane distribution
     * @param wordBits     word length
     * @param syncBits     sync length it goes with
     * @param msbFirst     bit order
     * @param wholeShare   share of bursts that are whole words
     * @param crc          checksum found, or null
     * @param fields       leading word, length field, data bursts
     * @param pictureScore smoothness of its best picture (0 when none)
     * @param score        overall score
     */
    record Framing(LaneDistribution distribution, int wordBits, int syncBits, boolean msbFirst, double wholeShare,
                          CrcCatalogue.Match crc, BurstFields fields, double pictureScore, double score) {

        String label() {
            return wordBits + "-bit words, " + (msbFirst ? "msb" : "lsb") + " first, lanes " + distribution.label;
        }
    }
}
