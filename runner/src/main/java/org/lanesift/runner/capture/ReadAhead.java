package org.lanesift.runner.capture;

import java.io.Closeable;
import java.io.IOException;
import java.io.InterruptedIOException;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.FutureTask;
import java.util.function.BooleanSupplier;

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
 * <p>When the caller asks for a span whose read the thread has not begun yet (the thread has not
 * been given a core: on a machine busy with other work), the caller reads it itself instead of
 * waiting for the thread to be scheduled.
 *
 * <p>A failure of a background read (an {@link IOException}, a {@link CaptureFormatException} such
 * as a file that shrank) is thrown from the {@link #next()} call that would have returned its
 * span, as the same exception object, so that callers see what a read on their own thread would
 * have thrown, at the same span. {@link #close()} stops the thread (interrupting a read in
 * progress) and waits for it to end. The thread is a daemon named {@value #THREAD_PREFIX} and the
 * file's name, started at the first read-ahead.
 *
 * <p>Off when the system property {@code lanesift.readAhead} is {@code false}, when the source's
 * {@code readAhead} option is false, and for a capture of one span (nothing to overlap).
 *
 * @param <S> a span as the reader returns it
 */
final class ReadAhead<S> implements Closeable {
    /** Name prefix of the read-ahead threads. */
    static final String THREAD_PREFIX = "lanesift-read-ahead ";
    /** Longest wait for the thread to end on {@link #close()}, in milliseconds. */
    private static final long JOIN_MS = 10_000;

    /** Reads the next span into the set of arrays {@link BlockArrays} is filling. */
    @FunctionalInterface
    interface SpanRead<S> {
        S read() throws IOException;
    }

    private final String threadName;
    private final boolean ahead;
    private final BlockArrays arrays;
    private final SpanRead<S> read;
    private final BooleanSupplier more;
    private final BlockingQueue<Runnable> tasks = new ArrayBlockingQueue<>(1);
    private Thread thread;
    private FutureTask<S> pending;
    private Throwable failed;
    private boolean closed;

    /**
     * Whether read-ahead is allowed by the system property {@code lanesift.readAhead} (default true).
     *
     * @return false when the property is {@code false}
     */
    static boolean allowed() {
        return !"false".equalsIgnoreCase(System.getProperty("lanesift.readAhead", "true"));
    }

    /**
     * @param threadName name of the read-ahead thread (after {@value #THREAD_PREFIX})
     * @param ahead      whether to read ahead on a second thread
     * @param arrays     the reader's block arrays
     * @param read       reads the next span, advancing the reader's read position
     * @param more       whether a span is left to read (asked only while no read runs)
     */
    ReadAhead(String threadName, boolean ahead, BlockArrays arrays, SpanRead<S> read, BooleanSupplier more) {
        this.threadName = THREAD_PREFIX + threadName;
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
            rethrow(failed);
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
            pending = new FutureTask<>(read::read);
            start();
            if (!tasks.offer(pending)) {
                throw new IllegalStateException("a read-ahead was asked for while one was queued");
            }
        }
        return ready;
    }

    private S awaitPending() throws IOException {
        FutureTask<S> p = pending;
        pending = null;
        // A read the thread has not begun (it has not been given a core yet, e.g. on a busy
        // machine) is done here rather than waited for; a FutureTask runs once, on whichever
        // thread gets to it first, so the thread then skips it.
        tasks.remove(p);
        p.run();
        try {
            return p.get();
        } catch (ExecutionException e) {
            failed = e.getCause();
            rethrow(failed);
            return null;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            p.cancel(true);
            failed = new InterruptedIOException("interrupted while waiting for the read-ahead of " + threadName.substring(THREAD_PREFIX.length()));
            throw (InterruptedIOException) failed;
        }
    }

    private static void rethrow(Throwable t) throws IOException {
        if (t instanceof IOException io) {
            throw io;
        }
        if (t instanceof RuntimeException r) {
            throw r;
        }
        if (t instanceof Error e) {
            throw e;
        }
        throw new IllegalStateException("read-ahead failed", t);
    }

    private void start() {
        if (thread != null) {
            return;
        }
        thread = new Thread(this::serve, threadName);
        thread.setDaemon(true);
        thread.start();
    }

    private void serve() {
        try {
            while (true) {
                tasks.take().run();
            }
        } catch (InterruptedException e) {
            // closed
        }
    }

    /** Whether a read was handed to the thread and has ended, there (for tests: the next span comes from the thread). */
    boolean readAheadDone() {
        FutureTask<S> p = pending;
        return p != null && p.isDone() && !tasks.contains(p);
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
        Thread t = thread;
        if (t == null) {
            return;
        }
        t.interrupt();
        boolean interrupted = false;
        long end = System.nanoTime() + JOIN_MS * 1_000_000L;
        while (t.isAlive() && System.nanoTime() < end) {
            try {
                t.join(Math.max(1, (end - System.nanoTime()) / 1_000_000L));
            } catch (InterruptedException e) {
                interrupted = true;
            }
        }
        if (interrupted) {
            Thread.currentThread().interrupt();
        }
    }
}
