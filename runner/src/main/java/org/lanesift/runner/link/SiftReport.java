package org.lanesift.runner.link;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;
import org.lanesift.runner.capture.InspectReport;
import org.lanesift.time.Femtos;

/**
 * The one report of a {@code sift} run, read back from what its chains wrote: first the result
 * (link, frames or packets and commands, timing, skews per named channel, the trust summary),
 * then the details (link facts with their sources, inputs, options as given, notes). Every value
 * says where it comes from: {@code measured}, {@code standard} (with a docs/reference-facts.md
 * anchor), {@code derived}, {@code given} or {@code assumed by default}, in the one host-api shape
 * ({@link Sourced}, {@link Source}). {@link #markdown()} and {@link #json()} render the
 * same model; docs/sift.md describes both.
 */
final class SiftReport {
    static final String FORMAT = "lanesift-sift-report/1";
    private final Map<String, Object> model = new LinkedHashMap<>();
    private final StringBuilder md = new StringBuilder();
    private final List<Map<String, Object>> findings = new ArrayList<>();
    private String headline = "";
    /** Channels whose applied skew correction is suspect, with the reason ("TX1: ambiguous ..."). */
    private final List<String> suspectSkews = new ArrayList<>();

    private SiftReport() {
    }

    static SiftReport read(Path out, Path capture, InspectReport inspect, List<LinkChains.Pair> pairs, LinkFacts f,
                           List<String> notes, ToolArgs args) throws IOException {
        SiftReport r = new SiftReport();
        r.model.put("format", FORMAT);
        Path decode = out.resolve("decode");
        r.suspectSkews(out.resolve("skew/legs.json"), out.resolve("skew/lanes.json"));
        r.result(decode, f, pairs);
        r.skews(out.resolve("skew/legs.json"), out.resolve("skew/lanes.json"), pairs);
        r.findings(decode.resolve("annotations.jsonl"));
        r.details(capture, inspect, pairs, f, notes, args);
        return r;
    }

    private static Map<String, Object> value(Object v, String unit, Source source) {
        return new Sourced(v, unit, source).model();
    }

    /**
     * Every row of the applied tables that carries a suspect reason: whatever was decoded through
     * it is suspect too, so the frame counts below say so even when the decoder saw nothing wrong.
     */
    private void suspectSkews(Path... tables) throws IOException {
        for (Path t : tables) {
            if (!Files.exists(t)) {
                continue; // no legs table: a logic capture
            }
            JsonValue ch = at(read(t), "channels");
            if (ch == null || !ch.isObject()) {
                continue;
            }
            for (Map.Entry<String, JsonValue> e : ch.members().entrySet()) {
                JsonValue why = e.getValue().get("suspect");
                if (why != null && why.isString() && !why.asString().isEmpty()) {
                    suspectSkews.add(e.getKey() + ": " + why.asString());
                }
            }
        }
    }

    /** The markdown sentence saying why every frame counts as suspect, or empty. */
    private String suspectSkewNote() {
        return suspectSkews.isEmpty() ? "" : "Every frame counts as suspect: it was decoded through a suspect skew correction ("
                + String.join("; ", suspectSkews) + ").\n\n";
    }

