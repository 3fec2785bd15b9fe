package org.lanesift.plugins.pixellink;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import org.lanesift.data.Artifact;
import org.lanesift.testkit.StageHarness;

/** Test helper: reads the plugin's timing JSON back by path. */
final class Report {
    final Object root;
    final String json;

    Report(String json) throws Exception {
        this.json = json;
        this.root = MiniJson.parse(json, "timing report");
    }

    static Report of(StageHarness h) throws Exception {
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

    Object get(String path) {
        Object o = root;
        for (String p : path.split("/")) {
            if (p.isEmpty()) {
                continue;
            }
            if (o instanceof Map<?, ?> m) {
                if (!m.containsKey(p)) {
                    throw new AssertionError("no " + path + " in " + json);
                }
                o = m.get(p);
            } else if (o instanceof List<?> l) {
                o = l.get(Integer.parseInt(p));
            } else {
                throw new AssertionError("no " + path + " in " + json);
            }
        }
        return o;
    }

    long num(String path) {
        Object o = get(path);
        if (!(o instanceof Double d)) {
            throw new AssertionError(path + " is " + o + " in " + json);
        }
        return Math.round(d);
    }

    double real(String path) {
        return (Double) get(path);
    }

    boolean bool(String path) {
        return (Boolean) get(path);
    }

    String str(String path) {
        return (String) get(path);
    }
}
