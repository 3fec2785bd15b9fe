package org.lanesift.plugins.differential;

import java.util.List;
import java.util.Locale;
import org.lanesift.annotation.Severity;
import org.lanesift.report.Source;

/**
 * Electrical level limits a capture is checked against. Each check names the quantity, its limits
 * in volts (NaN where there is none) and where the numbers come from.
 */
enum LevelProfile {
    /** LVDS, ANSI/TIA/EIA-644-A driver and receiver limits. */
    LVDS("lvds", List.of(
            new Check("vod-high", "|VOD| in the high state", 0.247, 0.454, Cite.TIA644),
            new Check("vod-low", "|VOD| in the low state", 0.247, 0.454, Cite.TIA644),
            new Check("vod", "leg swing (|VOD| of a complementary pair)", 0.247, 0.454, Cite.TIA644),
            new Check("vos", "offset (common-mode) voltage", 1.125, 1.375, Cite.TIA644),
            new Check("delta-vod", "change of |VOD| between states", Double.NaN, 0.050, Cite.TIA644_DELTA),
            new Check("delta-vos", "change of VOS between states", Double.NaN, 0.050, Cite.TIA644_DELTA),
            new Check("vid-high", "differential input in the high state (receiver threshold +100 mV)", 0.100, Double.NaN,
                    Cite.TIA644),
            new Check("vid-low", "differential input in the low state, magnitude (receiver threshold -100 mV)", 0.100, Double.NaN,
                    Cite.TIA644))),
    /** MIPI D-PHY high-speed levels. */
    DPHY_HS("dphy-hs", List.of(
            new Check("vod-high", "|VOD| in the high state", 0.140, 0.270, Cite.DPHY),
            new Check("vod-low", "|VOD| in the low state", 0.140, 0.270, Cite.DPHY),
            new Check("vod", "leg swing", 0.140, 0.270, Cite.DPHY),
            new Check("vos", "common-mode voltage (about 200 mV)", 0.150, 0.250, Cite.DPHY))),
    /** MIPI D-PHY low-power (single-ended) levels. */
    DPHY_LP("dphy-lp", List.of(
            new Check("lp-high", "low-power high level against the receiver's high threshold", 0.880, Double.NaN, Cite.DPHY),
            new Check("lp-low", "low-power low level against the receiver's low threshold", Double.NaN, 0.550, Cite.DPHY))),
    /** No limits; levels are only reported. */
    NONE("none", List.of());

    /** Where the profiles' limits come from (a holder: enum constants cannot refer to the enum's own static fields). */
    static final class Cite {
        static final Source TIA644 = Source.standard("ANSI/TIA/EIA-644-A, values from memory", "lvds-electrical-levels");
        static final Source TIA644_DELTA = Source.standard("ANSI/TIA/EIA-644-A, delta limits from memory", "lvds-electrical-levels");
        static final Source DPHY = Source.standard("MIPI D-PHY, values from memory", "d-phy-levels-and-states");

        private Cite() {
        }
    }
    /** Relative distance to a limit under which a level inside it is reported as near the limit. */
    static final double NEAR_FRACTION = 0.05;
    /** Numerical tolerance on limits, volts: float samples cannot hit a limit exactly. */
    static final double TOLERANCE_VOLTS = 1e-6;

    final String id;
    final List<Check> checks;

    LevelProfile(String id, List<Check> checks) {
        this.id = id;
        this.checks = checks;
    }

    /**
     * Largest difference magnitude of a sample that counts for the level statistics, volts. For
     * {@code dphy-hs}, twice the largest high-speed swing, 2 x 270 mV (MIPI D-PHY from memory,
     * docs/reference-facts.md#d-phy-levels-and-states): no high-speed level reaches it even with
     * full overshoot, while a low-power LP-01 or LP-10 state reads about -1.2 or +1.2 V
     * differential and would pull the settled low or high level. Other profiles: no limit.
     */
    float levelMaxAbsVolts() {
        return this == DPHY_HS ? 0.540f : Float.POSITIVE_INFINITY;
    }

    static LevelProfile of(String id) {
        for (LevelProfile p : values()) {
            if (p.id.equals(id)) {
                return p;
            }
        }
        throw new IllegalArgumentException("unknown level profile '" + id + "'");
    }

    /**
     * One limit check.
     *
     * @param quantity stable quantity name
     * @param what     human description
     * @param min      lower limit, volts, or NaN
     * @param max      upper limit, volts, or NaN
     * @param from     where the limits come from
     */
    record Check(String quantity, String what, double min, double max, Source from) {
        /** @return where the limits come from, as the findings and reports cite it */
        String source() {
            return from.text();
        }

        /**
         * Judges a value: ERROR outside the limits, WARNING inside but within
         * {@link #NEAR_FRACTION} of the band (or of a one-sided limit's value) from a limit, INFO
         * otherwise; null when the value is not known.
         */
        Severity judge(double v) {
            if (Double.isNaN(v)) {
                return null;
            }
            if ((!Double.isNaN(min) && v < min - TOLERANCE_VOLTS) || (!Double.isNaN(max) && v > max + TOLERANCE_VOLTS)) {
                return Severity.ERROR;
            }
            double margin = !Double.isNaN(min) && !Double.isNaN(max) ? NEAR_FRACTION * (max - min)
                    : NEAR_FRACTION * Math.abs(Double.isNaN(min) ? max : min);
            if ((!Double.isNaN(min) && v < min + margin) || (!Double.isNaN(max) && v > max - margin)) {
                return Severity.WARNING;
            }
            return Severity.INFO;
        }

        String limits() {
            if (!Double.isNaN(min) && !Double.isNaN(max)) {
                return String.format(Locale.ROOT, "%.0f to %.0f mV", min * 1e3, max * 1e3);
            }
            return !Double.isNaN(min) ? String.format(Locale.ROOT, "at least %.0f mV", min * 1e3)
                    : String.format(Locale.ROOT, "at most %.0f mV", max * 1e3);
        }
    }
}
