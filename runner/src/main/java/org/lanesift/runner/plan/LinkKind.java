package org.lanesift.runner.plan;

/**
 * The link kinds a capture can be planned for, with what the planning rules take from their
 * standards (docs/reference-facts.md#pixel-link-clock-and-slot-mappings,
 * docs/reference-facts.md#d-phy-levels-and-states, docs/reference-facts.md#edge-rates-of-the-link-standards).
 */
enum LinkKind {
    /** A 7:1 LVDS pixel link: seven bit slots per pixel clock on every data lane. */
    PIXEL("7:1 pixel link (LVDS)", 7, 0.26e-9, 0.3),
    /** A D-PHY/DSI-like packet link: high-speed data on both edges of the DDR clock. */
    PACKET("packet link (D-PHY high speed)", 2, 100e-12, 0.35);

    final String text;
    /** Unit intervals per period of the forwarded clock. */
    final int unitIntervalsPerClock;
    /** The fastest 20-80 % rise time a compliant driver may make, seconds (from memory, see the anchor). */
    final double fastestRiseS;
    /** The slowest rise time, as a fraction of the unit interval (from memory, see the anchor). */
    final double slowestRiseUi;

    LinkKind(String text, int unitIntervalsPerClock, double fastestRiseS, double slowestRiseUi) {
        this.text = text;
        this.unitIntervalsPerClock = unitIntervalsPerClock;
        this.fastestRiseS = fastestRiseS;
        this.slowestRiseUi = slowestRiseUi;
    }
}
