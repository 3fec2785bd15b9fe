package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;

/**
 * Issue 18 item 6: every irregularity of a live device stream gets an annotation, and a gap length
 * that only the wall clock can tell is labelled an estimate. Frames are built by hand (docs/device-stream.md)
 * and fed straight to the decoder; each case failed before the fix (no annotation, or "exact").
 */
class LiveGapAnnotationTest {
    private static final int N = 16; // samples per frame

    private final List<Annotation> notes = new ArrayList<>();
    private final List<long[]> runs = new ArrayList<>();
    private final SpoolDecoder dec = new SpoolDecoder(new SpoolHeader(true, 1e6, 8, "test", "1"), 1024, new SpoolDecoder.Out() {
        @Override
        public void samples(long firstIndex, byte[] b, int n) {
            runs.add(new long[] {firstIndex, firstIndex + n});
        }

        @Override
        public void annotate(Annotation a) {
            notes.add(a);
        }
    });

    private void frame(int seq, long index, int samples) {
        byte[] payload = new byte[8 + samples];
        Framing.putU64(payload, 0, index);
        byte[] f = Framing.encode(FrameType.DATA, seq, payload);
        dec.feed(f, 0, f.length);
    }

    private List<Annotation> of(String kind) {
        return notes.stream().filter(a -> a.kind().equals(kind)).toList();
    }

    private double num(Annotation a, String field) {
        return ((Number) a.fields().get(field).value()).doubleValue();
    }

    private String text(Annotation a, String field) {
        return String.valueOf(a.fields().get(field).value());
    }

    @Test
    void lossOfTheVeryFirstFrameIsAGap() {
        dec.beginSegment(0, 1000, -1);
        frame(1, N, N); // frame 0 (samples 0..15) never arrived
        frame(2, 2 * N, N);
        dec.endSegment();
        List<Annotation> gaps = of("stream-gap");
        assertEquals(1, gaps.size(), notes.toString());
        assertEquals(N, num(gaps.get(0), "missingSamples"));
        assertEquals(1, num(gaps.get(0), "missingFrames"));
        assertEquals("start", text(gaps.get(0), "cause"));
        assertEquals("exact", text(gaps.get(0), "length"));
    }

    @Test
    void aStreamStartingAtZeroHasNoGap() {
        dec.beginSegment(0, 1000, -1);
        frame(0, 0, N);
        frame(1, N, N);
        dec.endSegment();
        assertEquals(List.of(), notes);
        assertEquals(2 * N, dec.samples());
    }

    @Test
    void sequenceJumpWithContinuousIndexIsAnnotated() {
        dec.beginSegment(0, 1000, -1);
        frame(0, 0, N);
        frame(3, N, N); // frames 1 and 2 lost, yet the index runs on
        dec.endSegment();
        assertEquals(0, of("stream-gap").size());
        List<Annotation> j = of("stream-seq-jump");
        assertEquals(1, j.size(), notes.toString());
        assertEquals(2, num(j.get(0), "missingFrames"));
        assertEquals(2 * N, dec.samples(), "no sample lost or invented");
    }

    @Test
    void indexOverlapIsTrimmedAndAnnotated() {
        dec.beginSegment(0, 1000, -1);
        frame(0, 0, N);
        frame(1, N - 10, N); // its first 10 samples repeat indices already read
        dec.endSegment();
        List<Annotation> o = of("stream-overlap");
        assertEquals(1, o.size(), notes.toString());
        assertEquals(10, num(o.get(0), "trimmedSamples"));
        assertEquals(2 * N - 10, dec.samples());
        assertEquals(1, runs.size());
        assertEquals(2 * N - 10, runs.get(0)[1]);
    }

    @Test
    void reorderedFrameIsToldApartFromARepeat() {
        dec.beginSegment(0, 1000, -1);
        frame(0, 0, N);
        frame(2, 2 * N, N); // frame 1 comes late
        frame(1, N, N);
        frame(3, 3 * N, N);
        frame(3, 3 * N, N); // a true repeat
        dec.endSegment();
        assertEquals(1, of("stream-gap").size());
        assertEquals(1, of("stream-reordered").size(), notes.toString());
        assertEquals(1, num(of("stream-reordered").get(0), "seq"));
        assertEquals(1, of("stream-duplicate").size());
        assertEquals(3, num(of("stream-duplicate").get(0), "seq"));
        assertEquals(1, dec.reordered());
        assertEquals(1, dec.duplicates());
    }

    @Test
    void gapAfterIndexRestartIsLabelledAnEstimate() {
        dec.beginSegment(0, 1000, -1);
        frame(0, 0, N);
        frame(1, N, N);
        dec.beginSegment(1, 1050, 1000); // reconnect 50 ms later; the device counts from 0 again
        frame(0, 0, N);
        dec.endSegment();
        List<Annotation> gaps = of("stream-gap");
        assertEquals(1, gaps.size(), notes.toString());
        Annotation g = gaps.get(0);
        assertEquals("estimate", text(g, "length"));
        assertEquals(50_000, num(g, "missingSamples")); // 50 ms at 1 MHz
        assertTrue(g.label().contains("estimate"), g.label());
        assertTrue(g.label().contains("about"), g.label());
    }

    @Test
    void gapAcrossReconnectWithContinuousIndexIsExact() {
        dec.beginSegment(0, 1000, -1);
        frame(0, 0, N);
        dec.beginSegment(1, 1050, 1000);
        frame(7, 5 * N, N); // the device kept counting: the index tells the exact loss
        dec.endSegment();
        Annotation g = of("stream-gap").get(0);
        assertEquals("exact", text(g, "length"));
        assertEquals(4 * N, num(g, "missingSamples"));
    }
}
