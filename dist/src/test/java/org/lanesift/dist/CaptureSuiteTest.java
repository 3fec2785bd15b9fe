package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.time.Duration;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.json.JsonWriter;
import org.lanesift.testkit.ExternalTool;
import org.lanesift.testkit.ReportSources;

/**
 * The clean-capture and fault suite, from sources outside the project, through the command line
 * ({@code lanesift run}) and every plugin of the chain:
 * <ul>
 * <li>a 7:1 serialiser written in Verilog (the pixel-link module's test bench) simulated with
 * Icarus Verilog (Debian package {@code iverilog}), read as a VCD logic capture: dual-edge
 * (multiplied), pixel-link and jitter;</li>
 * <li>a DDR link written in Verilog (src/test/verilog/ddr_tx.v: two lanes, sync byte B8, bytes
 * LSB first, clock edges centred on the bits) simulated with Icarus Verilog: dual-edge (ddr),
 * packet-link (framed profile) and jitter;</li>
 * <li>an LVDS-like current-mode driver (3.5 mA into 100 ohm, common mode 1.2 V;
 * docs/reference-facts.md#lvds-electrical-levels, ANSI/TIA/EIA-644-A) simulated with ngspice
 * (Debian package {@code ngspice}, netlist src/test/spice/lvds-driver.cir) sending a 7:1 clock
 * lane: differential (level checks, leg-swap check) and jitter.</li>
 * </ul>
 * A clean capture gives no warning and no error; each injected fault gives its finding exactly
 * once, at the time it was injected, and no other warning or error ({@link #only}): what it causes
 * further down (frames or lines it breaks, bits it makes suspect) is information referring to that
 * one finding, and every such reference names a finding that was made ({@link #referencesResolve}).
 * Each case prints one line of the suite table
 * ({@code suite | case | expected finding | count | time of the finding | other findings}).
 */
class CaptureSuiteTest {
    /** The Verilog test bench's bit period: 1 ns, timescale 1 ps (7 ns pixel clock). */
    static final long UI_PS = 1000;

    /** The Verilog DDR link's unit interval: 2 ns (timescale 1 ps). */
    static final long DDR_UI_PS = 2000;

    @TempDir
    static Path tmp;
    static Path cleanVcd;
    static Path ddrVcd;

    /** A non-information finding: kind, severity, start (fs), label and the instance that made it. */
    record Finding(String kind, String severity, long startFs, String label, String source) {
    }

    @BeforeAll
    static void simulateSerialiser() throws Exception {
        Path iverilog = ExternalTool.require("iverilog");
        Path vvp = ExternalTool.require("vvp");
        Path src = Path.of("..", "plugins", "pixel-link", "src", "test", "verilog").toAbsolutePath().normalize();
        StringBuilder hex = new StringBuilder();
        Random r = new Random(20261203);
        for (int i = 0; i < 16 * 8; i++) {
            hex.append(String.format("%06x%n", r.nextInt(1 << 24)));
        }
        Files.writeString(tmp.resolve("image.hex"), hex);
        exec(List.of(iverilog.toString(), "-g2005", "-o", "sim.vvp", src.resolve("lvds71_tx.v").toString(),
                src.resolve("tb_lvds71.v").toString()));
        exec(List.of(vvp.toString(), "-n", "sim.vvp", "+image=image.hex", "+vcd=link.vcd", "+pixels=1500"));
        cleanVcd = tmp.resolve("link.vcd");
        Path ddr = Path.of("src", "test", "verilog").toAbsolutePath();
        exec(List.of(iverilog.toString(), "-g2005", "-o", "ddr.vvp", ddr.resolve("ddr_tx.v").toString(), ddr.resolve("tb_ddr.v").toString()));
        exec(List.of(vvp.toString(), "-n", "ddr.vvp", "+vcd=ddr.vcd", "+bits=2000"));
        ddrVcd = tmp.resolve("ddr.vcd");
    }

    // ------------------------------------------------------------------ 7:1 serialiser (Icarus Verilog)

