package org.lanesift.plugins.discovery;

import java.util.List;
import java.util.Locale;
import org.lanesift.json.JsonWriter;
import org.lanesift.kit.LineState;
import org.lanesift.kit.LineStateClassifier;
import org.lanesift.unit.Quantity;

/**
 * The hypotheses report, as JSON ({@code <id>-hypotheses.json}) and Markdown
 * ({@code <id>-hypotheses.md}): each parameter with its ranked candidates, the evidence behind
 * them and a confidence from 0 to 1 (a heuristic: how clearly the best candidate stands out).
 */
final class HypothesesReport {
    private HypothesesReport() {
    }

    static String json(Hypotheses h, LinkEdgesInput in, LineStates states) {
        Hypotheses.Framing b = h.best();
        Clocking c = h.clocking();
        JsonWriter w = JsonWriter.pretty();
        w.beginObject();
        w.name("clocking").beginObject().field("best", c.name()).field("confidence", round(h.clockConfidence()))
                .field("bitsPerClockPeriod", c.slotsPerPeriod()).field("periodS", c.periodFs() * 1e-15).field("dutyCycle", round(c.dutyCycle()))
                .field("eyeUi", round(c.eyeUi())).field("transitionsInClusters", round(c.clusteredShare()))
                .field("transitionsExamined", c.transitions());
        w.name("samplePhases").inlineArray(roundAll(c.samplePhases()), c.samplePhases().length);
        w.name("transitionPhases").inlineArray(roundAll(c.transitionPhases()), c.transitionPhases().length);
        w.endObject();
        w.name("bursts").beginObject().field("boundaries", h.link().burstMode()).field("count", h.link().bursts())
                .field("bitsPerLane", h.link().bits()).field("clockPauses", c.clockStops());
        w.name("idleLevels").beginArrayInline();
        for (boolean l : h.link().idleLevel()) {
            w.value(l ? 1 : 0);
        }
        w.endArray();
        if (h.restart() != null) {
            SyncTolerance.Choice t = h.restart();
            w.name("restartAtSync").beginObject().field("syncErrors", t.errors()).field("wordBoundariesExamined", t.boundaries())
                    .field("chancePerBoundary", t.chance()).endObject();
        }
        if (states != null) {
            lineStates(w, states);
        }
        w.endObject();
        w.name("sync").beginObject().field("present", h.syncBits() > 0).field("bits", h.syncBits()).field("wire", h.syncWire())
                .field("hex", h.syncBits() > 0 ? ChainFile.syncHex(h.syncWire(), b.msbFirst()) : "")
                .field("commonPrefixBits", h.prefixBits()).field("burstsStartingWithIt", round(h.syncShare())).endObject();
        w.name("wordLength").beginArray();
        for (WordLengthFinder.Candidate x : h.wordLengths().subList(0, Math.min(6, h.wordLengths().size()))) {
            w.beginObjectInline().field("bits", x.wordBits()).field("syncBits", x.syncBits()).field("wholeBurstShare", round(x.wholeShare()))
                    .endObject();
        }
        w.endArray();
        w.name("framings").beginArray();
        for (Hypotheses.Framing f : h.framings().subList(0, Math.min(8, h.framings().size()))) {
            w.beginObjectInline().field("wordBits", f.wordBits()).field("bitOrder", f.msbFirst() ? "msb" : "lsb")
                    .field("lanes", f.distribution().label).field("score", round(f.score())).field("pictureSmoothness", round(f.pictureScore()))
                    .field("checksum", f.crc() == null ? "" : f.crc().model().name())
                    .field("lengthFieldWord", f.fields().lengthWord).endObject();
        }
        w.endArray();
        w.name("checksum").beginObject().field("found", b.crc() != null);
        if (b.crc() != null) {
            CrcModel m = b.crc().model();
            w.field("model", m.name()).field("width", m.width()).field("poly", hex(m.poly())).field("init", hex(m.init()))
                    .field("refin", m.refin()).field("refout", m.refout()).field("xorout", hex(m.xorout())).field("check", hex(m.check()))
                    .field("burstsMatching", b.crc().matched()).field("burstsTried", b.crc().tested());
        }
        w.endObject();
        BurstFields f = b.fields();
        w.name("fields").beginObject().field("lengthFieldWord", f.lengthWord).field("lengthOffsetWords", f.lengthOffset)
                .field("lengthFieldShare", round(f.lengthShare)).field("dataOpcode", f.dataOpcode < 0 ? "" : hex(f.dataOpcode));
        w.name("opcodes").beginArray();
        f.opcodes.entrySet().stream().sorted((x, y) -> Long.compare(y.getValue()[0], x.getValue()[0])).limit(12)
                .forEach(e -> w.beginObjectInline().field("value", hex(e.getKey())).field("bursts", e.getValue()[0])
                        .field("meanBits", e.getValue()[1] / e.getValue()[0]).field("kind", e.getKey() == f.dataOpcode ? "data" : "command")
                        .endObject());
        w.endArray().endObject();
        w.name("pictures").beginArray();
        for (PictureCandidate p : h.pictures()) {
            w.beginObjectInline().field("format", p.format().label).field("lineLength", p.lineLength()).field("lines", p.lines())
                    .field("smoothness", round(p.smoothness())).field("horizontal", round(p.horizontal()))
                    .field("vertical", round(p.vertical())).field("framing", p.hypothesis()).endObject();
        }
        w.endArray();
        w.name("bitAutocorrelation").beginArray();
        for (double[] lag : h.bitAutocorrelation()) {
            w.beginObjectInline().field("lag", (long) lag[0]).field("value", round(lag[1])).endObject();
        }
        w.endArray();
        w.name("entropyPerWirePosition").inlineArray(roundAll(h.entropyPerPosition()), h.entropyPerPosition().length);
        w.endObject();
        return w.finish();
    }

