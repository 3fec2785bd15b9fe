package org.lanesift.viewer;

import java.awt.GraphicsEnvironment;
import java.awt.Point;
import java.awt.Rectangle;
import java.awt.Robot;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.lang.reflect.InvocationTargetException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.atomic.AtomicReference;
import javax.imageio.ImageIO;
import javax.swing.JFrame;
import javax.swing.SwingUtilities;
import javax.swing.WindowConstants;
import org.lanesift.chain.ChainFileReader;
import org.lanesift.chain.ChainSpec;
import org.lanesift.plugin.DeviceFailure;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OutputException;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;
import org.lanesift.time.TimeValue;

/**
 * {@code lanesift view}: opens the desktop viewer on a capture, a chain and/or a run's output
 * folder; or, with {@code --snapshot}, paints the same screen off screen into a PNG without a
 * display. With {@code --shot-when-done} the window runs the chain, photographs itself on the
 * screen once the result is shown, and closes (the end-to-end test and the docs' screenshots).
 */
public final class ViewTool implements Tool {
    static final ToolSpec SPEC = ToolSpec.builder("view")
            .summary("desktop viewer: waveforms, decoded rows, frames and findings on one screen")
            .description("Opens a window showing a capture's channels as rows, each plugin's annotations on rows under the",
                    "channel they belong to, decoded frames, analysis pictures and the findings list. With --chain the",
                    "chain runs on a worker thread (progress bar, cancel). --snapshot paints the same screen into a PNG",
                    "without a display (the layout goes beside it as FILE.png.json).")
            .option(OptionSpec.text("capture", null, "capture file (.csv .tsv .txt, .vcd, .bin .raw .dat with FILE.json)"), "FILE")
            .option(OptionSpec.text("chain", null, "chain file; its one source node reads --capture when that is given"), "FILE")
            .option(OptionSpec.text("folder", null, "a run's output folder to look at instead of running"), "DIR")
            .option(OptionSpec.text("snapshot", null, "write the screen to this PNG without opening a window, then exit"), "FILE.png")
            .option(OptionSpec.text("shot-when-done", null, "in the window: photograph it once the run is shown, write this PNG, close"), "FILE.png")
            .option(OptionSpec.time("at", TimeValue.Unit.US, null, "centre of the waveform view (default: whole capture)"), "TIME")
            .option(OptionSpec.time("span", TimeValue.Unit.US, null, "time across the waveform view (default: whole capture)"), "SPAN")
            .option(OptionSpec.integer("width", 1600L, 640, 8000, "screen width, pixels"), "PX")
            .option(OptionSpec.integer("height", 1000L, 400, 8000, "screen height, pixels"), "PX")
            .footer("Safety: the viewer only reads files. Probing the link that made a capture is another matter:"
                            + " see the cautions in README.md (earthed probe grounds, 50-ohm input limits, ESD on display flex cables).")
            .build();

