package org.lanesift.kit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.time.Duration;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.FutureTask;
import java.util.concurrent.atomic.AtomicReference;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.Poll;

/** The side thread: failures come back as themselves, unstarted jobs run on the caller, close ends the thread. */
class SideThreadTest {
    private static final String PREFIX = "lanesift-side-test ";
    private static final String PROPERTY = "lanesift.sideThreadTest";

    private static Thread named(String name) {
        return Thread.getAllStackTraces().keySet().stream().filter(t -> t.getName().equals(name) && t.isAlive()).findFirst()
                .orElse(null);
    }

    @Test
    void aJobsFailureIsThrownOnTheCallerAsTheSameObject() throws Exception {
        SideThread w = new SideThread(PREFIX + "fail-test");
        try {
            IllegalArgumentException bad = new IllegalArgumentException("filter failed");
            AtomicReference<String> ranOn = new AtomicReference<>();
            FutureTask<Void> job = w.submit(() -> {
                ranOn.set(Thread.currentThread().getName());
                throw bad;
            });
            Poll.until(Duration.ofSeconds(20), "the worker to run the job", job::isDone);
            assertEquals(PREFIX + "fail-test", ranOn.get());
            assertSame(bad, assertThrows(IllegalArgumentException.class, () -> w.await(job, IOException.class)));

            OutOfMemoryError full = new OutOfMemoryError("filter history");
            FutureTask<Void> job2 = w.submit(() -> {
                throw full;
            });
            Poll.until(Duration.ofSeconds(20), "the worker to run the second job", job2::isDone);
            assertSame(full, assertThrows(OutOfMemoryError.class, () -> w.await(job2, IOException.class)));
            Thread t = named(PREFIX + "fail-test");
            assertTrue(t != null && t.isDaemon(), "one daemon thread, still serving after failed jobs");
        } finally {
            w.close();
        }
        assertEquals(null, named(PREFIX + "fail-test"), "close() ends the thread");
    }

    @Test
    void aJobTheThreadHasNotBegunRunsOnTheCaller() throws Exception {
        SideThread w = new SideThread(PREFIX + "steal-test");
        CountDownLatch started = new CountDownLatch(1);
        CountDownLatch release = new CountDownLatch(1);
        try {
            FutureTask<Void> busy = w.submit(() -> {
                started.countDown();
                release.await();
                return null;
            });
            started.await();
            AtomicReference<Thread> ranOn = new AtomicReference<>();
            FutureTask<String> queued = w.submit(() -> {
                ranOn.set(Thread.currentThread());
                return "result";
            });
            assertEquals("result", w.await(queued, IOException.class)); // the thread is busy: the caller runs it
            assertSame(Thread.currentThread(), ranOn.get());
            release.countDown();
            assertEquals(null, w.awaitUninterruptibly(busy));
            assertTrue(busy.isDone());
        } finally {
            release.countDown();
            w.close();
        }
        assertEquals(null, named(PREFIX + "steal-test"));
    }

    @Test
    void noThreadBeforeTheFirstJobAndNoneWhenTurnedOff() {
        SideThread w = new SideThread(PREFIX + "lazy-test");
        assertEquals(null, named(PREFIX + "lazy-test"), "started with the first job, not before");
        w.close();
        assertThrows(IllegalStateException.class, () -> w.submit(() -> null));
        String before = System.getProperty(PROPERTY);
        try {
            System.setProperty(PROPERTY, "false");
            assertFalse(SideThread.allowed(PROPERTY));
            System.setProperty(PROPERTY, "true");
            assertEquals(Runtime.getRuntime().availableProcessors() > 1, SideThread.allowed(PROPERTY), "on unless one processor");
        } finally {
            if (before == null) {
                System.clearProperty(PROPERTY);
            } else {
                System.setProperty(PROPERTY, before);
            }
        }
    }

    @Test
    void aCheckedFailureOfTheDeclaredTypeIsThrownAsItselfAndOthersAreWrapped() throws Exception {
        SideThread w = new SideThread(PREFIX + "checked-test");
        try {
            IOException shrank = new IOException("file shrank");
            FutureTask<Integer> job = w.submit(() -> {
                throw shrank;
            });
            assertSame(shrank, assertThrows(IOException.class, () -> w.await(job, IOException.class)));
            Exception other = new java.util.concurrent.TimeoutException("not declared");
            FutureTask<Integer> job2 = w.submit(() -> {
                throw other;
            });
            IllegalStateException wrapped = assertThrows(IllegalStateException.class, () -> w.await(job2, IOException.class));
            assertSame(other, wrapped.getCause());
            FutureTask<Integer> job3 = w.submit(() -> {
                throw shrank;
            });
            assertSame(shrank, w.awaitUninterruptibly(job3), "returned, not thrown");
        } finally {
            w.close();
        }
        assertEquals(null, named(PREFIX + "checked-test"));
    }
}
