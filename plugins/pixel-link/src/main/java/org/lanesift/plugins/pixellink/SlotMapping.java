package org.lanesift.plugins.pixellink;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.json.JsonParseException;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.plugin.OptionException;

/**
 * A slot-to-colour mapping of a 7:1 pixel link: for each data lane and each of its seven bit
 * slots (slot 0 first on the wire), the colour bit ({@code R0..R7}, {@code G0..G7},
 * {@code B0..B7}), control bit ({@code DE}, {@code HS}, {@code VS}) or nothing ({@code "0"} or
 * {@code "-"}) it carries. Tables are data: the built-in ones are JSON resources, users may load
 * their own (format in {@code docs/pixel-mapping.md}). With six bits per colour the decoder widens
 * each colour to eight bits by bit replication ({@code v8 = v6 << 2 | v6 >> 4}; common practice).
 *
 * @param name       table name
 * @param title      one line for users
 * @param source     where the table comes from
 * @param colourBits bits per colour, 6 or 8
 * @param lanes      per lane, the seven slot names, slot 0 first
 */
public record SlotMapping(String name, String title, String source, int colourBits, List<List<String>> lanes) {

    /** Bit of the decoded word that carries DE. */
    static final int DE = 1 << 24;
    /** Bit of the decoded word that carries HS. */
    static final int HS = 1 << 25;
    /** Bit of the decoded word that carries VS. */
    static final int VS = 1 << 26;

    /** Names of the built-in tables, for the {@code mapping} option. */
    public static final List<String> BUILT_IN = List.of("vesa-24", "jeida-24", "bits-18");

    /** Copies the lists. */
    public SlotMapping {
        lanes = lanes.stream().map(List::copyOf).toList();
    }

    /**
     * Loads a built-in table from the module's resources.
     *
     * @param name one of {@link #BUILT_IN}
     * @return the table
     * @throws OptionException naming option {@code mapping} if there is no such table
     */
    public static SlotMapping builtIn(String name) {
        if (!BUILT_IN.contains(name)) {
            throw new OptionException("mapping", "option 'mapping' of plugin 'pixel-link': expected one of "
                    + String.join(", ", BUILT_IN) + ", got '" + name + "'");
        }
        String res = "mappings/" + name + ".json";
        try (InputStream in = SlotMapping.class.getResourceAsStream(res)) {
            if (in == null) {
                throw new IllegalStateException("built-in mapping resource " + res + " is missing from the plugin");
            }
            return parse(new String(in.readAllBytes(), StandardCharsets.UTF_8), "built-in mapping " + name, "mapping");
        } catch (IOException e) {
            throw new IllegalStateException("cannot read built-in mapping " + res + ": " + e.getMessage(), e);
        }
    }

    /**
     * Loads a user table from a JSON file.
     *
     * @param file the file
     * @return the validated table
     * @throws OptionException naming option {@code mappingFile}, the file and the field that is wrong
     */
    public static SlotMapping load(Path file) {
        String where = "mapping file '" + file + "'";
        JsonValue m;
        try {
            m = JsonReader.read(file, file.toString());
        } catch (JsonParseException e) {
            throw bad("mappingFile", e.getMessage());
        } catch (java.nio.file.NoSuchFileException e) {
            throw new OptionException("mappingFile", "option 'mappingFile' of plugin 'pixel-link': no such " + where
                    + " (looked in folder " + file.toAbsolutePath().normalize().getParent() + ")");
        } catch (IOException e) {
            throw new OptionException("mappingFile", "option 'mappingFile' of plugin 'pixel-link': cannot read " + where
                    + ": " + e.getMessage());
        }
        return of(m, where, "mappingFile");
    }

    /**
     * Parses and validates a table.
     *
     * @param json   the JSON text
     * @param where  what to call it in messages
     * @param option the option to blame
     * @return the table
     * @throws OptionException for malformed JSON, unknown names, duplicated or missing bits
     */
    static SlotMapping parse(String json, String where, String option) {
        JsonValue m;
        try {
            m = JsonReader.parse(where, json);
        } catch (JsonParseException e) {
            throw bad(option, e.getMessage());
        }
        return of(m, where, option);
    }