    /** Creates the tool (ServiceLoader). */
    public ViewTool() {
    }

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        PluginRegistry registry = PluginRegistry.discover(ViewTool.class.getClassLoader());
        Path capture = path(args, "capture");
        Path chain = path(args, "chain");
        Path folder = path(args, "folder");
        if (folder != null && (capture != null || chain != null)) {
            throw new OptionException("folder", "shows a finished run; give it alone, without --capture or --chain");
        }
        int w = (int) args.integer("width", 1600);
        int h = (int) args.integer("height", 1000);
        Path snapshot = path(args, "snapshot");
        if (snapshot != null) {
            makeParent(snapshot);
            ViewModel m = folder != null ? OutputFolder.load(registry, folder) : runNow(registry, capture, chain);
            BufferedImage img = onUiThread(() -> {
                ViewerScreen s = new ViewerScreen(registry);
                s.show(m);
                s.arrange(w, h);
                applyView(s, args);
                BufferedImage out = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
                java.awt.Graphics2D g = out.createGraphics();
                s.printAll(g);
                g.dispose();
                ScreenLayout.writeBeside(s, snapshot);
                return out;
            });
            writePng(img, snapshot);
            if (!console.quiet()) {
                console.out().println("wrote " + snapshot + " (" + w + "x" + h + ") and " + snapshot + ".json");
            }
            return 0;
        }
        if (GraphicsEnvironment.isHeadless()) {
            throw new DeviceFailure("no display to open a window on (DISPLAY is not set or the JVM is headless);"
                    + " use --snapshot FILE.png to render without one");
        }
        return window(registry, capture, chain, folder, args, path(args, "shot-when-done"), w, h);
    }

    private static ViewModel runNow(PluginRegistry registry, Path capture, Path chain) {
        ChainSpec spec = spec(capture, chain);
        return new RunJob(registry, spec).run((d, t) -> { });
    }

    private static ChainSpec spec(Path capture, Path chain) {
        if (chain == null && capture == null) {
            throw new OptionException("capture", "give --capture, --chain or --folder to look at");
        }
        if (chain == null) {
            return Sources.captureOnly(capture);
        }
        ChainSpec s = new ChainFileReader().read(chain, chain.toString()).spec();
        return capture == null ? s : Sources.withCapture(s, capture);
    }

    private int window(PluginRegistry registry, Path capture, Path chain, Path folder, ToolArgs args, Path shot, int w, int h) {
        CountDownLatch closed = new CountDownLatch(1);
        AtomicReference<RuntimeException> failed = new AtomicReference<>();
        onUiThread(() -> {
            JFrame f = new JFrame("lanesift view");
            ViewerScreen s = new ViewerScreen(registry);
            f.setContentPane(s);
            f.setDefaultCloseOperation(WindowConstants.DISPOSE_ON_CLOSE);
            f.addWindowListener(new java.awt.event.WindowAdapter() {
                @Override
                public void windowClosed(java.awt.event.WindowEvent e) {
                    closed.countDown();
                }
            });
            f.setSize(w, h);
            f.setLocation(0, 0);
            f.setVisible(true);
            s.arrange(s.getWidth(), s.getHeight());
            s.whenShown(m -> {
                applyView(s, args);
                if (shot != null) {
                    // photograph after this event, once the new model has been painted
                    javax.swing.Timer t = new javax.swing.Timer(700, e -> {
                        try {
                            photograph(s, shot);
                        } catch (RuntimeException ex) {
                            failed.set(ex);
                        }
                        f.dispose();
                    });
                    t.setRepeats(false);
                    t.start();
                }
            });
            if (folder != null) {
                s.openFolder(folder);
            } else if (chain != null) {
                s.openAndRun(capture, chain);
            } else if (capture != null) {
                s.openCapture(capture);
            }
            return null;
        });
        try {
            closed.await();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        if (failed.get() != null) {
            throw failed.get();
        }
        return 0;
    }

    /** The screen's own pixels as the display shows them, through the JDK's screen reader. */
    private static void photograph(ViewerScreen s, Path shot) {
        BufferedImage img;
        try {
            Point at = s.getLocationOnScreen();
            img = new Robot().createScreenCapture(new Rectangle(at.x, at.y, s.getWidth(), s.getHeight()));
        } catch (java.awt.AWTException e) {
            throw new DeviceFailure("cannot read the screen: " + e.getMessage());
        }
        writePng(img, shot);
        ScreenLayout.writeBeside(s, shot);
    }

    private static void applyView(ViewerScreen s, ToolArgs args) {
        ViewModel m = s.wave().model();
        double span = args.has("span") ? args.time("span").toFs(Double.NaN, Double.NaN) : m.endFs() - m.startFs();
        if (!(span > 0)) {
            throw new OptionException("span", "must be a positive time, such as 2us");
        }
        double centre = args.has("at") ? args.time("at").toFs(Double.NaN, Double.NaN) : m.startFs() + (m.endFs() - m.startFs()) / 2.0;
        if (args.has("at") || args.has("span")) {
            s.wave().show(centre - span / 2, span);
            s.wave().setCursorFs(centre);
        }
    }

    private static void makeParent(Path file) {
        Path parent = file.toAbsolutePath().getParent();
        try {
            if (parent != null) {
                Files.createDirectories(parent);
            }
        } catch (IOException e) {
            throw new OutputException(parent + ": cannot create the folder: " + e.getMessage(), e);
        }
    }

    private static void writePng(BufferedImage img, Path file) {
        makeParent(file);
        try {
            if (!ImageIO.write(img, "png", file.toFile())) {
                throw new OutputException(file + ": no PNG writer in this JDK", null);
            }
        } catch (IOException e) {
            throw new OutputException(file + ": cannot write: " + e.getMessage(), e);
        }
    }

    private static Path path(ToolArgs args, String name) {
        String s = args.text(name);
        return s == null ? null : Path.of(s);
    }

    /** Runs on the Swing thread and waits; bad input and bugs thrown there come back unchanged. */
    private static <T> T onUiThread(java.util.function.Supplier<T> work) {
        AtomicReference<T> out = new AtomicReference<>();
        try {
            SwingUtilities.invokeAndWait(() -> out.set(work.get()));
        } catch (InvocationTargetException e) {
            if (e.getCause() instanceof RuntimeException r) {
                throw r;
            }
            if (e.getCause() instanceof Error err) {
                throw err;
            }
            throw new IllegalStateException(e.getCause());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while painting", e);
        }
        return out.get();
    }
}
