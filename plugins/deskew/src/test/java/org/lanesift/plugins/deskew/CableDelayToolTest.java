package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.Map;
import java.util.ServiceLoader;
import org.junit.jupiter.api.Test;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;

/** The tool through its declaration; the command line itself is tested end to end in dist (ToolCommandsTest). */
class CableDelayToolTest {
    final ByteArrayOutputStream out = new ByteArrayOutputStream();

    String run(Map<String, String> options) {
        CableDelayTool t = new CableDelayTool();
        PrintStream ps = new PrintStream(out, true, StandardCharsets.UTF_8);
        assertEquals(0, t.run(ToolArgs.of(t.spec(), "", options), new ToolConsole(ps, ps, false, false)));
        return out.toString(StandardCharsets.UTF_8);
    }

    /** 10 cm of solid-PE coax (VF 0.66, common practice about 5.05 ns/m) at 200 Mbit/s: about 505 ps, 0.101 UI. */
    @Test
    void printsDelayAndFractionOfUi() {
        String s = run(Map.of("length", "0.10", "bit-rate", "200e6"));
        assertTrue(s.contains("delay 505.4 ps (5.054 ns/m"), s);
        assertTrue(s.contains("0.1011 UI"), s);
        assertTrue(s.contains("-505.4 ps"), s);
    }

    @Test
    void lengthAndRateTakeUnitsAndPrefixes() {
        String plain = run(Map.of("length", "0.1", "bit-rate", "200e6"));
        out.reset();
        assertEquals(plain, run(Map.of("length", "10cm", "bit-rate", "200Mbit/s")));
        out.reset();
        assertEquals(plain, run(Map.of("length", "100mm", "bit-rate", "0.2Gbit/s")));
    }

    @Test
    void badValuesNameTheOptionAndTheRange() {
        CableDelayTool t = new CableDelayTool();
        OptionException e = assertThrows(OptionException.class, () -> ToolArgs.of(t.spec(), "", Map.of("length", "ten")));
        assertEquals("option '--length': expected a number in -10000 to 10000 m, got 'ten'", e.getMessage());
        e = assertThrows(OptionException.class, () -> ToolArgs.of(t.spec(), "", Map.of("length", "1", "velocity-factor", "0")));
        assertEquals("option '--velocity-factor': 0 is outside the allowed range 0.01 to 1", e.getMessage());
        e = assertThrows(OptionException.class, () -> ToolArgs.of(t.spec(), "", Map.of("bit-rate", "1e9")));
        assertEquals("missing required option '--length=METRES'", e.getMessage());
    }

    @Test
    void isFoundThroughServiceLoader() {
        assertTrue(ServiceLoader.load(Tool.class).stream().anyMatch(p -> p.get().name().equals("cable-delay")));
    }
}
