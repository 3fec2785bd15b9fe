package org.lanesift.kit;

import java.util.concurrent.Callable;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.FutureTask;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.ThreadPoolExecutor;
import java.util.concurrent.TimeUnit;

/**
 * One helper thread beside a calling thread that works one step ahead: the caller
 * {@link #submit}s a job (read the next block, filter this block), does its own work, then
 * {@link #await}s the job. Used by the capture readers' read-ahead and by the leg deskew's filter
 * worker; the one place where Lanesift runs its own work on a second thread.
 *
 * <ul>
 * <li><b>A job not begun is taken back.</b> When the caller awaits a job the thread has not begun
 * (on a busy machine it has not been given a core), the caller runs it itself instead of waiting
 * for the thread to be scheduled. A {@link FutureTask} runs once, on whichever thread gets to it
 * first, so a job's result never depends on the thread that ran it.</li>
 * <li><b>Failures come back as themselves.</b> What a job threw is thrown from {@link #await} as
 * the same object (see {@link #rethrow}), so the caller reports what the work would have thrown on
 * its own thread.</li>
 * <li><b>Lifetime.</b> The thread is a daemon with the given name, started by the first job and
 * ended after {@value #IDLE_MS} ms without one (a later job starts another). {@link #close()}
 * interrupts a job in progress, drops jobs not begun, and waits for the thread to end.</li>
 * </ul>
 * Not thread-safe: one calling thread uses an instance.
 */
public final class SideThread implements AutoCloseable {
    /** An idle thread ends after this many milliseconds. */
    public static final long IDLE_MS = 5_000;
    /** Longest wait for the thread to end on {@link #close()}, in milliseconds. */
    private static final long JOIN_MS = 10_000;

    private final String name;
    private final ThreadPoolExecutor executor;
    /** The thread the executor made last (an earlier one ended when idle), for close() to wait for. */
    private volatile Thread last;
    private boolean closed;

    /**
     * Whether a second thread may be used: not when the system property is {@code false}, nor when
     * the JVM has one processor (the thread could only take turns with the caller's).
     *
     * @param property the system property that turns this use off
     * @return true when a side thread may be started
     */
    public static boolean allowed(String property) {
        return !"false".equalsIgnoreCase(System.getProperty(property, "true")) && Runtime.getRuntime().availableProcessors() > 1;
    }

    /**
     * @param name the thread's name
     */
    public SideThread(String name) {
        this.name = name;
        this.executor = new ThreadPoolExecutor(1, 1, IDLE_MS, TimeUnit.MILLISECONDS, new LinkedBlockingQueue<>(), r -> {
            Thread t = new Thread(r, name);
            t.setDaemon(true);
            last = t;
            return t;
        });
        // a host that never closes its chain does not keep an idle thread for ever
        executor.allowCoreThreadTimeOut(true);
    }

    /**
     * Hands a job to the thread (starting it on the first job).
     *
     * @param job the job; it must not touch what the caller uses until the caller awaits it
     * @param <T> the job's result
     * @return the job's handle, for {@link #await} or {@link #awaitUninterruptibly}
     * @throws IllegalStateException after {@link #close()}
     */
    public <T> FutureTask<T> submit(Callable<T> job) {
        if (closed) {
            throw new IllegalStateException("side thread '" + name + "' is closed");
        }
        FutureTask<T> task = new FutureTask<>(job);
        executor.execute(task);
        return task;
    }

    /**
     * Waits until a job has ended, running it here when the thread has not begun it.
     *
     * @param job    a handle {@link #submit} returned
     * @param thrown the checked exception type the job may throw
     * @param <T>    the job's result
     * @param <X>    the checked exception type
     * @return the job's result
     * @throws X                    what the job threw, the same object
     * @throws InterruptedException if the caller is interrupted while the thread runs the job
     */
    public <T, X extends Exception> T await(FutureTask<T> job, Class<X> thrown) throws X, InterruptedException {
        takeBack(job);
        try {
            return job.get();
        } catch (ExecutionException e) {
            throw rethrow(e.getCause(), thrown);
        }
    }

    /**
     * Waits until a job has ended, running it here when the thread has not begun it, and does not
     * stop waiting when interrupted (the interrupt is kept for the caller): for a job that still
     * reads something the caller hands back when it returns.
     *
     * @param job a handle {@link #submit} returned
     * @return what the job threw, or null when it ended normally
     */
    public Throwable awaitUninterruptibly(FutureTask<?> job) {
        takeBack(job);
        boolean interrupted = false;
        try {
            while (true) {
                try {
                    job.get();
                    return null;
                } catch (ExecutionException e) {
                    return e.getCause();
                } catch (InterruptedException e) {
                    interrupted = true;
                }
            }
        } finally {
            if (interrupted) {
                Thread.currentThread().interrupt();
            }
        }
    }

    private void takeBack(FutureTask<?> job) {
        if (executor.remove(job)) {
            job.run();
        }
    }

    /**
     * Throws what a job threw as the same object: an unchecked exception, an error, or a checked
     * exception of the given type; anything else (a type the job's signature did not allow) as an
     * {@link IllegalStateException} with it as the cause. Declared to return so that callers can
     * write {@code throw rethrow(t, X.class)}.
     *
     * @param t      what the job threw, not null
     * @param thrown the checked exception type the job may throw
     * @param <X>    that type
     * @return never returns
     * @throws X that exception
     */
    public static <X extends Exception> RuntimeException rethrow(Throwable t, Class<X> thrown) throws X {
        if (t instanceof RuntimeException r) {
            throw r;
        }
        if (t instanceof Error e) {
            throw e;
        }
        if (thrown.isInstance(t)) {
            throw thrown.cast(t);
        }
        throw new IllegalStateException("side job failed", t);
    }

    /**
     * Stops the thread: interrupts a job in progress, drops jobs not begun, and waits for the
     * thread to end. Later calls do nothing.
     */
    @Override
    public void close() {
        if (closed) {
            return;
        }
        closed = true;
        executor.shutdownNow();
        Thread t = last;
        if (t == null) {
            return;
        }
        boolean interrupted = false;
        long end = System.nanoTime() + JOIN_MS * 1_000_000L;
        // the executor terminates a moment before its thread ends: wait for the thread itself
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
