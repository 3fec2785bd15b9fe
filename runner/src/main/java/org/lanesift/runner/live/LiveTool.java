package org.lanesift.runner.live;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.ServiceLoader;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import org.lanesift.plugin.Tool;
import org.lanesift.runner.Main;

/**
 * {@code lanesift live}: captures a device into a spool (the {@code capture} tool of the
 * serial-source plugin) and, with {@code --chain}, decodes while capturing: every node of the
 * chain with plugin {@code spool} gets {@code dir} = the spool directory and {@code follow=true},
 * and the chain runs through {@code lanesift run} on its own thread behind the capture.
 */
public final class LiveTool implements Tool {
    /** Creates the tool (ServiceLoader). */
    public LiveTool() {
    }

    @Override
    public String name() {
        return "live";
    }

    @Override
    public String summary() {
        return "captures a USB acquisition device into a spool and decodes a chain while capturing";
    }

    @Override
    public int run(String[] args, PrintStream out, PrintStream err) {
        Tool capture = null;
        for (Tool t : ServiceLoader.load(Tool.class)) {
            if (t.name().equals("capture")) {
                capture = t;
            }
        }
        if (capture == null) {
            err.println("live: the serial-source plugin (command 'capture') is not on the class path");
            return 1;
        }
        List<String> rest = new ArrayList<>();
        String chain = null;
        String outDir = "lanesift-spool";
        for (int i = 0; i < args.length; i++) {
            if (args[i].equals("-h") || args[i].equals("--help")) {
                out.println("Usage: lanesift live (--port NAME | --device VID:PID | --simulate) [--chain CHAIN.json] [--duration T] [--out DIR]");
                out.println("       lanesift live --list");
                out.println("  --chain CHAIN.json  decode while capturing: the chain's 'spool' nodes read the live spool (docs/spool.md);");
                out.println("                      results go to DIR/decoded. Without it, only the spool is written.");
                out.println("All other options are those of 'lanesift capture --help'.");
                return 0;
            }
            if (args[i].equals("--chain")) {
                if (i + 1 >= args.length) {
                    err.println("live: --chain needs a chain file");
                    return 2;
                }
                chain = args[++i];
                continue;
            }
            if (args[i].equals("--out") && i + 1 < args.length) {
                outDir = args[i + 1];
            }
            rest.add(args[i]);
        }
        if (chain == null) {
            return capture.run(rest.toArray(String[]::new), out, err);
        }
        List<String> spoolNodes;
        try {
            spoolNodes = spoolNodes(Path.of(chain));
        } catch (IllegalArgumentException e) {
            err.println("live: " + e.getMessage());
            return 2;
        }
        Path dir = Path.of(outDir).toAbsolutePath();
        List<String> runArgs = new ArrayList<>(List.of("run", chain, "--out", dir.resolve("decoded").toString(), "--quiet"));
        for (String id : spoolNodes) {
            runArgs.add("--set");
            runArgs.add(id + ".dir=" + dir);
            runArgs.add("--set");
            runArgs.add(id + ".follow=true");
        }
        AtomicInteger captureCode = new AtomicInteger(-1);
        AtomicInteger chainCode = new AtomicInteger(-1);
        CountDownLatch chainDone = new CountDownLatch(1);
        Tool cap = capture;
        Thread capThread = new Thread(() -> captureCode.set(cap.run(rest.toArray(String[]::new), out, err)), "live-capture");
        Thread chainThread = new Thread(() -> {
            try {
                chainCode.set(Main.run(runArgs.toArray(String[]::new), out, err));
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
        capThread.start();
        chainThread.start();
        try {
            capThread.join();
            if (captureCode.get() != 0 && !Files.exists(dir.resolve("spool.closed"))) {
                chainThread.interrupt();
            }
            chainThread.join(captureCode.get() == 0 ? 0 : 5000);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } finally {
            try {
                Runtime.getRuntime().removeShutdownHook(hook);
            } catch (IllegalStateException shuttingDown) {
                // Ctrl-C
            }
        }
        if (captureCode.get() != 0) {
            return captureCode.get();
        }
        if (chainCode.get() != 0) {
            err.println("live: the capture is complete in " + dir + "; decoding failed (exit " + chainCode.get()
                    + "); decode it again with: lanesift run " + chain + " --set NODE.dir=" + dir);
        }
        return Math.max(0, chainCode.get());
    }

    /** Ids of the chain's nodes with plugin {@code spool}; the message names the file when there are none. */
    static List<String> spoolNodes(Path chain) {
        JsonNode root;
        try {
            if (!Files.isRegularFile(chain)) {
                throw new IllegalArgumentException("--chain " + chain + ": no such file");
            }
            if (Files.size(chain) > 4 << 20) {
                throw new IllegalArgumentException("--chain " + chain + ": larger than 4 MiB");
            }
            root = new ObjectMapper().readTree(chain.toFile());
        } catch (IOException e) {
            throw new IllegalArgumentException("--chain " + chain + ": not valid JSON (" + String.valueOf(e.getMessage()).lines().findFirst().orElse("") + ")");
        }
        List<String> ids = new ArrayList<>();
        JsonNode nodes = root == null ? null : root.get("nodes");
        if (nodes != null && nodes.isArray()) {
            for (JsonNode n : nodes) {
                if ("spool".equals(n.path("plugin").asText()) && n.path("id").isTextual()) {
                    ids.add(n.get("id").asText());
                }
            }
        }
        if (ids.isEmpty()) {
            throw new IllegalArgumentException("--chain " + chain + " /nodes: no node with plugin 'spool'; a live chain reads the capture through one");
        }
        return ids;
    }
}
