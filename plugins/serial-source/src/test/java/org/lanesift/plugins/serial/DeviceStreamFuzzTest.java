package org.lanesift.plugins.serial;

import com.code_intelligence.jazzer.api.FuzzedDataProvider;
import com.code_intelligence.jazzer.junit.FuzzTest;
import org.lanesift.annotation.Annotation;

/**
 * Jazzer fuzz test of the device-stream parser (issue 18): framing, CRC, sequence and sample
 * indices decoded from arbitrary bytes cut into arbitrary reads. A device stream is never "bad
 * input" to refuse: lost, corrupt and repeated data become annotations, so any exception is a
 * finding, and sample indices handed on must never go backwards.
 */
class DeviceStreamFuzzTest {
    @FuzzTest(maxDuration = "5s")
    void deviceStream(FuzzedDataProvider d) {
        SpoolDecoder dec = checkedDecoder();
        int segment = 0;
        long clock = 1_000_000L;
        dec.beginSegment(segment, clock, -1);
        while (d.remainingBytes() > 0) {
            if (d.consumeInt(0, 15) == 0) {
                // a reconnect: a new segment of the spool, after a gap of wall-clock time
                long closed = clock + d.consumeInt(0, 1000);
                clock = closed + d.consumeInt(0, 100_000);
                dec.beginSegment(++segment, clock, closed);
            }
            byte[] chunk = d.consumeBytes(1 + d.consumeInt(0, 300));
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