    /** The low-power/high-speed state pattern of the legs, under {@code bursts.lineStates}. */
    private static void lineStates(JsonWriter w, LineStates l) {
        w.name("lineStates").beginObject().field("pattern", l.found() ? PATTERN : "none").field("confidence", round(l.confidence()))
                .field("lanesExamined", l.lanes()).field("samplePairs", l.samples()).field("highSpeedIntervals", l.hsIntervals())
                .field("enteredThroughPattern", l.fullEntries());
        optional(w, "stopLevelVolts", round(l.stopLevelVolts()));
        optional(w, "highSpeedCommonModeVolts", round(l.hsCommonVolts()));
        optional(w, "lp01MeanS", l.lp01MeanS());
        optional(w, "lp00MeanS", l.lp00MeanS());
        w.name("timeShare").beginObjectInline();
        for (LineState s : LineState.values()) {
            w.field(s.label, round(l.stateShare()[s.ordinal()]));
        }
        w.endObject().field("source", "docs/reference-facts.md#d-phy-levels-and-states").endObject();
    }

    private static void optional(JsonWriter w, String name, double v) {
        if (Double.isFinite(v)) {
            w.field(name, v);
        }
    }

    /** The entry into high speed of a D-PHY lane. */
    static final String PATTERN = "LP-11, LP-01, LP-00, HS";

    /** The line-state paragraph of the Bursts section. */
    private static String lineStates(LineStates l) {
        StringBuilder s = new StringBuilder();
        s.append(f("Line states from the single-ended legs of %d lane(s) (a leg high above %.2f V, low below %.2f V; high speed at a"
                + " common mode of %.2f to %.2f V; docs/reference-facts.md#d-phy-levels-and-states): ", l.lanes(),
                LineStateClassifier.DEFAULT_HIGH_VOLTS, LineStateClassifier.DEFAULT_LOW_VOLTS, LineStateClassifier.DEFAULT_HS_COMMON_MIN_VOLTS,
                LineStateClassifier.DEFAULT_HS_COMMON_MAX_VOLTS));
        s.append(f("%d of %d high-speed intervals entered through LP-11, LP-01, LP-00", l.fullEntries(), l.hsIntervals()));
        if (l.fullEntries() > 0) {
            s.append(f(" (LP-01 for %s, LP-00 for %s on average)", Quantity.format(l.lp01MeanS(), "s"), Quantity.format(l.lp00MeanS(), "s")));
        }
        if (Double.isFinite(l.stopLevelVolts())) {
            s.append("; stop level (LP-11) ").append(Quantity.format(l.stopLevelVolts(), "V"));
        }
        if (Double.isFinite(l.hsCommonVolts())) {
            s.append("; high-speed common mode ").append(Quantity.format(l.hsCommonVolts(), "V"));
        }
        s.append("; time per state:");
        for (LineState st : LineState.values()) {
            if (l.stateShare()[st.ordinal()] > 0) {
                s.append(f(" %s %.0f %%", st.label, 100 * l.stateShare()[st.ordinal()]));
            }
        }
        s.append(l.found() ? f(". The lanes have the low-power/high-speed state pattern %s (confidence %.2f).\n\n", PATTERN, l.confidence())
                : f(". No low-power/high-speed state pattern (confidence %.2f).\n\n", l.confidence()));
        return s.toString();
    }

