package org.lanesift.runner;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.List;

/** Runs {@link Main#run} in-process and keeps exit code, stdout and stderr. */
record Cli(int code, String out, String err) {
    static Cli run(String... args) {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        ByteArrayOutputStream e = new ByteArrayOutputStream();
        int code;
        try (PrintStream po = new PrintStream(o, true, StandardCharsets.UTF_8);
             PrintStream pe = new PrintStream(e, true, StandardCharsets.UTF_8)) {
            code = Main.run(args, po, pe);
        }
        return new Cli(code, o.toString(StandardCharsets.UTF_8), e.toString(StandardCharsets.UTF_8));
    }

    /** Non-empty stderr lines. */
    List<String> errLines() {
        return Arrays.stream(err.split("\n", -1)).filter(s -> !s.isEmpty()).toList();
    }

    @Override
    public String toString() {
        return "exit " + code + "\n--- stdout\n" + out + "--- stderr\n" + err;
    }
}