    @Test
    void serialiserCleanCaptureHasNoFinding() throws Exception {
        List<Finding> f = runPixel("clean", cleanVcd);
        row("verilog 7:1", "clean", f, null);
        assertEquals(List.of(), f);
    }

    @Test
    void clockGlitchIsFoundOnceWhereItIs() throws Exception {
        long at = 5_003_100; // ps, inside a clock-high phase
        Path vcd = write("glitch.vcd", new VcdFaults(Files.readAllLines(cleanVcd)).glitch("clk_out", at, 150).text());
        List<Finding> f = runPixel("glitch", vcd);
        row("verilog 7:1", "clock glitch 150 ps at 5.0031 us", f, "clock-glitch");
        Finding g = only(f, "clock-glitch");
        assertEquals(at * 1000, g.startFs());
    }

    @Test
    void clockDropoutIsFoundOnceWhereItIs() throws Exception {
        long from = 5_000_000;
        long to = 5_040_000; // about 5.7 pixel clocks without an edge
        Path vcd = write("dropout.vcd", new VcdFaults(Files.readAllLines(cleanVcd)).hold("clk_out", from, to).text());
        List<Finding> f = runPixel("dropout", vcd);
        row("verilog 7:1", "clock held 40 ns from 5.000 us", f, "clock-dropout");
        Finding d = only(f, "clock-dropout");
        // the dropout starts at the last clock edge before the gap, less than one pixel clock (7 ns) earlier
        assertTrue(d.startFs() <= from * 1000 && d.startFs() > (from - 7 * UI_PS) * 1000, d.toString());
        // downstream the decoder loses lock and the frame it was building is broken: information naming
        // the sampler's finding as the cause, no finding of its own; the line the gap cut is not named again
        List<String> infos = infos(tmp.resolve("o-dropout"), "lost-lock");
        assertEquals(1, infos.size(), infos.toString());
        assertTrue(infos.get(0).contains("consequence: see the clock-dropout finding of 'sampler' at "), infos.toString());
        assertEquals(1, referencesResolve(tmp.resolve("o-dropout")).size());
    }

    /**
     * The transmitter pauses for six pixel clocks (clock and data held 42 ns from 5.000 us) and
     * the sampler is told to tolerate clock gaps of up to 10 periods ({@code dropoutPeriods} 10):
     * it makes no dropout finding, so the decoder refers to none; it finds the broken clock itself,
     * once ({@code lost-lock}, an error), and the frame it breaks is information referring to that.
     * Not folded yet: the sampler spreads the slots of the pixel clock it stretched over the pause
     * and of the one after it, and reports their low margins per lane ({@code margin-low}); the
     * frame holding those flagged bits is suspect on their account. Those are the only other
     * findings, and they lie at the pause.
     */
    @Test
    void pauseTheSamplerToleratesIsFoundOnceByTheDecoder() throws Exception {
        long from = 5_000_000;
        long to = 5_042_000;
        VcdFaults faults = new VcdFaults(Files.readAllLines(cleanVcd));
        for (String s : List.of("clk_out", "d0", "d1", "d2", "d3")) {
            faults.hold(s, from, to);
        }
        Path vcd = write("pause-tolerated.vcd", faults.text());
        List<Finding> f = runChain("pause-tolerated", pixelChain("pause-tolerated", vcd, ",\"dropoutPeriods\":10"));
        row("verilog 7:1", "link paused 42 ns from 5.000 us, sampler dropoutPeriods 10", f, "lost-lock");
        Finding l = once(f, "lost-lock");
        for (Finding o : consequences(f, "lost-lock")) {
            boolean margins = o.kind().equals("margin-low") && o.source().equals("sampler")
                    && o.startFs() >= from * 1000 && o.startFs() < (to + 28 * UI_PS) * 1000;
            boolean frame = List.of("frame", "suspect-bits").contains(o.kind()) && o.source().equals("panel");
            assertTrue(margins || frame, o.toString());
        }
        assertEquals("panel", l.source());
        assertEquals("error", l.severity());
        assertTrue(!l.label().contains("consequence") && l.label().contains("no finding of the stage that recovers the clock"),
                l.label());
        // the lock is lost at the first pixel after the pause, less than two pixel clocks after it
        assertTrue(l.startFs() >= from * 1000 && l.startFs() < (to + 14 * UI_PS) * 1000, l.toString());
        Path out = tmp.resolve("o-pause-tolerated");
        assertTrue(Files.readAllLines(out.resolve("annotations.jsonl")).stream().noneMatch(x -> x.contains("clock-dropout")),
                "no dropout finding, and nothing refers to one");
        assertEquals(List.of(), referencesResolve(out));
        assertTrue(infos(out, "partial-frame").stream().anyMatch(x -> x.contains("lock lost at")));
        // the same pause at the sampler's default: its dropout finding, and the lock loss refers to it
        List<Finding> d = runPixel("pause", vcd);
        row("verilog 7:1", "link paused 42 ns from 5.000 us", d, "clock-dropout");
        only(d, "clock-dropout");
        assertTrue(infos(tmp.resolve("o-pause"), "lost-lock").get(0).contains("consequence: see the clock-dropout finding of 'sampler'"));
        assertEquals(1, referencesResolve(tmp.resolve("o-pause")).stream().filter(x -> x.contains("lock lost")).count());
    }