    static String markdown(Hypotheses h, LinkEdgesInput in, LineStates states, String id) {
        Hypotheses.Framing b = h.best();
        Clocking c = h.clocking();
        StringBuilder s = new StringBuilder();
        s.append("# Link format hypotheses\n\n");
        s.append("Clock `").append(in.clockName()).append("`, lanes ");
        for (int k = 0; k < in.laneNames().length; k++) {
            s.append(k > 0 ? ", " : "").append('`').append(in.laneNames()[k]).append('`');
        }
        s.append(". Best hypothesis: ").append(b.label()).append(", ").append(c.name()).append(", ")
                .append(h.syncBits() > 0 ? "sync " + h.syncWire() + " (wire order)" : "no sync").append(".\n\n");
        s.append("## Clocking\n\n");
        s.append(f("%s (confidence %.2f): %d bit(s) per clock period of %.4g ns; data transitions cluster at %s of the period"
                + " (%.0f %% of %d transitions inside the clusters); sample points %s; narrowest eye %.2f UI; duty cycle %.2f.\n\n",
                c.name(), h.clockConfidence(), c.slotsPerPeriod(), c.periodFs() / 1e6, phases(c.transitionPhases()),
                100 * c.clusteredShare(), c.transitions(), phases(c.samplePhases()), c.eyeUi(), c.dutyCycle()));
        s.append("## Bursts\n\n");
        s.append(f("%d bursts, boundaries from %s; idle level per lane %s.\n\n", h.link().bursts(), switch (h.link().burstMode()) {
            case "clock-stops" -> "clock pauses (" + c.clockStops() + " pauses)";
            case "idle-runs" -> "idle runs of at least " + h.link().idleRunBits() + " bits";
            default -> h.link().bursts() > 1 ? "the sync alone: the link streams without pauses, cut at every occurrence of the sync"
                    + " that leaves whole words"
                    : "nothing: the link streams without pauses and no sync stands out";
        }, levels(h.link().idleLevel())));
        if (states != null) {
            s.append(lineStates(states));
        }
        if (h.restart() != null) {
            SyncTolerance.Choice t = h.restart();
            s.append(f("The generated chain restarts the word alignment at every sync on a word boundary (`syncRestart`), accepting"
                    + " %d wrong sync bit(s) (`syncErrors`): on random data a word boundary matches that closely with probability"
                    + " %.2g, over the %d word boundaries examined %.2g chance matches are expected%s.\n\n", t.errors(), t.chance(),
                    t.boundaries(), t.chance() * t.boundaries(), t.errors() < SyncTolerance.MAX_ERRORS
                            ? "; more would let data pass for a sync (or the examined bursts already hold a near match)" : ""));
        }
        s.append("## Sync\n\n");
        if (h.syncBits() > 0) {
            s.append(f("%d bits `%s` in wire order (0x%s read %s first); %.0f %% of the bursts start with it on every lane "
                    + "(up to two bit errors); the bursts' common prefix is %d bits.\n\n", h.syncBits(), h.syncWire(),
                    ChainFile.syncHex(h.syncWire(), b.msbFirst()), b.msbFirst() ? "msb" : "lsb", 100 * h.syncShare(), h.prefixBits()));
        } else {
            s.append(f("None found: the bursts share a prefix of only %d bits.\n\n", h.prefixBits()));
        }
        s.append("## Word length\n\n| rank | bits | sync bits | bursts of whole words |\n| --- | --- | --- | --- |\n");
        List<WordLengthFinder.Candidate> wl = h.wordLengths();
        for (int i = 0; i < Math.min(5, wl.size()); i++) {
            s.append(f("| %d | %d | %d | %.0f %% |\n", i + 1, wl.get(i).wordBits(), wl.get(i).syncBits(), 100 * wl.get(i).wholeShare()));
        }
        s.append("\nEvidence: a burst carries whole words, so its length after the sync is a multiple of the word length; ");
        if (h.bitAutocorrelation().length > 0) {
            s.append(f("the bit stream's autocorrelation peaks at lags %d, %d and %d; ", (int) h.bitAutocorrelation()[0][0],
                    (int) h.bitAutocorrelation()[1][0], (int) h.bitAutocorrelation()[2][0]));
        }
        s.append("entropy per wire position within a word: ").append(phases(h.entropyPerPosition())).append(".\n\n");
        s.append("## Framing (word length, bit order, lanes)\n\n| rank | framing | score | picture smoothness | checksum | length field |\n"
                + "| --- | --- | --- | --- | --- | --- |\n");
        List<Hypotheses.Framing> fr = h.framings();
        for (int i = 0; i < Math.min(6, fr.size()); i++) {
            Hypotheses.Framing x = fr.get(i);
            s.append(f("| %d | %s | %.3f | %.3f | %s | %s |\n", i + 1, x.label(), x.score(), x.pictureScore(),
                    x.crc() == null ? "none" : x.crc().model().name(), x.fields().lengthWord < 0 ? "none" : "word " + x.fields().lengthWord));
        }
        s.append(f("\nConfidence %.2f (the best score's lead over the next framing).\n\n", confidence(fr)));
        s.append("## Checksum\n\n");
        if (b.crc() != null) {
            CrcModel m = b.crc().model();
            s.append(f("%s (width %d, poly 0x%X, init 0x%X, refin %s, refout %s, xorout 0x%X; check value 0x%X from the CRC RevEng "
                    + "catalogue) matches the last %d bits of %d of %d bursts tried.\n\n", m.name(), m.width(), m.poly(), m.init(),
                    m.refin(), m.refout(), m.xorout(), m.check(), m.width(), b.crc().matched(), b.crc().tested()));
            for (CrcModel t : CrcCatalogue.twins(m)) {
                s.append(f("On the wire it cannot be told from %s: a reflected CRC sent LSB first gives the same bits as its direct "
                        + "twin sent MSB first; %s is named because the words are sent %s first.\n\n", t.name(), m.name(),
                        b.msbFirst() ? "msb" : "lsb"));
            }
        } else {
            s.append("No CRC-8, CRC-16 or CRC-32 of the catalogue matches the end of at least 80 % of the bursts.\n\n");
        }
        s.append("## Commands and data\n\n");
        BurstFields f = b.fields();
        if (f.lengthWord >= 0) {
            s.append(f("Word %d is a length field: the burst has value + %d words (%.0f %% of bursts).\n\n", f.lengthWord, f.lengthOffset,
                    100 * f.lengthShare));
        }
        s.append("| leading word | bursts | mean bits | kind |\n| --- | --- | --- | --- |\n");
        f.opcodes.entrySet().stream().sorted((x, y) -> Long.compare(y.getValue()[0], x.getValue()[0])).limit(12)
                .forEach(e -> s.append(f("| 0x%s | %d | %d | %s |\n", hex(e.getKey()).substring(2), e.getValue()[0],
                        e.getValue()[1] / e.getValue()[0], e.getKey() == f.dataOpcode ? "data" : "command")));
        s.append("\n## Pictures\n\n`").append(id).append("-pictures.png` shows these candidates left to right, best first "
                + "(smoothness: mean correlation of neighbouring pixels, horizontally and vertically).\n\n"
                + "| rank | format | line length | lines | smoothness | framing |\n| --- | --- | --- | --- | --- | --- |\n");
        List<PictureCandidate> pics = h.pictures();
        for (int i = 0; i < pics.size(); i++) {
            PictureCandidate p = pics.get(i);
            s.append(f("| %d | %s | %d | %d | %.3f | %s |\n", i + 1, p.format().label, p.lineLength(), p.lines(), p.smoothness(),
                    p.hypothesis()));
        }
        if (pics.isEmpty()) {
            s.append("| - | no data bursts decode to a smooth picture | | | | |\n");
        }
        s.append("\nRed and blue cannot be told apart by smoothness: if the colours look wrong, swap them. `").append(id)
                .append("-chain.json` decodes the capture with the best hypothesis.\n");
        return s.toString();
    }

    static double confidence(List<Hypotheses.Framing> fr) {
        if (fr.size() < 2) {
            return 1.0;
        }
        double lead = fr.get(0).score() - fr.get(1).score();
        return Math.max(0, Math.min(1, lead / 0.3));
    }

    private static String f(String fmt, Object... args) {
        return String.format(Locale.ROOT, fmt, args);
    }

    private static String hex(long v) {
        return "0x" + Long.toHexString(v).toUpperCase(Locale.ROOT);
    }

    private static double round(double v) {
        return Math.round(v * 1000) / 1000.0;
    }

    private static double[] roundAll(double[] v) {
        double[] o = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            o[i] = round(v[i]);
        }
        return o;
    }

    private static String phases(double[] p) {
        StringBuilder s = new StringBuilder();
        for (int i = 0; i < p.length; i++) {
            s.append(i > 0 ? ", " : "").append(String.format(Locale.ROOT, "%.2f", p[i]));
        }
        return s.toString();
    }

    private static String levels(boolean[] l) {
        StringBuilder s = new StringBuilder();
        for (boolean b : l) {
            s.append(b ? '1' : '0');
        }
        return s.toString();
    }
}
