package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.Path;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Source plugin {@code csv}: a CSV capture as exported by scopes and analysers, one ANALOG output
 * per channel column, in volts. The file is streamed in spans of {@code blockSamples} rows; the
 * format rules are in docs/capture-csv.md.
 */
public final class CsvSource implements PluginProvider {
    static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("csv")
            .name("CSV capture")
            .description("Reads a CSV capture (optional metadata lines, a header with units such as 'CH2 (V)' or 'mV',"
                    + " a time column in seconds or a sample-index column, ',', ';' or tab separators, decimal comma)."
                    + " One analog output per channel column, in volts.")
            .option(OptionSpec.text("file", null, "path of the CSV file"))
            .option(OptionSpec.integer("blockSamples", 65536L, 1, 1 << 24, "rows per block (per channel)"))
            .option(OptionSpec.number("rateHz", "Hz", 0.0, 0.0, 1e15,
                    "sample rate; needed with a sample-index column or without a time column; 0 = from the time column"))
            .option(OptionSpec.choice("separator", "auto", "field separator: auto, ',', ';', tab ('\\t' or 'tab')",
                    "auto", ",", ";", "\t", "tab"))
            .option(OptionSpec.choice("decimalComma", "auto", "whether numbers use a decimal comma: auto, true or false",
                    "auto", "true", "false"))
            .outputs(CsvSource::ports)
            .build();

    /** For the ServiceLoader. */
    public CsvSource() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) throws IOException {
        return new ReaderStage(reader(context.options()), context);
    }

    static CsvLayout layout(OptionValues o) {
        String sep = o.getString("separator");
        if (sep.equals("tab")) {
            sep = "\t";
        }
        return CsvLayout.sniff(Path.of(o.getString("file")), sep, o.getString("decimalComma"));
    }

    static CsvReader reader(OptionValues o) throws IOException {
        return new CsvReader(layout(o), o.getDouble("rateHz"), o.getInt("blockSamples"));
    }

    private static java.util.List<org.lanesift.plugin.PortSpec> ports(OptionValues o) {
        CsvLayout l = layout(o);
        java.util.List<org.lanesift.plugin.PortSpec> out = new java.util.ArrayList<>();
        for (int k = 0; k < l.ports.length; k++) {
            out.add(org.lanesift.plugin.PortSpec.of(l.ports[k], org.lanesift.data.DataKind.ANALOG,
                    "column '" + l.channelNames[k] + "' in " + l.units[k] + " (" + l.fileUnits[k] + ")"));
        }
        return out;
    }
}