    @Test
    void laneSkewedBeyondHalfAUnitIntervalIsFoundOnce() throws Exception {
        Path vcd = write("skew06.vcd", new VcdFaults(Files.readAllLines(cleanVcd)).delay("d1", 6 * UI_PS / 10).text());
        List<Finding> f = runPixel("skew06", vcd);
        row("verilog 7:1", "lane d1 late by 0.6 UI", f, "lane-skew-ambiguous");
        Finding s = only(f, "lane-skew-ambiguous");
        assertTrue(s.label().startsWith("d1:"), s.label());
        // downstream every frame is suspect because all of d1's bits are flagged: information that
        // names the sampler's one finding
        Path out = tmp.resolve("o-skew06");
        List<String> frames = infos(out, "frame").stream().filter(x -> x.contains("suspect")).toList();
        String ref = "consequence: see the lane-skew-ambiguous finding of 'sampler' at ";
        assertTrue(!frames.isEmpty() && frames.stream().allMatch(x -> x.contains(ref)), frames.toString());
        List<String> bits = infos(out, "suspect-bits");
        assertEquals(frames.size(), bits.size(), bits.toString());
        assertTrue(bits.stream().allMatch(x -> x.contains(ref)), bits.toString());
        assertEquals(2 * frames.size(), referencesResolve(out).size());
    }

    /**
     * A lane a whole unit interval off keeps its transitions on the slot boundaries, so margins
     * cannot see it. On the lane carrying DE, HS and VS (lane 2, VESA and JEIDA alike,
     * docs/reference-facts.md#pixel-link-clock-and-slot-mappings) the framing breaks: lines of
     * the wrong length, found once, naming the lane that carries the control slots; the later lines
     * and the frames they make suspect are information referring back to that one finding.
     */
    @Test
    void controlLaneAWholeUnitIntervalOffBreaksTheFraming() throws Exception {
        Path vcd = write("skew10.vcd", new VcdFaults(Files.readAllLines(cleanVcd)).delay("d2", UI_PS).text());
        List<Finding> f = runPixel("skew10", vcd);
        row("verilog 7:1", "lane d2 (DE/HS/VS) late by 1 UI", f, "line-length");
        Finding l = only(f, "line-length");
        assertTrue(l.label().contains("the lane carrying DE/HS/VS (lane2)"), l.label());
        assertTrue(infos(tmp.resolve("o-skew10"), "line-length").stream().allMatch(x -> x.contains("consequence")));
        List<String> frames = infos(tmp.resolve("o-skew10"), "frame").stream().filter(x -> x.contains("suspect")).toList();
        assertTrue(!frames.isEmpty() && frames.stream().allMatch(x -> x.contains("consequence: see the line-length finding at")),
                frames.toString());
    }

