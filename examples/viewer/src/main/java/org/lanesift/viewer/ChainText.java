package org.lanesift.viewer;

import java.io.IOException;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.chain.ChainSpec;
import org.lanesift.json.JsonParseException;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.plugin.InputFormatException;

/**
 * Reads a chain file (docs/chain-file.md) into the host API's {@link ChainSpec}, as a GUI that
 * carries only {@code host-api} has to: the text goes through the project's JSON reader, options
 * become plain values, and relative paths in file options ({@code file}, {@code dir},
 * {@code sidecar}, names ending in {@code File}) are taken from the chain file's folder. Wiring,
 * plugin ids and option ranges are checked by {@link org.lanesift.chain.ChainBuilder#build()}
 * with JSON pointers, so this reader checks only the shape it needs to build the model.
 */
public final class ChainText {
    private ChainText() {
    }

    /**
     * Reads a chain file.
     *
     * @param file the chain file
     * @return the model
     * @throws InputFormatException naming the file and the JSON pointer of what is wrong
     */
    public static ChainSpec read(Path file) {
        JsonValue root;
        try {
            root = JsonReader.read(file, file.toString());
        } catch (JsonParseException e) {
            throw new InputFormatException(e.getMessage(), e);
        } catch (NoSuchFileException e) {
            throw new InputFormatException(file + ": no such file (expected a JSON chain file)", e);
        } catch (IOException e) {
            throw new InputFormatException(file + ": cannot read: " + e.getMessage(), e);
        }
        Path dir = file.toAbsolutePath().getParent();
        List<ChainSpec.Node> nodes = new ArrayList<>();
        for (JsonValue n : array(root, "nodes", file)) {
            Map<String, Object> options = new LinkedHashMap<>();
            JsonValue opts = n.get("options");
            if (opts != null && opts.isObject()) {
                opts.members().forEach((k, v) -> options.put(k, value(k, v, dir)));
            }
            nodes.add(new ChainSpec.Node(string(n, "id", file), string(n, "plugin", file), options));
        }
        List<ChainSpec.Wire> wires = new ArrayList<>();
        if (root.get("wires") != null) {
            for (JsonValue w : array(root, "wires", file)) {
                wires.add(new ChainSpec.Wire(string(w, "from", file), string(w, "to", file)));
            }
        }
        return new ChainSpec(nodes, wires);
    }

    private static List<JsonValue> array(JsonValue root, String key, Path file) {
        JsonValue v = root.isObject() ? root.get(key) : null;
        if (v == null || !v.isArray()) {
            throw new InputFormatException(file + ": /" + key + ": expected an array (see docs/chain-file.md)");
        }
        for (JsonValue e : v.elements()) {
            if (!e.isObject()) {
                throw new InputFormatException(file + ": line " + e.line() + ": expected an object in /" + key + ", got " + e.describe());
            }
        }
        return v.elements();
    }

    private static String string(JsonValue o, String key, Path file) {
        JsonValue v = o.get(key);
        if (v == null || !v.isString()) {
            throw new InputFormatException(file + ": line " + o.line() + ": \"" + key + "\" must be a string");
        }
        return v.asString();
    }

    private static Object value(String name, JsonValue v, Path dir) {
        if (v.isString()) {
            String s = v.asString();
            boolean path = name.equals("file") || name.equals("dir") || name.equals("sidecar") || name.endsWith("File");
            return path && !s.isEmpty() ? dir.resolve(s).normalize().toString() : s;
        }
        if (v.isNumber()) {
            return v.asDouble();
        }
        if (v.isBoolean()) {
            return v.asBoolean();
        }
        if (v.isArray()) {
            List<Object> out = new ArrayList<>();
            for (JsonValue e : v.elements()) {
                out.add(value("", e, dir));
            }
            return out;
        }
        return null;
    }
}
