package org.lanesift.runner;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * A strict reader of the VCD subset the writer produces, for checking it: the declaration
 * keywords, {@code $scope}/{@code $var}/{@code $upscope}, {@code $enddefinitions}, {@code #time}
 * lines that never decrease, scalar changes ({@code 0 1 x z} + id) and vector changes
 * ({@code b<digits> id}). Source: IEEE 1364-2005 clause 18.2 (syntax of the four-state VCD file);
 * anything outside that grammar throws.
 */
final class VcdText {
    /** One declared variable: scope.name, width, and its changes as (time, value) with value a bit string or "x". */
    static final class Var {
        final String name;
        final int width;
        final List<long[]> times = new ArrayList<>();
        final List<String> values = new ArrayList<>();

        Var(String name, int width) {
            this.name = name;
            this.width = width;
        }

        /** Value at time t: the last change at or before t, or null before the first. */
        String at(long t) {
            String v = null;
            for (int i = 0; i < times.size() && times.get(i)[0] <= t; i++) {
                v = values.get(i);
            }
            return v;
        }
    }

    final Map<String, Var> byName = new LinkedHashMap<>();
    final Map<String, Var> byCode = new LinkedHashMap<>();
    String timescale;
    String comment = "";
    final List<String> body = new ArrayList<>();

    static VcdText read(Path file) throws IOException {
        VcdText v = new VcdText();
        v.parse(Files.readString(file, StandardCharsets.US_ASCII));
        return v;
    }

    private void parse(String text) {
        String[] tok = text.trim().split("\\s+");
        int i = 0;
        List<String> scopes = new ArrayList<>();
        while (true) {
            String t = tok[i++];
            switch (t) {
                case "$date", "$version" -> i = skipToEnd(tok, i);
                case "$comment" -> {
                    int j = skipToEnd(tok, i);
                    comment = String.join(" ", java.util.Arrays.copyOfRange(tok, i, j - 1));
                    i = j;
                }
                case "$timescale" -> {
                    int j = skipToEnd(tok, i);
                    timescale = String.join(" ", java.util.Arrays.copyOfRange(tok, i, j - 1));
                    i = j;
                }
                case "$scope" -> {
                    req(tok[i++].equals("module"), "scope type");
                    scopes.add(tok[i++]);
                    req(tok[i++].equals("$end"), "$end after scope");
                }
                case "$upscope" -> {
                    req(tok[i++].equals("$end"), "$end after upscope");
                    scopes.remove(scopes.size() - 1);
                }
                case "$var" -> {
                    req(tok[i++].equals("wire"), "var type wire");
                    int width = Integer.parseInt(tok[i++]);
                    String code = tok[i++];
                    String ref = tok[i++];
                    if (!tok[i].equals("$end")) {
                        req(tok[i++].equals("[" + (width - 1) + ":0]"), "bit range");
                    }
                    req(tok[i++].equals("$end"), "$end after var");
                    req(!byCode.containsKey(code), "unique id code " + code);
                    for (char c : code.toCharArray()) {
                        req(c >= 33 && c <= 126, "printable id code");
                    }
                    Var v = new Var(String.join(".", scopes) + "." + ref, width);
                    byCode.put(code, v);
                    byName.put(v.name, v);
                }
                case "$enddefinitions" -> {
                    req(tok[i++].equals("$end"), "$end after enddefinitions");
                    req(scopes.isEmpty(), "all scopes closed");
                    body(tok, i);
                    return;
                }
                default -> throw new IllegalArgumentException("unexpected token in header: " + t);
            }
        }
    }

    private void body(String[] tok, int i) {
        long time = -1;
        boolean inDump = false;
        while (i < tok.length) {
            String t = tok[i++];
            body.add(t);
            if (t.startsWith("#")) {
                long nt = Long.parseLong(t.substring(1));
                req(nt >= 0 && nt > time, "times increase: " + nt + " after " + time);
                time = nt;
            } else if (t.equals("$dumpvars")) {
                inDump = true;
            } else if (t.equals("$end")) {
                req(inDump, "$end closes $dumpvars");
                inDump = false;
            } else if (t.startsWith("b")) {
                String bits = t.substring(1);
                req(bits.matches("[01]+|x"), "vector value " + t);
                String code = tok[i++];
                body.add(code);
                Var v = byCode.get(code);
                req(v != null && v.width > 1, "vector id " + code);
                req(bits.length() <= v.width, "value fits width");
                add(v, time, bits);
            } else {
                char c = t.charAt(0);
                req("01xz".indexOf(c) >= 0, "scalar value " + t);
                Var v = byCode.get(t.substring(1));
                req(v != null && v.width == 1, "scalar id " + t);
                add(v, time, String.valueOf(c));
            }
        }
        req(time >= 0, "at least one time");
    }

    private static void add(Var v, long time, String value) {
        v.times.add(new long[] {time});
        v.values.add(value);
    }

    private static int skipToEnd(String[] tok, int i) {
        while (!tok[i].equals("$end")) {
            i++;
        }
        return i + 1;
    }

    private static void req(boolean ok, String what) {
        if (!ok) {
            throw new IllegalArgumentException("VCD syntax: expected " + what);
        }
    }
}
