package org.lanesift.viewer;

import java.awt.Color;
import org.lanesift.annotation.Severity;

/**
 * The viewer's colours, chosen for this program (docs/viewer.md explains them): a warm paper
 * background, ink-blue traces, and severity shown by the fill of an annotation box - pale sage for
 * information, amber for a warning, brick red for an error - with a darker edge of the same hue,
 * so a finding stands out even when its box is one pixel wide.
 */
public final class Palette {
    /** Waveform area background. */
    public static final Color PAPER = new Color(0xF7F3EA);
    /** Alternate band behind every other channel group. */
    public static final Color BAND = new Color(0xEFE9DC);
    /** Caption column background. */
    public static final Color CAPTION = new Color(0x2F3B45);
    /** Caption text. */
    public static final Color CAPTION_TEXT = new Color(0xF2EEE4);
    /** Analog trace and its min/max envelope. */
    public static final Color TRACE = new Color(0x1F4E79);
    /** Logic trace. */
    public static final Color LOGIC = new Color(0x2E6B4F);
    /** Grid lines and the time ruler's ticks. */
    public static final Color GRID = new Color(0xD8D0BF);
    /** The time cursor. */
    public static final Color CURSOR = new Color(0x8A2BE2);
    /** The reference mark. */
    public static final Color MARK = new Color(0x00838F);
    /** Text on annotation boxes. */
    public static final Color NOTE_TEXT = new Color(0x1E1E1E);

    private Palette() {
    }

    /**
     * Fill of an annotation box.
     *
     * @param s severity
     * @return the colour
     */
    public static Color fill(Severity s) {
        return switch (s) {
            case INFO -> new Color(0xCFE3C8);
            case WARNING -> new Color(0xF2B33D);
            case ERROR -> new Color(0xC0392B);
        };
    }

    /**
     * Edge of an annotation box.
     *
     * @param s severity
     * @return the colour
     */
    public static Color edge(Severity s) {
        return switch (s) {
            case INFO -> new Color(0x6E8F62);
            case WARNING -> new Color(0x9C6A00);
            case ERROR -> new Color(0x6E1A12);
        };
    }
}
