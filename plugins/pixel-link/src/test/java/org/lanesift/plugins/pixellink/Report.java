package org.lanesift.plugins.pixellink;

import java.nio.charset.StandardCharsets;
import org.lanesift.data.Artifact;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.StageHarness;

/** Test helper: reads the plugin's timing JSON back by path. */
final class Report {
    final JsonValue root;
    final String json;

    Report(String json) {
        this.json = json;
        this.root = JsonReader.parse("timing report", json);
    }

    static Report of(StageHarness h) {
        return new Report(text(h, "dut-timing.json"));
    }

    static String text(StageHarness h, String name) {
        for (Artifact a : h.outputs("files", Artifact.class)) {
            if (a.fileName().equals(name)) {
                return new String(a.content(), StandardCharsets.UTF_8);
            }
        }
        throw new AssertionError("no artifact " + name + " among " + h.outputs("files"));
    }

    /** The value at a slash-separated path; null (the Java reference) for a JSON null. */
    JsonValue get(String path) {
        JsonValue o = root;
        for (String p : path.split("/")) {
            if (p.isEmpty()) {
                continue;
            }
            if (o.isObject()) {
                if (!o.members().containsKey(p)) {
                    throw new AssertionError("no " + path + " in " + json);
                }
                o = o.get(p);
            } else if (o.isArray()) {
                o = o.elements().get(Integer.parseInt(p));
            } else {
                throw new AssertionError("no " + path + " in " + json);
            }
        }
        return o.isNull() ? null : o;
    }

    long num(String path) {
        JsonValue o = get(path);
        if (o == null || !o.isNumber()) {
            throw new AssertionError(path + " is " + o + " in " + json);
        }
        return Math.round(o.asDouble());
    }

    double real(String path) {
        return get(path).asDouble();
    }

    boolean bool(String path) {
        return get(path).asBoolean();
    }

    String str(String path) {
        return get(path).asString();
    }
}
