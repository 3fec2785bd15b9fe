package org.lanesift.runner;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code lanesift inspect FILE}: summarises a capture file channel by channel. */
@Command(name = "inspect", mixinStandardHelpOptions = true, versionProvider = Version.class, sortOptions = false,
        description = {"Summarises a capture (CSV, VCD or raw binary with a JSON sidecar): for each channel its kind, "
                + "sample or edge count, duration, levels, edges at an automatic threshold and fundamental frequency; "
                + "then likely differential pairs and clocks."})
final class InspectCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "FILE", description = "The capture file.")
    Path file;

    @Option(names = "--json", description = "Print one JSON object instead of text (see docs/cli-json.md).")
    boolean json;

    @Option(names = "--rate", paramLabel = "HZ",
            description = "Sample rate for captures that give sample indices instead of times, in Hz (e.g. 2.5e9).")
    String rate;

    private final Main.Host host;

    InspectCommand(Main.Host host) {
        this.host = host;
    }

    @Override
    public Integer call() {
        if (!Files.exists(file)) {
            throw new CliError(file + ": no such file (expected a capture: .csv, .vcd or raw binary with a .json sidecar)");
        }
        if (Files.isDirectory(file)) {
            throw new CliError(file + ": is a directory (expected a capture file)");
        }
        Map<String, String> options = new LinkedHashMap<>();
        if (rate != null) {
            double hz;
            try {
                hz = Double.parseDouble(rate.trim());
            } catch (NumberFormatException e) {
                throw new CliError("--rate " + rate + ": expected a sample rate in Hz, such as 2.5e9");
            }
            if (!(hz > 0) || Double.isInfinite(hz)) {
                throw new CliError("--rate " + rate + ": expected a positive sample rate in Hz");
            }
            options.put("rate", rate.trim());
        }
        String text = Inspection.inspect(file, options, json);
        host.out.print(text.endsWith("\n") ? text : text + "\n");
        host.out.flush();
        return 0;
    }
}
