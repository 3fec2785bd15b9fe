package org.lanesift.chain;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.lanesift.json.JsonParseException;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;

/**
 * Reads a JSON chain file ({@code docs/chain-file.md}) into a {@link ChainSpec}, checking its shape
 * before any plugin is looked up: every problem becomes a {@link ChainFileException} naming the
 * file and a JSON pointer and what was expected. The text is read by the project's one JSON reader
 * ({@link JsonReader}) with its limits on size, nesting, duplicate names and trailing text.
 *
 * <p>Besides the shape it checks what can be checked without plugins: instance ids are unique and
 * well formed, both ends of every wire name a declared instance, and the wires form no cycle.
 * Relative paths in every option that names a file or folder ({@link #isPathOption}: {@code file},
 * {@code dir}, {@code sidecar} and any name ending in {@code File}, such as {@code offsetsFile},
 * {@code mappingFile}, {@code maskFile}) are resolved against the chain file's directory.
 */
public final class ChainFileReader {
    private static final Set<String> ROOT_KEYS = Set.of("nodes", "wires", "description", "outputs");
    private static final Set<String> NODE_KEYS = Set.of("id", "plugin", "options");
    private static final Set<String> WIRE_KEYS = Set.of("from", "to");
    private static final String ID_PATTERN = "[A-Za-z0-9_-]+";

    /** Creates a reader. */
    public ChainFileReader() {
        // stateless: every limit is the JSON reader's
    }

    /**
     * Reads and checks a chain file.
     *
     * @param path      the file
     * @param shownName how to name it in messages
     * @return the chain file
     * @throws ChainFileException for any problem, including a missing or unreadable file
     */
    public ChainFile read(Path path, String shownName) {
        if (Files.isDirectory(path)) {
            throw new ChainFileException(shownName, null, 0, 0, "is a directory (expected a JSON chain file)");
        }
        JsonValue root;
        try {
            root = JsonReader.read(path, shownName);
        } catch (JsonParseException e) {
            throw new ChainFileException(e);
        } catch (NoSuchFileException e) {
            throw new ChainFileException(shownName, null, 0, 0, "no such file (expected a JSON chain file)");
        } catch (IOException e) {
            throw new ChainFileException(shownName, null, 0, 0, "cannot read: " + e.getMessage());
        }
        Path dir = path.toAbsolutePath().getParent();
        return parse(root, shownName, path, dir);
    }

    private ChainFile parse(JsonValue root, String file, Path path, Path dir) {
        if (!root.isObject()) {
            throw err(file, "", "expected a JSON object with \"nodes\" and \"wires\", got " + describe(root));
        }
        checkKeys(root, ROOT_KEYS, "", file);
        String description = "";
        if (root.get("description") != null) {
            description = text(root.get("description"), "/description", file);
        }
        JsonValue nodes = root.get("nodes");
        if (nodes == null) {
            throw err(file, "/nodes", "missing; expected an array of plugin instances");
        }
        if (!nodes.isArray()) {
            throw err(file, "/nodes", "expected an array of plugin instances, got " + describe(nodes));
        }
        if (nodes.elements().isEmpty()) {
            throw err(file, "/nodes", "is empty; a chain needs at least one plugin instance");
        }
        List<ChainSpec.Node> specNodes = new ArrayList<>();
        Map<String, Integer> ids = new HashMap<>();
        for (int i = 0; i < nodes.elements().size(); i++) {
            String p = "/nodes/" + i;
            JsonValue n = nodes.elements().get(i);
            if (!n.isObject()) {
                throw err(file, p, "expected an object with \"id\", \"plugin\" and \"options\", got " + describe(n));
            }
            checkKeys(n, NODE_KEYS, p, file);
            String id = required(n, "id", p, file, "an instance id such as \"rx\"");
            if (!id.matches(ID_PATTERN)) {
                throw err(file, p + "/id", "instance id must be letters, digits, '_' or '-', got '" + id + "'");
            }
            Integer before = ids.putIfAbsent(id, i);
            if (before != null) {
                throw err(file, p + "/id", "instance id '" + id + "' is already used by /nodes/" + before);
            }
            String plugin = required(n, "plugin", p, file, "a plugin id such as \"differential\" (see: lanesift plugins)");
            Map<String, Object> options = new LinkedHashMap<>();
            JsonValue opts = n.get("options");
            if (opts != null && !opts.isNull()) {
                if (!opts.isObject()) {
                    throw err(file, p + "/options", "expected an object of option values, got " + describe(opts));
                }
                for (Map.Entry<String, JsonValue> e : opts.members().entrySet()) {
                    String op = p + "/options/" + escape(e.getKey());
                    Object v = optionValue(e.getValue(), op, file);
                    if (isPathOption(e.getKey()) && v instanceof String s) {
                        String why = badPath(s);
                        if (why != null) {
                            throw err(file, op, why);
                        }
                        v = resolve(dir, s);
                    }
                    options.put(e.getKey(), v);
                }
            }
            specNodes.add(new ChainSpec.Node(id, plugin, options));
        }
        List<ChainSpec.Wire> specWires = new ArrayList<>();
        JsonValue wires = root.get("wires");
        if (wires != null && !wires.isNull()) {
            if (!wires.isArray()) {
                throw err(file, "/wires", "expected an array of wires {\"from\": \"a.out\", \"to\": \"b.in\"}, got " + describe(wires));
            }
            for (int i = 0; i < wires.elements().size(); i++) {
                String p = "/wires/" + i;
                JsonValue w = wires.elements().get(i);
                if (!w.isObject()) {
                    throw err(file, p, "expected an object {\"from\": \"instance.output\", \"to\": \"instance.input\"}, got " + describe(w));
                }
                checkKeys(w, WIRE_KEYS, p, file);
                String from = required(w, "from", p, file, "\"instance.output\"");
                String to = required(w, "to", p, file, "\"instance.input\"");
                checkEnd(from, p + "/from", ids, file);
                checkEnd(to, p + "/to", ids, file);
                specWires.add(new ChainSpec.Wire(from, to));
            }
        }
        checkCycles(specWires, ids.size(), ids, file);
        return new ChainFile(new ChainSpec(specNodes, specWires), path, file, description, outputNames(root.get("outputs"), file));
    }