    /**
     * A lane of pixel bits only (d0: R0..R5, G0 in VESA 24-bit,
     * docs/reference-facts.md#pixel-link-clock-and-slot-mappings) a whole unit interval late keeps
     * the framing intact; the test bench sends zeros while DE is low, so the blanking pixel right
     * after each DE fall carries the last active pixel's final slot in d0's first slot: one
     * finding naming the lane, every frame after it suspect as information referring to it.
     */
    @Test
    void dataLaneAWholeUnitIntervalOffIsFoundOnce() throws Exception {
        Path vcd = write("skew10d0.vcd", new VcdFaults(Files.readAllLines(cleanVcd)).delay("d0", UI_PS).text());
        List<Finding> f = runPixel("skew10d0", vcd);
        row("verilog 7:1", "lane d0 (pixel bits) late by 1 UI", f, "lane-slot-offset");
        Finding s = only(f, "lane-slot-offset");
        assertTrue(s.label().startsWith("d0 (lane0): pixel bits 1 unit interval late"), s.label());
        List<String> frames = infos(tmp.resolve("o-skew10d0"), "frame").stream().filter(x -> x.contains("suspect")).toList();
        assertTrue(!frames.isEmpty() && frames.stream().allMatch(x -> x.contains("consequence: see the lane-slot-offset finding at")),
                frames.toString());
    }

    @Test
    void captureBelowTheDecodableRateIsRefused() throws Exception {
        Path slow = write("slow.vcd", LogicCaptureRateTest.retime(Files.readAllLines(cleanVcd), 10_000));
        EndToEndTest.Cli r = EndToEndTest.cli("run", pixelChain("slow", slow).toString(), "--out", tmp.resolve("o-slow").toString(), "-q");
        System.out.println("SUITE | verilog 7:1 | re-timed to 100 MS/s (UI 1 ns) | exit " + r.code() + ": "
                + (r.errLines().isEmpty() ? "" : r.errLines().get(0)) + " | 1 | -");
        assertEquals(2, r.code(), r.err());
        assertEquals(1, r.errLines().size(), r.err());
        assertTrue(r.errLines().get(0).contains("at least 2 samples per unit interval"), r.err());
        // the 7 ns clock is aliased on a 10 ns grid: no unit interval is stated as a fact
        assertTrue(!r.errLines().get(0).contains("unit interval is") && r.errLines().get(0).contains("clock period measured"), r.err());
    }

    // ------------------------------------------------------------------ DDR link (Icarus Verilog)

    @Test
    void ddrCleanCaptureHasNoFindingAndGivesTheBytesSent() throws Exception {
        List<Finding> f = runDdr("ddr", ddrVcd);
        row("verilog DDR", "clean", f, null);
        assertEquals(List.of(), f);
        // src/test/verilog/ddr_tx.v sends byte n = (37 n + 11) mod 256, byte n on lane n mod 2
        List<String> words = Files.readAllLines(tmp.resolve("o-ddr").resolve("link-words.csv"));
        assertTrue(words.size() > 200, "words " + words.size());
        for (int n = 0; n < 200; n++) {
            String[] c = words.get(n + 1).split(",");
            assertEquals(String.format("%02X", (37 * n + 11) & 0xFF), c[5], "word " + n);
            assertEquals(Integer.toString(n % 2), c[2], "lane of word " + n);
        }
    }

    @Test
    void ddrClockGlitchIsFoundOnceWhereItIs() throws Exception {
        long at = 1_001_000; // ps, inside a clock phase
        Path vcd = write("ddr-glitch.vcd", new VcdFaults(Files.readAllLines(ddrVcd)).glitch("clk_out", at, 300).text());
        List<Finding> f = runDdr("ddr-glitch", vcd);
        row("verilog DDR", "clock glitch 300 ps at 1.001 us", f, "clock-glitch");
        assertEquals(at * 1000, only(f, "clock-glitch").startFs());
    }

