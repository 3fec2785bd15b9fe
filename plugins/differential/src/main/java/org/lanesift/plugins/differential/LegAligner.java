package org.lanesift.plugins.differential;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Set;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;

/**
 * Lines the legs up: queues each input's blocks, checks that a channel's blocks follow each other
 * without gaps, drops the leading samples of the leg that started earlier so both share sample
 * times, and hands on {@link Chunk}s of samples both legs have. With one input it hands on each
 * block whole.
 *
 * <p>Blocks may be lent (host-api {@code Block}, "Ownership"): after the stage's {@code accept} has
 * pumped, {@link #detach()} copies every block still queued into arrays of its own, which it
 * reuses once the copy has been handed on. A block handed on is read only while the pump runs.
 */
final class LegAligner {
    /** Receives the aligned samples. */
    interface Sink {
        /** Called before every chunk with the block the chunk starts in and the offset in it. */
        void start(AnalogBlock first, int offset);

        void feed(Chunk c);
    }

    private final boolean twoLegs;
    private final String[] inputNames;
    private final List<ArrayDeque<AnalogBlock>> queues = new ArrayList<>();
    /** Per input, the queued blocks that are copies of our own (their arrays go back to {@link #spare}). */
    private final List<Set<AnalogBlock>> copies = new ArrayList<>();
    /** Per input, volts arrays of copies already handed on, reused by the next {@link #detach()}. */
    private final List<ArrayDeque<float[]>> spare = new ArrayList<>();
    private final int[] headOffset;
    private final long[] expectedStart;
    private final boolean[] seen;
    private final long[] firstStart;
    private boolean aligned;
    private long skip = -1;
    private int skipLeg;

    LegAligner(boolean twoLegs) {
        this.twoLegs = twoLegs;
        int inputs = twoLegs ? 2 : 1;
        for (int i = 0; i < inputs; i++) {
            queues.add(new ArrayDeque<>());
            copies.add(Collections.newSetFromMap(new IdentityHashMap<>()));
            spare.add(new ArrayDeque<>());
        }
        headOffset = new int[inputs];
        expectedStart = new long[inputs];
        seen = new boolean[inputs];
        firstStart = new long[inputs];
        inputNames = twoLegs ? new String[] {"p", "n"} : new String[] {"in"};
        aligned = !twoLegs;
    }

    String inputName(int input) {
        return inputNames[input];
    }

    /**
     * Queues a non-empty block of an input.
     *
     * @throws org.lanesift.plugin.InputFormatException when it does not follow the input's previous block
     */
    void add(int input, AnalogBlock b, double periodFs) {
        if (seen[input] && Math.abs(b.startFs() - expectedStart[input]) > periodFs / 2) {
            throw new org.lanesift.plugin.InputFormatException("input '" + inputNames[input] + "': block starts at " + b.startFs()
                    + " fs but the previous block ended at " + expectedStart[input]
                    + " fs; blocks of a channel must follow each other without gaps (mark missing samples invalid)");
        }
        if (!seen[input]) {
            seen[input] = true;
            firstStart[input] = b.startFs();
        }
        expectedStart[input] = b.startFs() + Math.round(b.length() * b.periodFs());
        queues.get(input).add(b);
    }

    /** Hands on every chunk that both legs now have. */
    void pump(double periodFs, Sink sink) {
        if (!aligned) {
            if (!seen[0] || !seen[1]) {
                return;
            }
            if (skip < 0) {
                // drop leading samples of the leg that started earlier so both share sample times
                long diff = firstStart[0] - firstStart[1];
                skip = Math.round(Math.abs(diff) / periodFs);
                skipLeg = diff > 0 ? 1 : 0;
            }
            ArrayDeque<AnalogBlock> q = queues.get(skipLeg);
            while (skip > 0 && !q.isEmpty()) {
                AnalogBlock h = q.peek();
                int take = (int) Math.min(skip, h.length() - headOffset[skipLeg]);
                headOffset[skipLeg] += take;
                skip -= take;
                if (headOffset[skipLeg] == h.length()) {
                    release(skipLeg);
                    headOffset[skipLeg] = 0;
                }
            }
            if (skip > 0) {
                return;
            }
            aligned = true;
        }
        while (true) {
            AnalogBlock a = queues.get(0).peek();
            if (a == null) {
                return;
            }
            if (!twoLegs) {
                int off = headOffset[0];
                int len = a.length() - off;
                sink.start(a, off);
                sink.feed(new Chunk(a.volts(), off, null, 0, len, Chunk.mask(a.invalid(), off, len, null, 0)));
                release(0);
                headOffset[0] = 0;
                continue;
            }
            AnalogBlock b = queues.get(1).peek();
            if (b == null) {
                return;
            }
            int ao = headOffset[0];
            int bo = headOffset[1];
            int len = Math.min(a.length() - ao, b.length() - bo);
            sink.start(a, ao);
            sink.feed(new Chunk(a.volts(), ao, b.volts(), bo, len, Chunk.mask(a.invalid(), ao, len, b.invalid(), bo)));
            headOffset[0] += len;
            headOffset[1] += len;
            if (headOffset[0] == a.length()) {
                release(0);
                headOffset[0] = 0;
            }
            if (headOffset[1] == b.length()) {
                release(1);
                headOffset[1] = 0;
            }
        }
    }

    /** Drops an input's head block; a copy's array is kept for reuse (it is overwritten only by a later {@link #detach()}). */
    private void release(int input) {
        AnalogBlock h = queues.get(input).poll();
        if (h != null && copies.get(input).remove(h)) {
            spare.get(input).add(h.volts());
        }
    }

    /**
     * Replaces every queued block that is not yet a copy of our own by a copy (its samples and
     * invalid mask, the same place in the stream; the offset already handed on stays), so that
     * nothing queued refers to a received block's arrays once the stage's {@code accept} returns.
     * Call it after {@link #pump}, once the sink no longer reads the chunks it was fed.
     */
    void detach() {
        for (int input = 0; input < queues.size(); input++) {
            ArrayDeque<AnalogBlock> q = queues.get(input);
            Set<AnalogBlock> own = copies.get(input);
            for (int i = q.size(); i > 0; i--) {
                AnalogBlock b = q.poll();
                q.add(own.contains(b) ? b : copy(input, b));
            }
        }
    }

    private AnalogBlock copy(int input, AnalogBlock b) {
        float[] v = spare.get(input).poll();
        if (v == null || v.length < b.length()) {
            v = new float[b.length()];
        }
        System.arraycopy(b.volts(), 0, v, 0, b.length());
        long[] inv = b.invalid() == null ? null : Arrays.copyOf(b.invalid(), BitSets.words(b.length()));
        AnalogBlock c = new AnalogBlock(b.channel(), b.firstIndex(), b.startFs(), b.periodFs(), v, b.length(), inv);
        copies.get(input).add(c);
        return c;
    }

    /** At the end: when one leg never caught up with the other there is nothing to compare, so both queues are dropped. */
    void dropIfUnaligned() {
        if (!aligned && twoLegs) {
            queues.get(0).clear();
            queues.get(1).clear();
        }
    }

    /** The leg with samples left over at the end (0 or 1), or -1 when none has. */
    int legWithLeftovers() {
        if (!twoLegs || (queues.get(0).isEmpty() && queues.get(1).isEmpty())) {
            return -1;
        }
        return queues.get(0).isEmpty() ? 1 : 0;
    }

    /** Samples left over in a leg's queue. */
    long leftovers(int leg) {
        long extra = 0;
        for (AnalogBlock b : queues.get(leg)) {
            extra += b.length();
        }
        return extra - headOffset[leg];
    }
}
