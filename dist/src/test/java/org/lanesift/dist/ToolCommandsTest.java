package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;
import org.lanesift.runner.Main;

/** Every command, built-in or contributed by a module, through the one command line of the shaded distribution. */
class ToolCommandsTest {
    record Run(int code, String out, String err) {
        List<String> errLines() {
            return err.lines().toList();
        }
    }

    static Run run(String... args) {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        ByteArrayOutputStream e = new ByteArrayOutputStream();
        int code = Main.run(args, new PrintStream(o, true, StandardCharsets.UTF_8), new PrintStream(e, true, StandardCharsets.UTF_8));
        return new Run(code, o.toString(StandardCharsets.UTF_8), e.toString(StandardCharsets.UTF_8));
    }

    /**
     * {@code plugins} shows which bit inputs read no per-bit margins (host-api
     * {@code PortSpec.readsBitMargins}): pixel-link's lanes say so, dual-edge's outputs and
     * packet-link's lanes with line states (its default) do not.
     */
    @Test
    void pluginsShowWhichBitInputsReadNoMargins() throws Exception {
        Run text = run("plugins");
        assertEquals(0, text.code(), text::toString);
        String pixel = text.out().substring(text.out().indexOf("\npixel-link "));
        String pixelInputs = pixel.lines().filter(l -> l.startsWith("  inputs:")).findFirst().orElseThrow();
        assertTrue(pixelInputs.contains("(BITS, reads no bit margins)"), pixelInputs);
        Run json = run("plugins", "--json");
        assertEquals(0, json.code(), json::toString);
        boolean seenPixel = false;
        for (org.lanesift.json.JsonValue p : org.lanesift.json.JsonReader.parse("plugins --json", json.out()).get("plugins").elements()) {
            String id = p.get("id").asString();
            if (id.equals("pixel-link")) {
                seenPixel = true;
                assertEquals(false, p.at("/inputs/0/readsBitMargins").asBoolean(), p::toString);
            } else if (id.equals("dual-edge")) {
                assertEquals(true, p.at("/outputs/0/readsBitMargins").asBoolean(), "the default of a port: " + p);
                assertEquals("EDGES", p.at("/inputs/0/kind").asString(), p::toString);
                assertEquals(null, p.at("/inputs/0").get("readsBitMargins"), "only bit ports carry it: " + p);
            }
        }
        assertTrue(seenPixel, json::toString);
    }

    @ParameterizedTest
    @ValueSource(strings = {"run", "plugins", "inspect", "probe", "probe divider", "probe rise", "probe lead", "cable-delay",
        "capture", "simulate-device", "live", "demo", "bench", "view"})
    void everyCommandAnswersHelpWithExitZero(String command) {
        String[] words = command.split(" ");
        String[] args = java.util.Arrays.copyOf(words, words.length + 1);
        args[words.length] = "--help";
        Run r = run(args);
        assertEquals(0, r.code(), r::toString);
        assertTrue(r.out().startsWith("Usage: lanesift " + command), r::toString);
        assertEquals("", r.err());
    }

    /**
     * A '%' in an option's help is shown as written: the help library reads descriptions as format
     * strings, and an unescaped one made it print a warning on the process's error stream.
     */
    @Test
    void aPercentSignInHelpIsShownAsWritten() {
        PrintStream saved = System.err;
        ByteArrayOutputStream stray = new ByteArrayOutputStream();
        Run r;
        try {
            System.setErr(new PrintStream(stray, true, StandardCharsets.UTF_8));
            r = run("probe", "rise", "--help");
        } finally {
            System.setErr(saved);
        }
        assertEquals(0, r.code(), r::toString);
        assertTrue(r.out().contains("10-90 % rise time"), r::toString);
        assertFalse(r.out().contains("%%"), r::toString);
        assertEquals("", stray.toString(StandardCharsets.UTF_8));
    }

