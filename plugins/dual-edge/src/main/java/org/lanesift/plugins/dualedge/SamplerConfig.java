package org.lanesift.plugins.dualedge;

import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionValues;
import org.lanesift.time.TimeValue;

/**
 * The validated, cross-checked options of one sampler instance, in the units the stage works in.
 *
 * @param lanes           number of data lanes
 * @param mode            sampling mode
 * @param slots           bit slots per clock period (multiplied mode; 1 or 2 otherwise)
 * @param pattern         clock lane level per slot, slot 0 first (multiplied mode; empty otherwise)
 * @param slot0AfterRef   slots from the reference (rising) clock edge to the start of slot 0
 * @param highSlots       slots the clock is high per period (multiplied mode)
 * @param edgeAligned     data transitions sit at the clock edges (sample half a UI later)
 * @param phaseIsUi       true when the phase is a fraction of a unit interval
 * @param phaseUi         phase in UI (when {@code phaseIsUi})
 * @param phaseFs         phase in femtoseconds (when not {@code phaseIsUi})
 * @param autoPhase       search the eye centre instead of using the phase
 * @param searchBits      bit slots at the start of the capture used by the search
 * @param marginThreshold fraction of a UI below which a margin is flagged
 * @param glitchFraction  clock pulses shorter than this fraction of the period are glitches
 * @param dropoutPeriods  a clock gap longer than this many periods is a dropout
 * @param marginFindings  runs of flagged bits are annotated here ({@code margin-low}); false leaves that to the
 *                        decoder that knows where the lane carries data (the bits are flagged either way)
 */
record SamplerConfig(int lanes, Mode mode, int slots, String pattern, int slot0AfterRef, int highSlots,
                     boolean edgeAligned, boolean phaseIsUi, double phaseUi, double phaseFs, boolean autoPhase,
                     int searchBits, double marginThreshold, double glitchFraction, double dropoutPeriods,
                     boolean marginFindings) {

    /** The sampling modes. */
    enum Mode {
        DDR("ddr"), RISING("rising"), FALLING("falling"), MULTIPLIED("multiplied");

        final String option;

        Mode(String option) {
            this.option = option;
        }

        static Mode of(String s) {
            for (Mode m : values()) {
                if (m.option.equals(s)) {
                    return m;
                }
            }
            throw new IllegalArgumentException(s);
        }
    }

    /** The 7:1 pixel-link clock pattern, slot 0 first (docs/reference-facts.md#pixel-link-clock-and-slot-mappings). */
    static final String SEVEN_TO_ONE = "1100011";

    /**
     * Reads and cross-checks the options.
     *
     * @param o validated option values
     * @return the configuration
     * @throws OptionException naming the option and what is allowed
     */
    static SamplerConfig from(OptionValues o) {
        String id = o.pluginId();
        int lanes = o.getInt("lanes");
        Mode mode = Mode.of(o.getString("mode"));
        int slots = o.getInt("slots");
        String pattern = o.getString("clockPattern").trim();
        int slot0 = 0;
        int high = 0;
        if (mode == Mode.MULTIPLIED) {
            if (pattern.isEmpty()) {
                if (slots != 7) {
                    throw new OptionException("clockPattern", "option 'clockPattern' of plugin '" + id + "' is required when slots = "
                            + slots + ": give the clock lane's level in each slot, slot 0 first, as " + slots
                            + " characters 0/1 (the 7:1 default is " + SEVEN_TO_ONE + ")");
                }
                pattern = SEVEN_TO_ONE;
            }
            if (pattern.length() != slots || !pattern.matches("[01]+")) {
                throw new OptionException("clockPattern", "option 'clockPattern' of plugin '" + id + "': expected " + slots
                        + " characters 0 or 1 (one per slot, slot 0 first), got '" + pattern + "'");
            }
            int rises = 0;
            int r0 = -1;
            for (int i = 0; i < slots; i++) {
                char c = pattern.charAt(i);
                char prev = pattern.charAt((i + slots - 1) % slots);
                if (c == '1') {
                    high++;
                }
                if (c == '1' && prev == '0') {
                    rises++;
                    r0 = i;
                }
            }
            if (rises != 1) {
                throw new OptionException("clockPattern", "option 'clockPattern' of plugin '" + id + "': '" + pattern
                        + "' must have exactly one run of 1s (one rising and one falling clock edge per period)");
            }
            slot0 = (slots - r0) % slots;
        } else {
            slots = mode == Mode.DDR ? 2 : 1;
            pattern = "";
        }
        boolean edgeAligned = o.getString("alignment").equals("edge");
        TimeValue phase = o.getTime("phase");
        boolean phaseIsUi = phase.unit() == TimeValue.Unit.UI;
        double phaseUi = 0;
        double phaseFs = 0;
        if (phaseIsUi) {
            phaseUi = phase.value();
            if (Math.abs(phaseUi) > 1) {
                throw new OptionException("phase", "option 'phase' of plugin '" + id + "': " + phase
                        + " is outside -1UI to 1UI (beyond that the sampler would take the neighbouring bit)");
            }
        } else if (phase.unit() == TimeValue.Unit.SAMPLES) {
            double sp = o.getTime("samplePeriod").toFs(Double.NaN, Double.NaN);
            if (!(sp > 0)) {
                throw new OptionException("phase", "option 'phase' of plugin '" + id + "': " + phase
                        + " is in samples, but edge inputs carry no sample period; give 'samplePeriod' (such as 100ps) or write the phase in ps, ns or UI");
            }
            phaseFs = phase.value() * sp;
        } else {
            phaseFs = phase.toFs(Double.NaN, Double.NaN);
        }
        boolean auto = o.getBoolean("autoPhase");
        if (auto && (phaseIsUi ? phaseUi != 0 : phaseFs != 0)) {
            throw new OptionException("phase", "plugin '" + id + "': give either option 'phase' (" + phase
                    + ") or 'autoPhase' = true, not both");
        }
        if (mode == Mode.MULTIPLIED && o.getString("alignment").equals("edge")) {
            throw new OptionException("alignment", "option 'alignment' of plugin '" + id
                    + "': multiplied mode always samples slot centres; use 'phase' to move the sample point");
        }
        return new SamplerConfig(lanes, mode, slots, pattern, slot0, high, edgeAligned, phaseIsUi, phaseUi, phaseFs, auto,
                o.getInt("searchBits"), o.getDouble("marginThreshold"), o.getDouble("glitchFraction"),
                o.getDouble("dropoutPeriods"), o.getString("marginFindings").equals("sampler"));
    }

    /**
     * Unit intervals per clock period.
     *
     * @return 2 for DDR, 1 for single-edge, the slot count in multiplied mode
     */
    int uiPerPeriod() {
        return slots;
    }
}