    private void result(Path decode, LinkFacts f, List<LinkChains.Pair> pairs) throws IOException {
        Map<String, Object> res = new LinkedHashMap<>();
        String lanes = pairs.subList(1, pairs.size()).stream().map(LinkChains.Pair::name).toList().toString();
        md.append("# Lanesift sift report\n\n## Result\n\n");
        if (!f.packet()) {
            JsonValue t = read(decode.resolve("panel-timing.json"));
            long complete = (long) num(at(t, "frames", "complete"));
            long partial = (long) num(at(t, "frames", "partial"));
            long suspect = suspectSkews.isEmpty() ? (long) num(at(t, "frames", "suspect")) : complete + partial;
            res.put("link", "7:1 pixel link, clock " + pairs.get(0).name() + ", data " + lanes + ", mapping " + f.mapping());
            res.put("frames", Map.of("complete", complete, "partial", partial, "suspect", suspect));
            res.put("suspectSkews", List.copyOf(suspectSkews));
            headline = String.format(Locale.ROOT, "7:1 pixel link (%s, %d data pairs): %d complete, %d partial, %d suspect frames%n",
                    f.mapping(), f.dataLanes(), complete, partial, suspect);
            md.append("Decoded a **7:1 pixel link**: clock pair ").append(pairs.get(0).name()).append(", data pairs ").append(lanes)
                    .append(", mapping `").append(f.mapping()).append("`.\n\n")
                    .append(String.format(Locale.ROOT, "Frames: **%d complete**, %d partial, %d suspect.%n%n", complete, partial, suspect))
                    .append(suspectSkewNote());
            Map<String, Object> timing = new LinkedHashMap<>();
            md.append("### Timing\n\n| timing | active | front porch | sync | back porch | total |\n| --- | --- | --- | --- | --- | --- |\n");
            for (String axis : new String[] {"horizontal", "vertical"}) {
                Map<String, Object> row = new LinkedHashMap<>();
                md.append("| ").append(axis).append(" (").append(text(at(t, axis, "unit"))).append(')');
                for (String k : new String[] {"active", "frontPorch", "syncWidth", "backPorch", "total"}) {
                    double v = num(at(t, axis, k, "value"));
                    row.put(k, v);
                    md.append(" | ").append(Double.isFinite(v) ? String.format(Locale.ROOT, "%.0f", v) : "not seen");
                }
                md.append(" |\n");
                row.put("unit", text(at(t, axis, "unit")));
                row.put("source", Source.measured("").text());
                timing.put(axis, row);
            }
            double pclk = num(at(t, "pixelClockHz", "value"));
            double refresh = num(at(t, "refreshHz", "value"));
            timing.put("pixelClockHz", value(pclk, "Hz", Source.measured("")));
            timing.put("refreshHz", value(refresh, "Hz", Source.measured("")));
            res.put("timing", timing);
            md.append(String.format(Locale.ROOT, "%nPixel clock %.4f MHz (measured), refresh %.4g Hz (measured).%n%n", pclk / 1e6, refresh));
        } else {
            JsonValue cmds = at(read(decode.resolve("dsi-commands.json")), "commands");
            JsonValue frames = at(read(decode.resolve("dsi-timing.json")), "frames");
            long packets = countKind(decode.resolve("annotations.jsonl"), "packet");
            int nc = cmds != null && cmds.isArray() ? cmds.elements().size() : 0;
            int nf = frames != null && frames.isArray() ? frames.elements().size() : 0;
            long suspect = !suspectSkews.isEmpty() ? nf : frames != null && frames.isArray()
                    ? frames.elements().stream().filter(e -> e.get("suspect") != null && e.get("suspect").isBoolean()
                    && e.get("suspect").asBoolean()).count() : 0;
            res.put("link", "packet link, clock " + pairs.get(0).name() + ", data lanes " + lanes);
            res.put("packets", packets);
            res.put("commands", nc);
            res.put("frames", Map.of("complete", nf - suspect, "suspect", suspect));
            res.put("suspectSkews", List.copyOf(suspectSkews));
            headline = String.format(Locale.ROOT, "packet link (%d data lanes): %d packets, %d commands, %d frames (%d suspect)%n",
                    f.dataLanes(), packets, nc, nf, suspect);
            md.append("Decoded a **packet link**: clock pair ").append(pairs.get(0).name()).append(", data lanes ").append(lanes)
                    .append(".\n\n").append(String.format(Locale.ROOT,
                            "**%d packets**, **%d commands**, %d frames (%d suspect). Commands: `decode/dsi-commands.csv`, "
                                    + "init sequence: `decode/dsi-init.h`.%n%n", packets, nc, nf, suspect)).append(suspectSkewNote());
        }
        if (!suspectSkews.isEmpty()) {
            headline += "every frame is suspect: decoded through a suspect skew correction ("
                    + String.join(", ", suspectSkews.stream().map(x -> x.substring(0, x.indexOf(':'))).toList()) + ")\n";
        }
        res.put("source", Source.measured("decoded by chains/" + SiftTool.CHAIN).text());
        model.put("result", res);
    }

