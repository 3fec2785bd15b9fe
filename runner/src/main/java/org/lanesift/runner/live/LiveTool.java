package org.lanesift.runner.live;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.ServiceLoader;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import org.lanesift.json.JsonParseException;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.plugin.InputFormatException;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;
import org.lanesift.runner.ChainRun;

/**
 * {@code lanesift live}: captures a device into a spool (the {@code capture} tool of the
 * serial-source plugin, called through its {@link Tool#run} with the same parsed options) and,
 * with {@code --chain}, decodes while capturing: every node of the chain with plugin
 * {@code spool} gets {@code dir} = the spool directory and {@code follow=true}, and the chain runs
 * through {@link ChainRun} on its own thread behind the capture.
 */
public final class LiveTool implements Tool {
    private final Tool capture;
    private final ToolSpec spec;

    /** Creates the tool (ServiceLoader); it offers the options of the {@code capture} tool found beside it. */
    public LiveTool() {
        this(findCapture());
    }

    LiveTool(Tool capture) {
        this.capture = capture;
        ToolSpec.Builder b = ToolSpec.builder("live")
                .summary("captures a USB acquisition device into a spool and decodes a chain while capturing")
                .description("Captures a device into a spool directory, like 'lanesift capture', and with --chain decodes while",
                        "capturing: the chain's 'spool' nodes read the live spool (docs/spool.md); results go to DIR/decoded.",
                        "Without --chain, only the spool is written.")
                .option(OptionSpec.text("chain", null, "the chain file to decode with while capturing"), "CHAIN.json");
        if (capture != null) {
            b.options(capture.spec().options()).footer(capture.spec().footer().toArray(String[]::new));
        }
        spec = b.build();
    }

    private static Tool findCapture() {
        // skip this class before instantiating: its constructor comes here
        return ServiceLoader.load(Tool.class, LiveTool.class.getClassLoader()).stream()
                .filter(p -> p.type() != LiveTool.class).map(ServiceLoader.Provider::get)
                .filter(t -> t.name().equals("capture")).findFirst().orElse(null);
    }

    @Override
    public ToolSpec spec() {
        return spec;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        if (capture == null) {
            console.err().println("live: the serial-source plugin (command 'capture') is not on the class path");
            return 1;
        }
        ToolArgs captureArgs = args.without("chain");
        String chain = args.text("chain");
        if (chain == null) {
            return capture.run(captureArgs, console);
        }
        List<String> spoolNodes = spoolNodes(Path.of(chain));
        Path dir = Path.of(args.text("out")).toAbsolutePath();
        ChainRun run = ChainRun.of(Path.of(chain)).out(dir.resolve("decoded")).quiet(true).debug(console.debug());
        for (String id : spoolNodes) {
            run.set(id, "dir", dir.toString()).set(id, "follow", "true")
                    // the capture runs in this process and closes the spool when it ends; a device pause is no dead capture
                    .set(id, "followIdleSeconds", "86400");
        }
        AtomicInteger captureCode = new AtomicInteger(-1);
        AtomicReference<RuntimeException> captureFailure = new AtomicReference<>();
        AtomicInteger chainCode = new AtomicInteger(-1);
        CountDownLatch chainDone = new CountDownLatch(1);
        Thread capThread = new Thread(() -> {
            try {
                captureCode.set(capture.run(captureArgs, console));
            } catch (RuntimeException e) {
                captureFailure.set(e);
                captureCode.set(1);
            }
        }, "live-capture");
        Thread chainThread = new Thread(() -> {
            try {
                chainCode.set(run.run(console.out(), console.err()));
            } finally {
                chainDone.countDown();
            }
        }, "live-decode");
        Thread hook = new Thread(() -> {
            try {
                chainDone.await(15, TimeUnit.SECONDS); // the capture's own hook closes the spool; the chain then ends
            } catch (InterruptedException ignored) {
                // exiting anyway
            }
        }, "live-stop");
        Runtime.getRuntime().addShutdownHook(hook);
        // the capture refuses an --out that is not new or empty, and the decode writes into --out/decoded:
        // the decode starts once the capture has put its first file there (it has then taken the folder
        // as its spool), or has ended. The file system tells us (a watch on the folder), no polling.
        SpoolStart start = SpoolStart.watch(dir);
        capThread.start();
        try {
            start.await(capThread);
            if (captureFailure.get() == null && (capThread.isAlive() || captureCode.get() == 0)) {
                chainThread.start();
            }
            capThread.join();
            if (captureCode.get() != 0 && !Files.exists(dir.resolve("spool.closed"))) {
                chainThread.interrupt();
            }
            chainThread.join(captureCode.get() == 0 ? 0 : 5000);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } finally {
            start.close(captureCode.get() != 0);
            try {
                Runtime.getRuntime().removeShutdownHook(hook);
            } catch (IllegalStateException shuttingDown) {
                // Ctrl-C
            }
        }
        if (captureFailure.get() != null) {
            throw captureFailure.get();
        }
        if (captureCode.get() != 0) {
            return captureCode.get();
        }
        if (chainCode.get() != 0) {
            console.err().println("live: the capture is complete in " + dir + "; decoding failed (exit " + chainCode.get()
                    + "); decode it again with: lanesift run " + chain + " --set NODE.dir=" + dir);
        }
        return Math.max(0, chainCode.get());
    }

    /** Ids of the chain's nodes with plugin {@code spool}; the message names the file when there are none. */
    static List<String> spoolNodes(Path chain) {
        JsonValue root;
        try {
            if (!Files.isRegularFile(chain)) {
                throw new OptionException("chain", "--chain " + chain + ": no such file");
            }
            root = JsonReader.read(chain, chain.toString());
        } catch (IOException e) {
            throw new InputFormatException("--chain " + chain + ": cannot be read (" + e.getMessage() + ")", e);
        } catch (JsonParseException e) {
            throw new InputFormatException("--chain " + chain + ": not valid JSON (" + e.getMessage() + ")", e);
        }
        List<String> ids = new ArrayList<>();
        JsonValue nodes = root.isObject() ? root.get("nodes") : null;
        if (nodes != null && nodes.isArray()) {
            for (JsonValue n : nodes.elements()) {
                JsonValue plugin = n.isObject() ? n.get("plugin") : null;
                JsonValue id = n.isObject() ? n.get("id") : null;
                if (plugin != null && plugin.isString() && plugin.asString().equals("spool") && id != null && id.isString()) {
                    ids.add(id.asString());
                }
            }
        }
        if (ids.isEmpty()) {
            throw new InputFormatException("--chain " + chain + " /nodes: no node with plugin 'spool'; a live chain reads the capture through one");
        }
        return ids;
    }
}
