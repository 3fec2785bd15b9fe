package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Duration;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.FutureTask;
import java.util.concurrent.atomic.AtomicReference;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.Poll;

/** The deskew worker thread: failures come back as themselves, unstarted jobs run on the caller, close ends the thread. */
class FilterWorkerTest {
    private static Thread named(String name) {
        return Thread.getAllStackTraces().keySet().stream().filter(t -> t.getName().equals(name) && t.isAlive()).findFirst()
                .orElse(null);
    }

    @Test
    void aJobsFailureIsThrownOnTheCallerAsTheSameObject() throws Exception {
        FilterWorker w = new FilterWorker("fail-test");
        try {
            IllegalArgumentException bad = new IllegalArgumentException("filter failed");
            AtomicReference<String> ranOn = new AtomicReference<>();
            FutureTask<Void> job = w.submit(() -> {
                ranOn.set(Thread.currentThread().getName());
                throw bad;
            });
            Poll.until(Duration.ofSeconds(20), "the worker to run the job", job::isDone);
            assertEquals(FilterWorker.THREAD_PREFIX + "fail-test", ranOn.get());
            assertSame(bad, assertThrows(IllegalArgumentException.class, () -> w.await(job)));

            OutOfMemoryError full = new OutOfMemoryError("filter history");
            FutureTask<Void> job2 = w.submit(() -> {
                throw full;
            });
            Poll.until(Duration.ofSeconds(20), "the worker to run the second job", job2::isDone);
            assertSame(full, assertThrows(OutOfMemoryError.class, () -> w.await(job2)));
            Thread t = named(FilterWorker.THREAD_PREFIX + "fail-test");
            assertTrue(t != null && t.isDaemon(), "one daemon thread, still serving after failed jobs");
        } finally {
            w.close();
        }
        assertEquals(null, named(FilterWorker.THREAD_PREFIX + "fail-test"), "close() ends the thread");
    }

    @Test
    void aJobTheThreadHasNotBegunRunsOnTheCaller() throws Exception {
        FilterWorker w = new FilterWorker("steal-test");
        CountDownLatch started = new CountDownLatch(1);
        CountDownLatch release = new CountDownLatch(1);
        try {
            FutureTask<Void> busy = w.submit(() -> {
                started.countDown();
                try {
                    release.await();
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
            });
            started.await();
            AtomicReference<Thread> ranOn = new AtomicReference<>();
            FutureTask<Void> queued = w.submit(() -> ranOn.set(Thread.currentThread()));
            w.await(queued); // the thread is busy: the caller runs it
            assertSame(Thread.currentThread(), ranOn.get());
            release.countDown();
            w.await(busy);
            assertTrue(busy.isDone());
        } finally {
            release.countDown();
            w.close();
        }
        assertEquals(null, named(FilterWorker.THREAD_PREFIX + "steal-test"));
    }

    @Test
    void noThreadBeforeTheFirstJobAndNoneWhenTurnedOff() {
        FilterWorker w = new FilterWorker("lazy-test");
        assertEquals(null, named(FilterWorker.THREAD_PREFIX + "lazy-test"), "started with the first job, not before");
        w.close();
        assertThrows(IllegalStateException.class, () -> w.submit(() -> { }));
        String before = System.getProperty(FilterWorker.PROPERTY);
        try {
            System.setProperty(FilterWorker.PROPERTY, "false");
            assertFalse(FilterWorker.allowed());
            System.setProperty(FilterWorker.PROPERTY, "true");
            assertEquals(Runtime.getRuntime().availableProcessors() > 1, FilterWorker.allowed(), "on unless one processor");
        } finally {
            if (before == null) {
                System.clearProperty(FilterWorker.PROPERTY);
            } else {
                System.setProperty(FilterWorker.PROPERTY, before);
            }
        }
    }
}
