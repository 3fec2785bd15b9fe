package org.lanesift.runner.link;

import java.util.List;
import org.lanesift.plugin.InputFormatException;
import org.lanesift.report.Source;
import org.lanesift.runner.capture.InspectReport;

/**
 * The link as the {@code sift} command decides it: kind, measured clock, unit interval and slot
 * mapping, each with where it comes from.
 *
 * @param packet         true for a packet link, false for a 7:1 pixel link
 * @param kindSource     why this kind: "given" (--link) or the measured levels that decided it
 * @param clockHz        the clock pair's measured frequency (inspect's fundamental)
 * @param unitIntervalFs the unit interval, femtoseconds: clock period / 7 (pixel) or / 2 (packet, DDR)
 * @param mapping        pixel-link slot mapping (bits-18 or vesa-24), empty for a packet link
 * @param mappingAlso    another mapping the lane count also fits, empty if none
 * @param dataLanes      number of data pairs
 */
public record LinkFacts(boolean packet, Source kindSource, double clockHz, double unitIntervalFs, String mapping,
                        String mappingAlso, int dataLanes) {
    /** Where the slot pattern and mappings are cited. */
    public static final String PIXEL_SOURCE = "docs/reference-facts.md#pixel-link-clock-and-slot-mappings";
    /** Where the D-PHY levels and the DDR clock are cited. */
    public static final String DPHY_SOURCE = "docs/reference-facts.md#d-phy-levels-and-states";
    /** D-PHY low-power high is taken above this single-ended level (reference-facts, D-PHY, from memory). */
    static final double LP_HIGH_VOLTS = 0.88;
    /** D-PHY low-power low is taken below this single-ended level. */
    static final double LP_LOW_VOLTS = 0.55;

    /**
     * Decides the link.
     *
     * @param r     the inspect report of the capture
     * @param pairs the clock pair first, then the data pairs
     * @param kind  auto, pixel or packet
     * @return the facts
     * @throws InputFormatException when the clock has no measurable frequency or the lane count fits no mapping
     */
    public static LinkFacts of(InspectReport r, List<LinkChains.Pair> pairs, String kind) {
        boolean packet;
        Source source;
        if (kind.equals("auto")) {
            String lp = lowPowerLeg(r, pairs);
            packet = lp != null;
            source = Source.measured(packet ? lp + " swings between D-PHY low-power levels (above "
                    + LP_HIGH_VOLTS + " V and below " + LP_LOW_VOLTS + " V, " + DPHY_SOURCE + ")"
                    : "no leg swings between D-PHY low-power levels (" + DPHY_SOURCE + "), so a 7:1 pixel link");
        } else {
            packet = kind.equals("packet");
            source = Source.given("--link " + kind);
        }
        LinkChains.Pair clk = pairs.get(0);
        double hz = clockHz(r, clk);
        if (!(hz > 0) || !Double.isFinite(hz)) {
            throw new InputFormatException(r.file() + ": channel " + clk.p() + " (clock pair " + clk.name()
                    + "): no regular rising edges, so no clock frequency to derive the unit interval from");
        }
        double ui = 1e15 / hz / (packet ? 2 : 7);
        int lanes = pairs.size() - 1;
        String mapping = "";
        String also = "";
        if (!packet) {
            if (lanes == 3) {
                mapping = "bits-18";
            } else if (lanes == 4) {
                mapping = "vesa-24";
                also = "jeida-24";
            } else {
                throw new InputFormatException(r.file() + ": a 7:1 pixel link has 3 data pairs (18-bit) or 4 (24-bit), found "
                        + lanes + " besides the clock pair " + clk.name() + "; give the channels with --map");
            }
        } else if (lanes > 4) {
            throw new InputFormatException(r.file() + ": a packet link has 1 to 4 data lanes, found " + lanes
                    + " besides the clock pair " + clk.name() + "; give the channels with --map");
        }
        return new LinkFacts(packet, source, hz, ui, mapping, also, lanes);
    }

    private static double clockHz(InspectReport r, LinkChains.Pair clk) {
        for (InspectReport.Clock c : r.clocks()) {
            if (c.channel().equals(clk.p()) || c.channel().equals(clk.n())) {
                return c.frequencyHz();
            }
        }
        for (InspectReport.Channel c : r.channels()) {
            if (c.name().equals(clk.p()) && c.fundamentalHz() != null) {
                return c.fundamentalHz();
            }
        }
        return Double.NaN;
    }

    /** A data leg that reaches both low-power levels, or null. */
    private static String lowPowerLeg(InspectReport r, List<LinkChains.Pair> pairs) {
        for (LinkChains.Pair p : pairs.subList(1, pairs.size())) {
            for (InspectReport.Channel c : r.channels()) {
                if ((c.name().equals(p.p()) || c.name().equals(p.n())) && c.min() != null && c.max() != null
                        && c.max() > LP_HIGH_VOLTS && c.min() < LP_LOW_VOLTS) {
                    return c.name();
                }
            }
        }
        return null;
    }
}
