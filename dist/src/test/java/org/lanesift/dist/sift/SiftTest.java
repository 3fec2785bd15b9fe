package org.lanesift.dist.sift;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.kit.FramePictures;
import org.lanesift.runner.Main;

/**
 * {@code lanesift sift} end to end on captures made by the test tree's own generator (not the
 * demo's): the pixel link decodes pixel-exact with the exact timing and every skew within 50 ps;
 * a capture with renamed channels decodes through a map file; the chain files it wrote rerun with
 * {@code run} give byte-identical decoder outputs; bad map input and {@code --fail-on} give their
 * documented exit codes.
 */
class SiftTest {
    static final String[] NAMES = {"TXC_P", "TXC_N", "TX0_P", "TX0_N", "TX1_P", "TX1_N", "TX2_P", "TX2_N"};

    record Run(int code, String out, String err) {
    }

    static Run lanesift(String... args) {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        ByteArrayOutputStream e = new ByteArrayOutputStream();
        int code = Main.run(args, new PrintStream(o, true, StandardCharsets.UTF_8), new PrintStream(e, true, StandardCharsets.UTF_8));
        return new Run(code, o.toString(StandardCharsets.UTF_8), e.toString(StandardCharsets.UTF_8));
    }

    static JsonValue json(Path f) throws IOException {
        return JsonReader.parse(f.toString(), Files.readString(f, StandardCharsets.UTF_8));
    }

    @Test
    void pixelLinkDecodesExactlyWithSkewsWithin50psAndTheChainsRerunIdentically(@TempDir Path dir) throws IOException {
        Path cap = dir.resolve("my-scope.csv");
        PixelLinkCapture gen = new PixelLinkCapture();
        gen.write(cap, NAMES, 7001);
        Path out = dir.resolve("sifted");
        Run r = lanesift("sift", "--capture", cap.toString(), "--out", out.toString(), "--json");
        assertEquals(0, r.code(), r.err());
        JsonValue report = JsonReader.parse("stdout", r.out());
        assertEquals(json(out.resolve("report.json")), report, "--json prints the report.json it wrote");
        assertEquals("pixel", report.at("/link/kind/value").asString());
        assertEquals("bits-18", report.at("/link/mapping/value").asString());
        // Source: docs/reference-facts.md#pixel-link-clock-and-slot-mappings: UI = clock period / 7
        assertEquals(1 / PixelLinkCapture.PIXEL_CLOCK_HZ / 7, report.at("/link/unitIntervalS/value").asDouble(), 1e-12);
        assertEquals(2, (int) report.at("/result/frames/complete").asDouble());
        assertEquals(0, (int) report.at("/result/frames/suspect").asDouble());
        int[] h = {PixelLinkCapture.H_ACTIVE, PixelLinkCapture.H_FRONT, PixelLinkCapture.H_SYNC, PixelLinkCapture.H_BACK,
            PixelLinkCapture.H_TOTAL};
        int[] v = {PixelLinkCapture.V_ACTIVE, PixelLinkCapture.V_FRONT, PixelLinkCapture.V_SYNC, PixelLinkCapture.V_BACK,
            PixelLinkCapture.V_TOTAL};
        String[] keys = {"active", "frontPorch", "syncWidth", "backPorch", "total"};
        for (int i = 0; i < keys.length; i++) {
            assertEquals(h[i], (int) report.at("/result/timing/horizontal/" + keys[i]).asDouble(), "horizontal " + keys[i]);
            assertEquals(v[i], (int) report.at("/result/timing/vertical/" + keys[i]).asDouble(), "vertical " + keys[i]);
        }
        for (int f = 1; f <= 2; f++) {
            assertFrameExact(out.resolve("decode").resolve(FramePictures.fileName("panel", f, false)), gen.frames.get(f));
        }
        assertSkews(report.at("/skews"), new String[] {"TXC_N", "TX0_N", "TX1_N", "TX2_N"}, new String[] {"TX0", "TX1", "TX2"});
        for (JsonValue s : report.at("/skews").elements()) {
            assertTrue(s.get("source").asString().startsWith("measured"), s::toString);
        }

        // the chain files it wrote hold relative paths and rerun to the same decoder outputs
        String chain = Files.readString(out.resolve("chains/sift.json"));
        assertTrue(!chain.contains(dir.toString()), "no absolute path in the chain file:\n" + chain);
        Path again = dir.resolve("again");
        Run rerun = lanesift("run", out.resolve("chains/sift.json").toString(), "--out", again.toString(), "--quiet");
        assertEquals(0, rerun.code(), rerun.err());
        List<String> compared = new ArrayList<>();
        try (var files = Files.list(out.resolve("decode"))) {
            // report.md holds the output folder and run time, the VCD the date of the run (as in DemoDigestTest)
            for (Path f : files.filter(p -> !p.getFileName().toString().matches("report\\.md|.*\\.vcd")).sorted().toList()) {
                assertArrayEquals(Files.readAllBytes(f), Files.readAllBytes(again.resolve(f.getFileName())), f.getFileName().toString());
                compared.add(f.getFileName().toString());
            }
        }
        assertTrue(compared.contains("panel-timing.json") && compared.contains(FramePictures.fileName("panel", 2, false)), compared::toString);

        // --fail-on: a clean capture gives no warning and no error (frames cut by the capture's ends are
        // information, and so are the samples the leg deskew leaves unused), so neither level fails
        Run warn = lanesift("sift", "--capture", cap.toString(), "--out", dir.resolve("w").toString(), "--fail-on", "warning", "--quiet");
        assertEquals(0, warn.code(), warn.err());
        Run err = lanesift("sift", "--capture", cap.toString(), "--out", dir.resolve("e").toString(), "--fail-on", "error", "--quiet");
        assertEquals(0, err.code(), err.err());
        String md = Files.readString(dir.resolve("e/report.md"));
        assertTrue(md.indexOf("## Result") < md.indexOf("### Skews") && md.indexOf("### Trust") < md.indexOf("## Details"), md);
        assertTrue(md.contains("--fail-on error") && !md.contains("NaN") && !md.matches("(?s).*\\dsamples.*"), md);
    }

