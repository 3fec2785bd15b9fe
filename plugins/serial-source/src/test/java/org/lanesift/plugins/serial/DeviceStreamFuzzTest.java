package org.lanesift.plugins.serial;

import com.code_intelligence.jazzer.api.FuzzedDataProvider;
import com.code_intelligence.jazzer.junit.FuzzTest;
import org.lanesift.annotation.Annotation;
import org.lanesift.testkit.AllocationBound;

/**
 * Jazzer fuzz test of the device-stream parser (issue 18): framing, CRC, sequence and sample
 * indices decoded from arbitrary bytes cut into arbitrary reads. A device stream is never "bad
 * input" to refuse: lost, corrupt and repeated data become annotations, so any exception is a
 * finding, sample indices handed on must never go backwards, and the decoder allocates no more
 * than its {@link AllocationBound} allows.
 */
class DeviceStreamFuzzTest {
    /**
     * The decoder keeps at most two maximal frames (payload at most 16384 bytes, and nothing
     * allocated from a length field: docs/device-stream.md) and hands samples on in blocks: 4 MiB
     * for any input, 64 bytes per input byte. Seen in the
     * seeded mutations: at most about 0.45 MiB, mostly first-use class loading.
     */
    static final AllocationBound BOUND = new AllocationBound("device stream", 4L << 20, 64);

    @FuzzTest(maxDuration = "5s")
    void deviceStream(FuzzedDataProvider d) throws Exception {
        // what the fuzzer chose, drawn first so that the decode can be repeated (AllocationBound)
        java.util.List<byte[]> chunks = new java.util.ArrayList<>();
        java.util.List<int[]> reconnects = new java.util.ArrayList<>();
        long size = 0;
        while (d.remainingBytes() > 0) {
            reconnects.add(d.consumeInt(0, 15) == 0 ? new int[] {d.consumeInt(0, 1000), d.consumeInt(0, 100_000)} : null);
            byte[] chunk = d.consumeBytes(1 + d.consumeInt(0, 300));
            chunks.add(chunk);
            size += chunk.length;
        }
        BOUND.check(size, () -> decode(chunks, reconnects));
    }

    private static void decode(java.util.List<byte[]> chunks, java.util.List<int[]> reconnects) {
        SpoolDecoder dec = checkedDecoder();
        int segment = 0;
        long clock = 1_000_000L;
        dec.beginSegment(segment, clock, -1);
        for (int i = 0; i < chunks.size(); i++) {
            int[] r = reconnects.get(i);
            if (r != null) {
                // a reconnect: a new segment of the spool, after a gap of wall-clock time
                long closed = clock + r[0];
                clock = closed + r[1];
                dec.beginSegment(++segment, clock, closed);
            }
            byte[] chunk = chunks.get(i);
            dec.feed(chunk, 0, chunk.length);
        }
        dec.flush();
    }

    /** A decoder whose output check fails when sample indices handed on go backwards. */
    static SpoolDecoder checkedDecoder() {
        long[] last = {Long.MIN_VALUE};
        return new SpoolDecoder(new SpoolHeader(true, 50e6, 8, "fuzz", "1"), 64, new SpoolDecoder.Out() {
            @Override
            public void samples(long firstIndex, byte[] b, int n) {
                if (firstIndex < last[0]) {
                    throw new AssertionError("samples from index " + firstIndex + " after " + last[0]);
                }
                last[0] = firstIndex + n;
            }

            @Override
            public void annotate(Annotation a) {
                // gaps, corruption and repeats are reported here; any is fine
            }
        });
    }
}
