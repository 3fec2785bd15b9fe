package org.lanesift.chain;

/** Told how far a chain has got, for a progress bar. Called on the chain's thread. */
@FunctionalInterface
public interface ProgressListener {
    /**
     * Progress over all sources.
     *
     * @param doneSamples samples produced so far
     * @param totalSamples total, or -1 when unknown
     */
    void progress(long doneSamples, long totalSamples);
}