    private void skews(Path legs, Path lanes, List<LinkChains.Pair> pairs) throws IOException {
        JsonValue lg = Files.exists(legs) ? at(read(legs), "channels") : null; // a logic capture has no legs
        JsonValue ln = at(read(lanes), "channels");
        List<Object> list = new ArrayList<>();
        md.append("### Skews\n\n| channel | skew | against | kind | confidence | source |\n| --- | --- | --- | --- | --- | --- |\n");
        for (LinkChains.Pair p : lg == null ? List.<LinkChains.Pair>of() : pairs) {
            double ps = num(at(lg, p.n(), "offsetPs")) - num(at(lg, p.p(), "offsetPs"));
            skewRow(list, p.n(), p.p(), "leg", -ps, num(at(lg, p.n(), "confidence")), text(at(lg, p.n(), "method")));
        }
        LinkChains.Pair clk = pairs.get(0);
        for (LinkChains.Pair p : pairs.subList(1, pairs.size())) {
            double ps = num(at(ln, p.name(), "offsetPs")) - num(at(ln, clk.name(), "offsetPs"));
            skewRow(list, p.name(), clk.name(), "lane", -ps, num(at(ln, p.name(), "confidence")), text(at(ln, p.name(), "method")));
        }
        md.append("\nA skew is how late the channel is against the reference; the correction applied is its negative.\n\n");
        model.put("skews", list);
    }

    private void skewRow(List<Object> list, String ch, String against, String kind, double ps, double conf, String method) {
        boolean applied = !method.equals("manual");
        String source = (applied ? Source.measured(method) : Source.assumed("0 ps, the estimate was not confident enough")).text();
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("channel", ch);
        m.put("against", against);
        m.put("kind", kind);
        m.put("skewPs", applied ? ps : 0.0);
        m.put("confidence", conf);
        m.put("source", source);
        list.add(m);
        md.append("| ").append(ch).append(" | ").append(Femtos.format(applied ? ps * 1e3 : 0)).append(" | ").append(against)
                .append(" | ").append(kind).append(" | ").append(String.format(Locale.ROOT, "%.2f", conf)).append(" | ")
                .append(source).append(" |\n");
    }

    /** One-line meanings of the findings a decode can give; others are described by their own label. */
    private static final Map<String, String> MEANINGS = Map.of(
            "input-invalid", "samples at the capture ends that the leg deskew cannot interpolate; nothing is decoded there",
            "partial-frame", "the capture starts or ends inside a frame; that frame is shown but not counted as complete",
            "frame", "a frame that is not complete or not consistent with the others",
            "margin-low", "a sampled bit lies close to a data edge: little setup or hold margin on that lane",
            "level-out-of-range", "a differential level outside the standard's range",
            "level-near-limit", "a differential level close to the standard's limit",
            "clock-dropout", "the clock stopped for longer than expected",
            "skew-suspect", "a skew estimate is ambiguous, weak or near half an interval: what was decoded through it is suspect",
            "skew-not-applied", "a skew estimate was too weak to apply; that channel was decoded without correction");

    private void findings(Path annotations) throws IOException {
        Map<String, Map<String, Object>> groups = new LinkedHashMap<>();
        for (String line : Files.readAllLines(annotations, StandardCharsets.UTF_8)) {
            if (line.isBlank()) {
                continue;
            }
            JsonValue a = JsonReader.parse(annotations.getFileName().toString(), line);
            String sev = text(a.get("severity"));
            if (!sev.equals("warning") && !sev.equals("error")) {
                continue;
            }
            String kind = text(a.get("kind"));
            String track = text(a.get("track"));
            Map<String, Object> g = groups.computeIfAbsent(sev + "|" + kind + "|" + track, k -> {
                Map<String, Object> m = new LinkedHashMap<>();
                m.put("severity", sev);
                m.put("kind", kind);
                m.put("channel", track);
                m.put("count", 0L);
                m.put("meaning", MEANINGS.getOrDefault(kind, text(a.get("label"))));
                m.put("firstAt", Femtos.format(num(a.get("start_fs"))));
                m.put("source", Source.measured("by " + text(a.get("source"))).text());
                return m;
            });
            g.put("count", (Long) g.get("count") + 1);
        }
        findings.addAll(groups.values());
        findings.sort((x, y) -> x.get("severity").equals(y.get("severity")) ? 0 : x.get("severity").equals("error") ? -1 : 1);
        long errors = findings.stream().filter(m -> m.get("severity").equals("error")).mapToLong(m -> (Long) m.get("count")).sum();
        long warnings = findings.stream().filter(m -> m.get("severity").equals("warning")).mapToLong(m -> (Long) m.get("count")).sum();
        model.put("trust", Map.of("errors", errors, "warnings", warnings, "findings", findings));
        md.append(String.format(Locale.ROOT, "### Trust: %d errors, %d warnings%n%n", errors, warnings));
        if (findings.isEmpty()) {
            md.append("No warnings or errors.\n\n");
        } else {
            md.append("| severity | finding | channel | count | first at | meaning |\n| --- | --- | --- | --- | --- | --- |\n");
            for (Map<String, Object> g : findings) {
                md.append("| ").append(g.get("severity")).append(" | ").append(g.get("kind")).append(" | ").append(g.get("channel"))
                        .append(" | ").append(g.get("count")).append(" | ").append(g.get("firstAt")).append(" | ")
                        .append(g.get("meaning")).append(" |\n");
            }
            md.append('\n');
        }
        headline += String.format(Locale.ROOT, "trust: %d errors, %d warnings%n", errors, warnings);
    }