    @Test
    void ddrLaneSkewedBeyondHalfAUnitIntervalIsFoundOnce() throws Exception {
        Path vcd = write("ddr-skew06.vcd", new VcdFaults(Files.readAllLines(ddrVcd)).delay("d1", 6 * DDR_UI_PS / 10).text());
        List<Finding> f = runDdr("ddr-skew06", vcd);
        row("verilog DDR", "lane d1 late by 0.6 UI", f, "lane-skew-ambiguous");
        assertTrue(only(f, "lane-skew-ambiguous").label().startsWith("d1:"), f.toString());
    }

    @Test
    void ddrClockDropoutIsFoundOnceWhereItIs() throws Exception {
        long from = 1_000_000;
        long to = 1_020_000; // ps: five 4 ns clock periods without an edge
        Path vcd = write("ddr-dropout.vcd", new VcdFaults(Files.readAllLines(ddrVcd)).hold("clk_out", from, to).text());
        List<Finding> f = runDdr("ddr-dropout", vcd);
        row("verilog DDR", "clock held 20 ns from 1.000 us", f, "clock-dropout");
        Finding d = only(f, "clock-dropout");
        // the dropout starts at the last clock edge before the gap, less than one clock period (4 ns) earlier
        assertTrue(d.startFs() <= from * 1000 && d.startFs() > (from - 2 * DDR_UI_PS) * 1000, d.toString());
    }

    /** A lane a whole unit interval late: clean margins, but it finds its sync pattern one clock edge after the other lane. */
    @Test
    void ddrLaneAWholeUnitIntervalOffIsFoundOnce() throws Exception {
        Path vcd = write("ddr-skew10.vcd", new VcdFaults(Files.readAllLines(ddrVcd)).delay("d1", DDR_UI_PS).text());
        List<Finding> f = runDdr("ddr-skew10", vcd);
        row("verilog DDR", "lane d1 late by 1 UI", f, "lane-sync-offset");
        Finding s = only(f, "lane-sync-offset");
        assertTrue(s.label().startsWith("lane 1 found its sync pattern 1 UI after lane 0"), s.label());
    }

    // ------------------------------------------------------------------ current-mode driver (ngspice)

    @Test
    void driverCleanCaptureHasNoFinding() throws Exception {
        List<Finding> f = runDriver("driver", 3.5e-3, false);
        row("ngspice driver", "clean, 3.5 mA", f, null);
        assertEquals(List.of(), f);
    }

    @Test
    void driverSwingBelowTheStandardIsOneErrorNamingBothStates() throws Exception {
        // 1.5 mA into 100 ohm: |VOD| about 150 mV, below the 247 mV of ANSI/TIA/EIA-644-A
        // (docs/reference-facts.md#lvds-electrical-levels, from memory)
        List<Finding> f = runDriver("weak", 1.5e-3, false);
        row("ngspice driver", "1.5 mA (|VOD| ~150 mV)", f, "level-out-of-range");
        Finding x = only(f, "level-out-of-range");
        assertEquals("error", x.severity());
        assertEquals(0, x.startFs(), "the whole capture is out of range");
        // one fault, one finding: both states' values, each about 1.5 mA x 100 ohm
        assertTrue(x.label().matches("vod-high 1[45]\\d\\.\\d mV and vod-low 1[45]\\d\\.\\d mV outside 247 to 454 mV"),
                x.label());
        // report.md says where the limits come from: the standard, with its reference-facts anchor
        String md = Files.readString(tmp.resolve("o-weak").resolve("report.md"));
        assertTrue(md.contains("- standard: limits the findings were checked against")
                && md.contains("standard: ANSI/TIA/EIA-644-A, values from memory (docs/reference-facts.md#lvds-electrical-levels)"), md);
        // and each finding line says its value is measured and where its limit comes from
        assertTrue(md.contains(f.get(0).label() + " [measured; limit standard: ANSI/TIA/EIA-644-A, values from memory"
                + " (docs/reference-facts.md#lvds-electrical-levels)]"), md);
    }

