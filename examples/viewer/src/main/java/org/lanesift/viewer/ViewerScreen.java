package org.lanesift.viewer;

import java.awt.BorderLayout;
import java.awt.Color;
import java.awt.Dimension;
import java.awt.FlowLayout;
import java.nio.file.Path;
import java.util.function.Consumer;
import javax.swing.JButton;
import javax.swing.JFileChooser;
import javax.swing.JLabel;
import javax.swing.JPanel;
import javax.swing.JProgressBar;
import javax.swing.JScrollPane;
import javax.swing.JSplitPane;
import javax.swing.JTabbedPane;
import javax.swing.SwingUtilities;
import org.lanesift.chain.ChainFileReader;
import org.lanesift.chain.ChainSpec;
import org.lanesift.plugin.InputException;
import org.lanesift.plugin.PluginRegistry;

/**
 * The whole screen, as one Swing panel (the window shows it in a frame; the snapshot paints it
 * off screen): a command strip on top (open capture, open chain, open output folder, run,
 * cancel, progress, status), the waveform area at the left with the findings list under it, and
 * at the right the frame pane over a tabbed pane of analysis pictures and the chain editor.
 *
 * <p>Threading: every method is for the UI thread. {@link #run()} starts one worker thread that
 * builds and runs the chain; progress reaches the bar, and the annotations made since the last
 * report reach the findings list as one batch, through {@code invokeLater}, at most every 50 ms;
 * the finished model replaces the shown one in one step on the UI thread; cancel calls the
 * chain's one thread-safe method.
 */
public final class ViewerScreen extends JPanel {
    private static final long serialVersionUID = 1L;

    private final transient PluginRegistry registry;
    private final WavePanel wave = new WavePanel();
    private final FramePane frames = new FramePane(this::goTo);
    private final PicturesPane pictures = new PicturesPane();
    private final FindingsList findings = new FindingsList(this::goTo);
    private final ChainPane chainPane;
    private final JProgressBar bar = new JProgressBar(0, 1000);
    private final JLabel status = new JLabel("open a capture, a chain or a run's output folder");
    private final JButton runButton = new JButton("Run chain");
    private final JButton cancelButton = new JButton("Cancel");
    private transient Path capture;
    private transient boolean haveChain;
    private transient RunJob job;
    private transient Consumer<ViewModel> whenShown = m -> { };
    private final JSplitPane mainSplit;
    private final JSplitPane leftSplit;
    private final JSplitPane rightSplit;

    /**
     * A screen.
     *
     * @param registry plugins and capture readers, found at run time
     */
    public ViewerScreen(PluginRegistry registry) {
        super(new BorderLayout());
        this.registry = registry;
        this.chainPane = new ChainPane(registry);
        JPanel strip = new JPanel(new FlowLayout(FlowLayout.LEFT, 6, 3));
        strip.setBackground(Palette.CAPTION);
        JButton openCapture = new JButton("Open capture\u2026");
        JButton openChain = new JButton("Open chain\u2026");
        JButton openFolder = new JButton("Open output folder\u2026");
        openCapture.addActionListener(e -> choose(false).ifPresent(this::openCapture));
        openChain.addActionListener(e -> choose(false).ifPresent(p -> report(() -> openChain(p))));
        openFolder.addActionListener(e -> choose(true).ifPresent(p -> report(() -> openFolder(p))));
        runButton.addActionListener(e -> run());
        cancelButton.addActionListener(e -> cancel());
        cancelButton.setEnabled(false);
        bar.setPreferredSize(new Dimension(160, 18));
        status.setForeground(Palette.CAPTION_TEXT);
        for (var c : new javax.swing.JComponent[] {openCapture, openChain, openFolder, runButton, cancelButton, bar, status}) {
            strip.add(c);
        }
        JSplitPane left = new JSplitPane(JSplitPane.VERTICAL_SPLIT, wave, findings);
        left.setResizeWeight(0.82);
        JTabbedPane tabs = new JTabbedPane();
        tabs.addTab("Analysis pictures", new JScrollPane(pictures));
        tabs.addTab("Chain", chainPane);
        JSplitPane right = new JSplitPane(JSplitPane.VERTICAL_SPLIT, frames, tabs);
        right.setResizeWeight(0.45);
        JSplitPane main = new JSplitPane(JSplitPane.HORIZONTAL_SPLIT, left, right);
        main.setResizeWeight(0.72);
        add(strip, BorderLayout.NORTH);
        add(main, BorderLayout.CENTER);
        mainSplit = main;
        leftSplit = left;
        rightSplit = right;
        setBackground(new Color(0xE6E0D2));
    }

    /**
     * Opens a capture: with no chain chosen its channels are read at once; with one, the chain's
     * source reads it on the next run.
     *
     * @param file the capture
     */
    public void openCapture(Path file) {
        capture = file;
        status.setText("capture " + file.getFileName() + (haveChain ? "; press Run chain" : ""));
        if (haveChain) {
            report(() -> chainPane.setChain(Sources.withCapture(chainPane.chain(), file)));
        } else {
            report(() -> chainPane.setChain(Sources.captureOnly(file)));
            run();
        }
    }

    /**
     * Chooses a capture and a chain together and runs the chain on it (the command line's way in).
     *
     * @param file  the capture, or null to run the chain on its own source file
     * @param chain the chain file
     * @throws InputException when the chain cannot be read or has no single source node
     */
    public void openAndRun(Path file, Path chain) {
        capture = file;
        openChain(chain);
        run();
    }

