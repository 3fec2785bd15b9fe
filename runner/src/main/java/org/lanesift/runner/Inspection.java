package org.lanesift.runner;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;
import org.lanesift.capture.Captures;
import org.lanesift.runner.capture.InspectReport;
import org.lanesift.runner.capture.Inspector;

/**
 * Connects {@code inspect} to the capture readers' analysis ({@link Inspector}). The command's
 * {@code rate} option goes to the reader option that holds a sample rate: {@code rateHz} for CSV
 * (sample-index columns), {@code realRateHz} for VCD (real variables); raw captures take their
 * rate from the sidecar.
 */
final class Inspection {

    private Inspection() {
    }

    /**
     * Summarises a capture for {@code inspect}.
     *
     * @param file    the capture
     * @param options command options ({@code rate})
     * @param json    true for the JSON form
     * @return the summary
     */
    static String inspect(Path file, Map<String, String> options, boolean json) {
        Map<String, String> o = new LinkedHashMap<>();
        String rate = options.get("rate");
        if (rate != null) {
            String plugin = Captures.pluginFor(file);
            switch (plugin) {
                case "csv" -> o.put("rateHz", rate);
                case "vcd" -> o.put("realRateHz", rate);
                default -> throw new CliError("--rate " + rate + ": " + file + " is a " + plugin
                        + " capture, which takes its sample rate from its JSON sidecar");
            }
        }
        InspectReport r = Inspector.inspect(file, o);
        return json ? r.toJson() : r.toText();
    }
}
