package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

class EdgeListBuilderTest {
    @Test
    void buildsExactArraysOfWhatWasAddedAcrossGrowth() {
        Random r = new Random(9);
        EdgeListBuilder b = new EdgeListBuilder(1);
        for (int round = 0; round < 3; round++) {
            b.clear();
            List<Long> times = new ArrayList<>();
            List<Long> spans = new ArrayList<>();
            long t = 1000;
            int n = r.nextInt(5000);
            for (int i = 0; i < n; i++) {
                t += 1 + r.nextInt(1000);
                if (r.nextInt(50) == 0) {
                    b.addSpan(t, t + 5);
                    spans.add(t);
                    spans.add(t + 5);
                    t += 5;
                } else {
                    if (r.nextInt(7) == 0) {
                        b.reserve(r.nextInt(100));
                    }
                    b.addTime(t);
                    times.add(t);
                }
            }
            Edges e = b.build("d", 0, t + 1, round == 1);
            assertEquals(times.size(), e.count());
            assertEquals(times.size(), e.timesFs().length);
            assertArrayEquals(times.stream().mapToLong(Long::longValue).toArray(), e.timesFs());
            assertEquals(spans.size() / 2, e.invalidCount());
            if (spans.isEmpty()) {
                assertNull(e.invalidSpans());
            } else {
                assertArrayEquals(spans.stream().mapToLong(Long::longValue).toArray(), e.invalidSpans());
            }
            assertEquals(round == 1, e.initialLevel());
            for (int i = 0; i < b.timeCount(); i++) {
                assertEquals(times.get(i), b.time(i));
            }
        }
    }

    @Test
    void handsOnInPiecesLikeAListWould() {
        Random r = new Random(13);
        EdgeListBuilder b = new EdgeListBuilder(2);
        List<Long> times = new ArrayList<>();
        List<long[]> spans = new ArrayList<>();
        long t = 0;
        for (int round = 0; round < 2000; round++) {
            int add = r.nextInt(20);
            for (int i = 0; i < add; i++) {
                t += 1 + r.nextInt(50);
                if (r.nextInt(10) == 0) {
                    b.addSpan(t, t + 7);
                    spans.add(new long[] {t, t + 7});
                } else {
                    b.addTime(t);
                    times.add(t);
                }
            }
            long cut = t - r.nextInt(200);
            // oracle: the list's own filters
            int before = (int) times.stream().takeWhile(x -> x < cut).count();
            assertEquals(before, b.timesBefore(cut));
            if (!times.isEmpty()) {
                assertEquals(times.get(times.size() - 1), b.lastTime());
            }
            long[] taken = b.removeFirstTimes(before);
            assertArrayEquals(times.subList(0, before).stream().mapToLong(Long::longValue).toArray(), taken);
            times.subList(0, before).clear();
            assertEquals(times.size(), b.timeCount());
            spans.removeIf(sp -> sp[1] <= cut);
            b.keepSpansEndingAfter(cut);
            assertEquals(spans.size(), b.spanCount());
            for (int i = 0; i < spans.size(); i++) {
                assertEquals(spans.get(i)[0], b.spanStart(i));
                assertEquals(spans.get(i)[1], b.spanEnd(i));
            }
        }
    }
}
