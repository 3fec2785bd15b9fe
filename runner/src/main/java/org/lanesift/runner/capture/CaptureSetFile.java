package org.lanesift.runner.capture;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.lanesift.capture.Captures;
import org.lanesift.json.JsonValue;

/**
 * A capture set file (docs/capture-set.md): acquisitions of one link made one after another with
 * fewer channels than the link has signals, each holding the shared reference channel. Paths of
 * the acquisitions are relative to the set file.
 */
final class CaptureSetFile {
    static final String FORMAT = Captures.SET_FORMAT;
    static final int MAX_ACQUISITIONS = 64;
    private static final Set<String> TOP = Set.of("format", "shared", "acquisitions", "searchS");
    private static final Set<String> ACQ = Set.of("name", "file");

    /**
     * One acquisition.
     *
     * @param name its name in messages and reports
     * @param file the capture, resolved against the set file's folder
     */
    record Acquisition(String name, Path file) {
    }

    final Path path;
    final String shared;
    final List<Acquisition> acquisitions;
    /** Largest offset searched between two acquisitions, seconds; 0 = an eighth of the shortest. */
    final double searchS;

    private CaptureSetFile(Path path, String shared, List<Acquisition> acquisitions, double searchS) {
        this.path = path;
        this.shared = shared;
        this.acquisitions = List.copyOf(acquisitions);
        this.searchS = searchS;
    }

    /** Whether a JSON file declares this format; false for anything else, readable or not. */
    static boolean declaresSet(Path file) {
        return FORMAT.equals(Captures.declaredFormat(file));
    }

    static CaptureSetFile read(Path file) {
        JsonValue root = CaptureJson.read(file, "file not found");
        if (!root.isObject()) {
            throw bad(file, "", "expected a JSON object");
        }
        for (String f : root.members().keySet()) {
            if (!TOP.contains(f)) {
                throw bad(file, "/" + f, "unknown field; expected format, shared, acquisitions, searchS");
            }
        }
        JsonValue fmt = root.get("format");
        if (fmt == null || !fmt.isString() || !fmt.asString().equals(FORMAT)) {
            throw bad(file, "/format", "expected \"" + FORMAT + "\"");
        }
        JsonValue sh = root.get("shared");
        if (sh == null || !sh.isString() || sh.asString().isBlank()) {
            throw bad(file, "/shared", "expected the name of the channel every acquisition holds");
        }
        double search = 0;
        JsonValue se = root.get("searchS");
        if (se != null) {
            if (!se.isNumber() || !(se.asDouble() > 0) || !(se.asDouble() <= 1e3)) {
                throw bad(file, "/searchS", "expected a positive number of seconds, found " + se);
            }
            search = se.asDouble();
        }
        JsonValue acqs = root.get("acquisitions");
        if (acqs == null || !acqs.isArray() || acqs.elements().size() < 2 || acqs.elements().size() > MAX_ACQUISITIONS) {
            throw bad(file, "/acquisitions", "expected an array of 2 to " + MAX_ACQUISITIONS + " objects {name, file}");
        }
        Path base = file.toAbsolutePath().getParent();
        List<Acquisition> list = new ArrayList<>();
        Set<String> names = new HashSet<>();
        for (int i = 0; i < acqs.elements().size(); i++) {
            JsonValue a = acqs.elements().get(i);
            String p = "/acquisitions/" + i;
            if (!a.isObject()) {
                throw bad(file, p, "expected an object {name, file}");
            }
            for (String f : a.members().keySet()) {
                if (!ACQ.contains(f)) {
                    throw bad(file, p + "/" + f, "unknown field; expected name, file");
                }
            }
            JsonValue name = a.get("name");
            JsonValue f = a.get("file");
            if (name == null || !name.isString() || name.asString().isBlank() || !names.add(name.asString())) {
                throw bad(file, p + "/name", "expected a name no other acquisition has");
            }
            if (f == null || !f.isString() || f.asString().isBlank()) {
                throw bad(file, p + "/file", "expected the path of the capture, relative to the set file");
            }
            list.add(new Acquisition(name.asString(), base.resolve(f.asString()).normalize()));
        }
        return new CaptureSetFile(file, sh.asString(), list, search);
    }

    CaptureFormatException bad(String detail) {
        return new CaptureFormatException(path, 0, detail);
    }

    private static CaptureFormatException bad(Path file, String pointer, String msg) {
        return new CaptureFormatException(file, 0, (pointer.isEmpty() ? "at the top level" : pointer) + ": " + msg);
    }
}
