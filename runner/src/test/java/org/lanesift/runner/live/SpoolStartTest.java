package org.lanesift.runner.live;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.CountDownLatch;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The live decode starts on the capture's first spool file, or when the capture ends without one. */
class SpoolStartTest {
    @TempDir
    Path tmp;

    @Test
    void theFirstFileOfTheCaptureEndsTheWaitWhileTheCaptureRuns() throws Exception {
        Path dir = tmp.resolve("spool");
        SpoolStart start = SpoolStart.watch(dir);
        assertTrue(Files.isDirectory(dir), "the folder is made so that it can be watched");
        CountDownLatch release = new CountDownLatch(1);
        Thread capture = new Thread(() -> {
            try {
                Files.writeString(dir.resolve("spool.properties"), "version=1\n");
                release.await();
            } catch (Exception e) {
                throw new IllegalStateException(e);
            }
        });
        capture.start();
        try {
            start.await(capture);
            assertTrue(capture.isAlive(), "the wait ended on the file, not on the capture's end");
            assertTrue(Files.exists(dir.resolve("spool.properties")));
        } finally {
            release.countDown();
            capture.join();
            start.close(false);
        }
        assertTrue(Files.isDirectory(dir));
    }

    @Test
    void aFolderThatAlreadyHoldsFilesWaitsForTheCaptureToEnd() throws Exception {
        Path dir = Files.createDirectories(tmp.resolve("used"));
        Files.writeString(dir.resolve("old.txt"), "someone's file");
        SpoolStart start = SpoolStart.watch(dir);
        CountDownLatch started = new CountDownLatch(1);
        Thread capture = new Thread(() -> {
            started.countDown();
            // the capture refuses the folder and ends
        });
        capture.start();
        started.await();
        start.await(capture);
        assertFalse(capture.isAlive(), "a folder with files in it is no sign that the capture began");
        start.close(true);
        assertTrue(Files.exists(dir.resolve("old.txt")), "a folder this class did not make is left alone");
    }

    @Test
    void aFolderMadeForTheWatchIsRemovedWhenTheCaptureFailsBeforeWriting() throws Exception {
        Path dir = tmp.resolve("new");
        SpoolStart start = SpoolStart.watch(dir);
        Thread capture = new Thread(() -> { });
        capture.start();
        start.await(capture);
        start.close(true);
        assertFalse(Files.exists(dir), "the capture failed: no empty folder is left behind");
    }
}
