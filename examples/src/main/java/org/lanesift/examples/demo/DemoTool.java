package org.lanesift.examples.demo;

import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import javax.imageio.ImageIO;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.report.Sourced;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OutputException;
import org.lanesift.kit.FramePictures;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;
import org.lanesift.runner.ChainRun;
import org.lanesift.runner.link.ChainModels;
import org.lanesift.runner.link.SkewTables;

/**
 * {@code lanesift demo}: writes the invented demo scenario's captures as instrument exports, the
 * chain files it uses, runs them (three passes per link: leg skew, lane skew, decode) and compares
 * what was decoded with the scenario's ground truth. It lives beside the scenario and reaches the
 * runner through its Java API ({@link ChainRun}); the runner finds it through ServiceLoader.
 */
public final class DemoTool implements Tool {
    /** The command line. */
    static final ToolSpec SPEC = ToolSpec.builder("demo")
            .summary("runs the main job on the bundled demo scenario and compares it with the scenario's ground truth")
            .description("Writes the demo scenario (docs/demo-scenario.md) as instrument exports (raw + sidecar, CSV),",
                    "the chain files it uses, runs them and compares the result with the scenario's ground truth.")
            .option(OptionSpec.text("out", "lanesift-demo", "output directory"), "DIR")
            .footer("Exit codes: 0 everything matched, 1 a mismatch or failure, 2 bad arguments.")
            .build();

