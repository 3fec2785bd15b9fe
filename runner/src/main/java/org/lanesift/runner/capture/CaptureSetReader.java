package org.lanesift.runner.capture;

import java.io.IOException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.capture.Captures;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PortSpec;
import org.lanesift.unit.Quantity;

/**
 * Streams a capture set as one capture: the reference acquisition's channels (the first), then
 * every other acquisition's channels but the shared one, each moved in time by the offset the
 * shared channel's transitions give ({@link EdgeAlignment}), so all channels stand on the
 * reference's time axis. The alignment reads each acquisition's shared channel once before the
 * first block; memory is the readers' own plus at most {@link SharedEdges#MAX_EDGES} transition
 * times per acquisition. Refuses, naming the set file and the acquisition, acquisitions that
 * disagree on the sample rate, lack the shared channel, repeat a channel name, do not repeat the
 * reference's content or align ambiguously.
 */
final class CaptureSetReader implements CaptureReader {
    /** Relative difference of sample periods taken as the same rate. */
    static final double SAME_RATE = 1e-9;

    /**
     * How one acquisition was placed.
     *
     * @param name      acquisition name
     * @param alignment the alignment on the reference, null for the reference itself
     */
    record Placement(String name, EdgeAlignment.Result alignment) {
    }

    private final CaptureSetFile set;
    private final List<CaptureReader> readers = new ArrayList<>();
    /** Per acquisition, per channel of its reader: the output index, or -1 (the shared channel after the first). */
    private final List<int[]> outIndex = new ArrayList<>();
    private final long[] shiftFs;
    private final boolean[] done;
    private final List<PortSpec> ports = new ArrayList<>();
    private final List<String> units = new ArrayList<>();
    private final List<Placement> placements = new ArrayList<>();

    CaptureSetReader(CaptureSetFile set, boolean headerOnly) throws IOException {
        this.set = set;
        int n = set.acquisitions.size();
        shiftFs = new long[n];
        done = new boolean[n];
        Map<String, String> owner = new HashMap<>();
        int[] sharedIndex = new int[n];
        try {
            for (int a = 0; a < n; a++) {
                CaptureSetFile.Acquisition acq = set.acquisitions.get(a);
                CaptureReader r = open(acq);
                readers.add(r);
                List<PortSpec> ps = r.ports();
                int[] map = new int[ps.size()];
                sharedIndex[a] = -1;
                for (int c = 0; c < ps.size(); c++) {
                    String name = ps.get(c).name();
                    boolean shared = name.equals(set.shared);
                    if (shared) {
                        sharedIndex[a] = c;
                    }
                    if (shared && a > 0) {
                        map[c] = -1;
                        continue;
                    }
                    String before = owner.putIfAbsent(name, acq.name());
                    if (before != null) {
                        throw set.bad("channel '" + name + "' is in acquisitions '" + before + "' and '" + acq.name()
                                + "'; only the shared channel '" + set.shared + "' may be in more than one");
                    }
                    map[c] = ports.size();
                    ports.add(ps.get(c));
                    units.add(r.units().get(c));
                }
                if (sharedIndex[a] < 0) {
                    throw set.bad("acquisition '" + acq.name() + "' (" + acq.file().getFileName() + ") has no channel '" + set.shared
                            + "' (its channels: " + String.join(", ", ps.stream().map(PortSpec::name).toList())
                            + "); expected every acquisition to hold the shared channel");
                }
                outIndex.add(map);
            }
            if (!headerOnly) {
                align(sharedIndex);
                for (CaptureReader r : readers) {
                    r.close();
                }
                for (int a = 0; a < n; a++) {
                    readers.set(a, open(set.acquisitions.get(a)));
                }
            }
        } catch (RuntimeException | IOException e) {
            close();
            throw e;
        }
    }

    private static CaptureReader open(CaptureSetFile.Acquisition acq) throws IOException {
        String plugin = Captures.pluginFor(acq.file());
        Map<String, Object> raw = new HashMap<>();
        raw.put("file", acq.file().toString());
        return CaptureReaders.open(plugin, OptionValues.validate(CaptureReaders.descriptor(plugin), raw));
    }