    /** The {@code outputs} field: its shape only (a list of non-empty strings); the host checks the names. */
    private static List<String> outputNames(JsonValue v, String file) {
        if (v == null) {
            return null;
        }
        if (!v.isArray()) {
            throw err(file, "/outputs", "expected an array of output names such as [\"standard\"] or [\"none\"], got " + describe(v));
        }
        if (v.elements().isEmpty()) {
            throw err(file, "/outputs", "is empty; expected at least one output name, or [\"none\"] for no output files");
        }
        List<String> names = new ArrayList<>();
        for (int i = 0; i < v.elements().size(); i++) {
            String name = text(v.elements().get(i), "/outputs/" + i, file);
            if (name.isBlank()) {
                throw err(file, "/outputs/" + i, "empty; expected an output name (see docs/chain-file.md, \"Which outputs a run writes\")");
            }
            names.add(name);
        }
        return names;
    }

    /**
     * Whether an option names a file or folder, so that a relative value is taken relative to the
     * chain file: {@code file}, {@code dir}, {@code sidecar}, or a name ending in {@code File}.
     *
     * @param option option name
     * @return true for a path option
     */
    public static boolean isPathOption(String option) {
        return option.equals("file") || option.equals("dir") || option.equals("sidecar")
                || (option.length() > 4 && option.endsWith("File"));
    }

    /** Resolves a relative path against the chain file's directory. */
    /**
     * Why a text cannot be a file path on this system (a NUL or another character the file system
     * refuses), or null when it can.
     *
     * @param path the text
     * @return the reason, for a message
     */
    public static String badPath(String path) {
        int nul = path.indexOf('\0');
        if (nul >= 0) {
            return "the path has a NUL character at position " + (nul + 1) + "; expected a file name without control characters";
        }
        try {
            Path.of(path);
            return null;
        } catch (java.nio.file.InvalidPathException e) {
            return "'" + org.lanesift.plugin.Echo.of(path) + "' is not a valid path here (" + org.lanesift.plugin.Echo.of(e.getReason()) + ")";
        }
    }

    static String resolve(Path dir, String file) {
        if (file.isEmpty() || dir == null) {
            return file;
        }
        Path p = Path.of(file);
        return p.isAbsolute() ? file : dir.resolve(p).normalize().toString();
    }

    private static void checkEnd(String end, String pointer, Map<String, Integer> ids, String file) {
        if (end.isEmpty()) {
            throw err(file, pointer, "empty; expected \"instance.port\"");
        }
        int dot = end.indexOf('.');
        String id = dot < 0 ? end : end.substring(0, dot);
        if (!ids.containsKey(id)) {
            List<String> known = new ArrayList<>(ids.keySet());
            known.sort(null);
            throw err(file, pointer, "no instance '" + id + "' in /nodes; expected \"instance.port\" with one of: "
                    + String.join(", ", known));
        }
        if (dot >= 0 && dot == end.length() - 1) {
            throw err(file, pointer, "port name missing after '" + id + ".'; expected \"instance.port\"");
        }
    }