    @Test
    void globalSwitchesWorkAfterAContributedCommandsOptions() {
        Run plain = run("cable-delay", "--length", "0.1");
        Run debug = run("cable-delay", "--length", "0.1", "--debug");
        Run quiet = run("cable-delay", "--length", "0.1", "--quiet");
        assertEquals(0, plain.code(), plain::toString);
        assertEquals(0, debug.code(), debug::toString);
        assertEquals(0, quiet.code(), quiet::toString);
        assertTrue(plain.out().startsWith("delay 505.4 ps"), plain::toString);
        assertEquals(plain.out(), debug.out());
        assertEquals(plain.out(), quiet.out());
        Run probe = run("probe", "rise", "--bandwidth", "500MHz", "--quiet");
        assertEquals(0, probe.code(), probe::toString);
        assertTrue(probe.out().contains("700 ps"), probe::toString);
        Run probeDebug = run("--debug", "probe", "lead", "--length", "10cm", "--debug");
        assertEquals(0, probeDebug.code(), probeDebug::toString);
    }

    @Test
    void unitsAndPrefixesAreTakenEverywhere() {
        Run metres = run("cable-delay", "--length", "0.1", "--bit-rate", "200e6");
        for (String[] same : List.of(new String[] {"--length", "10cm", "--bit-rate", "200Mbit/s"},
                new String[] {"--length", "100mm", "--bit-rate", "0.2Gbit/s"}, new String[] {"--length=0.1m", "--bit-rate=200e6"})) {
            String[] args = new String[same.length + 1];
            args[0] = "cable-delay";
            System.arraycopy(same, 0, args, 1, same.length);
            Run r = run(args);
            assertEquals(0, r.code(), r::toString);
            assertEquals(metres.out(), r.out(), String.join(" ", args));
        }
        // micro in its three spellings: u, U+00B5 (micro sign), U+03BC (Greek mu)
        Run u = run("probe", "rise", "--bandwidth", "500MHz", "--measured", "0.001us");
        for (String mu : List.of("0.001\u00b5s", "0.001\u03bcs")) {
            Run r = run("probe", "rise", "--bandwidth", "500MHz", "--measured", mu);
            assertEquals(0, r.code(), r::toString);
            assertEquals(u.out(), r.out());
        }
    }

    @Test
    void aBadValueIsOneLineNamingTheOptionWithExitTwoForEveryCommand() {
        Run builtIn = run("run", "x.json", "--jobs", "many");
        Run contributed = run("cable-delay", "--length", "ten");
        Run nested = run("probe", "lead", "--length", "far");
        Run capture = run("capture", "--simulate", "--channels", "9");
        for (Run r : List.of(builtIn, contributed, nested, capture)) {
            assertEquals(2, r.code(), r::toString);
            assertEquals(1, r.errLines().size(), r::toString);
            assertEquals("", r.out(), r::toString);
        }
        // the same shape: "lanesift COMMAND: Invalid value for option '--NAME': WHAT (see: lanesift COMMAND --help)"
        String shape = "lanesift [a-z -]+: Invalid value for option '--[a-z-]+': .+ \\(see: lanesift [a-z -]+ --help\\)";
        for (Run r : List.of(builtIn, contributed, nested, capture)) {
            assertTrue(r.errLines().get(0).matches(shape), r::toString);
        }
        assertEquals("lanesift cable-delay: Invalid value for option '--length': expected a number in -10000 to 10000 m, got 'ten'"
                + " (see: lanesift cable-delay --help)", contributed.errLines().get(0));
        assertEquals("lanesift capture: Invalid value for option '--channels': 9 is outside the allowed range 1 to 8"
                + " (see: lanesift capture --help)", capture.errLines().get(0));
    }

    @Test
    void missingValuesUnknownOptionsAndMissingSubcommandsAreOneLine() {
        for (String[] args : List.of(new String[] {"cable-delay", "--length"}, new String[] {"cable-delay", "--length", "1", "--colour", "red"},
                new String[] {"probe"}, new String[] {"probe", "nope"}, new String[] {"probe", "rise"}, new String[] {"demo", "--frobnicate"},
                new String[] {"bench", "--samples", "12"}, new String[] {"simulate-device", "--mb", "1"})) {
            Run r = run(args);
            assertEquals(2, r.code(), () -> String.join(" ", args) + ": " + r);
            assertEquals(1, r.errLines().size(), r::toString);
            assertTrue(r.errLines().get(0).startsWith("lanesift "), r::toString);
        }
        assertEquals(List.of("lanesift probe: missing subcommand: expected one of divider, rise, lead (see: lanesift probe --help)"),
                run("probe").errLines());
        assertEquals(List.of("lanesift probe divider: divider: give exactly one of --ratio N or --resistor OHMS"
                + " (see: lanesift probe divider --help)"), run("probe", "divider", "--level", "1").errLines());
    }
}
