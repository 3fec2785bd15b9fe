package org.lanesift.plugins.packetlink;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.function.Consumer;
import org.lanesift.kit.LineState;
import org.lanesift.kit.LineStateClassifier;
import org.lanesift.kit.LineStateFilter;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;

/**
 * Follows the line state of one lane from its two single-ended legs, sample by sample, and keeps
 * the list of high-speed intervals for the bit handling.
 *
 * <p>Each sample pair's state comes from signal-kit's {@link LineStateClassifier} (each leg
 * high above {@code lpHighVolts}, low below {@code lpLowVolts}, its last reading in between; both
 * low with a common mode inside {@code [hsCommonMinVolts, hsCommonMaxVolts]} is high speed). A new
 * state counts only once it has lasted {@code minStateFs}; it then starts at its first sample and
 * the previous state ends just after its own last sample. Sequences are checked from each stop
 * state (LP-11): LP-01, LP-00 then HS is a high-speed entry; LP-10, LP-00, LP-01, LP-00 an escape
 * entry; LP-10, LP-00, LP-10, LP-00 a turnaround request (MIPI D-PHY, from memory). In escape mode
 * the spaced one-hot marks (LP-10 = 1, LP-01 = 0, each followed by LP-00; from memory) are
 * collected; the first eight are the escape command, and after a low-power data command the rest
 * are bytes, least significant bit first, handed to {@link LpdtSink}.
 */
final class LaneStateTracker {
    /** A committed high-speed interval {@code [startFs, endFs)}; {@code endFs} is MAX_VALUE while open. */
    static final class Interval {
        final long startFs;
        long endFs = Long.MAX_VALUE;
        boolean closed;

        Interval(long startFs) {
            this.startFs = startFs;
        }
    }

    /** Receives low-power data bytes from escape mode. */
    interface LpdtSink {
        void bytes(int lane, byte[] data, long[] startFs, long[] endFs, int count);
    }

    /** Escape command codes in transmission order, first bit in bit 7 (MIPI D-PHY, from memory). */
    static final int ESC_LPDT = 0b11100001;
    static final int ESC_ULPS = 0b00011110;
    static final int ESC_RESET_TRIGGER = 0b01100010;

    private final int lane;
    private final String track;
    private final LineStateClassifier levels;
    private final LineStateFilter filter;
    private final Consumer<Annotation> out;
    private final LpdtSink lpdt;

    private long lastMatchEndFs = Long.MIN_VALUE;
    private long lastMatchFs = Long.MIN_VALUE;
    private long processedUntilFs = Long.MIN_VALUE;

    private final List<LineState> sequence = new ArrayList<>();
    private final List<long[]> sequenceSpans = new ArrayList<>();
    private boolean escape;
    private long escapeStartFs;
    private final List<long[]> marks = new ArrayList<>();

    final ArrayDeque<Interval> intervals = new ArrayDeque<>();
    private Interval open;
    int burstCount;

    LaneStateTracker(int lane, double highVolts, double lowVolts, double cmMinVolts, double cmMaxVolts, long minStateFs,
                     Consumer<Annotation> out, LpdtSink lpdt) {
        this.lane = lane;
        this.track = "lane" + lane + ".state";
        this.levels = new LineStateClassifier(highVolts, lowVolts, cmMinVolts, cmMaxVolts);
        this.filter = new LineStateFilter(minStateFs);
        this.out = out;
        this.lpdt = lpdt;
    }

    /**
     * Takes {@code n} sample pairs.
     *
     * @param p        positive leg samples
     * @param pOff     first positive sample
     * @param pInvalid validity mask of the positive block or null
     * @param nv       negative leg samples
     * @param nOff     first negative sample
     * @param nInvalid validity mask of the negative block or null
     * @param n        pairs
     * @param t0Fs     time of the first pair
     * @param periodFs sample period
     */
    void accept(float[] p, int pOff, long[] pInvalid, float[] nv, int nOff, long[] nInvalid, int n, long t0Fs, double periodFs) {
        long step = Math.round(periodFs);
        for (int i = 0; i < n; i++) {
            long t = t0Fs + Math.round(i * periodFs);
            step(levels.classify(p, pOff + i, pInvalid, nv, nOff + i, nInvalid), t, step);
        }
    }

    private void step(LineState s, long t, long step) {
        processedUntilFs = t + step;
        LineState prev = filter.committed();
        long prevStart = filter.committedStartFs();
        if (prev != null && s == prev) {
            lastMatchEndFs = t + step;
            lastMatchFs = t;
        }
        if (filter.step(s, t)) {
            commit(prev, prevStart, s, filter.committedStartFs(), t + step);
        }
    }