    /** Reads every acquisition's shared channel and places each on the reference. */
    private void align(int[] sharedIndex) throws IOException {
        int n = readers.size();
        SharedEdges[] edges = new SharedEdges[n];
        for (int a = 0; a < n; a++) {
            SharedEdges e = new SharedEdges();
            int want = sharedIndex[a];
            CaptureReader r = readers.get(a);
            while (r.next((c, b) -> {
                if (c == want) {
                    e.accept(b);
                }
            })) {
                // collected in the callback
            }
            edges[a] = e;
        }
        String refName = set.acquisitions.get(0).name();
        for (int a = 1; a < n; a++) {
            String name = set.acquisitions.get(a).name();
            double p0 = edges[0].periodFs;
            double pa = edges[a].periodFs;
            if (Double.isFinite(p0) != Double.isFinite(pa) || Double.isFinite(p0) && Math.abs(pa - p0) > SAME_RATE * p0) {
                throw set.bad("acquisition '" + name + "' is sampled at " + rate(pa) + ", the reference '" + refName + "' at "
                        + rate(p0) + "; expected every acquisition at the same sample rate");
            }
        }
        long shortest = Long.MAX_VALUE;
        for (SharedEdges e : edges) {
            shortest = Math.min(shortest, e.endFs - e.startFs);
        }
        long searchFs = set.searchS > 0 ? Math.round(set.searchS * 1e15) : shortest / 8;
        placements.add(new Placement(refName, null));
        for (int a = 1; a < n; a++) {
            String name = set.acquisitions.get(a).name();
            EdgeAlignment.Result r = EdgeAlignment.align(edges[0], edges[a], searchFs);
            String what = "acquisition '" + name + "': the shared channel '" + set.shared + "'";
            if (r == null) {
                throw set.bad(what + " has fewer than " + EdgeAlignment.MIN_VOTERS + " transitions where it overlaps '" + refName
                        + "' beyond the search range of +/-" + Quantity.format(searchFs / 1e15, "s")
                        + "; expected longer acquisitions or a smaller searchS");
            }
            if (r.matched() < EdgeAlignment.MIN_MATCHED) {
                throw set.bad(String.format(Locale.ROOT, "%s does not repeat what '%s' holds: at the best offset (%s) only %.0f %%"
                        + " of its transitions match; expected the same repeating content, each acquisition triggered at the"
                        + " same point of it", what, refName, Quantity.format(r.offsetFs() / 1e15, "s"), 100 * r.matched()));
            }
            if (r.runnerUp() > EdgeAlignment.MAX_RUNNER_UP) {
                throw set.bad(String.format(Locale.ROOT, "%s aligns ambiguously on '%s': offsets %s and %s match nearly as well"
                        + " (%.0f %% of the best's votes); expected a shared channel whose pattern does not repeat within the"
                        + " search range of +/-%s (the lane with the sync bits), or a smaller searchS", what, refName,
                        Quantity.format(r.offsetFs() / 1e15, "s"), Quantity.format(r.runnerUpFs() / 1e15, "s"), 100 * r.runnerUp(),
                        Quantity.format(searchFs / 1e15, "s")));
            }
            shiftFs[a] = Math.round(r.offsetFs());
            placements.add(new Placement(name, r));
        }
    }

    private static String rate(double periodFs) {
        return Double.isFinite(periodFs) ? Quantity.format(1e15 / periodFs, "S/s") : "no sample rate (edge times)";
    }

    /** How each acquisition was placed, the reference first; empty for a header-only reader. */
    List<Placement> placements() {
        return placements;
    }

    @Override
    public List<PortSpec> ports() {
        return ports;
    }

    @Override
    public List<String> units() {
        return units;
    }

    @Override
    public boolean next(Out out) throws IOException {
        boolean any = false;
        for (int a = 0; a < readers.size(); a++) {
            if (done[a]) {
                continue;
            }
            int[] map = outIndex.get(a);
            long shift = shiftFs[a];
            boolean more = readers.get(a).next((c, b) -> {
                if (map[c] >= 0) {
                    out.emit(map[c], shift == 0 ? b : shifted(b, shift));
                }
            });
            done[a] = !more;
            any |= more;
        }
        return any;
    }

    /** The block moved earlier by {@code shiftFs} (onto the reference's time axis). */
    static Block shifted(Block b, long shiftFs) {
        if (b instanceof LogicBlock l) {
            return new LogicBlock(l.channel(), l.firstIndex(), l.startFs() - shiftFs, l.periodFs(), l.bits(), l.length(), l.invalid());
        }
        if (b instanceof AnalogBlock v) {
            return new AnalogBlock(v.channel(), v.firstIndex(), v.startFs() - shiftFs, v.periodFs(), v.volts(), v.length(), v.invalid());
        }
        if (b instanceof Edges e) {
            long[] t = new long[e.count()];
            for (int i = 0; i < t.length; i++) {
                t[i] = e.timesFs()[i] - shiftFs;
            }
            long[] sp = e.invalidSpans() == null ? null : new long[2 * e.invalidCount()];
            for (int i = 0; sp != null && i < sp.length; i++) {
                sp[i] = e.invalidSpans()[i] - shiftFs;
            }
            return new Edges(e.channel(), e.startFs() - shiftFs, e.endFs() - shiftFs, e.initialLevel(), t, t.length, sp, e.invalidCount());
        }
        throw new IllegalStateException("a capture set moves analog, logic and edge blocks in time, not " + b.getClass().getSimpleName());
    }

    @Override
    public long done() {
        long d = 0;
        for (CaptureReader r : readers) {
            d += r.done();
        }
        return d;
    }

    @Override
    public long total() {
        long t = 0;
        for (CaptureReader r : readers) {
            if (r.total() < 0) {
                return -1;
            }
            t += r.total();
        }
        return t;
    }

    @Override
    public void close() throws IOException {
        for (CaptureReader r : readers) {
            r.close();
        }
    }
}