    /** Creates the tool (ServiceLoader). */
    public DemoTool() {
    }

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        Path dir = Path.of(args.text("out"));
        try {
            return new DemoRun(dir, console.out(), console.err()).execute();
        } catch (IOException | UncheckedIOException e) {
            throw new OutputException("demo: " + dir + ": " + e.getMessage(), e);
        }
    }

    /** One run of the demo. */
    private static final class DemoRun {
        private final Path dir;
        private final PrintStream out;
        private final PrintStream err;
        private final List<String> summary = new ArrayList<>();
        private final StringBuilder report = new StringBuilder();
        private boolean allMatched = true;

        DemoRun(Path dir, PrintStream out, PrintStream err) {
            this.dir = dir;
            this.out = out;
            this.err = err;
        }

        int execute() throws IOException {
            long t0 = System.nanoTime();
            for (String d : new String[] {"captures", "chains", "skew", "pixel", "packet", "work"}) {
                Files.createDirectories(dir.resolve(d));
            }
            out.println("lanesift demo: the invented Siftlet-64 (docs/demo-scenario.md), output in " + dir);
            ExecutorService pool = Executors.newFixedThreadPool(2);
            try {
                Future<PixelLinkScene.Truth> pixel = pool.submit(this::pixelLink);
                Future<PacketLinkScene.Truth> packet = pool.submit(this::packetLink);
                PixelLinkScene.Truth pt = pixel.get();
                PacketLinkScene.Truth kt = packet.get();
                comparePixel(pt);
                comparePacket(kt);
            } catch (java.util.concurrent.ExecutionException e) {
                Throwable c = e.getCause();
                err.println("demo: " + (c instanceof DemoFailure ? c.getMessage() : String.valueOf(c)));
                return 1;
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return 1;
            } finally {
                pool.shutdownNow();
            }
            double s = (System.nanoTime() - t0) / 1e9;
            writeReport(s);
            for (String line : summary) {
                out.println("  " + line);
            }
            out.printf(Locale.ROOT, "%s in %.1f s; report: %s%n", allMatched ? "everything matched the ground truth"
                    : "MISMATCHES against the ground truth (see report)", s, dir.resolve("report.md"));
            return allMatched ? 0 : 1;
        }

        private void runChain(Map<String, Object> model, String name, Path outDir) throws IOException {
            Path chain = dir.resolve("chains").resolve(name);
            ChainModels.write(chain, model);
            ByteArrayOutputStream o = new ByteArrayOutputStream();
            ByteArrayOutputStream e = new ByteArrayOutputStream();
            int code = ChainRun.of(chain).out(outDir).quiet(true)
                    .run(new PrintStream(o, true, StandardCharsets.UTF_8), new PrintStream(e, true, StandardCharsets.UTF_8));
            if (code != 0) {
                throw new DemoFailure("chain " + chain + " failed (exit " + code + "): " + e.toString(StandardCharsets.UTF_8).trim());
            }
        }

        private PixelLinkScene.Truth pixelLink() throws IOException {
            PixelLinkScene.Capture c = PixelLinkScene.render(Impairments.pixelLinkDefaults());
            Path cap = dir.resolve("captures/pixel-link.bin");
            CaptureFiles.writeRaw(cap, c.channels(), c.volts(), c.sampleRateHz(), 50e-6);
            List<String> notes = new ArrayList<>();
            runChain(DemoChains.pixelLegs(dir.resolve("chains"), cap), "pixel-1-legs.json", dir.resolve("work/pixel-1"));
            Path legs = SkewTables.merge(dir.resolve("work/pixel-1"), "legs-", dir.resolve("skew/pixel-legs.json"), notes);
            runChain(DemoChains.pixelLanes(dir.resolve("chains"), cap, legs), "pixel-2-lanes.json", dir.resolve("work/pixel-2"));
            Path lanes = SkewTables.merge(dir.resolve("work/pixel-2"), "lanes-", dir.resolve("skew/pixel-lanes.json"), notes);
            runChain(DemoChains.pixelDecode(dir.resolve("chains"), cap, legs, lanes), "pixel-3-decode.json", dir.resolve("pixel"));
            synchronized (this) {
                pixelNotes.addAll(notes);
            }
            return c.truth();
        }

        private PacketLinkScene.Truth packetLink() throws IOException {
            PacketLinkScene.Capture c = PacketLinkScene.render(Impairments.packetLinkDefaults());
            Path cap = dir.resolve("captures/packet-link.csv");
            CaptureFiles.writeCsv(cap, c.channels(), c.volts(), c.sampleRateHz(), 0);
            List<String> notes = new ArrayList<>();
            runChain(DemoChains.packetLegs(dir.resolve("chains"), cap), "packet-1-legs.json", dir.resolve("work/packet-1"));
            Path legs = SkewTables.merge(dir.resolve("work/packet-1"), "legs-", dir.resolve("skew/packet-legs.json"), notes);
            runChain(DemoChains.packetLanes(dir.resolve("chains"), cap, legs), "packet-2-lanes.json", dir.resolve("work/packet-2"));
            Path lanes = SkewTables.merge(dir.resolve("work/packet-2"), "lanes-", dir.resolve("skew/packet-lanes.json"), notes);
            runChain(DemoChains.packetDecode(dir.resolve("chains"), cap, legs, lanes), "packet-3-decode.json", dir.resolve("packet"));
            synchronized (this) {
                packetNotes.addAll(notes);
            }
            return c.truth();
        }

        private final List<String> pixelNotes = new ArrayList<>();
        private final List<String> packetNotes = new ArrayList<>();

        private void comparePixel(PixelLinkScene.Truth t) throws IOException {
            report.append("## Part (a): 7:1 pixel link\n\n");
            int match = 0;
            int total = 0;
            List<String> missing = new ArrayList<>();
            for (int i = 0; i < t.completeFrames().size(); i++) {
                int k = t.completeFrames().get(i);
                int[] truth = t.pictures().get(i);
                Path png = dir.resolve("pixel/" + FramePictures.fileName("panel", k, false));
                total += truth.length;
                if (!Files.exists(png)) {
                    missing.add(png.getFileName().toString());
                    continue;
                }
                BufferedImage im = ImageIO.read(png.toFile());
                for (int y = 0; y < PixelLinkScene.V_ACTIVE; y++) {
                    for (int x = 0; x < PixelLinkScene.H_ACTIVE; x++) {
                        if (x >= im.getWidth() || y >= im.getHeight()) {
                            continue;
                        }
                        int rgb = im.getRGB(x, y);
                        // 18-bit colour: the decoder widens 6 bits to 8 by replication; the top 6 bits are the wire bits
                        int six = (((rgb >> 16) & 0xFF) >> 2) << 12 | (((rgb >> 8) & 0xFF) >> 2) << 6 | ((rgb & 0xFF) >> 2);
                        if (six == truth[y * PixelLinkScene.H_ACTIVE + x]) {
                            match++;
                        }
                    }
                }
            }
            boolean partialOk = Files.exists(dir.resolve("pixel/" + FramePictures.fileName("panel", 0, true)))
                    && !Files.exists(dir.resolve("pixel/" + FramePictures.fileName("panel", 0, false)));
            check(match == total && missing.isEmpty() && partialOk, String.format(Locale.ROOT,
                    "pixel link: %d of %d pixels match in %d complete frames%s; partial first frame labelled partial: %s",
                    match, total, t.completeFrames().size(), missing.isEmpty() ? "" : " (missing " + missing + ")",
                    partialOk ? "yes" : "NO"));
            JsonValue timing = read(dir.resolve("pixel/panel-timing.json"));
            int[] expH = {PixelLinkScene.H_ACTIVE, PixelLinkScene.H_FRONT, PixelLinkScene.H_SYNC, PixelLinkScene.H_BACK, PixelLinkScene.H_TOTAL};
            int[] expV = {PixelLinkScene.V_ACTIVE, PixelLinkScene.V_FRONT, PixelLinkScene.V_SYNC, PixelLinkScene.V_BACK, PixelLinkScene.V_TOTAL};
            String[] keys = {"active", "frontPorch", "syncWidth", "backPorch", "total"};
            boolean timingOk = true;
            StringBuilder got = new StringBuilder();
            for (int i = 0; i < keys.length; i++) {
                int h = (int) number(at(timing, "horizontal", keys[i], "value"), -1);
                int v = (int) number(at(timing, "vertical", keys[i], "value"), -1);
                timingOk &= h == expH[i] && v == expV[i];
                got.append(i == 0 ? "" : "/").append(h);
            }
            double clk = number(at(timing, "pixelClockHz", "value"), 0);
            timingOk &= Math.abs(clk - t.pixelClockHz()) < 1e-4 * t.pixelClockHz();
            check(timingOk, String.format(Locale.ROOT, "pixel link timing: H %s, V %d/%d/%d/%d/%d lines, pixel clock %.4f MHz "
                            + "(truth 64/8/8/8/88, 40/2/2/4/48, 20 MHz)", got,
                    vertical(timing, "active"), vertical(timing, "frontPorch"), vertical(timing, "syncWidth"),
                    vertical(timing, "backPorch"), vertical(timing, "total"), clk / 1e6));
            skewLines("pixel link", dir.resolve("skew/pixel-legs.json"), dir.resolve("skew/pixel-lanes.json"),
                    DemoChains.PIXEL_PAIRS, t.legSkewPs(), t.laneSkewPs(), pixelNotes);
            JsonValue ring = at(read(dir.resolve("pixel/clk-p-ringing.json")), "summary");
            double fn = number(at(ring, "naturalHz", "value"), 0);
            double truthFn = Impairments.pixelLinkDefaults().ringFrequencyHz();
            check(Math.abs(fn - truthFn) < 0.05 * truthFn, String.format(Locale.ROOT,
                    "probe ringing on CLK_P: natural frequency %.1f MHz, damping %.3f (scenario: %.1f MHz, %.2f)", fn / 1e6,
                    number(at(ring, "dampingRatio", "value"), 0), truthFn / 1e6, Impairments.pixelLinkDefaults().ringDamping()));
            report.append("Files: `pixel/` (frames `panel-frame-NNNN.png`, `panel-timing.json`/`.txt`, `d0-eye.png` (eye of D0, P-N), ")
                    .append("`d1-edges.json` (edges of D1, P-N), `sampler-margins.json`, `clk-p-ringing.json` (ringing on the CLK_P leg), ")
                    .append("`clk-jitter.json` and `clk-bathtub.png` (clock edges), `report.md` of the decode pass).\n")
                    .append("To build with: `pixel/panel-timing.dts` (devicetree display-timings node), `pixel/panel-timing.h` ")
                    .append("(the same values as C macros) and `pixel/panel-tx.v` (a synthesisable Verilog 7:1 transmitter with this ")
                    .append("timing, the decoded slot mapping and a test picture); docs/timing-report.md and docs/transmitter.md.\n\n");
        }

        private void comparePacket(PacketLinkScene.Truth t) throws IOException {
            report.append("## Part (b): packet link\n\n");
            JsonValue commands = at(read(dir.resolve("packet/dsi-commands.json")), "commands");
            List<JsonValue> log = commands != null && commands.isArray() ? commands.elements() : List.of();
            int match = 0;
            int n = t.commands().size();
            List<String> diffs = new ArrayList<>();
            for (int i = 0; i < n; i++) {
                PacketLinkScene.Command c = t.commands().get(i);
                JsonValue d = i < log.size() ? log.get(i) : null;
                boolean memory = c.command() == 0x2C || c.command() == 0x3C;
                boolean ok = d != null && d.isObject() && Integer.decode(text(at(d, "command"), "-1")) == c.command()
                        && Integer.decode(text(at(d, "dataType"), "-1")) == c.dataType()
                        && (memory || text(at(d, "params"), "").equals(hex(c.params())));
                if (ok) {
                    match++;
                } else if (diffs.size() < 5) {
                    diffs.add("#" + i + " expected " + String.format("%02X", c.command()) + " " + hex(c.params()) + ", got " + d);
                }
            }
            boolean extra = log.size() != n;
            check(match == n && !extra, "packet link: " + match + " of " + n + " commands match (type, command, parameters)"
                    + (extra ? "; decoded " + log.size() + " commands" : "") + (diffs.isEmpty() ? "" : "; first differences: " + diffs));
            int pm = 0;
            int pt = 0;
            for (int k = 0; k < t.pictures().size(); k++) {
                int[] truth = t.pictures().get(k);
                pt += truth.length;
                Path png = dir.resolve("packet/" + FramePictures.fileName("dsi", k, false));
                if (!Files.exists(png)) {
                    continue;
                }
                BufferedImage im = ImageIO.read(png.toFile());
                for (int y = 0; y < Math.min(im.getHeight(), PacketLinkScene.HEIGHT); y++) {
                    for (int x = 0; x < Math.min(im.getWidth(), PacketLinkScene.WIDTH); x++) {
                        if ((im.getRGB(x, y) & 0xFFFFFF) == truth[y * PacketLinkScene.WIDTH + x]) {
                            pm++;
                        }
                    }
                }
            }
            check(pm == pt, "packet link: " + pm + " of " + pt + " pixels match in " + t.pictures().size() + " frames");
            skewLines("packet link", dir.resolve("skew/packet-legs.json"), dir.resolve("skew/packet-lanes.json"),
                    DemoChains.PACKET_PAIRS, t.legSkewPs(), t.laneSkewPs(), packetNotes);
            report.append("Files: `packet/` (`dsi-commands.json`/`.csv`, the init sequence `dsi-init.h`, frames `dsi-frame-NNNN.png`, ")
                    .append("`dsi-timing.json`, every packet in `dsi-packets.jsonl`/`.csv`, `report.md` of the decode pass).\n")
                    .append("To build with: `packet/dsi-init.h` holds the link configuration, the init commands with their mode, ")
                    .append("data identifier and waits in whole microseconds (rounded up), and the first frame's window apart from ")
                    .append("them; docs/init-sequence.md and docs/packet-export.md.\n\n");
        }

        /** Skew errors: the corrections should be minus the injected skews. */
        private void skewLines(String link, Path legs, Path lanes, String[][] pairs, double[] legTruth, double[] laneTruth,
                               List<String> notes) throws IOException {
            JsonValue lg = at(read(legs), "channels");
            JsonValue ln = at(read(lanes), "channels");
            StringBuilder legText = new StringBuilder();
            double worst = 0;
            for (int k = 0; k < pairs.length; k++) {
                double corr = number(at(lg, pairs[k][2], "offsetPs"), 0) - number(at(lg, pairs[k][1], "offsetPs"), 0);
                double errPs = corr + legTruth[k];
                boolean applied = !text(at(lg, pairs[k][2], "method"), "").equals("manual");
                legText.append(String.format(Locale.ROOT, "%s%s %+.1f ps (truth %+.0f, error %s)", k == 0 ? "" : ", ", pairs[k][2],
                        -corr, legTruth[k], applied ? String.format(Locale.ROOT, "%.1f ps", errPs) : "not estimated"));
                if (applied) {
                    worst = Math.max(worst, Math.abs(errPs));
                }
            }
            StringBuilder laneText = new StringBuilder();
            double worstLane = 0;
            for (int k = 1; k < pairs.length; k++) {
                double corr = number(at(ln, pairs[k][0], "offsetPs"), 0) - number(at(ln, pairs[0][0], "offsetPs"), 0);
                double errPs = corr + laneTruth[k - 1];
                worstLane = Math.max(worstLane, Math.abs(errPs));
                laneText.append(String.format(Locale.ROOT, "%s%s %+.1f ps (truth %+.0f, error %.1f ps)", k == 1 ? "" : ", ", pairs[k][0],
                        -corr, laneTruth[k - 1], errPs));
            }
            check(worst < 15 && worstLane < 25, link + " skew of N legs against P: " + legText);
            summary.add(link + " skew of data pairs against the clock pair: " + laneText);
            report.append("- ").append(link).append(" skew of data pairs against the clock pair: ").append(laneText).append('\n');
            for (String note : notes) {
                summary.add(link + " note: " + note);
                report.append("- note: ").append(note).append('\n');
            }
            report.append('\n');
        }

        private void check(boolean ok, String line) {
            allMatched &= ok;
            summary.add((ok ? "" : "MISMATCH: ") + line);
            report.append("- ").append(ok ? "" : "**MISMATCH** ").append(line).append('\n');
        }

        private void writeReport(double seconds) throws IOException {
            StringBuilder r = new StringBuilder();
            r.append("# Lanesift demo report\n\n");
            r.append("Scenario: the invented Siftlet-64 (docs/demo-scenario.md). Captures in `captures/`, the chain files that ")
                    .append("ran in `chains/` (paths relative to that folder), merged skew tables in `skew/`, intermediate passes ")
                    .append("in `work/`. Passes 2 and 3 apply the skew tables measured on this capture: on a capture of your own, ")
                    .append("run pass 1 and pass 2 on it first and merge their tables, never pass 3 alone.\n\n");
            r.append("Each link was decoded in three passes: (1) skew between the legs of every pair (cross-correlation), ")
                    .append("(2) legs corrected, skew of every data pair against the clock pair, (3) both corrected, then sampling ")
                    .append("and decoding. Skews are reported as measured (the correction is their negative).\n\n");
            r.append(report);
            r.append(String.format(Locale.ROOT, "Result: %s (%.1f s).%n", allMatched ? "everything matched the ground truth"
                    : "mismatches against the ground truth", seconds));
            Files.writeString(dir.resolve("report.md"), r.toString());
        }

        private static JsonValue read(Path f) throws IOException {
            return JsonReader.read(f, f.getFileName().toString());
        }

        /** The member at a path of names, or null where one is missing or not an object. */
        private static JsonValue at(JsonValue v, String... names) {
            JsonValue c = v;
            for (String n : names) {
                if (c == null || !c.isObject()) {
                    return null;
                }
                c = c.get(n);
            }
            return c;
        }

        private static double number(JsonValue v, double absent) {
            JsonValue n = Sourced.plain(v);
            return n != null && n.isNumber() ? n.asDouble() : absent;
        }

        private static String text(JsonValue v, String absent) {
            return v != null && v.isString() ? v.asString() : absent;
        }

        private static int vertical(JsonValue timing, String key) {
            return (int) number(at(timing, "vertical", key, "value"), 0);
        }

        private static String hex(byte[] b) {
            StringBuilder s = new StringBuilder();
            for (byte x : b) {
                if (s.length() > 0) {
                    s.append(' ');
                }
                s.append(String.format("%02X", x & 0xFF));
            }
            return s.toString();
        }
    }

    /** A chain of the demo failed. */
    private static final class DemoFailure extends RuntimeException {
        private static final long serialVersionUID = 1L;

        DemoFailure(String m) {
            super(m);
        }
    }
}
