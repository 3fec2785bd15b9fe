package org.lanesift.plugins.deskew;

import java.io.PrintStream;
import java.util.Locale;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;

/**
 * Command-line tool {@code cable-delay}: prints the delay a cable length difference causes, in ps
 * and, given a bit rate, as a fraction of the unit interval, with the offset to give the
 * {@code deskew} plugin. See {@link CableDelay} for the arithmetic.
 *
 * <pre>
 * lanesift cable-delay --length 10cm [--velocity-factor 0.66] [--bit-rate 200e6]
 * </pre>
 */
public final class CableDelayTool implements Tool {
    /** Creates the tool (stateless). */
    public CableDelayTool() {
    }

    /** The command line: every value takes its unit and SI prefixes ({@code 10cm}, {@code 200Mbit/s}). */
    static final ToolSpec SPEC = ToolSpec.builder("cable-delay")
            .summary("delay of a cable length difference, in ps and as a fraction of a unit interval")
            .description("Prints the delay a cable length difference causes, in ps and, given a bit rate, as a fraction of the",
                    "unit interval, with the offset to give the deskew plugin.")
            .required(OptionSpec.number("length", "m", null, -1e4, 1e4,
                    "extra length of the later path (negative if shorter), such as 0.1, 10cm or 100mm"), "METRES")
            .option(OptionSpec.number("velocity-factor", "", CableDelay.SOLID_PE_VELOCITY_FACTOR, 0.01, 1.0,
                    "fraction of the speed of light; see the cable's data sheet (0.66: solid PE coax, common practice)"), "VF")
            .option(OptionSpec.number("bit-rate", "bit/s", null, 1.0, 1e12,
                    "bits per second on one lane, such as 200e6 or 200Mbit/s, to express the delay in unit intervals"), "BIT_PER_S")
            .build();

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        PrintStream out = console.out();
        double length = args.number("length");
        double vf = args.number("velocity-factor");
        double ps = CableDelay.delayPs(length, vf);
        out.printf(Locale.ROOT, "delay %.1f ps (%.3f ns/m at velocity factor %.3f)%n", ps,
                CableDelay.secondsPerMetre(vf) * 1e9, vf);
        if (args.has("bit-rate")) {
            double rate = args.number("bit-rate");
            out.printf(Locale.ROOT, "%.4f UI at %.6g bit/s (UI %.1f ps)%n",
                    CableDelay.fractionOfUnitInterval(length, vf, rate), rate, 1e12 / rate);
        }
        out.printf(Locale.ROOT, "to align: deskew the longer path by %+.1f ps (or the shorter by %+.1f ps)%n", -ps, ps);
        return 0;
    }
}
