package org.lanesift.runner.capture;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.WordStream;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.testkit.StageHarness;

/** Runs a source plugin through the real chain engine and joins its blocks per output. */
final class Collected {
    private final StageHarness h;

    private Collected(StageHarness h) {
        this.h = h;
    }

    static Collected run(PluginProvider p, Map<String, ?> options) {
        StageHarness h = StageHarness.of(p, options);
        h.run();
        return new Collected(h);
    }

    List<Block> blocks(String port) {
        return h.outputs(port);
    }

    /** All samples of an analog output, with NaN for invalid ones. */
    double[] analog(String port) {
        List<AnalogBlock> bs = h.outputs(port, AnalogBlock.class);
        int n = bs.stream().mapToInt(AnalogBlock::length).sum();
        double[] out = new double[n];
        int k = 0;
        long expectIndex = bs.isEmpty() ? 0 : bs.get(0).firstIndex();
        for (AnalogBlock b : bs) {
            if (b.firstIndex() != expectIndex) {
                throw new AssertionError("block of " + port + " starts at index " + b.firstIndex() + ", expected " + expectIndex);
            }
            for (int i = 0; i < b.length(); i++) {
                out[k++] = b.isValid(i) ? b.volts()[i] : Double.NaN;
            }
            expectIndex += b.length();
        }
        return out;
    }

    /** Joined transitions (fs). */
    long[] edgeTimes(String port) {
        List<Long> t = new ArrayList<>();
        long end = Long.MIN_VALUE;
        for (Edges e : h.outputs(port, Edges.class)) {
            if (end != Long.MIN_VALUE && e.startFs() != end) {
                throw new AssertionError(port + ": block starts at " + e.startFs() + " but the one before ended at " + end);
            }
            for (int i = 0; i < e.count(); i++) {
                t.add(e.timesFs()[i]);
            }
            end = e.endFs();
        }
        return t.stream().mapToLong(Long::longValue).toArray();
    }

    /** Joined unknown spans, adjacent ones merged, as start,end pairs (fs). */
    long[] unknownSpans(String port) {
        List<Long> s = new ArrayList<>();
        for (Edges e : h.outputs(port, Edges.class)) {
            for (int i = 0; i < e.invalidCount(); i++) {
                long a = e.invalidSpans()[2 * i];
                long b = e.invalidSpans()[2 * i + 1];
                if (!s.isEmpty() && s.get(s.size() - 1) == a) {
                    s.set(s.size() - 1, b);
                } else {
                    s.add(a);
                    s.add(b);
                }
            }
        }
        return s.stream().mapToLong(Long::longValue).toArray();
    }

    /** Words as {value, startFs, endFs, flags} rows. */
    List<long[]> words(String port) {
        List<long[]> out = new ArrayList<>();
        for (WordStream w : h.outputs(port, WordStream.class)) {
            for (int i = 0; i < w.count(); i++) {
                out.add(new long[] {w.values()[i], w.wordStartFs()[i], w.wordEndFs()[i], w.flags()[i]});
            }
        }
        return out;
    }

    Edges firstEdges(String port) {
        return h.outputs(port, Edges.class).get(0);
    }

    Edges lastEdges(String port) {
        List<Edges> l = h.outputs(port, Edges.class);
        return l.get(l.size() - 1);
    }
}
