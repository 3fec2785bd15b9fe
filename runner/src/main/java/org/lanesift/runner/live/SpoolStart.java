package org.lanesift.runner.live;

import java.io.IOException;
import java.nio.file.FileSystems;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardWatchEventKinds;
import java.nio.file.WatchKey;
import java.nio.file.WatchService;
import java.util.concurrent.TimeUnit;

/**
 * The signal that a capture has begun its spool: the first file it creates in the spool folder,
 * reported by the file system's change notification (a {@link WatchService}) rather than found by
 * polling the folder. The folder is created (empty, which the capture accepts) so that it can be
 * watched before the capture starts; if this class created it and the capture fails before
 * writing anything, it is removed again. A folder that already holds files (which the capture
 * refuses) or cannot be watched gives no signal: the wait is then for the capture's end.
 */
final class SpoolStart {
    /** How often a wait with no file event checks whether the capture ended without one. */
    private static final long CAPTURE_END_CHECK_MS = 50;
    private final Path dir;
    private final WatchService watch;
    private final boolean created;

    private SpoolStart(Path dir, WatchService watch, boolean created) {
        this.dir = dir;
        this.watch = watch;
        this.created = created;
    }

    /**
     * Starts watching the spool folder, creating it if it does not exist.
     *
     * @param dir the spool folder the capture will write
     * @return the watch; a watch that waits for nothing but the capture's end when the folder cannot be watched
     */
    static SpoolStart watch(Path dir) {
        boolean created = false;
        try {
            if (!Files.exists(dir)) {
                Files.createDirectories(dir);
                created = true;
            }
            // a folder with files in it already is refused by the capture: then wait for the capture's end
            if (Files.isDirectory(dir) && !new SpoolStart(dir, null, false).hasEntries()) {
                WatchService ws = FileSystems.getDefault().newWatchService();
                dir.register(ws, StandardWatchEventKinds.ENTRY_CREATE);
                return new SpoolStart(dir, ws, created);
            }
        } catch (IOException e) {
            // the capture meets the same problem and reports it, naming the folder
        }
        return new SpoolStart(dir, null, created);
    }

    /**
     * Waits until the folder holds a file or the capture thread has ended.
     *
     * @param capture the capture's thread
     * @throws InterruptedException if interrupted while waiting
     */
    void await(Thread capture) throws InterruptedException {
        if (watch == null) {
            capture.join();
            return;
        }
        while (capture.isAlive() && !hasEntries()) {
            // woken by the first file; the timeout only notices a capture that ends without writing one
            WatchKey k = watch.poll(CAPTURE_END_CHECK_MS, TimeUnit.MILLISECONDS);
            if (k != null) {
                k.pollEvents();
                k.reset();
            }
        }
    }

    /**
     * Stops watching; removes the folder if this class created it, the capture failed and left it empty.
     *
     * @param captureFailed whether the capture ended with a non-zero code (or not at all)
     */
    void close(boolean captureFailed) {
        try {
            if (watch != null) {
                watch.close();
            }
            if (created && captureFailed && !hasEntries()) {
                Files.deleteIfExists(dir);
            }
        } catch (IOException e) {
            // nothing to undo
        }
    }

    private boolean hasEntries() {
        try (var files = Files.list(dir)) {
            return files.findAny().isPresent();
        } catch (IOException e) {
            return false;
        }
    }
}