    /**
     * Time before which the lane's state is settled: bits earlier than this may be classified.
     * It is just after the last sample that matched the committed state, since a later sample may
     * start a new state whose start is only known once it has lasted {@code minStateFs}.
     */
    long knownUntilFs() {
        if (filter.committed() == null) {
            return Long.MIN_VALUE;
        }
        return lastMatchFs + 1;
    }

    /**
     * A new state was committed by the filter.
     *
     * @param prev       the state before it, or null
     * @param prevStart  start of {@code prev}
     * @param s          the new state
     * @param startFs    its start (its first sample)
     * @param matchEndFs just after the sample that committed it
     */
    private void commit(LineState prev, long prevStart, LineState s, long startFs, long matchEndFs) {
        long prevLastSampleFs = lastMatchFs;
        long prevEnd = prev == null ? startFs : Math.min(lastMatchEndFs, startFs);
        if (prev != null) {
            stateSpan(prev, prevStart, prevEnd);
        }
        lastMatchEndFs = matchEndFs;
        lastMatchFs = matchEndFs - 1;
        if (prev == LineState.HS && open != null) {
            // the burst ends just after its last high-speed sample: bits between that sample and the
            // next state belong to the trail or to the transition and are not used
            open.endFs = Math.max(open.startFs, prevLastSampleFs + 1);
            open.closed = true;
            open = null;
            if (s == LineState.LP11) {
                out.accept(Annotation.on(track, "hs-exit").span(prevEnd, startFs).label("HS exit to LP-11")
                        .field("lane", Field.integer(lane, "")).build());
            } else {
                out.accept(Annotation.on(track, "hs-exit-bad").span(prevEnd, startFs).severity(Severity.WARNING)
                        .label("HS exit to " + s.label + ", expected LP-11").field("lane", Field.integer(lane, ""))
                        .field("state", Field.enumValue(s.label)).build());
            }
        }
        if (escape && prev != null) {
            escapeStep(prev, prevStart, prevEnd, s);
        }
        if (s == LineState.LP11) {
            if (escape) {
                endEscape(startFs);
            }
            sequence.clear();
            sequenceSpans.clear();
            return;
        }
        if (s == LineState.HS) {
            checkHsEntry(startFs);
            open = new Interval(startFs);
            intervals.add(open);
            burstCount++;
            sequence.clear();
            sequenceSpans.clear();
            return;
        }
        if (escape || s == LineState.INVALID) {
            if (s == LineState.INVALID) {
                out.accept(Annotation.on(track, "lane-level-invalid").span(startFs, startFs).severity(Severity.WARNING)
                        .label("lane " + lane + " levels fit no line state").field("lane", Field.integer(lane, "")).build());
            }
            return;
        }
        if (sequence.size() < 8) {
            sequence.add(s);
            sequenceSpans.add(new long[] {startFs});
        }
        if (matches(LineState.LP10, LineState.LP00, LineState.LP01, LineState.LP00)) {
            escape = true;
            escapeStartFs = sequenceSpans.get(0)[0];
            marks.clear();
            out.accept(Annotation.on(track, "escape-entry").span(escapeStartFs, startFs).label("escape mode entry")
                    .field("lane", Field.integer(lane, "")).build());
        } else if (matches(LineState.LP10, LineState.LP00, LineState.LP10, LineState.LP00)) {
            out.accept(Annotation.on(track, "turnaround-request").span(sequenceSpans.get(0)[0], startFs)
                    .label("bus turnaround request").field("lane", Field.integer(lane, "")).build());
        }
    }

    private boolean matches(LineState... want) {
        if (sequence.size() != want.length) {
            return false;
        }
        for (int i = 0; i < want.length; i++) {
            if (sequence.get(i) != want[i]) {
                return false;
            }
        }
        return true;
    }

