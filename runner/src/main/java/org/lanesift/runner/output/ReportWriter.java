package org.lanesift.runner.output;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.annotation.Severity;
import org.lanesift.data.DataKind;
import org.lanesift.report.Source;
import org.lanesift.unit.Quantity;

/**
 * Writes {@code report.md}: what ran on which inputs with which options, how it ended, the
 * counts per output, the findings grouped by severity (errors first) and the files written.
 */
public final class ReportWriter {
    private ReportWriter() {
    }

    /**
     * Writes the report into the outputs' directory and lists it among the files.
     *
     * @param run  what ran
     * @param outs the (closed) outputs
     * @return the report file
     * @throws IOException if it cannot be written
     */
    public static Path write(RunSummary run, RunOutputs outs) throws IOException {
        Path file = outs.dir().resolve(RunOutputs.REPORT);
        outs.files().putIfAbsent(RunOutputs.REPORT, file);
        Files.writeString(file, render(run, outs), StandardCharsets.UTF_8);
        return file;
    }

    static String render(RunSummary run, RunOutputs outs) {
        StringBuilder sb = new StringBuilder();
        sb.append("# Lanesift run report\n\n");
        sb.append("- chain: `").append(run.chainFile()).append("`");
        if (!run.description().isBlank()) {
            sb.append(" (").append(oneLine(run.description())).append(")");
        }
        sb.append('\n');
        sb.append("- lanesift ").append(run.version()).append(", started ").append(run.started().truncatedTo(java.time.temporal.ChronoUnit.SECONDS))
                .append(", took ").append(String.format(Locale.ROOT, "%.1f", run.millis() / 1000.0)).append(" s\n");
        sb.append("- status: ").append(oneLine(run.status())).append("\n");
        if (!outs.suspectSkews().isEmpty()) {
            // a decode through a doubtful skew correction is never reported as clean, whatever its counts say
            sb.append("- trust: SUSPECT: the skew of ").append(oneLine(String.join(", ", outs.suspectSkews())))
                    .append(" is not to be trusted; whatever was decoded through it is suspect, however complete it looks\n");
        }
        sb.append('\n');

        sb.append("## Inputs\n\n");
        if (run.inputs().isEmpty()) {
            sb.append("Files as named in the chain file (see the options below).\n");
        } else {
            for (Map.Entry<String, String> e : run.inputs().entrySet()) {
                sb.append("- `").append(e.getKey()).append("` reads `").append(e.getValue()).append("`\n");
            }
        }
        if (!run.sets().isEmpty()) {
            sb.append("\nOptions set on the command line: ");
            sb.append(String.join(", ", run.sets().stream().map(s -> "`" + s + "`").toList())).append('\n');
        }

        sb.append("\n## Instances\n\n| instance | plugin | version | options given | defaults assumed |\n| --- | --- | --- | --- | --- |\n");
        for (RunSummary.Instance i : run.instances()) {
            StringBuilder given = new StringBuilder();
            StringBuilder assumed = new StringBuilder();
            for (Map.Entry<String, String> e : i.options().entrySet()) {
                StringBuilder o = i.given().contains(e.getKey()) ? given : assumed;
                if (o.length() > 0) {
                    o.append(", ");
                }
                o.append(e.getKey()).append('=').append(e.getValue());
            }
            sb.append("| ").append(cell(i.id())).append(" | ").append(cell(i.plugin())).append(" (").append(cell(i.name()))
                    .append(") | ").append(cell(i.version())).append(" | ").append(cell(given.toString())).append(" | ")
                    .append(cell(assumed.toString())).append(" |\n");
        }

        sb.append("\n## Outputs\n\n");
        List<RunOutputs.OutputStats> stats = outs.outputs();
        if (stats.isEmpty()) {
            sb.append("No unwired outputs.\n");
        } else {
            sb.append("| output | kind | blocks | count | span | files |\n| --- | --- | --- | --- | --- | --- |\n");
            for (RunOutputs.OutputStats s : stats) {
                String span = s.blocks() == 0 ? "" : Quantity.format(s.firstFs() * 1e-15, "s") + " to " + Quantity.format(s.lastFs() * 1e-15, "s");
                sb.append("| ").append(cell(s.name())).append(" | ").append(s.kind() == null ? "" : s.kind())
                        .append(" | ").append(s.blocks()).append(" | ").append(s.items()).append(' ').append(unit(s.kind()))
                        .append(" | ").append(span).append(" | ").append(cell(String.join(", ", s.files()))).append(" |\n");
            }
        }
        if (!outs.leftOut().isEmpty() || !outs.selectionText().equals(OutputSelection.of(null, List.of(), List.of()).describe())) {
            sb.append("\nWritten: ").append(outs.selectionText()).append(" (the chain file's `outputs` or `--outputs`).\n");
        }
        if (!outs.leftOut().isEmpty()) {
            sb.append("Left out, not written: ").append(cell(String.join(", ", outs.leftOut()))).append(".\n");
        }

        sb.append("\n## Findings\n\n");
        Map<Severity, Long> counts = outs.severityCounts();
        if (counts.isEmpty()) {
            sb.append("No annotations.\n");
        } else {
            Severity[] order = {Severity.ERROR, Severity.WARNING, Severity.INFO};
            for (Severity sev : order) {
                long n = counts.getOrDefault(sev, 0L);
                if (n == 0) {
                    continue;
                }
                String name = sev.name().toLowerCase(Locale.ROOT);
                sb.append("### ").append(Character.toUpperCase(name.charAt(0))).append(name.substring(1)).append(" (").append(n).append(")\n\n");
                for (Map.Entry<String, Long> e : outs.kindCounts().entrySet()) {
                    if (e.getKey().startsWith(name + " ")) {
                        sb.append("- ").append(e.getKey().substring(name.length() + 1)).append(": ").append(e.getValue()).append('\n');
                    }
                }
                List<String> ex = outs.examples().getOrDefault(sev, List.of());
                sb.append("\nFirst ").append(ex.size()).append(":\n\n");
                for (String line : ex) {
                    sb.append("- ").append(oneLine(line)).append('\n');
                }
                sb.append('\n');
            }
            sb.append("All annotations: `").append(RunOutputs.ANNOTATIONS).append("`.\n");
        }

        sources(sb, outs);

        sb.append("\n## Files written\n\n");
        for (Map.Entry<String, Path> e : outs.files().entrySet()) {
            sb.append("- `").append(e.getKey()).append('`');
            if (!e.getKey().equals(RunOutputs.REPORT)) {
                try {
                    sb.append(" (").append(Files.size(e.getValue())).append(" bytes)");
                } catch (IOException ignored) {
                    sb.append(" (not written)");
                }
            }
            sb.append('\n');
        }
        if (!run.stale().isEmpty()) {
            sb.append("\n## Stale files\n\n");
            sb.append("Left in the output folder by an earlier run and not written by this one (kept, not removed; "
                    + "see docs/outputs.md):\n\n");
            for (String n : run.stale()) {
                sb.append("- `").append(oneLine(n)).append("`\n");
            }
        }
        return sb.toString();
    }

