package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Set;
import java.util.TreeSet;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.capture.Captures;
import org.lanesift.plugin.InputFormatException;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;

/** Choosing a reader by extension and content, and finding the three readers through ServiceLoader. */
class CapturesTest {
    @Test
    void byExtension() {
        assertEquals("csv", Captures.pluginFor(CsvReaderTest.res("scope-meta.csv")));
        assertEquals("csv", Captures.pluginFor(CsvReaderTest.res("tab-index.tsv")));
        assertEquals("vcd", Captures.pluginFor(CsvReaderTest.res("scopes-and-states.vcd")));
        assertEquals("raw", Captures.pluginFor(BadCaptureTest.DIR.resolve("raw-missing-sidecar.bin")));
    }

    @Test
    void byContent(@TempDir Path dir) throws Exception {
        Path v = dir.resolve("dump.out");
        Files.writeString(v, "\n$timescale 1ns $end\n");
        assertEquals("vcd", Captures.pluginFor(v));
        Path c = dir.resolve("scope.export");
        Files.writeString(c, "t,a\n0,1\n");
        assertEquals("csv", Captures.pluginFor(c));
        Path r = dir.resolve("samples.u16");
        Files.write(r, new byte[] {0, 1, 2, 3});
        Files.writeString(Path.of(r + ".json"), "{}");
        assertEquals("raw", Captures.pluginFor(r));
        Path x = dir.resolve("mystery.xyz");
        Files.write(x, new byte[] {0, 1, 2, 3});
        InputFormatException e = assertThrows(InputFormatException.class, () -> Captures.pluginFor(x));
        assertTrue(e.getMessage().startsWith("mystery.xyz: cannot tell the capture format; known extensions: .csv"), e.getMessage());
        InputFormatException m = assertThrows(InputFormatException.class, () -> Captures.pluginFor(dir.resolve("gone.csv")));
        assertEquals("gone.csv: file not found", m.getMessage());
    }

    @Test
    void readersAreDiscovered() {
        PluginRegistry reg = PluginRegistry.discover(CapturesTest.class.getClassLoader());
        Set<String> ids = new TreeSet<>();
        for (PluginProvider p : reg.all()) {
            ids.add(p.descriptor().id());
        }
        assertTrue(ids.containsAll(Set.of("csv", "vcd", "raw")), "found " + ids);
        for (String id : new String[] {"csv", "vcd", "raw"}) {
            PluginProvider p = reg.find(id);
            assertTrue(p.descriptor().inputs(null).isEmpty(), id + " is a source");
            assertEquals(null, p.descriptor().option("file").defaultValue(), id + ": file is required");
        }
    }
}
