package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/** A source stage that pumps a {@link CaptureReader} into its outputs, one span per call. */
final class ReaderStage implements Stage {
    private final CaptureReader reader;
    private final StageContext ctx;
    private boolean started;

    ReaderStage(CaptureReader reader, StageContext ctx) {
        this.reader = reader;
        this.ctx = ctx;
    }

    @Override
    public boolean produce() throws IOException {
        if (ctx.isCancelled()) {
            return false;
        }
        if (!started) {
            // asked at the first call, when the engine has wired every output
            started = true;
            boolean[] lend = new boolean[ctx.outputs().size()];
            for (int k = 0; k < lend.length; k++) {
                lend[k] = ctx.mayLend(k);
            }
            reader.lend(lend);
        }
        boolean more = reader.next(ctx::emit);
        long total = reader.total();
        ctx.progress(reader.done(), more ? total : reader.done());
        return more;
    }

    @Override
    public void close() {
        try {
            reader.close();
        } catch (IOException ignored) {
            // nothing useful to do on close
        }
    }

    /** Opens a reader of a capture's header (or the whole capture where the header does not say enough). */
    @FunctionalInterface
    interface Opener {
        CaptureReader open() throws IOException;
    }

    /**
     * The ports of a capture, for a source descriptor's outputs: the reader is opened, asked and closed.
     *
     * @param file   the capture, named in the error when it cannot be read
     * @param opener opens the reader
     * @return its ports
     */
    static List<PortSpec> portsOf(Path file, Opener opener) {
        try (CaptureReader r = opener.open()) {
            return r.ports();
        } catch (IOException e) {
            throw new CaptureFormatException(file, 0, "cannot read: " + e.getMessage(), e);
        }
    }
}
