package org.lanesift.plugins.deskew;

import java.util.concurrent.ExecutionException;
import java.util.concurrent.FutureTask;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.ThreadPoolExecutor;
import java.util.concurrent.TimeUnit;

/**
 * The second thread of one {@code deskew} instance: runs one filter job at a time (a leg block
 * through its delay line) while the engine thread hands the previous block's outputs downstream.
 *
 * <p>The engine thread {@link #submit}s a job, does its own work, and then {@link #await}s the
 * job before its {@code accept} returns, so the job never outlives the call that gave it its input
 * block. A job the thread has not begun by then (it has not been given a core: on a machine busy
 * with other work) is run on the engine thread instead of waited for; a {@link FutureTask} runs
 * once, on whichever thread gets to it first. The outputs are the same either way: the job's
 * result does not depend on the thread that runs it.
 *
 * <p>A failure of a job is thrown from {@link #await} as the same exception object (a job is a
 * {@link Runnable}: only unchecked exceptions and errors), so the engine reports what the filter
 * would have thrown on its own thread. The thread is a daemon named {@value #THREAD_PREFIX} and
 * the instance id, started with the first job and ended after {@value #IDLE_MS} ms without one;
 * {@link #close()} stops it and waits for it to end.
 * Not thread-safe: one engine thread calls it.
 */
final class FilterWorker implements AutoCloseable {
    /** Name prefix of the worker threads. */
    static final String THREAD_PREFIX = "lanesift-deskew ";
    /** The system property that turns stage worker threads off everywhere ({@code -Dlanesift.stageThreads=false}). */
    static final String PROPERTY = "lanesift.stageThreads";
    /** Longest wait for the thread to end on {@link #close()}, in milliseconds. */
    private static final long JOIN_MS = 10_000;
    /** An idle thread ends after this many milliseconds (a later job starts a new one). */
    static final long IDLE_MS = 5_000;

    private final String threadName;
    /** One thread, created by the first job (the JDK's executor; a job it has not begun can be taken back). */
    private final ThreadPoolExecutor thread;
    /** The thread the executor made last (an earlier one ended when it was idle), for close() to wait for. */
    private volatile Thread last;
    private boolean closed;

    /**
     * Whether stages may use a second thread: not when the system property {@value #PROPERTY} is
     * {@code false}, nor when the JVM has one processor (the thread could only take turns with the
     * engine's).
     *
     * @return true when a worker may be started
     */
    static boolean allowed() {
        return !"false".equalsIgnoreCase(System.getProperty(PROPERTY, "true")) && Runtime.getRuntime().availableProcessors() > 1;
    }

    /**
     * @param instanceId the stage's instance id (names the thread)
     */
    FilterWorker(String instanceId) {
        this.threadName = THREAD_PREFIX + instanceId;
        this.thread = new ThreadPoolExecutor(1, 1, IDLE_MS, TimeUnit.MILLISECONDS, new LinkedBlockingQueue<>(), r -> {
            Thread t = new Thread(r, threadName);
            t.setDaemon(true);
            last = t;
            return t;
        });
        // a host that never closes its chain does not keep an idle thread for ever
        thread.allowCoreThreadTimeOut(true);
    }

    /**
     * Hands a job to the thread (starting it on the first job).
     *
     * @param job the job; it must not touch what the engine thread uses until {@link #await}
     * @return the job's handle, to pass to {@link #await} or {@link #awaitQuietly}
     */
    FutureTask<Void> submit(Runnable job) {
        if (closed) {
            throw new IllegalStateException("deskew worker " + threadName + " is closed");
        }
        FutureTask<Void> task = new FutureTask<>(job, null);
        thread.execute(task);
        return task;
    }

    /**
     * Waits until a job has ended (running it here when the thread has not begun it) and throws
     * what it threw.
     *
     * @param task the handle {@link #submit} returned
     */
    void await(FutureTask<Void> task) {
        Throwable t = awaitQuietly(task);
        if (t instanceof RuntimeException r) {
            throw r;
        }
        if (t instanceof Error e) {
            throw e;
        }
        if (t != null) {
            throw new IllegalStateException("deskew job failed", t);
        }
    }

    /**
     * Waits until a job has ended (running it here when the thread has not begun it), without
     * throwing: for when the engine thread is already failing.
     *
     * @param task the handle {@link #submit} returned
     * @return what the job threw, or null
     */
    Throwable awaitQuietly(FutureTask<Void> task) {
        if (thread.remove(task)) {
            task.run();
        }
        boolean interrupted = false;
        try {
            while (true) {
                try {
                    task.get();
                    return null;
                } catch (ExecutionException e) {
                    return e.getCause();
                } catch (InterruptedException e) {
                    // the job still reads the caller's input block: it must end before accept returns
                    interrupted = true;
                }
            }
        } finally {
            if (interrupted) {
                Thread.currentThread().interrupt();
            }
        }
    }

    /**
     * Stops the thread and waits for it to end (a job in progress runs to its end first: a job is
     * one block through a delay line). Later calls do nothing.
     */
    @Override
    public void close() {
        if (closed) {
            return;
        }
        closed = true;
        thread.shutdownNow();
        Thread t = last;
        try {
            // the executor terminates a moment before its thread ends: wait for the thread itself
            if (t != null) {
                t.join(JOIN_MS);
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
