package org.lanesift.runner.capture;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.lanesift.capture.Captures;
import org.lanesift.json.JsonValue;

/**
 * The JSON sidecar of a packed logic capture (docs/capture-raw.md, "Packed logic captures"): the
 * sample rate, the sample word ({@code logic8}: 8 channels in a byte; {@code logic16le} /
 * {@code logic16be}: 16 channels in a 16-bit word of either byte order) and the channels to take,
 * each a name and its bit in the word. Read by the project's one JSON reader; every field is
 * checked and an error names the sidecar, the JSON pointer and what was expected.
 */
final class PackedLogicSidecar {
    /** The sample word layouts. */
    enum Word {
        LOGIC8("logic8", 1, true), LOGIC16LE("logic16le", 2, true), LOGIC16BE("logic16be", 2, false);

        final String text;
        final int bytes;
        final boolean littleEndian;

        Word(String text, int bytes, boolean littleEndian) {
            this.text = text;
            this.bytes = bytes;
            this.littleEndian = littleEndian;
        }

        int bits() {
            return 8 * bytes;
        }

        static Word of(String text) {
            for (Word w : values()) {
                if (w.text.equals(text)) {
                    return w;
                }
            }
            return null;
        }
    }

    private static final Set<String> TOP = Set.of("rateHz", "format", "channels", "startTimeS");
    private static final Set<String> CHANNEL = Set.of("name", "bit");

    final Path path;
    final double rateHz;
    final Word word;
    final double startTimeS;
    /** Port names, in sidecar order. */
    final String[] names;
    /** Bit of the word each channel is, in sidecar order. */
    final int[] bits;

    private PackedLogicSidecar(Path path, double rateHz, Word word, double startTimeS, String[] names, int[] bits) {
        this.path = path;
        this.rateHz = rateHz;
        this.word = word;
        this.startTimeS = startTimeS;
        this.names = names;
        this.bits = bits;
    }

    /**
     * Whether a sidecar declares a packed logic format; false for any other content (including
     * a sidecar that cannot be read, which the reader of that format then reports).
     */
    static boolean declaresPacked(Path sidecar) {
        String f = Captures.declaredFormat(sidecar);
        return f != null && Word.of(f) != null;
    }

    static PackedLogicSidecar read(Path sidecar) {
        JsonValue root = CaptureJson.read(sidecar, "sidecar not found; a packed logic capture needs a JSON sidecar with"
                + " rateHz, format (logic8, logic16le or logic16be) and channels [{name, bit}]");
        if (!root.isObject()) {
            throw bad(sidecar, "", "expected a JSON object");
        }
        unknown(sidecar, "", root.members(), TOP);
        JsonValue rate = root.get("rateHz");
        if (rate == null || !rate.isNumber() || !(rate.asDouble() > 0) || !Double.isFinite(rate.asDouble())) {
            throw bad(sidecar, "/rateHz", "expected a positive number of samples per second, found "
                    + (rate == null ? "nothing" : rate.toString()));
        }
        JsonValue fmt = root.get("format");
        Word word = fmt != null && fmt.isString() ? Word.of(fmt.asString()) : null;
        if (word == null) {
            throw bad(sidecar, "/format", "expected logic8, logic16le or logic16be, found " + (fmt == null ? "nothing" : fmt.toString()));
        }
        double start = 0;
        JsonValue st = root.get("startTimeS");
        if (st != null) {
            if (!st.isNumber() || !(Math.abs(st.asDouble()) <= 1e3)) {
                throw bad(sidecar, "/startTimeS", "expected a number of seconds within +/-1000, found " + st);
            }
            start = st.asDouble();
        }
        JsonValue chs = root.get("channels");
        if (chs == null || !chs.isArray() || chs.elements().isEmpty()) {
            throw bad(sidecar, "/channels", "expected a non-empty array of {name, bit}");
        }
        int n = chs.elements().size();
        if (n > word.bits()) {
            throw bad(sidecar, "/channels", n + " channels named; a " + word.text + " sample word holds at most " + word.bits());
        }
        List<String> raw = new ArrayList<>();
        int[] bits = new int[n];
        long seen = 0;
        for (int i = 0; i < n; i++) {
            JsonValue c = chs.elements().get(i);
            String p = "/channels/" + i;
            if (!c.isObject()) {
                throw bad(sidecar, p, "expected an object {name, bit}");
            }
            unknown(sidecar, p, c.members(), CHANNEL);
            JsonValue name = c.get("name");
            if (name == null || !name.isString() || name.asString().isBlank()) {
                throw bad(sidecar, p + "/name", "expected a channel name");
            }
            JsonValue bit = c.get("bit");
            double b = bit != null && bit.isNumber() ? bit.asDouble() : -1;
            if (b != Math.rint(b) || b < 0 || b >= word.bits()) {
                throw bad(sidecar, p + "/bit", "expected a whole number from 0 to " + (word.bits() - 1) + " (the bit of the "
                        + word.text + " word), found " + (bit == null ? "nothing" : bit.toString()));
            }
            bits[i] = (int) b;
            if ((seen >>> bits[i] & 1) != 0) {
                throw bad(sidecar, p + "/bit", "bit " + bits[i] + " is already named by another channel");
            }
            seen |= 1L << bits[i];
            raw.add(name.asString());
        }
        return new PackedLogicSidecar(sidecar, rate.asDouble(), word, start, Names.ports(raw).toArray(String[]::new), bits);
    }

    private static void unknown(Path sidecar, String at, Map<String, JsonValue> members, Set<String> known) {
        for (String f : members.keySet()) {
            if (!known.contains(f)) {
                throw bad(sidecar, at + "/" + f, "unknown field; expected one of " + String.join(", ", known.stream().sorted().toList()));
            }
        }
    }

    private static CaptureFormatException bad(Path sidecar, String pointer, String msg) {
        return new CaptureFormatException(sidecar, 0, (pointer.isEmpty() ? "at the top level" : pointer) + ": " + msg);
    }
}
