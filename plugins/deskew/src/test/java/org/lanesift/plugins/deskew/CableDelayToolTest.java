package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.ServiceLoader;
import org.junit.jupiter.api.Test;
import org.lanesift.plugin.Tool;

class CableDelayToolTest {
    final ByteArrayOutputStream out = new ByteArrayOutputStream();
    final ByteArrayOutputStream err = new ByteArrayOutputStream();

    int run(String... args) {
        return new CableDelayTool().run(args, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
    }

    /** 10 cm of solid-PE coax (VF 0.66, common practice about 5.05 ns/m) at 200 Mbit/s: about 505 ps, 0.101 UI. */
    @Test
    void printsDelayAndFractionOfUi() {
        assertEquals(0, run("--length", "0.10", "--bit-rate", "200e6"));
        String s = out.toString(StandardCharsets.UTF_8);
        assertTrue(s.contains("delay 505.4 ps (5.054 ns/m"), s);
        assertTrue(s.contains("0.1011 UI"), s);
        assertTrue(s.contains("-505.4 ps"), s);
    }

    @Test
    void badInputExitsWithTwoAndOneLine() {
        assertEquals(2, run("--length", "ten"));
        assertEquals("cable-delay: --length expects a number, got 'ten'", err.toString(StandardCharsets.UTF_8).trim());
        err.reset();
        assertEquals(2, run("--length", "1", "--velocity-factor", "0"));
        assertTrue(err.toString(StandardCharsets.UTF_8).contains("velocity factor must be greater than 0"));
        err.reset();
        assertEquals(2, run("--bit-rate", "1e9"));
        assertTrue(err.toString(StandardCharsets.UTF_8).contains("--length is required"));
    }

    @Test
    void isFoundThroughServiceLoader() {
        assertTrue(ServiceLoader.load(Tool.class).stream().anyMatch(p -> p.get().name().equals("cable-delay")));
    }
}
