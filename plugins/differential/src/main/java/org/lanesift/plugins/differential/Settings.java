package org.lanesift.plugins.differential;

import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionValues;
import org.lanesift.time.TimeValue;

/** The validated, cross-checked options of one instance. */
final class Settings {
    enum Mode { PAIR, DIFFERENTIAL, SINGLE, LOGIC_PAIR }

    enum Reference { MID_LEVEL, MEDIAN, FIXED }

    enum SwapPattern { CLOCK_1100011, IDLE_HIGH, IDLE_LOW }

    final String pluginId;
    final Mode mode;
    final String channel;
    final double thresholdVolts;
    final double hysteresisVolts;
    final double hysteresisFraction;
    final Reference reference;
    final double referenceVolts;
    final boolean invert;
    final boolean detectSwap;
    /** Whether level checks, the level summary and the levels report are made. */
    final boolean levelReport;
    final SwapPattern swapPattern;
    final boolean cubic;
    final LevelProfile profile;
    final int windowSamples;
    final TimeValue adaptTimeConstant;
    final int warmupSamples;
    final int statsStride;
    /** Whether output {@code diff} (P-N, volts) exists: mode pair with option {@code diffOutput}. */
    final boolean diffOutput;
    /** Whether output {@code common} ((P+N)/2, volts) exists: mode pair with option {@code commonOutput}. */
    final boolean commonOutput;

    Settings(OptionValues o, String instanceId) {
        pluginId = o.pluginId();
        mode = switch (o.getString("mode")) {
            case "pair" -> Mode.PAIR;
            case "differential" -> Mode.DIFFERENTIAL;
            case "single" -> Mode.SINGLE;
            default -> Mode.LOGIC_PAIR;
        };
        String n = o.getString("name");
        channel = n.isEmpty() ? instanceId : n;
        thresholdVolts = o.getDouble("thresholdVolts");
        hysteresisVolts = o.getDouble("hysteresisVolts");
        hysteresisFraction = o.getDouble("hysteresisFraction");
        reference = switch (o.getString("reference")) {
            case "median" -> Reference.MEDIAN;
            case "fixed" -> Reference.FIXED;
            default -> Reference.MID_LEVEL;
        };
        referenceVolts = o.getDouble("referenceVolts");
        invert = o.getBoolean("invert");
        detectSwap = o.getBoolean("detectSwap");
        swapPattern = switch (o.getString("swapPattern")) {
            case "idle-high" -> SwapPattern.IDLE_HIGH;
            case "idle-low" -> SwapPattern.IDLE_LOW;
            default -> SwapPattern.CLOCK_1100011;
        };
        cubic = o.getString("interpolation").equals("cubic");
        profile = LevelProfile.of(o.getString("levelProfile"));
        windowSamples = o.getInt("windowSamples");
        adaptTimeConstant = o.getTime("adaptTimeConstant");
        warmupSamples = o.getInt("warmupSamples");
        statsStride = o.getInt("statsStride");
        levelReport = o.getBoolean("levelReport");
        diffOutput = o.getBoolean("diffOutput");
        commonOutput = o.getBoolean("commonOutput");
        check();
    }

    private OptionException bad(String option, String msg) {
        return new OptionException(option, "option '" + option + "' of plugin '" + pluginId + "': " + msg);
    }

    private void check() {
        if (mode == Mode.SINGLE && !Double.isNaN(thresholdVolts)) {
            throw bad("thresholdVolts", "not used in mode 'single', where the threshold is the reference;"
                    + " give reference=fixed with referenceVolts instead");
        }
        if (mode == Mode.SINGLE && reference == Reference.FIXED && Double.isNaN(referenceVolts)) {
            throw bad("referenceVolts", "required with reference=fixed: the reference level in volts");
        }
        if (!Double.isNaN(referenceVolts) && (mode != Mode.SINGLE || reference != Reference.FIXED)) {
            throw bad("referenceVolts", "only used in mode 'single' with reference=fixed");
        }
        if (mode == Mode.LOGIC_PAIR) {
            for (String k : new String[] {"thresholdVolts", "hysteresisVolts"}) {
                double v = k.equals("thresholdVolts") ? thresholdVolts : hysteresisVolts;
                if (!Double.isNaN(v)) {
                    throw bad(k, "not used in mode 'logic-pair', whose inputs are already logic levels");
                }
            }
        }
        if (mode == Mode.LOGIC_PAIR && detectSwap) {
            throw bad("detectSwap", "not available in mode 'logic-pair'; set invert=true for swapped legs");
        }
        if (profile == LevelProfile.DPHY_LP && mode != Mode.SINGLE) {
            throw bad("levelProfile", "'dphy-lp' checks single-ended low-power levels: use it with mode 'single'"
                    + " on one leg (expected lvds, dphy-hs or none for mode '" + modeName() + "')");
        }
        for (String k : new String[] {"diffOutput", "commonOutput"}) {
            boolean on = k.equals("diffOutput") ? diffOutput : commonOutput;
            if (on && mode != Mode.PAIR) {
                throw bad(k, "only available in mode 'pair', which has both legs (expected false for mode '" + modeName() + "')");
            }
        }
        TimeValue t = adaptTimeConstant;
        if (t.unit() == TimeValue.Unit.UI) {
            throw bad("adaptTimeConstant", "the unit interval is not known to this plugin: give fs, ps, ns, us, ms, s or samples");
        }
        if (t.value() < 0) {
            throw bad("adaptTimeConstant", "must not be negative (0 turns drift adaptation off), got " + t);
        }
    }

    String modeName() {
        return switch (mode) {
            case PAIR -> "pair";
            case DIFFERENTIAL -> "differential";
            case SINGLE -> "single";
            case LOGIC_PAIR -> "logic-pair";
        };
    }

    /**
     * The threshold given by the options, when it is not learned: {@code referenceVolts} in mode
     * {@code single} with {@code reference=fixed}, {@code thresholdVolts} otherwise.
     */
    double givenThresholdVolts() {
        return mode == Mode.SINGLE ? referenceVolts : thresholdVolts;
    }

    boolean autoThreshold() {
        return mode == Mode.SINGLE ? reference != Reference.FIXED : Double.isNaN(thresholdVolts);
    }

    boolean autoHysteresis() {
        return Double.isNaN(hysteresisVolts);
    }

    boolean needsWarmup() {
        return autoThreshold() || autoHysteresis() || detectSwap;
    }

    /** The drift time constant in samples, 0 for no adaptation. */
    double adaptSamples(double periodFs) {
        return adaptTimeConstant.toFs(periodFs, Double.NaN) / periodFs;
    }
}
