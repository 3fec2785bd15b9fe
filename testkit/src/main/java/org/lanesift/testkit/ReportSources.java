package org.lanesift.testkit;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;

/**
 * Finds the values of JSON reports that do not say where they come from (issue 17 item 8), and
 * the docs/reference-facts.md anchors a run's outputs cite.
 *
 * <p>A member needs a source, that is the host-api {@code Sourced} shape
 * {@code {"value": ..., "unit": ..., "source": "..."}}, when all of these hold:
 * <ul>
 * <li>it is a member of an object that is not inside an array: arrays hold data series (histogram
 * counts, bathtub points, the rows of windows, fits, frames, packets and commands), whose
 * provenance is that of the report and whose summary values are the sourced headline members;</li>
 * <li>its value is a number or null (a measurement that could not be made is still a measurement);</li>
 * <li>its name says it is a quantity: it ends in a unit, camel-case ({@code thresholdVolts},
 * {@code eyeWidthPs}, {@code ringHz}, {@code phaseUI}, {@code overshootPercent}; see
 * {@link #UNIT}), or it is one of the dimensionless measures in {@link #MEASURES}.</li>
 * </ul>
 * Exempt, because they are not measurements or limits: times and places in the capture of what was
 * found (names starting {@code start}, {@code end}, {@code time}, {@code first} or {@code last}
 * before a capital: where, not how much); counts, indices and versions (no unit in the name:
 * {@code edges}, {@code samples}, {@code count}, {@code index}); the members of a statistics block
 * ({@code count}, {@code mean}, {@code std}, {@code min}, {@code max}, {@code p50} with the block's
 * {@code unit}: a distribution, like an array); text, booleans and enumerations.
 */
public final class ReportSources {
    /** Unit suffixes of quantity names, after a lower-case letter or digit. */
    static final Pattern UNIT = Pattern.compile(
            ".*[a-z0-9](Volts|Mv|V|Ps|Fs|Ns|Us|Ms|S|Hz|Ui|UI|Percent|Pct|Nh|H|Mm|Pf|Ohms|Db|Watts|Amps)");
    /** Dimensionless measures and limits that have no unit to name. */
    static final Set<String> MEASURES = Set.of("confidence", "dampingRatio", "q", "rSquared", "duty", "ber", "transitionDensity",
            "diracWeight", "qOfBer");
    private static final Pattern PLACE = Pattern.compile("(start|end|time|first|last)[A-Z].*");
    private static final Pattern CITE = Pattern.compile("reference-facts\\.md#([a-z0-9-]+)");

    private ReportSources() {
    }

    /**
     * @param name a member name
     * @return whether a number under that name is a measurement or a limit that needs a source
     */
    public static boolean needsSource(String name) {
        return !PLACE.matcher(name).matches() && (UNIT.matcher(name).matches() || MEASURES.contains(name));
    }

    /**
     * The members of a parsed report that need a source and have none.
     *
     * @param root the report
     * @return their RFC 6901 pointers, in document order
     */
    public static List<String> unsourced(JsonValue root) {
        List<String> out = new ArrayList<>();
        for (JsonScan.Member m : JsonScan.members(root)) {
            // the member "value" of a value with its source needs none itself: it is not a quantity name
            if ((m.value().isNumber() || m.value().isNull()) && needsSource(m.name()) && !inArray(root, m.pointer())) {
                out.add(m.pointer());
            }
        }
        return out;
    }

    /** Whether a member lies inside an array (a data series), from its RFC 6901 pointer. */
    private static boolean inArray(JsonValue root, String pointer) {
        JsonValue v = root;
        String[] parts = pointer.substring(1).split("/", -1);
        for (int i = 0; i < parts.length - 1; i++) {
            if (v.isArray()) {
                return true;
            }
            v = v.get(parts[i].replace("~1", "/").replace("~0", "~"));
        }
        return v.isArray();
    }

    /**
     * Every JSON report under a run's output folder with the members that lack a source: each
     * {@code .json} file, except the inputs a demo or suite writes beside its outputs (files under a
     * folder named {@code chains} or {@code captures}).
     *
     * @param dir the output folder
     * @return "file: pointer" lines, sorted; empty when every value has a source
     * @throws IOException if a file cannot be read
     */
    public static List<String> unsourcedIn(Path dir) throws IOException {
        List<String> out = new ArrayList<>();
        for (Path f : reports(dir)) {
            String rel = dir.relativize(f).toString().replace('\\', '/');
            for (String p : unsourced(JsonReader.read(f, rel))) {
                out.add(rel + ": " + p);
            }
        }
        return out;
    }

    /**
     * @param dir a run's or the demo's output folder
     * @return its JSON reports, sorted
     * @throws IOException if the folder cannot be walked
     */
    public static List<Path> reports(Path dir) throws IOException {
        try (Stream<Path> s = Files.walk(dir)) {
            return s.filter(f -> Files.isRegularFile(f) && f.getFileName().toString().endsWith(".json"))
                    .filter(f -> !isInput(dir.relativize(f))).sorted().toList();
        }
    }

    private static boolean isInput(Path rel) {
        for (Path part : rel) {
            if (part.toString().equals("chains") || part.toString().equals("captures")) {
                return true;
            }
        }
        return false;
    }

    /**
     * The docs/reference-facts.md anchors cited by the reports and report.md files under a folder.
     *
     * @param dir the output folder
     * @return the anchors, sorted
     * @throws IOException if a file cannot be read
     */
    public static Set<String> citedAnchors(Path dir) throws IOException {
        Set<String> out = new TreeSet<>();
        List<Path> files = new ArrayList<>(reports(dir));
        try (Stream<Path> s = Files.walk(dir)) {
            s.filter(f -> f.getFileName().toString().equals("report.md") || f.getFileName().toString().endsWith(".jsonl"))
                    .forEach(files::add);
        }
        for (Path f : files) {
            Matcher m = CITE.matcher(Files.readString(f, StandardCharsets.UTF_8));
            while (m.find()) {
                out.add(m.group(1));
            }
        }
        return out;
    }
}
