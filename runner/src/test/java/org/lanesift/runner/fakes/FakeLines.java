package org.lanesift.runner.fakes;

import java.io.BufferedReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.lanesift.data.BitSets;
import org.lanesift.data.DataKind;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.runner.capture.CaptureFormatException;

/**
 * Test-only file source: each line of a text file is one logic block of '0', '1' and 'x'
 * (unknown) samples at 1 ns. A line with another character fails with a
 * {@link CaptureFormatException} naming the file and line.
 */
public final class FakeLines implements PluginProvider {
    static final PluginDescriptor D = PluginDescriptor.builder("fake-lines").name("Fake line reader")
            .option(OptionSpec.text("file", null, "the text file"))
            .output(PortSpec.of("out", DataKind.LOGIC, "levels"))
            .build();

    @Override
    public PluginDescriptor descriptor() {
        return D;
    }

    @Override
    public Stage open(StageContext ctx) throws Exception {
        Path file = Path.of(ctx.options().getString("file"));
        BufferedReader r = Files.newBufferedReader(file, StandardCharsets.UTF_8);
        return new Stage() {
            long line;
            long index;

            @Override
            public boolean produce() throws Exception {
                String s = r.readLine();
                if (s == null) {
                    return false;
                }
                line++;
                int n = s.length();
                long[] bits = new long[BitSets.words(n)];
                long[] inv = new long[BitSets.words(n)];
                for (int i = 0; i < n; i++) {
                    char c = s.charAt(i);
                    if (c == '1') {
                        BitSets.set(bits, i, true);
                    } else if (c == 'x') {
                        BitSets.set(inv, i, true);
                    } else if (c != '0') {
                        throw new CaptureFormatException(file, line, "expected 0, 1 or x, found '" + c + "' at column " + (i + 1));
                    }
                }
                ctx.emit(0, new LogicBlock("lines", index, index * 1_000_000L, 1e6, bits, n, inv));
                index += n;
                return true;
            }

            @Override
            public void close() {
                try {
                    r.close();
                } catch (java.io.IOException ignored) {
                    // test source
                }
            }
        };
    }
}