    /** Depth-first search on instances; reports the wire that closes a cycle. */
    private static void checkCycles(List<ChainSpec.Wire> wires, int n, Map<String, Integer> ids, String file) {
        List<List<int[]>> adj = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            adj.add(new ArrayList<>());
        }
        for (int w = 0; w < wires.size(); w++) {
            int a = ids.get(instanceOf(wires.get(w).from()));
            int b = ids.get(instanceOf(wires.get(w).to()));
            adj.get(a).add(new int[] {b, w});
        }
        byte[] state = new byte[n];
        int[] stackNode = new int[n];
        int[] stackEdge = new int[n];
        String[] names = new String[n];
        ids.forEach((k, v) -> names[v] = k);
        for (int s = 0; s < n; s++) {
            if (state[s] != 0) {
                continue;
            }
            int depth = 0;
            stackNode[0] = s;
            stackEdge[0] = 0;
            state[s] = 1;
            while (depth >= 0) {
                int u = stackNode[depth];
                if (stackEdge[depth] < adj.get(u).size()) {
                    int[] e = adj.get(u).get(stackEdge[depth]++);
                    int v = e[0];
                    if (state[v] == 1) {
                        StringBuilder path = new StringBuilder();
                        int from = 0;
                        while (stackNode[from] != v) {
                            from++;
                        }
                        for (int k = from; k <= depth; k++) {
                            path.append(names[stackNode[k]]).append(" -> ");
                        }
                        path.append(names[v]);
                        throw err(file, "/wires/" + e[1], "this wire closes a cycle " + path
                                + "; a chain must flow one way (expected no loops)");
                    }
                    if (state[v] == 0) {
                        state[v] = 1;
                        depth++;
                        stackNode[depth] = v;
                        stackEdge[depth] = 0;
                    }
                } else {
                    state[u] = 2;
                    depth--;
                }
            }
        }
    }

    private static String instanceOf(String end) {
        int dot = end.indexOf('.');
        return dot < 0 ? end : end.substring(0, dot);
    }

    private static Object optionValue(JsonValue v, String pointer, String file) {
        if (v.isString()) {
            return v.asString();
        }
        if (v.isBoolean()) {
            return v.asBoolean();
        }
        if (v.isNumber()) {
            String t = v.numberText();
            if (t.indexOf('.') < 0 && t.indexOf('e') < 0 && t.indexOf('E') < 0) {
                try {
                    return Long.parseLong(t);
                } catch (NumberFormatException e) {
                    throw err(file, pointer, "integer " + t + " is too large");
                }
            }
            return v.asDouble();
        }
        if (v.isArray()) {
            List<Object> list = new ArrayList<>();
            for (int i = 0; i < v.elements().size(); i++) {
                JsonValue e = v.elements().get(i);
                if (!(e.isNumber() || e.isString())) {
                    throw err(file, pointer + "/" + i, "expected a number or a string in an option list, got " + describe(e));
                }
                list.add(optionValue(e, pointer + "/" + i, file));
            }
            return list;
        }
        throw err(file, pointer, "expected a string, number, boolean or list of numbers as option value, got " + describe(v));
    }

    private static String required(JsonValue n, String key, String p, String file, String expected) {
        JsonValue v = n.get(key);
        if (v == null || v.isNull()) {
            throw err(file, p + "/" + key, "missing; expected " + expected);
        }
        return text(v, p + "/" + key, file);
    }

    private static String text(JsonValue v, String pointer, String file) {
        if (!v.isString()) {
            throw err(file, pointer, "expected a string, got " + describe(v));
        }
        return v.asString();
    }

    private static void checkKeys(JsonValue obj, Set<String> allowed, String p, String file) {
        for (String k : obj.members().keySet()) {
            if (!allowed.contains(k)) {
                List<String> a = new ArrayList<>(allowed);
                a.sort(null);
                throw err(file, p + "/" + escape(k), "unknown key '" + k + "'; expected one of: " + String.join(", ", a));
            }
        }
    }

    private static String describe(JsonValue v) {
        if (v.isObject()) {
            return "an object";
        } else if (v.isArray()) {
            return "an array";
        } else if (v.isString()) {
            String s = v.asString();
            return "the string \"" + (s.length() > 40 ? s.substring(0, 40) + "..." : s) + "\"";
        } else if (v.isBoolean()) {
            return v.asBoolean() ? "true" : "false";
        } else if (v.isNumber()) {
            return "the number " + v.numberText();
        }
        return "null";
    }

    /** Escapes a key for a JSON pointer (RFC 6901). */
    static String escape(String key) {
        return key.replace("~", "~0").replace("/", "~1");
    }

    private static ChainFileException err(String file, String pointer, String what) {
        return new ChainFileException(file, pointer, 0, 0, what);
    }
}
