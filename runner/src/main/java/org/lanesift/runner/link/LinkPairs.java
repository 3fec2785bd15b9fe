package org.lanesift.runner.link;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.lanesift.plugin.InputFormatException;
import org.lanesift.plugin.OptionException;
import org.lanesift.runner.capture.InspectReport;

/**
 * Which capture channels form which pair, and which pair is the clock: from a channel map given
 * by the user ({@code --map} and/or {@code --map-file}), or found in what {@code inspect} reports
 * (its anti-correlated pairs and regular clocks). A channel map lists one pair per entry as
 * {@code NAME=P,N}; the first entry is the clock pair, the others are the data lanes in lane order.
 */
public final class LinkPairs {
    private LinkPairs() {
    }

    /**
     * Parses {@code --map} text: entries separated by spaces or semicolons.
     *
     * @param text  the option's value
     * @param known the capture's channel names
     * @return the pairs in the order given
     * @throws OptionException naming the entry and what was expected
     */
    public static List<LinkChains.Pair> parseOption(String text, Set<String> known) {
        List<LinkChains.Pair> out = new ArrayList<>();
        for (String entry : text.trim().split("[;\\s]+")) {
            if (entry.isEmpty()) {
                continue;
            }
            String problem = problem(entry, known, out);
            if (problem != null) {
                throw new OptionException("map", "--map " + entry + ": " + problem);
            }
            out.add(pair(entry));
        }
        return out;
    }

    /**
     * Reads a map file: one {@code NAME=P,N} per line, blank lines and {@code #} comments ignored.
     *
     * @param file  the map file
     * @param known the capture's channel names
     * @param into  the pairs given so far (by {@code --map}); the file's are added after them
     * @throws InputFormatException naming the file and line
     */
    public static void parseFile(Path file, Set<String> known, List<LinkChains.Pair> into) {
        List<String> lines;
        try {
            byte[] b = org.lanesift.plugin.InputFiles.readAtMost(file, file.toString(), 1 << 20);
            if (b.length > 1 << 20) {
                throw new InputFormatException(file + ": more than 1 MiB; expected a channel map of NAME=P,N lines");
            }
            lines = new String(b, StandardCharsets.UTF_8).lines().toList();
        } catch (IOException e) {
            throw new InputFormatException(file + ": cannot read the channel map (expected a text file of NAME=P,N lines): "
                    + e.getMessage(), e);
        }
        for (int i = 0; i < lines.size(); i++) {
            String line = lines.get(i).replaceAll("#.*", "").trim();
            if (line.isEmpty()) {
                continue;
            }
            String problem = problem(line, known, into);
            if (problem != null) {
                throw new InputFormatException(file + ":" + (i + 1) + ": " + problem);
            }
            into.add(pair(line));
        }
    }

    private static LinkChains.Pair pair(String entry) {
        int eq = entry.indexOf('=');
        String[] legs = entry.substring(eq + 1).split(",");
        return new LinkChains.Pair(entry.substring(0, eq).trim(), legs[0].trim(), legs.length > 1 ? legs[1].trim() : "");
    }

    /** What is wrong with one entry, or null. */
    private static String problem(String entry, Set<String> known, List<LinkChains.Pair> before) {
        int eq = entry.indexOf('=');
        String[] legs = eq < 0 ? new String[0] : entry.substring(eq + 1).split(",", -1);
        if (eq <= 0 || legs.length < 1 || legs.length > 2 || legs[0].isBlank() || (legs.length == 2 && legs[1].isBlank())) {
            return "expected NAME=P,N (a pair name, then the P and N channels), such as CLK=CH1,CH2, or NAME=CH for one"
                    + " channel of a logic capture";
        }
        String name = entry.substring(0, eq).trim();
        if (!name.matches("[A-Za-z][A-Za-z0-9_]*")) {
            return "pair name '" + name + "': expected a letter, then letters, digits or '_'";
        }
        for (String leg : legs) {
            if (!known.contains(leg.trim())) {
                return "no channel '" + leg.trim() + "' in the capture (it has " + String.join(", ", known) + ")";
            }
        }
        for (LinkChains.Pair p : before) {
            if (p.name().equals(name)) {
                return "pair name '" + name + "' given twice";
            }
            for (String leg : legs) {
                if (p.p().equals(leg.trim()) || p.n().equals(leg.trim())) {
                    return "channel '" + leg.trim() + "' is already in pair " + p.name();
                }
            }
        }
        return null;
    }

