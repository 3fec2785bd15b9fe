package org.lanesift.data;

import java.util.List;
import java.util.Objects;

/**
 * Bits sampled from one data lane, each with the time it was taken and its timing margins.
 *
 * <p>Bit {@code i} (0 &le; i &lt; {@code count}) has value {@code BitSets.get(values, i)}, was
 * sampled at {@code timesFs[i]}, belongs to clock edge number {@code clockEdge[i]} counted from the
 * start of the capture (the same number on every lane sampled against one clock, so lanes can be
 * merged), was taken on a falling clock edge if {@code BitSets.get(falling, i)}, and sits in bit
 * slot {@code slot[i]} of that edge's period (always 0 for one bit per edge; 0..6 for 7:1 links).
 * {@code setupFs[i]} is the time from the last data transition to the sample point, and
 * {@code holdFs[i]} the time from the sample point to the next transition; {@link #UNKNOWN_MARGIN}
 * when there was no transition within reach. Bits whose margin fell below the sampler's threshold,
 * or that were taken in an unknown span, are set in {@code flagged}.
 *
 * <p><b>Margins only for those who read them.</b> The two margin arrays cost 16 bytes a bit, and
 * most receivers never look at them, so a producer may leave them out (both {@code null}) when the
 * engine tells it that no receiver of the output reads them
 * ({@link org.lanesift.plugin.StageContext#wantsBitMargins(int)}: a receiver that reads them says
 * so on its input port, {@link org.lanesift.plugin.PortSpec#readsBitMargins()}, or as a host sink,
 * {@link org.lanesift.chain.BlockSink#readsBitMargins}). {@link #hasMargins()} tells which; the
 * flags are always there, and the margins were still measured to set them. Asking a stream
 * without margins for them ({@link #setupFs()}, {@link #holdFs()}) is a bug of the wiring's
 * declarations and throws {@link IllegalStateException}: it never reads as zeros or as unknown.
 *
 * <p>{@code causes} names the findings the producer made (and annotated) that account for flagged
 * bits or clock breaks in this block ({@link FindingRef}); a consumer states what they cause as
 * information referring to them, and reports as its own finding only what none of them covers.
 *
 * @param channel   lane name
 * @param startFs   start of the covered span
 * @param endFs     end of the covered span, exclusive
 * @param count     number of bits
 * @param values    packed bit values
 * @param timesFs   sample times
 * @param clockEdge clock edge index of each bit
 * @param falling   packed flags: taken on a falling clock edge
 * @param slot      bit slot within the clock period, or null when every bit is slot 0
 * @param setupFs   setup margin of each bit (femtoseconds), or null when the stream carries no margins
 * @param holdFs    hold margin of each bit (femtoseconds), or null when the stream carries no margins
 * @param flagged   packed flags: margin below threshold or otherwise suspect
 * @param unitIntervalFs the unit interval the margins refer to (femtoseconds)
 * @param causes    findings of the producer that account for flags or clock breaks in this block (unmodifiable)
 */
