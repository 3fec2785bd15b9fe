package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.ExternalTool;
import org.junit.jupiter.api.io.TempDir;

/**
 * A VCD written by Icarus Verilog (Debian package {@code iverilog}) from a small testbench goes
 * through {@code lanesift run} (the {@code vcd} reader, then our VCD writer); every signal must
 * have the same value as in Icarus' file at every change time and between changes, with x and z
 * both becoming x. Source: Icarus Verilog's $dumpvars output, an independent IEEE 1364 VCD writer.
 */
class IcarusVcdTest {
    @TempDir
    Path tmp;

    static final String BENCH = """
            `timescale 1ns/1ps
            module tb;
              reg clk = 0;
              reg [7:0] count = 0;
              reg data = 1'bx;
              always #2.5 clk = ~clk;
              always @(posedge clk) count <= count + 1;
              initial begin
                $dumpfile("dump.vcd");
                $dumpvars(0, tb);
                #7.25 data = 0;
                #10 data = 1;
                #3.125 data = 1'bz;
                #4 data = 0;
                #1.001 data = 1;
                #50 $finish;
              end
            endmodule
            """;

    @Test
    void valuesMatchIcarusAtEveryChange() throws Exception {
        Path iverilog = ExternalTool.require("iverilog");
        Path vvp = ExternalTool.require("vvp");
        Files.writeString(tmp.resolve("tb.v"), BENCH);
        exec(tmp, iverilog.toString(), "-o", "tb.vvp", "tb.v");
        exec(tmp, vvp.toString(), "-n", "tb.vvp");
        Path dump = tmp.resolve("dump.vcd");
        assertTrue(Files.size(dump) > 100);
        Files.writeString(tmp.resolve("c.json"), "{\"nodes\": [{\"id\": \"tb\", \"plugin\": \"vcd\", \"options\": {\"file\": \"dump.vcd\"}}]}");
        Cli r = Cli.run("run", tmp.resolve("c.json").toString(), "--out", tmp.resolve("out").toString(), "-q");
        assertEquals(0, r.code(), r::toString);

        Icarus ref = Icarus.read(dump);
        VcdText ours = VcdText.read(tmp.resolve("out/signals.vcd"));
        assertEquals("1 fs", ours.timescale);
        List<Long> times = new ArrayList<>(new TreeSet<>(ref.allTimes()));
        int checked = 0;
        for (String name : List.of("clk", "count", "data")) {
            VcdText.Var v = ours.byName.get("tb." + name);
            assertTrue(v != null, "tb." + name + " in " + ours.byName.keySet());
            for (int i = 0; i < times.size(); i++) {
                long t = times.get(i);
                long mid = i + 1 < times.size() ? (t + times.get(i + 1)) / 2 : t + 1000;
                for (long at : new long[] {t, mid}) {
                    String expect = ref.at(name, at);
                    String got = v.at(at);
                    if (v.width > 1 && !expect.equals("x")) {
                        assertEquals(Long.parseLong(expect, 2), Long.parseLong(got, 2), name + " at " + at + " fs");
                    } else {
                        assertEquals(expect, got, name + " at " + at + " fs");
                    }
                    checked++;
                }
            }
        }
        assertTrue(checked > 100, "checked " + checked);
    }

    static void exec(Path dir, String... cmd) throws Exception {
        Process p = new ProcessBuilder(cmd).directory(dir.toFile()).redirectErrorStream(true)
                .redirectOutput(dir.resolve("log.txt").toFile()).start();
        assertTrue(p.waitFor(60, TimeUnit.SECONDS), "timeout: " + String.join(" ", cmd));
        assertEquals(0, p.exitValue(), () -> String.join(" ", cmd) + ": " + read(dir.resolve("log.txt")));
    }

    static String read(Path p) {
        try {
            return Files.readString(p);
        } catch (Exception e) {
            return "";
        }
    }

    /** Just enough of IEEE 1364-2005 clause 18 to read Icarus' output: $timescale, $var, #t, scalar and b-vector changes. */
    static final class Icarus {
        long fsPerUnit = 1;
        final Map<String, String> nameOf = new HashMap<>();
        final Map<String, List<long[]>> times = new HashMap<>();
        final Map<String, List<String>> values = new HashMap<>();

        static Icarus read(Path f) throws Exception {
            Icarus v = new Icarus();
            String[] tok = Files.readString(f).trim().split("\\s+");
            long time = 0;
            boolean body = false;
            for (int i = 0; i < tok.length; i++) {
                String t = tok[i];
                if (!body) {
                    if (t.equals("$timescale")) {
                        String ts = tok[++i];
                        if (!tok[i + 1].equals("$end")) {
                            ts += tok[++i];
                        }
                        v.fsPerUnit = switch (ts.replaceAll("^\\d+", "")) {
                            case "fs" -> 1L;
                            case "ps" -> 1_000L;
                            case "ns" -> 1_000_000L;
                            default -> throw new IllegalArgumentException("timescale " + ts);
                        } * Long.parseLong(ts.replaceAll("\\D.*$", ""));
                    } else if (t.equals("$var")) {
                        String code = tok[i + 3];
                        String ref = tok[i + 4];
                        v.nameOf.put(code, ref);
                        v.times.put(ref, new ArrayList<>());
                        v.values.put(ref, new ArrayList<>());
                    } else if (t.equals("$enddefinitions")) {
                        body = true;
                    }
                    continue;
                }
                if (t.startsWith("#")) {
                    time = Long.parseLong(t.substring(1)) * v.fsPerUnit;
                } else if (t.startsWith("b") || t.startsWith("B")) {
                    String bits = t.substring(1).toLowerCase();
                    v.add(tok[++i], time, bits.matches("[01]+") ? bits : "x");
                } else if (t.length() > 1 && "01xzXZ".indexOf(t.charAt(0)) >= 0) {
                    char c = Character.toLowerCase(t.charAt(0));
                    v.add(t.substring(1), time, c == 'z' ? "x" : String.valueOf(c));
                }
            }
            return v;
        }

        void add(String code, long time, String value) {
            String n = nameOf.get(code);
            times.get(n).add(new long[] {time});
            values.get(n).add(value);
        }

        List<Long> allTimes() {
            List<Long> all = new ArrayList<>();
            times.values().forEach(l -> l.forEach(a -> all.add(a[0])));
            return all;
        }

        String at(String name, long t) {
            String out = "x";
            List<long[]> ts = times.get(name);
            for (int i = 0; i < ts.size() && ts.get(i)[0] <= t; i++) {
                out = values.get(name).get(i);
            }
            return out;
        }
    }
}