    /**
     * The lanes of a logic capture (every channel one bit, no legs): the clock is the slowest
     * regular clock inspect found (a 7:1 link's clock is its slowest periodic signal; a bit clock,
     * if captured, is faster), the data lanes are the other channels that are not clocks, in name
     * order. Each lane is a {@link LinkChains.Pair} with an empty N channel.
     *
     * @param r the inspect report of a logic capture
     * @return the clock lane first, then the data lanes
     * @throws InputFormatException when there is no clock or no data lane
     */
    public static List<LinkChains.Pair> findLogic(InspectReport r) {
        InspectReport.Clock clock = r.clocks().stream().min(Comparator.comparingDouble(InspectReport.Clock::frequencyHz)).orElse(null);
        if (clock == null) {
            throw new InputFormatException(r.file() + ": found no channel that carries a regular clock; give the lanes with"
                    + " --map CLK=CH D0=CH ... or --map-file");
        }
        Set<String> clocks = new HashSet<>();
        r.clocks().forEach(c -> clocks.add(c.channel()));
        List<LinkChains.Pair> out = new ArrayList<>();
        out.add(new LinkChains.Pair(clock.channel(), clock.channel(), ""));
        r.channels().stream().map(InspectReport.Channel::name).filter(n -> !clocks.contains(n)).sorted()
                .forEach(n -> out.add(new LinkChains.Pair(n, n, "")));
        if (out.size() < 2) {
            throw new InputFormatException(r.file() + ": found the clock " + clock.channel() + " but no data lane; give the"
                    + " lanes with --map CLK=CH D0=CH ... or --map-file");
        }
        return out;
    }

    /**
     * Finds the pairs in an inspect report: the pairs inspect found (anti-correlated levels or, for
     * data lanes that idle in single-ended low-power states, anti-correlated steps); the pair
     * holding the steadiest clock comes first, the others follow in name order.
     *
     * @param r the inspect report of the capture
     * @return the clock pair first, then the data pairs
     * @throws InputFormatException when no clock pair or no data pair is found
     */
    public static List<LinkChains.Pair> find(InspectReport r) {
        List<LinkChains.Pair> pairs = new ArrayList<>();
        Set<String> used = new HashSet<>();
        for (InspectReport.Pair p : r.pairs()) {
            if (used.add(p.first()) && used.add(p.second())) {
                pairs.add(oriented(p.first(), p.second()));
            }
        }
        InspectReport.Clock clock = r.clocks().stream().min(Comparator.comparingDouble(InspectReport.Clock::periodCv)).orElse(null);
        LinkChains.Pair clk = clock == null ? null : pairs.stream()
                .filter(p -> p.p().equals(clock.channel()) || p.n().equals(clock.channel())).findFirst().orElse(null);
        if (clk == null) {
            throw new InputFormatException(r.file() + ": found no differential pair that carries a regular clock (pairs: "
                    + pairs + "; clocks: " + r.clocks().stream().map(InspectReport.Clock::channel).toList()
                    + "); give the channels with --map CLK=P,N D0=P,N ... or --map-file");
        }
        List<LinkChains.Pair> data = new ArrayList<>(pairs);
        data.remove(clk);
        if (data.isEmpty()) {
            throw new InputFormatException(r.file() + ": found the clock pair " + clk.name()
                    + " but no data pair; give the channels with --map CLK=P,N D0=P,N ... or --map-file");
        }
        data.sort(Comparator.comparing(LinkChains.Pair::name));
        List<LinkChains.Pair> out = new ArrayList<>();
        out.add(clk);
        out.addAll(data);
        return out;
    }

    /** The name without a P/N ending ("D0_P" -> "D0"), or null when it has none. */
    static String stem(String name) {
        String u = name.toUpperCase(java.util.Locale.ROOT);
        for (String end : new String[] {"_P", "_N", "-P", "-N", "+", "-", "P", "N"}) {
            if (u.endsWith(end) && u.length() > end.length()) {
                String s = name.substring(0, name.length() - end.length());
                return s.endsWith("_") || s.endsWith("-") ? s.substring(0, s.length() - 1) : s;
            }
        }
        return null;
    }

    private static boolean isN(String name) {
        String u = name.toUpperCase(java.util.Locale.ROOT);
        return u.endsWith("N") || u.endsWith("-");
    }

    /** P first when the names say which is which, else in the order found; the pair is named after the stem. */
    private static LinkChains.Pair oriented(String a, String b) {
        String p = isN(a) && !isN(b) ? b : a;
        String n = p.equals(a) ? b : a;
        String stem = stem(p);
        String name = stem != null && stem.equals(stem(n)) && stem.matches("[A-Za-z][A-Za-z0-9_]*") ? stem
                : (p + "_" + n).replaceAll("[^A-Za-z0-9_]", "_");
        return new LinkChains.Pair(name, p, n);
    }
}
