package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.LogicBlock;
import org.lanesift.testkit.StageHarness;

/** Replays a spool with the spool source and checks every sample against the simulator's function. */
final class Replayed {
    /** Runs of sample indices [from, to) that came out, in order. */
    final List<long[]> runs = new ArrayList<>();
    final List<Annotation> annotations;
    long samples;

    Replayed(Path dir) {
        this(dir, Map.of());
    }

    /** Replays with more options of the spool source, such as {@code start}. */
    Replayed(Path dir, Map<String, ?> more) {
        this(dir, more, false);
    }

    /**
     * Replays with more options; with {@code deviceRestarts} every run of contiguous samples is
     * checked as the simulator sends it after a reconnect that counts from 0 again (its first
     * sample is the simulator's sample 0).
     */
    Replayed(Path dir, Map<String, ?> more, boolean deviceRestarts) {
        Map<String, Object> options = new java.util.HashMap<>(more);
        options.put("dir", dir.toString());
        try (StageHarness h = StageHarness.of(new SpoolSourceProvider(), options)) {
            h.run();
            List<List<LogicBlock>> ch = new ArrayList<>();
            for (int c = 0; c < 8; c++) {
                ch.add(h.outputs("ch" + c, LogicBlock.class));
            }
            for (int k = 0; k < ch.get(0).size(); k++) {
                LogicBlock b0 = ch.get(0).get(k);
                long from = b0.firstIndex();
                long to = from + b0.length();
                if (runs.isEmpty() || runs.get(runs.size() - 1)[1] != from) {
                    runs.add(new long[] {from, from});
                }
                long[] run = runs.get(runs.size() - 1);
                long deviceShift = deviceRestarts ? run[0] : 0;
                for (int i = 0; i < b0.length(); i++) {
                    int v = 0;
                    for (int c = 0; c < 8; c++) {
                        LogicBlock b = ch.get(c).get(k);
                        v |= (b.get(i) ? 1 : 0) << c;
                    }
                    long idx = b0.firstIndex() + i;
                    assertEquals(DeviceSimulator.sample(idx - deviceShift) & 0xFF, v, "sample " + idx);
                }
                assertEquals(Math.round(b0.firstIndex() * b0.periodFs()), b0.startFs());
                run[1] = to;
                samples += b0.length();
            }
            annotations = h.annotations();
        }
    }

    /** A number field of the one annotation of a kind. */
    double field(String kind, String name) {
        Annotation a = annotations.stream().filter(x -> x.kind().equals(kind)).findFirst().orElseThrow();
        return ((Number) a.fields().get(name).value()).doubleValue();
    }

    long count(String kind) {
        return annotations.stream().filter(a -> a.kind().equals(kind)).count();
    }

    String runsText() {
        StringBuilder s = new StringBuilder();
        for (long[] r : runs) {
            s.append('[').append(r[0]).append(',').append(r[1]).append(')');
        }
        return s.toString();
    }
}
