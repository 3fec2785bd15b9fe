package org.lanesift.runner.capture;

import java.util.ArrayList;
import java.util.List;

/**
 * The one command {@code inspect} suggests running next, built from what it found.
 *
 * <p><b>This is the single place where the suggested command line is built</b> (text and
 * {@code --json} member {@code next} both come from {@link #suggest}). A capture with differential
 * pairs and a clock gets {@code lanesift sift}, the one command for the whole job (it finds the
 * pairs, skews and link itself, docs/sift.md); anything else gets {@code lanesift run} with the
 * chain the capture would need, since {@code sift} works on differential pairs only.
 */
public final class NextCommand {
    private NextCommand() {
    }

    /**
     * The suggestion: one command line, then in brackets what the chain it names must hold.
     *
     * @param r what inspect found
     * @return one line, no line break
     */
    public static String suggest(InspectReport r) {
        if (!r.pairs().isEmpty() && !r.clocks().isEmpty()) {
            return "lanesift sift --capture " + quote(r.file()) + " --out " + quote(outFor(r.file()))
                    + "   (finds the pairs, both skews, the unit interval and the link; --map names the pairs if it guesses wrong)";
        }
        String cmd = "lanesift run chain.json --input cap=" + quote(r.file());
        List<String> need = new ArrayList<>();
        need.add("a '" + r.format() + "' source with id 'cap'");
        if (!r.pairs().isEmpty()) {
            List<String> legs = new ArrayList<>();
            for (InspectReport.Pair p : r.pairs()) {
                legs.add(p.first() + "/" + p.second());
            }
            need.add("per pair (" + String.join(", ", legs) + ") a skew-estimate mode=legs, then deskew and a differential receiver");
        }
        if (!r.clocks().isEmpty()) {
            InspectReport.Clock c = r.clocks().get(0);
            need.add("the clock on " + c.channel() + (c.otherLeg() == null ? "" : " & " + c.otherLeg()));
        }
        return cmd + "   (chain.json: " + String.join("; ", need) + "; see docs/chain-file.md)";
    }

    /** A fresh output folder beside the capture: its name without extension, plus "-sift". */
    private static String outFor(String file) {
        String name = java.nio.file.Path.of(file).getFileName().toString();
        int dot = name.lastIndexOf('.');
        return (dot > 0 ? name.substring(0, dot) : name) + "-sift";
    }

    /** Quotes a path for a POSIX shell when it holds anything but safe characters. */
    private static String quote(String s) {
        return s.matches("[A-Za-z0-9_./:@%+=,-]+") ? s : "'" + s.replace("'", "'\\''") + "'";
    }
}
