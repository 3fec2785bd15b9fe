package org.lanesift.plugins.deskew;

import java.io.PrintStream;
import java.util.Locale;
import org.lanesift.plugin.Tool;

/**
 * Command-line tool {@code cable-delay}: prints the delay a cable length difference causes, in ps
 * and, given a bit rate, as a fraction of the unit interval, with the offset to give the
 * {@code deskew} plugin. See {@link CableDelay} for the arithmetic.
 *
 * <pre>
 * lanesift cable-delay --length 0.10 [--velocity-factor 0.66] [--bit-rate 200e6]
 * </pre>
 */
public final class CableDelayTool implements Tool {
    /** Creates the tool (stateless). */
    public CableDelayTool() {
    }

    @Override
    public String name() {
        return "cable-delay";
    }

    @Override
    public String summary() {
        return "delay of a cable length difference, in ps and as a fraction of a unit interval";
    }

    private static final String USAGE = "usage: cable-delay --length METRES [--velocity-factor VF (default 0.66, solid PE coax)]"
            + " [--bit-rate BIT_PER_S]";

    @Override
    public int run(String[] args, PrintStream out, PrintStream err) {
        Double length = null;
        double vf = CableDelay.SOLID_PE_VELOCITY_FACTOR;
        Double rate = null;
        for (int i = 0; i < args.length; i++) {
            String a = args[i];
            if (a.equals("--help") || a.equals("-h")) {
                out.println(USAGE);
                out.println("  --length           extra length of the later path in metres (negative if shorter)");
                out.println("  --velocity-factor  fraction of the speed of light, 0 < VF <= 1; see the cable's data sheet");
                out.println("  --bit-rate         bits per second on one lane, to express the delay in unit intervals");
                return 0;
            }
            if (i + 1 >= args.length) {
                err.println("cable-delay: " + a + " needs a value; " + USAGE);
                return 2;
            }
            String v = args[++i];
            double d;
            try {
                d = Double.parseDouble(v);
            } catch (NumberFormatException e) {
                err.println("cable-delay: " + a + " expects a number, got '" + v + "'");
                return 2;
            }
            switch (a) {
                case "--length" -> length = d;
                case "--velocity-factor" -> vf = d;
                case "--bit-rate" -> rate = d;
                default -> {
                    err.println("cable-delay: unknown option '" + a + "'; " + USAGE);
                    return 2;
                }
            }
        }
        if (length == null) {
            err.println("cable-delay: --length is required; " + USAGE);
            return 2;
        }
        try {
            double ps = CableDelay.delayPs(length, vf);
            out.printf(Locale.ROOT, "delay %.1f ps (%.3f ns/m at velocity factor %.3f)%n", ps,
                    CableDelay.secondsPerMetre(vf) * 1e9, vf);
            if (rate != null) {
                out.printf(Locale.ROOT, "%.4f UI at %.6g bit/s (UI %.1f ps)%n",
                        CableDelay.fractionOfUnitInterval(length, vf, rate), rate, 1e12 / rate);
            }
            out.printf(Locale.ROOT, "to align: deskew the longer path by %+.1f ps (or the shorter by %+.1f ps)%n", -ps, ps);
            return 0;
        } catch (IllegalArgumentException e) {
            err.println("cable-delay: " + e.getMessage());
            return 2;
        }
    }
}