    private static String unit(DataKind k) {
        if (k == null) {
            return "";
        }
        return switch (k) {
            case ANALOG, LOGIC -> "samples";
            case EDGES -> "transitions";
            case BITS -> "bits";
            case WORDS -> "words";
            case FRAME -> "frames";
            case ARTIFACT -> "bytes";
            case ANY -> "";
        };
    }

    private static String oneLine(String s) {
        return s.replace('\r', ' ').replace('\n', ' ');
    }

    /**
     * Where the values of the run come from: measured from the capture, given by the user, assumed
     * by default, or limits from a standard (cited with its docs/reference-facts.md anchor).
     */
    private static void sources(StringBuilder sb, RunOutputs outs) {
        sb.append("\n## Where the values come from\n\n");
        sb.append("- each finding above ends with the source of its numbers in brackets; each value in the JSON reports"
                + " carries its own `source` (measured, standard, derived, given or assumed by default)\n");
        sb.append("- given: the options under \"options given\" (chain file or `--set`)\n");
        sb.append("- assumed: the options under \"defaults assumed\" are the plugins' defaults; check that they fit the setup\n");
        Map<String, Long> cited = outs.citedSources();
        if (cited.isEmpty()) {
            sb.append("- standard: no finding was checked against a published limit\n");
        } else {
            sb.append("- standard: limits the findings were checked against (field `source` of each finding):\n");
            for (Map.Entry<String, Long> e : cited.entrySet()) {
                String reference = e.getKey().startsWith(Source.Kind.STANDARD.word() + ": ")
                        ? e.getKey().substring(Source.Kind.STANDARD.word().length() + 2) : e.getKey();
                sb.append("  - ").append(oneLine(reference)).append(": ").append(e.getValue())
                        .append(e.getValue() == 1 ? " finding" : " findings").append('\n');
            }
        }
    }

    private static String cell(String s) {
        return oneLine(s).replace("|", "\\|");
    }
}