    private void details(Path capture, InspectReport inspect, List<LinkChains.Pair> pairs, LinkFacts f, List<String> notes,
                         ToolArgs args) throws IOException {
        Map<String, Object> link = new LinkedHashMap<>();
        String std = f.packet() ? LinkFacts.DPHY_SOURCE : LinkFacts.PIXEL_SOURCE;
        String anchor = std.substring(std.indexOf('#') + 1);
        Sourced kind = new Sourced(f.packet() ? "packet" : "pixel", null, f.kindSource());
        Sourced clock = new Sourced(f.clockHz(), "Hz", Source.measured("on " + pairs.get(0).p()));
        Sourced ui = new Sourced(f.unitIntervalFs() / 1e15, "s", Source.derived("measured clock period / "
                + (f.packet() ? "2 (DDR, " : "7 (") + std + ")"));
        link.put("kind", kind.model());
        link.put("clockHz", clock.model());
        link.put("unitIntervalS", ui.model());
        Sourced mapping = new Sourced(f.mapping(), null, Source.standard(f.dataLanes() + " data pairs", anchor));
        if (!f.packet()) {
            link.put("mapping", mapping.model());
            link.put("mappingAlsoFits", f.mappingAlso().isEmpty() ? null : f.mappingAlso());
        }
        List<Object> pairList = new ArrayList<>();
        StringBuilder pairText = new StringBuilder();
        for (LinkChains.Pair p : pairs) {
            pairList.add(Map.of("name", p.name(), "p", p.p(), "n", p.n()));
            pairText.append(p.name()).append(" = ").append(p.p()).append(p.n().isEmpty() ? "" : " / " + p.n())
                    .append(p == pairs.get(0) ? " (clock)" : "").append(p == pairs.get(pairs.size() - 1) ? "" : ", ");
        }
        Sourced pairsValue = new Sourced(pairList, null, args.text("map").isEmpty() && args.text("map-file").isEmpty()
                ? Source.measured("the pairs inspect found (anti-correlated levels or steps), the steadiest clock first")
                : Source.given("channel map"));
        link.put("pairs", pairsValue.model());
        model.put("link", link);
        md.append("## Details\n\n### Link\n\n")
                .append(kind.markdown("kind", f.packet() ? "packet link" : "7:1 pixel link"))
                .append(clock.markdown("clock", String.format(Locale.ROOT, "%.6g MHz", f.clockHz() / 1e6)))
                .append(ui.markdown("unit interval", Femtos.format(f.unitIntervalFs())));
        if (!f.packet()) {
            md.append(mapping.markdown("slot mapping", "`" + f.mapping() + "`"));
            if (!f.mappingAlso().isEmpty()) {
                md.append("- `").append(f.mappingAlso()).append("` also fits 4 data pairs: if the colours look wrong, edit"
                        + " `chains/3-decode.json` (node `panel`, option `mapping`) and rerun it\n");
            }
        }
        md.append(pairsValue.markdown("pairs", pairText.toString())).append('\n');
        Map<String, Object> in = new LinkedHashMap<>();
        in.put("file", capture.toString());
        in.put("format", inspect.format());
        in.put("sizeBytes", Files.size(capture));
        in.put("channels", inspect.channels().stream().map(InspectReport.Channel::name).toList());
        double rate = inspect.channels().stream().filter(c -> c.sampleRateHz() != null).mapToDouble(InspectReport.Channel::sampleRateHz)
                .findFirst().orElse(Double.NaN);
        double dur = inspect.channels().stream().mapToDouble(InspectReport.Channel::durationS).max().orElse(Double.NaN);
        in.put("sampleRateHz", rate);
        in.put("durationS", dur);
        in.put("source", Source.measured("read from the capture by inspect").text());
        model.put("inputs", in);
        md.append("### Inputs\n\n- file: `").append(capture).append("` (").append(inspect.format()).append(", ")
                .append(String.format(Locale.ROOT, "%.3g MB", Files.size(capture) / 1e6)).append(")\n- channels: ")
                .append(String.join(", ", (List<String>) in.get("channels"))).append('\n')
                .append(String.format(Locale.ROOT, "- sample rate: %.4g GS/s; duration: %s%n%n", rate / 1e9, Femtos.format(dur * 1e15)));
        Map<String, Object> opts = new LinkedHashMap<>();
        md.append("### Options\n\n");
        for (String o : new String[] {"capture", "link", "map", "map-file", "out", "fail-on"}) {
            if (args.given(o)) {
                opts.put(o, args.text(o));
                md.append("- --").append(o).append(' ').append(args.text(o)).append('\n');
            } else {
                md.append("- --").append(o).append(": not given").append(args.text(o).isEmpty() ? "" : " (default " + args.text(o) + ")")
                        .append('\n');
            }
        }
        model.put("options", opts);
        model.put("notes", notes);
        md.append("\n### Notes and files\n\n");
        for (String n : notes) {
            md.append("- ").append(n).append('\n');
        }
        md.append("- chain that ran: `chains/" + SiftTool.CHAIN + "` (one run: its skew estimators feed the corrections through"
                + " calibration wires; paths relative to the chain file; rerun with `lanesift run chains/" + SiftTool.CHAIN
                + " --out DIR`); skew tables as applied in `skew/`; decoder outputs in `decode/`.\n");
        md.append("- Safety: display flex cables and connectors are sensitive to electrostatic discharge; a scope's ground lead"
                + " is earthed, so never clip it to a mains-referenced circuit. Follow local codes and licensed practice.\n");
    }

