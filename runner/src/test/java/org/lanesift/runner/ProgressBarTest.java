package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.concurrent.atomic.AtomicLong;
import org.junit.jupiter.api.Test;

/** The progress bar appears only after two seconds, redraws at most five times a second, and erases itself. */
class ProgressBarTest {
    @Test
    void silentForTheFirstTwoSecondsThenDrawnThenErased() {
        AtomicLong now = new AtomicLong(0);
        ByteArrayOutputStream b = new ByteArrayOutputStream();
        PrintStream err = new PrintStream(b, true, StandardCharsets.UTF_8);
        ProgressBar bar = new ProgressBar(err, true, now::get);
        bar.progress(10, 100);
        now.set(1_999_000_000L);
        bar.progress(20, 100);
        assertEquals("", b.toString(StandardCharsets.UTF_8));
        now.set(2_000_000_000L);
        bar.progress(50, 100);
        String drawn = b.toString(StandardCharsets.UTF_8);
        assertTrue(drawn.startsWith("\r[###############---------------]  50%"), drawn);
        now.set(2_100_000_000L);
        bar.progress(60, 100);
        assertEquals(drawn, b.toString(StandardCharsets.UTF_8), "no redraw within 200 ms");
        now.set(2_300_000_000L);
        bar.progress(100, 100);
        assertTrue(b.toString(StandardCharsets.UTF_8).contains("100%"));
        bar.done();
        String all = b.toString(StandardCharsets.UTF_8);
        assertTrue(all.endsWith("\r"), "erased at the end");
    }

    @Test
    void disabledDrawsNothing() {
        AtomicLong now = new AtomicLong(0);
        ByteArrayOutputStream b = new ByteArrayOutputStream();
        ProgressBar bar = new ProgressBar(new PrintStream(b, true, StandardCharsets.UTF_8), false, now::get);
        now.set(10_000_000_000L);
        bar.progress(1, -1);
        bar.done();
        assertEquals(0, b.size());
    }

    @Test
    void unknownTotalShowsACount() {
        assertEquals("[running]  1,234 samples  3 s", ProgressBar.render(1234, -1, 3.2));
    }
}