    private void checkHsEntry(long hsStartFs) {
        boolean ok = matches(LineState.LP01, LineState.LP00);
        if (ok) {
            long lp01 = sequenceSpans.get(0)[0];
            long lp00 = sequenceSpans.get(1)[0];
            out.accept(Annotation.on(track, "hs-entry").span(lp01, hsStartFs).label("HS entry LP-11, LP-01, LP-00")
                    .field("lane", Field.integer(lane, ""))
                    .number("lp01Duration", (lp00 - lp01) * 1e-15, "s")
                    .number("lp00Duration", (hsStartFs - lp00) * 1e-15, "s").build());
        } else {
            StringBuilder seq = new StringBuilder("LP-11");
            for (LineState x : sequence) {
                seq.append(", ").append(x.label);
            }
            out.accept(Annotation.on(track, "hs-entry-bad").span(hsStartFs, hsStartFs).severity(Severity.WARNING)
                    .label("HS entered after " + seq + ", expected LP-11, LP-01, LP-00")
                    .field("lane", Field.integer(lane, "")).text("sequence", seq.toString()).build());
        }
    }

    private void escapeStep(LineState prev, long prevStart, long prevEnd, LineState next) {
        if ((prev == LineState.LP10 || prev == LineState.LP01) && next == LineState.LP00) {
            marks.add(new long[] {prev == LineState.LP10 ? 1 : 0, prevStart, prevEnd});
        }
    }

    private void endEscape(long atFs) {
        escape = false;
        // the mark just before LP-11 is the exit mark, not data
        int n = marks.size();
        int cmd = 0;
        int cmdBits = Math.min(8, n);
        for (int i = 0; i < cmdBits; i++) {
            cmd = cmd << 1 | (int) marks.get(i)[0];
        }
        String name;
        if (cmdBits < 8) {
            name = "incomplete";
        } else if (cmd == ESC_LPDT) {
            name = "low-power-data";
        } else if (cmd == ESC_ULPS) {
            name = "ultra-low-power";
        } else if (cmd == ESC_RESET_TRIGGER) {
            name = "reset-trigger";
        } else {
            name = "unknown";
        }
        int dataBits = Math.max(0, n - 8);
        Annotation.Builder b = Annotation.on(track, "escape-command").span(escapeStartFs, atFs)
                .label("escape command " + name + (cmdBits == 8 ? " (" + String.format(Locale.ROOT, "%8s", Integer.toBinaryString(cmd)).replace(' ', '0') + ")" : ""))
                .severity(cmdBits < 8 || name.equals("unknown") ? Severity.WARNING : Severity.INFO)
                .field("lane", Field.integer(lane, "")).field("command", Field.enumValue(name))
                .field("dataBits", Field.integer(dataBits, ""));
        out.accept(b.build());
        if (cmdBits == 8 && cmd == ESC_LPDT && dataBits > 0) {
            if (dataBits % 8 != 0) {
                out.accept(Annotation.on(track, "lpdt-partial-byte").span(escapeStartFs, atFs).severity(Severity.WARNING)
                        .label((dataBits % 8) + " low-power data bits after the last whole byte ignored")
                        .field("lane", Field.integer(lane, "")).build());
            }
            int bytes = dataBits / 8;
            byte[] data = new byte[bytes];
            long[] s = new long[bytes];
            long[] e = new long[bytes];
            for (int k = 0; k < bytes; k++) {
                int v = 0;
                for (int j = 0; j < 8; j++) {
                    v |= (int) marks.get(8 + 8 * k + j)[0] << j;
                }
                data[k] = (byte) v;
                s[k] = marks.get(8 + 8 * k)[1];
                e[k] = marks.get(8 + 8 * k + 7)[2];
            }
            if (lpdt != null && bytes > 0) {
                lpdt.bytes(lane, data, s, e, bytes);
            }
        }
        marks.clear();
    }

    private void stateSpan(LineState s, long startFs, long endFs) {
        out.accept(Annotation.on(track, "lane-state").span(startFs, Math.max(startFs, endFs)).label(s.label)
                .field("lane", Field.integer(lane, "")).field("state", Field.enumValue(s.label)).build());
    }

    /** Ends the capture: closes an open interval and reports the last state. */
    void finish() {
        LineState prev = filter.committed();
        long prevStart = filter.committedStartFs();
        if (filter.flush(processedUntilFs)) {
            commit(prev, prevStart, filter.committed(), filter.committedStartFs(), processedUntilFs);
        }
        LineState last = filter.committed();
        if (last != null) {
            long end = Math.max(filter.committedStartFs(), lastMatchEndFs);
            stateSpan(last, filter.committedStartFs(), end);
            if (open != null) {
                open.endFs = end;
                open.closed = true;
                out.accept(Annotation.on(track, "hs-burst-cut").span(open.startFs, end).severity(Severity.WARNING)
                        .label("capture ended inside a high-speed burst").field("lane", Field.integer(lane, "")).build());
                open = null;
            }
        }
    }

    LineState committed() {
        return filter.committed();
    }
}