    /**
     * The driver's clock stops for 200 ns (both legs held): in this chain no sampler recovers the
     * clock, so the jitter stage, the only one that sees it, is told to report dropouts
     * (option dropoutPeriods, as a dual-edge sampler's default of 1.5 periods).
     */
    @Test
    void driverClockDropoutIsFoundOnceWhereItIs() throws Exception {
        List<Finding> f = runDriver("driver-dropout", 3.5e-3, false, 1.0e-6, 1.2e-6);
        row("ngspice driver", "legs held 200 ns from 1.0 us", f, "clock-dropout");
        Finding d = only(f, "clock-dropout");
        // the gap starts at the last rising edge before 1.0 us, less than one 50 ns period earlier
        assertTrue(d.startFs() <= 1_000_000_000L && d.startFs() > 950_000_000L, d.toString());
    }

    @Test
    void swappedLegsAreFoundOnce() throws Exception {
        List<Finding> f = runDriver("swapped", 3.5e-3, true);
        row("ngspice driver", "P and N swapped", f, "legs-swapped");
        only(f, "legs-swapped");
    }

    // ------------------------------------------------------------------ helpers

    private static List<Finding> runPixel(String name, Path vcd) throws Exception {
        return runChain(name, pixelChain(name, vcd));
    }

    /** Runs a chain file with {@code lanesift run} into its own folder and returns its warnings and errors. */
    private static List<Finding> runChain(String name, Path chain) throws Exception {
        Path out = tmp.resolve("o-" + name);
        EndToEndTest.Cli r = EndToEndTest.cli("run", chain.toString(), "--out", out.toString(), "-q");
        assertEquals(0, r.code(), r.err());
        // every measurement and limit of its JSON reports says where it comes from (issue 17 item 8)
        assertEquals(List.of(), ReportSources.unsourcedIn(out), "values without a source in the reports of " + name);
        return findings(out);
    }

    private static List<Finding> runDdr(String name, Path vcd) throws Exception {
        String json = "{\"nodes\":[{\"id\":\"cap\",\"plugin\":\"vcd\",\"options\":{\"file\":" + JsonWriter.quote(vcd.toString()) + "}},"
                + "{\"id\":\"sampler\",\"plugin\":\"dual-edge\",\"options\":{\"mode\":\"ddr\",\"lanes\":2,\"alignment\":\"center\"}},"
                + "{\"id\":\"clk\",\"plugin\":\"jitter\",\"options\":{}},"
                + "{\"id\":\"link\",\"plugin\":\"packet-link\",\"options\":{\"lanes\":2,\"profile\":\"framed\",\"lpStates\":false,"
                + "\"syncPattern\":\"B8\",\"syncBits\":8,\"wordBits\":8,\"bitOrder\":\"lsb\",\"laneDistribution\":\"word\"}}],"
                + "\"wires\":[{\"from\":\"cap.clk_out\",\"to\":\"sampler.clock\"},{\"from\":\"cap.clk_out\",\"to\":\"clk.clock\"},"
                + "{\"from\":\"cap.d0\",\"to\":\"sampler.lane0\"},{\"from\":\"cap.d1\",\"to\":\"sampler.lane1\"},"
                + "{\"from\":\"sampler.bits0\",\"to\":\"link.bits0\"},{\"from\":\"sampler.bits1\",\"to\":\"link.bits1\"}]}";
        return runChain(name, write(name + ".json", json));
    }

    private static Path pixelChain(String name, Path vcd) throws Exception {
        return pixelChain(name, vcd, "");
    }