    @Test
    void siftWritesTheOutputsItIsToldAndSaysSoInItsChain(@TempDir Path dir) throws IOException {
        Path cap = dir.resolve("my-scope.csv");
        PixelLinkCapture gen = new PixelLinkCapture();
        gen.write(cap, NAMES, 7001);
        Path out = dir.resolve("sifted");
        Run r = lanesift("sift", "--capture", cap.toString(), "--out", out.toString(), "--outputs", "none", "--quiet");
        assertEquals(0, r.code(), r.err());
        // none: the decoders' files are left out, the artifacts and findings the report is built from are kept
        assertEquals(List.of("artifacts", "annotations"), json(out.resolve("chains/sift.json")).get("outputs").elements().stream()
                .map(JsonValue::asString).toList());
        try (var files = Files.list(out.resolve("decode"))) {
            List<String> names = files.map(p -> p.getFileName().toString()).toList();
            assertTrue(names.stream().noneMatch(n -> n.endsWith(".vcd") || n.endsWith("-bits.csv")), names::toString);
            assertTrue(names.contains(FramePictures.fileName("panel", 2, false)) && names.contains("lanes-applied-skew.json"), names::toString);
        }
        assertEquals(2, (int) json(out.resolve("report.json")).at("/result/frames/complete").asDouble());
        Run bad = lanesift("sift", "--capture", cap.toString(), "--out", dir.resolve("bad").toString(), "--outputs", "vcd,pictures");
        assertEquals(2, bad.code(), bad.err());
        assertEquals("lanesift sift: --outputs vcd,pictures: unknown output name 'pictures'; expected one or more of: none, standard,"
                + " by-products, vcd, csv, binary, artifacts, annotations (see: lanesift sift --help)", bad.err().trim());
    }