    /**
     * Chooses a chain file.
     *
     * @param file the chain file
     * @throws InputException when it cannot be read
     */
    public void openChain(Path file) {
        ChainSpec spec = new ChainFileReader().read(file, file.toString()).spec();
        if (capture != null) {
            spec = Sources.withCapture(spec, capture);
        }
        chainPane.setChain(spec);
        haveChain = true;
        status.setText("chain " + file.getFileName() + "; press Run chain");
    }

    /**
     * Shows a run's output folder (signals, annotations, frames, pictures).
     *
     * @param dir the folder
     * @throws InputException when a file in it is bad
     */
    public void openFolder(Path dir) {
        show(OutputFolder.load(registry, dir));
        status.setText("output folder " + dir);
    }

    /** Runs the chain on a worker thread; the result replaces the view when it is done. */
    public void run() {
        if (job != null) {
            return;
        }
        RunJob j = new RunJob(registry, chainPane.chain());
        job = j;
        runButton.setEnabled(false);
        cancelButton.setEnabled(true);
        bar.setValue(0);
        status.setText("running\u2026");
        long[] lastNs = {0};
        findings.setFindings(java.util.List.of());
        Thread worker = new Thread(() -> {
            ViewModel m = null;
            String problem = null;
            Collector into = new Collector();
            try {
                j.gather(into, (done, total) -> {
                    long now = System.nanoTime();
                    if (now - lastNs[0] > 50_000_000L || done == total) {
                        lastNs[0] = now;
                        int v = total > 0 ? (int) (1000.0 * done / total) : 0;
                        var batch = into.drainFresh();
                        SwingUtilities.invokeLater(() -> {
                            bar.setValue(v);
                            findings.append(batch);
                        });
                    }
                });
                m = into.build();
            } catch (InputException e) {
                problem = e.getMessage();
            } catch (RuntimeException e) {
                problem = "internal error (a bug, please report it): " + e;
                e.printStackTrace();
            }
            ViewModel result = m;
            String message = problem;
            SwingUtilities.invokeLater(() -> finished(j, result, message));
        }, "lanesift-viewer-run");
        worker.setDaemon(true);
        worker.start();
    }

    /** Cancels the run in progress, if any. */
    public void cancel() {
        RunJob j = job;
        if (j != null) {
            j.cancel();
            status.setText("cancelling\u2026");
        }
    }

    private void finished(RunJob j, ViewModel m, String problem) {
        job = null;
        runButton.setEnabled(true);
        cancelButton.setEnabled(false);
        if (problem != null) {
            status.setText(problem);
            return;
        }
        bar.setValue(1000);
        show(m);
        status.setText((j.isCancelled() ? "cancelled; showing what was read: " : "done: ") + m.rows().size() + " rows, "
                + m.frames().size() + " frames, " + m.findings().size() + " annotations");
    }

    /**
     * Shows a model in every pane.
     *
     * @param m the model
     */
    public void show(ViewModel m) {
        wave.setModel(m);
        frames.setFrames(m.frames());
        pictures.setPictures(m.pictures());
        findings.setFindings(m.findings());
        whenShown.accept(m);
    }

    /**
     * Told each time a model is shown (after a run or an opened folder).
     *
     * @param c the listener, on the UI thread
     */
    public void whenShown(Consumer<ViewModel> c) {
        whenShown = c;
    }

    /**
     * The waveform area.
     *
     * @return the component
     */
    public WavePanel wave() {
        return wave;
    }

    /**
     * The frame pane.
     *
     * @return the component
     */
    public FramePane frames() {
        return frames;
    }

    /**
     * The status line's text.
     *
     * @return the text
     */
    public String statusText() {
        return status.getText();
    }

    /**
     * Sizes the screen and places the pane dividers at their design proportions (waveform 72 %
     * of the width; findings the lowest 20 % of the left column; frame the top 48 % of the right).
     * The snapshot calls it before painting; the window once it is shown.
     *
     * @param widthPx  width, pixels
     * @param heightPx height, pixels
     */
    public void arrange(int widthPx, int heightPx) {
        setSize(widthPx, heightPx);
        layoutTree(this);
        mainSplit.setDividerLocation((int) (mainSplit.getWidth() * 0.72));
        layoutTree(this);
        leftSplit.setDividerLocation((int) (leftSplit.getHeight() * 0.80));
        rightSplit.setDividerLocation((int) (rightSplit.getHeight() * 0.48));
        layoutTree(this);
    }

    private static void layoutTree(java.awt.Component c) {
        c.doLayout();
        if (c instanceof java.awt.Container k) {
            for (java.awt.Component child : k.getComponents()) {
                layoutTree(child);
            }
        }
    }

    private void goTo(double tFs) {
        wave.jumpTo(tFs);
    }

    private void report(Runnable r) {
        try {
            r.run();
        } catch (InputException e) {
            status.setText(e.getMessage());
        }
    }

    private java.util.Optional<Path> choose(boolean folder) {
        JFileChooser fc = new JFileChooser(capture == null ? null : capture.toAbsolutePath().getParent().toFile());
        fc.setFileSelectionMode(folder ? JFileChooser.DIRECTORIES_ONLY : JFileChooser.FILES_ONLY);
        return fc.showOpenDialog(this) == JFileChooser.APPROVE_OPTION ? java.util.Optional.of(fc.getSelectedFile().toPath())
                : java.util.Optional.empty();
    }
}