    private static SlotMapping of(JsonValue m, String where, String option) {
        if (!m.isObject()) {
            throw bad(option, where + ": expected a JSON object at /");
        }
        for (String k : m.members().keySet()) {
            if (!List.of("format", "name", "title", "source", "colourBits", "lanes").contains(k)) {
                throw bad(option, where + ": unknown member /" + k + "; expected format, name, title, source, colourBits, lanes");
            }
        }
        JsonValue fmt = member(m, "format");
        if (fmt != null && !(fmt.isString() && fmt.asString().equals("lanesift-slot-map/1"))) {
            throw bad(option, where + ": /format must be \"lanesift-slot-map/1\", got " + fmt.describe());
        }
        String name = text(m, "name", where, option, true);
        String title = text(m, "title", where, option, false);
        String source = text(m, "source", where, option, false);
        JsonValue cb = member(m, "colourBits");
        if (cb == null || !cb.isNumber() || (cb.asDouble() != 6.0 && cb.asDouble() != 8.0)) {
            throw bad(option, where + ": /colourBits must be 6 or 8, got " + (cb == null ? "nothing" : cb.describe()));
        }
        int bits = (int) cb.asDouble();
        JsonValue lanesObj = member(m, "lanes");
        List<JsonValue> lanesList = lanesObj != null && lanesObj.isArray() ? lanesObj.elements() : List.of();
        if (lanesList.isEmpty() || lanesList.size() > 4) {
            throw bad(option, where + ": /lanes must be an array of 1 to 4 lanes, each an array of 7 slot names");
        }
        List<List<String>> lanes = new ArrayList<>();
        Map<String, String> seen = new HashMap<>();
        for (int l = 0; l < lanesList.size(); l++) {
            JsonValue laneValue = lanesList.get(l);
            if (!laneValue.isArray() || laneValue.elements().size() != 7) {
                throw bad(option, where + ": /lanes/" + l + " (lane " + l + ") must be an array of exactly 7 slot names, slot 0 first");
            }
            List<String> lane = new ArrayList<>();
            for (int s = 0; s < 7; s++) {
                String at = "/lanes/" + l + "/" + s + " (lane " + l + ", slot " + s + ")";
                JsonValue slot = laneValue.elements().get(s);
                if (!slot.isString()) {
                    throw bad(option, where + ": " + at + " must be a string such as \"R0\", \"DE\" or \"0\"");
                }
                String n = slot.asString();
                String norm = n.trim().toUpperCase(java.util.Locale.ROOT);
                if (norm.equals("-")) {
                    norm = "0";
                }
                if (!norm.equals("0")) {
                    if (contribution(norm, bits) == 0) {
                        throw bad(option, where + ": " + at + ": '" + n + "' is not a bit name; expected R0..R" + (bits - 1)
                                + ", G0..G" + (bits - 1) + ", B0..B" + (bits - 1) + ", DE, HS, VS or \"0\" for an unused slot");
                    }
                    String prev = seen.put(norm, at);
                    if (prev != null) {
                        throw bad(option, where + ": " + at + ": bit " + norm + " is duplicated; it is already at " + prev);
                    }
                }
                lane.add(norm);
            }
            lanes.add(lane);
        }
        List<String> missing = new ArrayList<>();
        for (String c : new String[] {"R", "G", "B"}) {
            for (int b = 0; b < bits; b++) {
                if (!seen.containsKey(c + b)) {
                    missing.add(c + b);
                }
            }
        }
        if (!seen.containsKey("DE")) {
            missing.add("DE");
        }
        if (!missing.isEmpty()) {
            throw bad(option, where + ": bit" + (missing.size() > 1 ? "s " : " ") + String.join(", ", missing)
                    + (missing.size() > 1 ? " are" : " is") + " missing from /lanes; a " + (3 * bits)
                    + "-bit table needs every colour bit and DE in exactly one lane/slot");
        }
        return new SlotMapping(name, title == null ? name : title, source == null ? "" : source, bits, lanes);
    }

