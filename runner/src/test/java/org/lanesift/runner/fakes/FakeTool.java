package org.lanesift.runner.fakes;

import java.io.PrintStream;
import org.lanesift.plugin.Tool;

/** Test-only tool: prints its arguments one per line; exits 2 if the first is "bad". */
public final class FakeTool implements Tool {
    @Override
    public String name() {
        return "fake-tool";
    }

    @Override
    public String summary() {
        return "Echoes its arguments (test only).";
    }

    @Override
    public int run(String[] args, PrintStream out, PrintStream err) {
        if (args.length > 0 && args[0].equals("bad")) {
            err.println("fake-tool: bad argument 'bad': expected anything else");
            return 2;
        }
        for (String a : args) {
            out.println(a);
        }
        return 0;
    }
}