    /** Whether findings of {@code failOn} severity or worse exist ({@code none} never). */
    boolean reaches(String failOn) {
        return switch (failOn) {
            case "error" -> findings.stream().anyMatch(m -> m.get("severity").equals("error"));
            case "warning" -> !findings.isEmpty();
            default -> false;
        };
    }

    String headline() {
        return headline;
    }

    String markdown() {
        return md.toString();
    }

    String json() {
        return ChainModels.text(model);
    }

    private static long countKind(Path annotations, String kind) throws IOException {
        long n = 0;
        for (String line : Files.readAllLines(annotations, StandardCharsets.UTF_8)) {
            if (!line.isBlank() && kind.equals(text(JsonReader.parse(annotations.getFileName().toString(), line).get("kind")))) {
                n++;
            }
        }
        return n;
    }

    private static JsonValue read(Path f) throws IOException {
        return JsonReader.read(f, f.getFileName().toString());
    }

    /** The value at a path of member names (as an RFC 6901 pointer), or null where the path leads nowhere. */
    private static JsonValue at(JsonValue v, String... names) {
        StringBuilder pointer = new StringBuilder();
        for (String n : names) {
            pointer.append('/').append(n.replace("~", "~0").replace("/", "~1"));
        }
        return v == null ? null : v.at(pointer.toString());
    }

    private static double num(JsonValue v) {
        JsonValue n = Sourced.plain(v);
        return n != null && n.isNumber() ? n.asDouble() : Double.NaN;
    }

    private static String text(JsonValue v) {
        return v != null && v.isString() ? v.asString() : "";
    }
}