    /** A member, or null when it is absent or JSON null (both mean "not given"). */
    private static JsonValue member(JsonValue m, String key) {
        JsonValue v = m.get(key);
        return v == null || v.isNull() ? null : v;
    }

    private static String text(JsonValue m, String key, String where, String option, boolean required) {
        JsonValue v = member(m, key);
        if (v == null) {
            if (required) {
                throw bad(option, where + ": /" + key + " is required (a string)");
            }
            return null;
        }
        if (!v.isString()) {
            throw bad(option, where + ": /" + key + " must be a string");
        }
        return v.asString();
    }

    private static OptionException bad(String option, String msg) {
        return new OptionException(option, "option '" + option + "' of plugin 'pixel-link': " + msg);
    }

    /**
     * The decoded-word bits one slot name sets: colour bits land in {@code 0xRRGGBB} (six-bit
     * colours replicated to eight), control bits at {@link #DE}, {@link #HS}, {@link #VS}.
     */
    static int contribution(String name, int colourBits) {
        switch (name) {
            case "DE":
                return DE;
            case "HS":
                return HS;
            case "VS":
                return VS;
            default:
                break;
        }
        if (name.length() != 2) {
            return 0;
        }
        int base = switch (name.charAt(0)) {
            case 'R' -> 16;
            case 'G' -> 8;
            case 'B' -> 0;
            default -> -1;
        };
        int k = name.charAt(1) - '0';
        if (base < 0 || k < 0 || k >= colourBits) {
            return 0;
        }
        if (colourBits == 8) {
            return 1 << (base + k);
        }
        int c = 1 << (base + k + 2);
        if (k >= 4) {
            c |= 1 << (base + k - 4);
        }
        return c;
    }

    /**
     * Number of data lanes.
     *
     * @return lanes, 1 to 4
     */
    public int laneCount() {
        return lanes.size();
    }

    /**
     * Names the lanes carrying the control bits, for findings about the framing, e.g.
     * {@code "the lane carrying DE/HS/VS (lane2)"}.
     *
     * @param laneNames the input port of each lane of the (first) link, in table order
     * @return a phrase naming each lane with a control slot and the control bits it carries
     */
    String controlLanes(List<String> laneNames) {
        StringBuilder b = new StringBuilder();
        for (int l = 0; l < lanes.size(); l++) {
            List<String> lane = lanes.get(l);
            List<String> ctl = List.of("DE", "HS", "VS").stream().filter(lane::contains).toList();
            if (!ctl.isEmpty()) {
                b.append(b.length() == 0 ? "" : " and ").append("the lane carrying ").append(String.join("/", ctl))
                        .append(" (").append(l < laneNames.size() ? laneNames.get(l) : "lane " + l).append(")");
            }
        }
        return b.toString();
    }

    /**
     * Whether the table carries HS and VS.
     *
     * @return true if both sync bits are mapped
     */
    boolean hasSyncBits() {
        boolean hs = false;
        boolean vs = false;
        for (List<String> l : lanes) {
            hs |= l.contains("HS");
            vs |= l.contains("VS");
        }
        return hs && vs;
    }

    /**
     * Lookup tables from a lane's 7-bit slot word (bit s = slot s as received) to decoded-word bits.
     *
     * @param reverseSlots true if the wire sends the table's slots in reverse order (slot 0 on the wire carries the table's slot 6)
     * @return per lane, 128 entries
     */
    int[][] lookupTables(boolean reverseSlots) {
        int[][] t = new int[lanes.size()][128];
        for (int l = 0; l < lanes.size(); l++) {
            int[] c = new int[7];
            for (int s = 0; s < 7; s++) {
                String n = lanes.get(l).get(reverseSlots ? 6 - s : s);
                c[s] = n.equals("0") ? 0 : contribution(n, colourBits);
            }
            for (int w = 0; w < 128; w++) {
                int v = 0;
                for (int s = 0; s < 7; s++) {
                    if ((w & (1 << s)) != 0) {
                        v |= c[s];
                    }
                }
                t[l][w] = v;
            }
        }
        return t;
    }
}
