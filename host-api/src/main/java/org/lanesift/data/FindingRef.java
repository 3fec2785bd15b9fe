package org.lanesift.data;

import java.util.Objects;
import org.lanesift.time.Femtos;

/**
 * Names a finding (a warning or error annotation) that the stage emitting a {@link BitStream}
 * actually made, and what part of the stream it accounts for, so that a stage further down can
 * state the consequences it sees there as information referring to that one finding instead of
 * reporting the same fault again. A stage lists a finding only once it has annotated it; a
 * consumer that sees a flagged bit or a clock break no listed finding covers reports it itself.
 *
 * <p>Times are femtoseconds from the capture origin. {@code atFs} is the start of the finding's
 * annotation (what a reader looks up); {@code fromFs..toFs} (inclusive) is where its effect lies:
 * <ul>
 * <li>{@link Effect#FLAGGED_BITS}: flagged bits of the stream sampled within the span are its
 * consequences ({@code toFs = Long.MAX_VALUE} for "from here on");</li>
 * <li>{@link Effect#CLOCK_BREAK}: a break in the clock-edge numbering or timing between two
 * consecutive bits at {@code t1 < t2} is its consequence when {@code [t1, t2]} meets the span.</li>
 * </ul>
 *
 * @param source the instance id of the stage that made the finding
 * @param kind   the finding's annotation kind, such as {@code "clock-dropout"}
 * @param atFs   the finding's annotation start, femtoseconds
 * @param effect what it accounts for
 * @param fromFs start of the span it accounts for, femtoseconds
 * @param toFs   end of that span (inclusive), femtoseconds
 */
public record FindingRef(String source, String kind, long atFs, Effect effect, long fromFs, long toFs) {

    /** What a referenced finding accounts for in the stream that carries it. */
    public enum Effect {
        /** Bits flagged suspect. */
        FLAGGED_BITS,
        /** Gaps or jumps of the clock between consecutive bits. */
        CLOCK_BREAK
    }

    /**
     * Checks the fields.
     *
     * @param source the instance id of the stage that made the finding
     * @param kind the finding's annotation kind, such as {@code "clock-dropout"}
     * @param atFs the finding's annotation start, femtoseconds
     * @param effect what it accounts for
     * @param fromFs start of the span it accounts for, femtoseconds
     * @param toFs end of that span (inclusive), femtoseconds
     */
    public FindingRef {
        Objects.requireNonNull(source, "source");
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(effect, "effect");
        if (toFs < fromFs) {
            throw new IllegalArgumentException("finding reference '" + kind + "' ends before it starts");
        }
    }

    /**
     * Whether the span covers an instant.
     *
     * @param tFs time, femtoseconds
     * @return true if {@code fromFs <= tFs <= toFs}
     */
    public boolean covers(long tFs) {
        return tFs >= fromFs && tFs <= toFs;
    }

    /**
     * Whether the span meets an interval.
     *
     * @param aFs start, femtoseconds
     * @param bFs end (inclusive), femtoseconds
     * @return true if {@code [aFs, bFs]} and the span share an instant
     */
    public boolean meets(long aFs, long bFs) {
        return aFs <= toFs && bFs >= fromFs;
    }

    /**
     * How a consequence refers to the finding in a label, e.g.
     * {@code "the clock-dropout finding of 'sampler' at 5.0 us"}.
     *
     * @return the reference text
     */
    public String describe() {
        return "the " + kind + " finding of '" + source + "' at " + Femtos.format(atFs);
    }
}
