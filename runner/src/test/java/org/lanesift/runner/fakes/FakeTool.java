package org.lanesift.runner.fakes;

import java.util.Locale;
import org.lanesift.plugin.DeviceFailure;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;

/**
 * Test-only tool: prints its parsed options; {@code --fail} makes it throw what a bug, bad input or
 * a failed device throws, so the host's handling of each can be checked.
 */
public final class FakeTool implements Tool {
    static final ToolSpec SPEC = ToolSpec.builder("fake-tool")
            .summary("Echoes its options (test only).")
            .option(OptionSpec.text("text", null, "any text"), "TEXT")
            .option(OptionSpec.number("length", "m", 1.0, -100.0, 100.0, "a length, such as 10cm"), "METRES")
            .flag("shout", "upper case")
            .option(OptionSpec.choice("fail", "none", "what to throw", "none", "npe", "input", "device"), "KIND")
            .build();

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        switch (args.text("fail")) {
            case "npe" -> throw new NullPointerException("fake-tool: a bug");
            case "input" -> throw new OptionException("text", "fake-tool: --text: expected anything else");
            case "device" -> throw new DeviceFailure("fake-tool: the device went away");
            default -> {
                // no failure asked for
            }
        }
        String text = "text=" + args.text("text") + " length=" + args.number("length") + " given=" + args.given("length")
                + " quiet=" + console.quiet() + " debug=" + console.debug();
        console.out().println(args.flag("shout") ? text.toUpperCase(Locale.ROOT) : text);
        return 0;
    }
}
