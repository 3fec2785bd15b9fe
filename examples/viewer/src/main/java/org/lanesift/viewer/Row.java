package org.lanesift.viewer;

/**
 * One horizontal band of the waveform area: an analog channel, a logic signal, or the annotations
 * of one track. Exactly one of {@code analog}, {@code logic}, {@code notes} is set.
 *
 * @param name   caption at the left
 * @param analog the samples, for an analog row
 * @param logic  the edges, for a logic row
 * @param notes  the annotations, for a note row
 * @param lanes  stacked lanes of a note row (1 for the others)
 * @param owner  name of the channel row it hangs under, or null for a channel row or a free track
 */
public record Row(String name, AnalogTrace analog, LogicTrace logic, NoteTrack notes, int lanes, String owner) {
    /** Height of an analog row, pixels. */
    public static final int ANALOG_PX = 60;
    /** Height of a logic row, pixels. */
    public static final int LOGIC_PX = 24;
    /** Height of one lane of a note row, pixels. */
    public static final int LANE_PX = 17;

    /**
     * Height on screen.
     *
     * @return pixels
     */
    public int heightPx() {
        if (analog != null) {
            return ANALOG_PX;
        }
        if (logic != null) {
            return LOGIC_PX;
        }
        return lanes * LANE_PX + 2;
    }
}