public record BitStream(String channel, long startFs, long endFs, int count, long[] values, long[] timesFs,
                        long[] clockEdge, long[] falling, byte[] slot, long[] setupFs, long[] holdFs, long[] flagged,
                        double unitIntervalFs, List<FindingRef> causes) implements Block {

    /** Margin value meaning "no transition within reach". */
    public static final long UNKNOWN_MARGIN = Long.MAX_VALUE;

    /**
     * Checks array sizes, and that the margins are both present or both absent.
     *
     * @param channel lane name
     * @param startFs start of the covered span
     * @param endFs end of the covered span, exclusive
     * @param count number of bits
     * @param values packed bit values
     * @param timesFs sample times
     * @param clockEdge clock edge index of each bit
     * @param falling packed flags: taken on a falling clock edge
     * @param slot bit slot within the clock period, or null when every bit is slot 0
     * @param setupFs setup margin of each bit, or null (with {@code holdFs}) for a stream without margins
     * @param holdFs hold margin of each bit, or null (with {@code setupFs}) for a stream without margins
     * @param flagged packed flags: margin below threshold or otherwise suspect
     * @param unitIntervalFs the unit interval the margins refer to (femtoseconds)
     * @param causes findings of the producer that account for flags or clock breaks in this block
     */
    public BitStream {
        Objects.requireNonNull(channel, "channel");
        causes = causes == null ? List.of() : List.copyOf(causes);
        int w = BitSets.words(count);
        if (count < 0 || values.length < w || timesFs.length < count || clockEdge.length < count || falling.length < w
                || (slot != null && slot.length < count) || (setupFs != null && setupFs.length < count)
                || (holdFs != null && holdFs.length < count) || flagged.length < w) {
            throw new IllegalArgumentException("bit stream '" + channel + "': arrays do not hold " + count + " bits");
        }
        if ((setupFs == null) != (holdFs == null)) {
            throw new IllegalArgumentException("bit stream '" + channel + "': setup and hold margins must both be given or both be left out");
        }
        if (endFs < startFs) {
            throw new IllegalArgumentException("bit stream '" + channel + "': end before start");
        }
    }

    /**
     * A block whose producer names no finding behind its flags.
     *
     * @param channel lane name
     * @param startFs start of the covered span
     * @param endFs end of the covered span, exclusive
     * @param count number of bits
     * @param values packed bit values
     * @param timesFs sample times
     * @param clockEdge clock edge index of each bit
     * @param falling packed flags: taken on a falling clock edge
     * @param slot bit slot within the clock period, or null when every bit is slot 0
     * @param setupFs setup margin of each bit, or null (with {@code holdFs}) for a stream without margins
     * @param holdFs hold margin of each bit, or null (with {@code setupFs}) for a stream without margins
     * @param flagged packed flags: margin below threshold or otherwise suspect
     * @param unitIntervalFs the unit interval the margins refer to (femtoseconds)
     */
    public BitStream(String channel, long startFs, long endFs, int count, long[] values, long[] timesFs, long[] clockEdge,
                     long[] falling, byte[] slot, long[] setupFs, long[] holdFs, long[] flagged, double unitIntervalFs) {
        this(channel, startFs, endFs, count, values, timesFs, clockEdge, falling, slot, setupFs, holdFs, flagged, unitIntervalFs,
                List.of());
    }

    /**
     * Whether the stream carries its per-bit setup and hold margins. A producer leaves them out only
     * when no receiver of its output declared that it reads them (see the type's Javadoc).
     *
     * @return true when {@link #setupFs()} and {@link #holdFs()} may be read
     */
    public boolean hasMargins() {
        return setupFs != null;
    }

    /**
     * The setup margin of each bit: the time from the last data transition to the sample point.
     *
     * @return femtoseconds per bit, {@link #UNKNOWN_MARGIN} where no transition was within reach
     * @throws IllegalStateException when the stream carries no margins ({@link #hasMargins()} is
     *         false): the reader did not declare that it reads them, a bug, never bad input
     */
    @Override
    public long[] setupFs() {
        if (setupFs == null) {
            throw noMargins("setup");
        }
        return setupFs;
    }

    /**
     * The hold margin of each bit: the time from the sample point to the next data transition.
     *
     * @return femtoseconds per bit, {@link #UNKNOWN_MARGIN} where no transition was within reach
     * @throws IllegalStateException when the stream carries no margins ({@link #hasMargins()} is
     *         false): the reader did not declare that it reads them, a bug, never bad input
     */
    @Override
    public long[] holdFs() {
        if (holdFs == null) {
            throw noMargins("hold");
        }
        return holdFs;
    }

    private IllegalStateException noMargins(String which) {
        return new IllegalStateException("bit stream '" + channel + "' carries no " + which + " margins: its producer was told"
                + " that no receiver reads them; a receiver that reads margins must declare it (PortSpec.readsBitMargins on its"
                + " input, BlockSink.readsBitMargins for a host sink)");
    }

    /**
     * Value of bit {@code i}.
     *
     * @param i bit index
     * @return the bit
     */
    public boolean bit(int i) {
        return BitSets.get(values, i);
    }

    /**
     * Whether bit {@code i} was flagged.
     *
     * @param i bit index
     * @return true if suspect
     */
    public boolean isFlagged(int i) {
        return BitSets.get(flagged, i);
    }

    /**
     * Slot of bit {@code i} within its clock period.
     *
     * @param i bit index
     * @return 0 when the stream has one bit per clock edge
     */
    public int slotOf(int i) {
        return slot == null ? 0 : slot[i];
    }

    @Override
    public DataKind kind() {
        return DataKind.BITS;
    }

    @Override
    public String toString() {
        return "BitStream[" + channel + ", " + count + " bits" + (hasMargins() ? "]" : ", no margins]");
    }
}
