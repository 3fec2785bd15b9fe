package org.lanesift.runner;

import java.io.PrintStream;
import java.util.Locale;
import org.lanesift.chain.ProgressListener;

/**
 * A one-line progress bar on stderr, drawn only once a run has taken two seconds, redrawn at
 * most five times a second, and erased at the end. Disabled when stderr is not a terminal or
 * with {@code --quiet}.
 */
final class ProgressBar implements ProgressListener {
    static final long SHOW_AFTER_NANOS = 2_000_000_000L;
    private static final long REDRAW_NANOS = 200_000_000L;
    private static final int WIDTH = 30;

    private final PrintStream err;
    private final boolean enabled;
    private final long startNanos;
    private final java.util.function.LongSupplier clock;
    private long lastDraw;
    private boolean drawn;
    private int lastLength;

    ProgressBar(PrintStream err, boolean enabled) {
        this(err, enabled, System::nanoTime);
    }

    ProgressBar(PrintStream err, boolean enabled, java.util.function.LongSupplier clock) {
        this.err = err;
        this.enabled = enabled;
        this.clock = clock;
        this.startNanos = clock.getAsLong();
    }

    @Override
    public void progress(long done, long total) {
        if (!enabled) {
            return;
        }
        long now = clock.getAsLong();
        if (now - startNanos < SHOW_AFTER_NANOS || (drawn && now - lastDraw < REDRAW_NANOS)) {
            return;
        }
        lastDraw = now;
        String line = render(done, total, (now - startNanos) / 1e9);
        StringBuilder sb = new StringBuilder("\r").append(line);
        for (int i = line.length(); i < lastLength; i++) {
            sb.append(' ');
        }
        lastLength = line.length();
        err.print(sb);
        err.flush();
        drawn = true;
    }

    static String render(long done, long total, double seconds) {
        StringBuilder sb = new StringBuilder();
        if (total > 0) {
            double f = Math.max(0, Math.min(1, done / (double) total));
            int fill = (int) Math.round(f * WIDTH);
            sb.append('[');
            for (int i = 0; i < WIDTH; i++) {
                sb.append(i < fill ? '#' : '-');
            }
            sb.append("] ").append(String.format(Locale.ROOT, "%3.0f%%", f * 100));
        } else {
            sb.append("[running]");
        }
        sb.append(String.format(Locale.ROOT, "  %,d samples  %.0f s", done, seconds));
        return sb.toString();
    }

    /** Erases the bar if it was drawn. */
    void done() {
        if (drawn) {
            err.print("\r" + " ".repeat(lastLength) + "\r");
            err.flush();
            drawn = false;
        }
    }
}