    @Test
    void aSuspectSkewMakesEveryFrameSuspect(@TempDir Path dir) throws IOException {
        // lane TX2 sits 0.43 UI late: the slot-grid estimate folds skew into one UI, so one this close to half a UI
        // may belong on the other side and is marked suspect (docs/skew-table.md); the frames may still decode,
        // but the report must not call them trustworthy
        Path cap = dir.resolve("near-half.csv");
        PixelLinkCapture gen = new PixelLinkCapture();
        gen.laneSkewPs[2] = 0.43 * 1e12 / PixelLinkCapture.PIXEL_CLOCK_HZ / 7;
        gen.write(cap, NAMES, 5150);
        Path out = dir.resolve("o");
        Run r = lanesift("sift", "--capture", cap.toString(), "--out", out.toString(), "--quiet");
        assertEquals(0, r.code(), r.err());
        JsonValue report = json(out.resolve("report.json"));
        long complete = (long) report.at("/result/frames/complete").asDouble();
        long partial = (long) report.at("/result/frames/partial").asDouble();
        assertTrue(complete + partial > 0, "frames were decoded");
        assertEquals(complete + partial, (long) report.at("/result/frames/suspect").asDouble(), "every frame is suspect");
        List<JsonValue> why = report.at("/result/suspectSkews").elements();
        assertTrue(why.stream().anyMatch(w -> w.asString().startsWith("TX2: ") && w.asString().contains("half an interval")),
                why::toString);
        assertTrue(Files.readString(out.resolve("report.md")).contains("suspect skew correction (TX2: "),
                "report.md says why");
    }

    @Test
    void renamedChannelsDecodeThroughAMapFile(@TempDir Path dir) throws IOException {
        // scope channel numbers in a shuffled order: the map file says which is which
        String[] names = {"CH5", "CH6", "CH1", "CH2", "CH8", "CH7", "CH3", "CH4"};
        Path cap = dir.resolve("bench.csv");
        PixelLinkCapture gen = new PixelLinkCapture();
        gen.write(cap, names, 4242);
        Path map = dir.resolve("link.map");
        Files.writeString(map, "# clock pair first, then data lanes 0 to 2\nPCLK=CH5,CH6\nRX0=CH1,CH2\n\nRX1=CH8,CH7\nRX2=CH3,CH4\n");
        Path out = dir.resolve("o");
        Run r = lanesift("sift", "--capture", cap.toString(), "--map-file", map.toString(), "--out", out.toString(), "--quiet");
        assertEquals(0, r.code(), r.err());
        JsonValue report = json(out.resolve("report.json"));
        assertEquals(2, (int) report.at("/result/frames/complete").asDouble());
        assertFrameExact(out.resolve("decode").resolve(FramePictures.fileName("panel", 1, false)), gen.frames.get(1));
        assertSkews(report.at("/skews"), new String[] {"CH6", "CH2", "CH7", "CH4"}, new String[] {"RX0", "RX1", "RX2"});

        Files.writeString(map, "PCLK=CH5,CH6\nRX0=CH1,CH9\n");
        Run bad = lanesift("sift", "--capture", cap.toString(), "--map-file", map.toString(), "--out", out.toString());
        assertEquals(2, bad.code(), bad.err());
        assertTrue(bad.err().contains(map + ":2: no channel 'CH9'"), bad.err());
        Run badOpt = lanesift("sift", "--capture", cap.toString(), "--map", "PCLK=CH5", "--out", out.toString());
        assertEquals(2, badOpt.code(), badOpt.err());
        assertTrue(badOpt.err().contains("map entry PCLK: this capture has analog legs: expected PCLK=P,N"), badOpt.err());
    }