    /** The pixel chain; {@code samplerOptions} is added to the sampler's options as written (",\"name\":value"). */
    private static Path pixelChain(String name, Path vcd, String samplerOptions) throws Exception {
        StringBuilder wires = new StringBuilder("{\"from\":\"cap.clk_out\",\"to\":\"sampler.clock\"},{\"from\":\"cap.clk_out\",\"to\":\"clk.clock\"}");
        for (int l = 0; l < 4; l++) {
            wires.append(",{\"from\":\"cap.d").append(l).append("\",\"to\":\"sampler.lane").append(l).append("\"}");
            wires.append(",{\"from\":\"sampler.bits").append(l).append("\",\"to\":\"panel.lane").append(l).append("\"}");
        }
        String json = "{\"nodes\":[{\"id\":\"cap\",\"plugin\":\"vcd\",\"options\":{\"file\":" + JsonWriter.quote(vcd.toString()) + "}},"
                + "{\"id\":\"sampler\",\"plugin\":\"dual-edge\",\"options\":{\"mode\":\"multiplied\",\"slots\":7,\"lanes\":4" + samplerOptions + "}},"
                + "{\"id\":\"clk\",\"plugin\":\"jitter\",\"options\":{}},"
                + "{\"id\":\"panel\",\"plugin\":\"pixel-link\",\"options\":{\"mapping\":\"vesa-24\",\"pictures\":\"none\"}}],"
                + "\"wires\":[" + wires + "]}";
        return write(name + ".json", json);
    }

    /** Simulates the driver at a drive current, writes its legs as a CSV capture and runs the chain. */
    private static List<Finding> runDriver(String name, double driveAmps, boolean swapLegs) throws Exception {
        return runDriver(name, driveAmps, swapLegs, Double.NaN, Double.NaN);
    }

    /** As above; between {@code holdFromS} and {@code holdToS} (unless NaN) both legs keep their values from before. */
    private static List<Finding> runDriver(String name, double driveAmps, boolean swapLegs, double holdFromS, double holdToS)
            throws Exception {
        Path exe = ExternalTool.require("ngspice");
        String netlist = Files.readString(Path.of("src", "test", "spice", "lvds-driver.cir"))
                .replace(".param IDRV=3.5m", ".param IDRV=" + driveAmps).replace("lvds-driver.out", name + ".out");
        Path cir = write(name + ".cir", netlist);
        String log = ExternalTool.run(tmp, Duration.ofSeconds(120), List.of(exe.toString(), cir.getFileName().toString()));
        Path wave = tmp.resolve(name + ".out");
        assertTrue(Files.exists(wave), () -> "ngspice wrote no " + wave.getFileName() + ": " + log);
        Path csv = tmp.resolve(name + ".csv");
        try (BufferedWriter w = Files.newBufferedWriter(csv)) {
            w.write("Time (s),CLK_P (V),CLK_N (V)\n");
            String held = null;
            for (String line : Files.readAllLines(wave)) {
                String[] c = line.trim().split("\\s+");
                if (c.length < 4) {
                    continue;
                }
                // wrdata: time v(p) time v(n)
                String legs = (swapLegs ? c[3] : c[1]) + "," + (swapLegs ? c[1] : c[3]);
                double t = Double.parseDouble(c[0]);
                if (t >= holdFromS && t <= holdToS) {
                    held = held == null ? legs : held;
                    legs = held;
                }
                w.write(c[0] + "," + legs + "\n");
            }
        }
        String json = "{\"nodes\":[{\"id\":\"cap\",\"plugin\":\"csv\",\"options\":{\"file\":" + JsonWriter.quote(csv.toString()) + "}},"
                + "{\"id\":\"rx\",\"plugin\":\"differential\",\"options\":{\"mode\":\"pair\",\"name\":\"CLK\",\"levelProfile\":\"lvds\","
                + "\"detectSwap\":true,\"swapPattern\":\"clock-1100011\"}},"
                + "{\"id\":\"clk\",\"plugin\":\"jitter\",\"options\":{\"dropoutPeriods\":1.5}}],"
                + "\"wires\":[{\"from\":\"cap.CLK_P\",\"to\":\"rx.p\"},{\"from\":\"cap.CLK_N\",\"to\":\"rx.n\"},"
                + "{\"from\":\"rx.edges\",\"to\":\"clk.clock\"}]}";
        return runChain(name, write(name + ".json", json));
    }

    /** The warnings and errors of a run, in file order. */
    static List<Finding> findings(Path out) throws Exception {
        List<Finding> f = new ArrayList<>();
        for (String line : Files.readAllLines(out.resolve("annotations.jsonl"))) {
            JsonValue a = JsonReader.parse("annotations.jsonl", line);
            String sev = a.get("severity").asString();
            if (!sev.equals("info")) {
                f.add(new Finding(a.get("kind").asString(), sev, (long) a.get("start_fs").asDouble(), a.get("label").asString(),
                        a.get("source").asString()));
            }
        }
        return f;
    }

