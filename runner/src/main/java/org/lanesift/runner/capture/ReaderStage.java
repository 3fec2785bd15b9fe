package org.lanesift.runner.capture;

import java.io.IOException;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/** A source stage that pumps a {@link CaptureReader} into its outputs, one span per call. */
final class ReaderStage implements Stage {
    private final CaptureReader reader;
    private final StageContext ctx;

    ReaderStage(CaptureReader reader, StageContext ctx) {
        this.reader = reader;
        this.ctx = ctx;
    }

    @Override
    public boolean produce() throws IOException {
        if (ctx.isCancelled()) {
            return false;
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
}