    @Test
    void packetLinkDecodesEveryCommandWithSkewsWithin50ps(@TempDir Path dir) throws IOException {
        Path cap = dir.resolve("dsi-probe.csv");
        PacketLinkCapture gen = new PacketLinkCapture();
        gen.write(cap, new String[] {"CKP", "CKN", "D0P", "D0N", "D1P", "D1N"}, 9313);
        Path out = dir.resolve("o");
        Run r = lanesift("sift", "--capture", cap.toString(), "--out", out.toString(), "--quiet");
        assertEquals(0, r.code(), r.err());
        JsonValue report = json(out.resolve("report.json"));
        assertEquals("packet", report.at("/link/kind/value").asString());
        // D-PHY HS data on both clock edges: UI = half the clock period (docs/reference-facts.md#d-phy-levels-and-states)
        assertEquals(PacketLinkCapture.UI_S, report.at("/link/unitIntervalS/value").asDouble(), 1e-12);
        List<JsonValue> log = json(out.resolve("decode/dsi-commands.json")).get("commands").elements();
        List<String> want = new ArrayList<>();
        List<String> got = new ArrayList<>();
        for (PacketLinkCapture.Command c : gen.commands) {
            StringBuilder p = new StringBuilder();
            for (int b : c.params()) {
                p.append(p.length() == 0 ? "" : " ").append(String.format("%02X", b));
            }
            want.add(String.format("0x%02X 0x%02X [%s]", c.dataType(), c.command(), p));
        }
        for (JsonValue d : log) {
            got.add(d.get("dataType").asString() + " " + d.get("command").asString() + " [" + d.get("params").asString() + "]");
        }
        assertEquals(want, got, "every command, in order, with its parameters");
        assertEquals(gen.commands.size(), (int) report.at("/result/commands").asDouble());

        // --fail-on warning exits 3 exactly when the report counts a warning or an error, and the
        // trust table counts what its rows say
        long warnings = (long) report.at("/trust/warnings").asDouble();
        long errors = (long) report.at("/trust/errors").asDouble();
        long rows = 0;
        for (JsonValue f : report.at("/trust/findings").elements()) {
            String sev = f.get("severity").asString();
            rows += sev.equals("warning") || sev.equals("error") ? (long) f.get("count").asDouble() : 0;
        }
        assertEquals(warnings + errors, rows, "the trust counts are the sum of its rows");
        Run strict = lanesift("sift", "--capture", cap.toString(), "--out", dir.resolve("strict").toString(), "--fail-on", "warning",
                "--quiet");
        assertEquals(warnings + errors > 0 ? 3 : 0, strict.code(), strict.err());
        assertSkews(report.at("/skews"), new String[] {"CKN", "D0N", "D1N"}, PacketLinkCapture.LEG_SKEW_PS,
                new String[] {"D0", "D1"}, PacketLinkCapture.LANE_SKEW_PS);
    }

    /** Every skew within 50 ps of the injected one: legs (N against P) first, then lanes against the clock. */
    static void assertSkews(JsonValue skews, String[] nLegs, String[] lanes) {
        assertSkews(skews, nLegs, PixelLinkCapture.LEG_SKEW_PS, lanes, PixelLinkCapture.LANE_SKEW_PS);
    }

    /** Every skew measured (not a default) and within 50 ps of the injected one. */
    static void assertSkews(JsonValue skews, String[] nLegs, double[] legTruthPs, String[] lanes, double[] laneTruthPs) {
        List<String> wrong = new ArrayList<>();
        for (JsonValue s : skews.elements()) {
            String ch = s.get("channel").asString();
            double ps = s.get("skewPs").asDouble();
            if (!s.get("source").asString().startsWith("measured")) {
                wrong.add(ch + " not measured: " + s.get("source").asString());
            }
            for (int k = 0; k < nLegs.length; k++) {
                if (ch.equals(nLegs[k]) && Math.abs(ps - legTruthPs[k]) > 50) {
                    wrong.add(ch + " " + ps + " ps, injected " + legTruthPs[k]);
                }
            }
            for (int k = 0; k < lanes.length; k++) {
                if (ch.equals(lanes[k]) && Math.abs(ps - laneTruthPs[k]) > 50) {
                    wrong.add(ch + " " + ps + " ps, injected " + laneTruthPs[k]);
                }
            }
        }
        assertEquals(nLegs.length + lanes.length, skews.elements().size(), skews::toString);
        assertEquals(List.of(), wrong);
    }

    /** Every pixel's top 6 bits per colour (the 18-bit wire value; the decoder widens to 8 bits) equal the generated one. */
    static void assertFrameExact(Path png, int[] truth) throws IOException {
        assertTrue(Files.exists(png), png::toString);
        BufferedImage im = ImageIO.read(png.toFile());
        assertEquals(PixelLinkCapture.H_ACTIVE, im.getWidth());
        assertEquals(PixelLinkCapture.V_ACTIVE, im.getHeight());
        int bad = 0;
        for (int y = 0; y < im.getHeight(); y++) {
            for (int x = 0; x < im.getWidth(); x++) {
                int rgb = im.getRGB(x, y);
                int six = (((rgb >> 16) & 0xFF) >> 2) << 12 | (((rgb >> 8) & 0xFF) >> 2) << 6 | ((rgb & 0xFF) >> 2);
                if (six != truth[y * PixelLinkCapture.H_ACTIVE + x]) {
                    bad++;
                }
            }
        }
        assertEquals(0, bad, png + ": pixels that differ from the generated frame");
    }
}
