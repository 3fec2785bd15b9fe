package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.time.Femtos;

/**
 * The declarations of a VCD file, up to {@code $enddefinitions $end} (IEEE 1364-2005 18.2.3): the
 * time unit from {@code $timescale}, and one {@link VcdSignal} per distinct identifier code from
 * {@code $var}, in declaration order, each with a port name made from the shortest unique suffix of
 * its scope path. A second name for a code already declared is dropped (the first is kept).
 */
final class VcdHeader {
    /** Most variables (distinct identifier codes) accepted. */
    static final int MAX_SIGNALS = 65_536;
    /** Most bytes of declarations accepted before $enddefinitions. */
    static final long MAX_HEADER_BYTES = 64L << 20;

    private final Path file;
    private final VcdTokens tk;
    final List<VcdSignal> signals = new ArrayList<>();
    final VcdCodes codes = new VcdCodes();
    /** Time-step unit, fs. */
    long unitFs;
    /** The time unit as written, e.g. {@code "10 ns"}. */
    String timescaleText;

    private VcdHeader(Path file, VcdTokens tk) {
        this.file = file;
        this.tk = tk;
    }

    /**
     * Reads the declarations, leaving the tokens just after {@code $enddefinitions $end}.
     *
     * @param file for messages
     * @param tk   the file's tokens
     * @return the declarations
     * @throws CaptureFormatException naming the line on anything malformed or missing
     */
    static VcdHeader read(Path file, VcdTokens tk) throws IOException {
        VcdHeader h = new VcdHeader(file, tk);
        h.read();
        return h;
    }

    private void read() throws IOException {
        List<String> scope = new ArrayList<>();
        List<List<String>> paths = new ArrayList<>();
        while (true) {
            if (!tk.next()) {
                throw new CaptureFormatException(file, tk.tokLine, "truncated: the file ends inside the declarations; expected"
                        + " $enddefinitions $end");
            }
            if (tk.bytesRead() > MAX_HEADER_BYTES) {
                throw tk.error("declarations longer than " + MAX_HEADER_BYTES + " bytes; expected $enddefinitions sooner");
            }
            if (tk.is("$enddefinitions")) {
                tk.expectEnd("$enddefinitions");
                break;
            } else if (tk.is("$timescale")) {
                StringBuilder sb = new StringBuilder();
                long ln = tk.tokLine;
                while (true) {
                    if (!tk.next()) {
                        throw tk.truncated("$timescale");
                    }
                    if (tk.is("$end")) {
                        break;
                    }
                    sb.append(tk.text());
                    if (sb.length() > 64) {
                        break;
                    }
                }
                parseTimescale(sb.toString(), ln);
            } else if (tk.is("$scope")) {
                List<String> args = args("$scope");
                if (args.size() != 2) {
                    throw tk.error("$scope: expected a scope type and a name before $end, found " + args.size() + " words");
                }
                scope.add(args.get(1));
            } else if (tk.is("$upscope")) {
                tk.expectEnd("$upscope");
                if (scope.isEmpty()) {
                    throw tk.error("$upscope without an open $scope");
                }
                scope.remove(scope.size() - 1);
            } else if (tk.is("$var")) {
                long ln = tk.tokLine;
                List<String> a = args("$var");
                if (a.size() < 4 || a.size() > 5) {
                    throw new CaptureFormatException(file, ln, "$var: expected type, size, identifier code, reference"
                            + " [and a bit select] before $end, found " + a.size() + " words");
                }
                declare(a, scope, paths, ln);
            } else if (tk.is("$date") || tk.is("$version") || tk.is("$comment")) {
                String what = tk.text();
                tk.skipToEnd(what);
            } else if (tk.tokLen > 0 && tk.tok[0] == '$') {
                throw tk.error("unknown declaration keyword '" + tk.shown() + "'; expected $date, $version, $comment, $timescale,"
                        + " $scope, $upscope, $var or $enddefinitions");
            } else {
                throw tk.error("unexpected '" + tk.shown() + "' in the declarations; expected a keyword starting with '$'");
            }
        }
        if (timescaleText == null) {
            throw new CaptureFormatException(file, tk.tokLine, "no $timescale declaration; expected one such as '$timescale 1ns $end'"
                    + " before $enddefinitions");
        }
        if (signals.isEmpty()) {
            throw new CaptureFormatException(file, tk.tokLine, "no $var declarations; expected at least one variable");
        }
        assignPorts(paths);
    }

    private List<String> args(String kw) throws IOException {
        List<String> out = new ArrayList<>();
        while (true) {
            if (!tk.next()) {
                throw tk.truncated(kw);
            }
            if (tk.is("$end")) {
                return out;
            }
            if (out.size() > 8) {
                throw tk.error(kw + ": too many words before $end");
            }
            out.add(tk.text());
        }
    }