    /** The labels of the information annotations of a kind, in file order. */
    static List<String> infos(Path out, String kind) throws Exception {
        List<String> l = new ArrayList<>();
        for (String line : Files.readAllLines(out.resolve("annotations.jsonl"))) {
            JsonValue a = JsonReader.parse("annotations.jsonl", line);
            if (a.get("severity").asString().equals("info") && a.get("kind").asString().equals(kind)) {
                l.add(a.get("label").asString());
            }
        }
        return l;
    }

    /** The one finding of a kind; fails when there is none or more than one. */
    static Finding once(List<Finding> f, String kind) {
        List<Finding> k = f.stream().filter(x -> x.kind().equals(kind)).toList();
        assertEquals(1, k.size(), kind + " expected once: " + f);
        return k.get(0);
    }

    /** The one finding of a kind, when it is the run's only warning or error; fails otherwise. */
    static Finding only(List<Finding> f, String kind) {
        Finding one = once(f, kind);
        assertEquals(List.of(), consequences(f, kind), "no warning or error but the one " + kind);
        return one;
    }

    /**
     * The information annotations that refer to a finding of another stage ("the KIND finding of
     * 'SOURCE' at TIME"); fails unless each refers to a warning or error that was made, with that
     * kind and source, starting at that time.
     */
    static List<String> referencesResolve(Path out) throws Exception {
        java.util.regex.Pattern ref = java.util.regex.Pattern.compile("the ([a-z-]+) finding of '([^']+)' at ([^)]+)\\)");
        List<JsonValue> all = new ArrayList<>();
        for (String line : Files.readAllLines(out.resolve("annotations.jsonl"))) {
            all.add(JsonReader.parse("annotations.jsonl", line));
        }
        List<String> refs = new ArrayList<>();
        for (JsonValue a : all) {
            java.util.regex.Matcher m = ref.matcher(a.get("label").asString());
            if (!m.find()) {
                continue;
            }
            assertEquals("info", a.get("severity").asString(), a.get("label").asString());
            boolean made = all.stream().anyMatch(b -> !b.get("severity").asString().equals("info")
                    && b.get("kind").asString().equals(m.group(1)) && b.get("source").asString().equals(m.group(2))
                    && org.lanesift.time.Femtos.format((long) b.get("start_fs").asDouble()).equals(m.group(3)));
            assertTrue(made, "refers to a finding that was not made: " + a.get("label").asString());
            refs.add(a.get("label").asString());
        }
        return refs;
    }

    /** The findings other than the expected kind. */
    static List<Finding> consequences(List<Finding> f, String kind) {
        return f.stream().filter(x -> !x.kind().equals(kind)).toList();
    }

    /** Prints one row of the suite table. */
    private static void row(String suite, String fault, List<Finding> f, String expected) {
        List<Finding> hit = expected == null ? List.of() : f.stream().filter(x -> x.kind().equals(expected)).toList();
        StringBuilder others = new StringBuilder();
        consequences(f, expected == null ? "" : expected).stream().map(Finding::kind).distinct()
                .forEach(k -> others.append(others.length() == 0 ? "" : ", ").append(k).append(" x")
                        .append(f.stream().filter(x -> x.kind().equals(k)).count()));
        System.out.println("SUITE | " + suite + " | " + fault + " | " + (expected == null ? "none" : expected) + " | " + hit.size()
                + " | " + (hit.isEmpty() ? "-" : String.format("%.4f us", hit.get(0).startFs() * 1e-9))
                + " | others: " + (others.length() == 0 ? "none" : others));
    }

    private static Path write(String name, String text) throws Exception {
        Path p = tmp.resolve(name);
        Files.writeString(p, text);
        return p;
    }

    private static void exec(List<String> cmd) throws Exception {
        ExternalTool.run(tmp, Duration.ofSeconds(120), cmd);
    }
}
