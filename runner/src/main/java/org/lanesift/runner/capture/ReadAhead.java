package org.lanesift.runner.capture;

import java.io.Closeable;
import java.io.IOException;
import java.io.InterruptedIOException;
import java.util.concurrent.FutureTask;
import java.util.function.BooleanSupplier;
import org.lanesift.kit.SideThread;

/**
 * Hands out the spans of a capture reader in order, reading the next span on a second thread
 * while the caller decodes the current one (one span ahead, never more), or, when off, reading
 * each span on the caller's thread when it is asked for. Shared by the raw and packed-logic
 * readers.
 *
 * <p>The read-ahead keeps the ownership rule of lent blocks (host-api {@code Block}, "Ownership")
 * with the two sets of {@link BlockArrays}: when {@link #next()} is called, the set handed out by
 * the previous call is recycled, the set filled in the background is handed out, and only then is
 * the recycled set given to the background thread to fill with the following span. Every use of
 * the {@link BlockArrays} and of the reader's state happens either on the caller's thread while no
 * read is running, or in the read itself, one read at a time (a {@link FutureTask} orders them).
 *
 * <p>The thread is signal-kit's {@link SideThread}: a read it has not begun when the caller needs
 * the span is done by the caller, and a failure of a background read (an {@link IOException}, a
 * {@link CaptureFormatException} such as a file that shrank) is thrown from the {@link #next()}
 * call that would have returned its span, as the same exception object, so that callers see what
 * a read on their own thread would have thrown, at the same span. {@link #close()} stops the
 * thread (interrupting a read in progress) and waits for it to end. The thread is a daemon named
 * {@value #THREAD_PREFIX} and the file's name, started at the first read-ahead.
 *
 * <p>Off when the system property {@code lanesift.readAhead} is {@code false}, when the JVM has
 * one processor, when the source's {@code readAhead} option is false, and for a capture of one
 * span (nothing to overlap).
 *
 * @param <S> a span as the reader returns it
 */
final class ReadAhead<S> implements Closeable {
    /** Name prefix of the read-ahead threads. */
    static final String THREAD_PREFIX = "lanesift-read-ahead ";

    /** Reads the next span into the set of arrays {@link BlockArrays} is filling. */
    @FunctionalInterface
    interface SpanRead<S> {
        S read() throws IOException;
    }

    private final String fileName;
    private final boolean ahead;
    private final BlockArrays arrays;
    private final SpanRead<S> read;
    private final BooleanSupplier more;
    private SideThread thread;
    private FutureTask<S> pending;
    private Throwable failed;
    private boolean closed;

    /**
     * Whether read-ahead is allowed: by the system property {@code lanesift.readAhead} (default
     * true) and by the processor count ({@link SideThread#allowed}).
     *
     * @return false when the property is {@code false} or the JVM has one processor
     */
    static boolean allowed() {
        return SideThread.allowed("lanesift.readAhead");
    }

    /**
     * @param fileName   the file's name, for the thread's name (after {@value #THREAD_PREFIX})
     * @param ahead      whether to read ahead on a second thread
     * @param arrays     the reader's block arrays
     * @param read       reads the next span, advancing the reader's read position
     * @param more       whether a span is left to read (asked only while no read runs)
     */
    ReadAhead(String fileName, boolean ahead, BlockArrays arrays, SpanRead<S> read, BooleanSupplier more) {
        this.fileName = fileName;
        this.ahead = ahead;
        this.arrays = arrays;
        this.read = read;
        this.more = more;
    }

    /**
     * The next span: the one read in the background, or one read now.
     *
     * @return the span, or null when the capture is exhausted
     * @throws IOException what the read threw, wherever it ran
     */
    S next() throws IOException {
        if (closed) {
            throw new IllegalStateException("read after close");
        }
        if (failed != null) {
            throw SideThread.rethrow(failed, IOException.class);
        }
        S ready = pending == null ? null : awaitPending();
        arrays.release();
        if (ready == null) {
            if (!more.getAsBoolean()) {
                return null;
            }
            arrays.begin();
            ready = read.read();
        }
        arrays.handOut();
        if (ahead && more.getAsBoolean()) {
            arrays.begin();
            if (thread == null) {
                thread = new SideThread(THREAD_PREFIX + fileName);
            }
            pending = thread.submit(read::read);
        }
        return ready;
    }

    private S awaitPending() throws IOException {
        FutureTask<S> p = pending;
        pending = null;
        try {
            return thread.await(p, IOException.class);
        } catch (IOException | RuntimeException | Error e) {
            failed = e;
            throw e;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            p.cancel(true);
            InterruptedIOException stop = new InterruptedIOException("interrupted while waiting for the read-ahead of " + fileName);
            failed = stop;
            throw stop;
        }
    }

    /** Whether a read was handed to the thread and has ended, there (for tests: the next span comes from the thread). */
    boolean readAheadDone() {
        FutureTask<S> p = pending;
        return p != null && p.isDone();
    }

    /**
     * Stops the read-ahead thread, interrupting a read in progress (which may close the reader's
     * channel: the reader is being closed anyway), and waits for it to end.
     */
    @Override
    public void close() {
        if (closed) {
            return;
        }
        closed = true;
        if (pending != null) {
            pending.cancel(true);
            pending = null;
        }
        if (thread != null) {
            thread.close();
        }
    }
}