    private void parseTimescale(String s, long ln) {
        String t = s.trim();
        int i = 0;
        while (i < t.length() && Character.isDigit(t.charAt(i))) {
            i++;
        }
        String num = t.substring(0, i);
        String unit = t.substring(i);
        long mult = switch (num) {
            case "1" -> 1;
            case "10" -> 10;
            case "100" -> 100;
            default -> -1;
        };
        long u = switch (unit) {
            case "s" -> Femtos.PER_S;
            case "ms" -> Femtos.PER_MS;
            case "us" -> Femtos.PER_US;
            case "ns" -> Femtos.PER_NS;
            case "ps" -> Femtos.PER_PS;
            case "fs" -> 1;
            default -> -1;
        };
        if (mult < 0 || u < 0 || (u == Femtos.PER_S && mult > 1)) {
            throw new CaptureFormatException(file, ln, "bad $timescale '" + (t.length() > 40 ? t.substring(0, 40) + "..." : t)
                    + "'; expected 1, 10 or 100 followed by s, ms, us, ns, ps or fs");
        }
        unitFs = mult * u;
        timescaleText = num + " " + unit;
    }

    private enum Kind { SCALAR, VECTOR, REAL }

    private void declare(List<String> a, List<String> scope, List<List<String>> paths, long ln) {
        String type = a.get(0);
        String code = a.get(2);
        String ref = a.get(3);
        String select = a.size() == 5 ? a.get(4) : null;
        if (ref.contains("[") && select == null) {
            int b = ref.indexOf('[');
            select = ref.substring(b);
            ref = ref.substring(0, b);
        }
        long size;
        try {
            size = Long.parseLong(a.get(1));
        } catch (NumberFormatException e) {
            throw new CaptureFormatException(file, ln, "$var " + ref + ": expected a size in bits, found '" + a.get(1) + "'");
        }
        boolean real = type.equals("real") || type.equals("realtime") || type.equals("shortreal");
        if (!real && (size < 1 || size > 64)) {
            throw new CaptureFormatException(file, ln, "$var " + ref + ": " + size + " bits; expected 1 to 64 (wider vectors"
                    + " are not supported)");
        }
        for (int i = 0; i < code.length(); i++) {
            char c = code.charAt(i);
            if (c < 33 || c > 126) {
                throw new CaptureFormatException(file, ln, "$var " + ref + ": identifier code has a non-printable character");
            }
        }
        if (codes.find(code) != null) {
            return; // another name for a signal already declared: the first name is kept
        }
        if (signals.size() >= MAX_SIGNALS) {
            throw new CaptureFormatException(file, ln, "more than " + MAX_SIGNALS + " variables; at most " + MAX_SIGNALS
                    + " are supported");
        }
        Kind kind = real ? Kind.REAL : size == 1 ? Kind.SCALAR : Kind.VECTOR;
        if (select != null && select.matches("\\[\\s*-?\\d+\\s*\\]")) {
            ref = ref + select.replace(" ", "");
        }
        List<String> path = new ArrayList<>(scope);
        path.add(ref);
        String dotted = String.join(".", path);
        VcdSignal s = switch (kind) {
            case SCALAR -> new VcdScalar(signals.size(), dotted, code);
            case VECTOR -> new VcdVector(signals.size(), (int) size, dotted, code);
            case REAL -> new VcdReal(signals.size(), dotted, code);
        };
        signals.add(s);
        paths.add(path);
        codes.put(code, s);
    }

    /** Port name: the shortest suffix of the scope path that is unique, sanitised. */
    private void assignPorts(List<List<String>> paths) {
        int n = signals.size();
        int[] depth = new int[n];
        Arrays.fill(depth, 1);
        for (int round = 0; round < 64; round++) {
            Map<String, List<Integer>> by = new HashMap<>();
            for (int i = 0; i < n; i++) {
                by.computeIfAbsent(suffix(paths.get(i), depth[i]).toLowerCase(Locale.ROOT), k -> new ArrayList<>()).add(i);
            }
            boolean changed = false;
            for (List<Integer> g : by.values()) {
                if (g.size() > 1) {
                    for (int i : g) {
                        if (depth[i] < paths.get(i).size()) {
                            depth[i]++;
                            changed = true;
                        }
                    }
                }
            }
            if (!changed) {
                break;
            }
        }
        List<String> raw = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            raw.add(suffix(paths.get(i), depth[i]));
        }
        List<String> p = Names.ports(raw);
        for (int i = 0; i < n; i++) {
            signals.get(i).port(p.get(i));
        }
    }

    private static String suffix(List<String> path, int d) {
        return String.join(".", path.subList(Math.max(0, path.size() - d), path.size()));
    }
}
