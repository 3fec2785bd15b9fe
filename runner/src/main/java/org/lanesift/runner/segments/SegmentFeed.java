package org.lanesift.runner.segments;

import java.util.ArrayDeque;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Block;

/**
 * What one segment's front chain emits, in the order it emits it, handed from the worker thread
 * that decodes the segment to the thread that stitches. The stitching thread takes the events of
 * the segment it is at (the head) while they are produced, so the head's output is never held
 * whole; a segment decoded ahead of the head keeps its events here until the head reaches it.
 * While the stitching thread reads a feed, the worker waits when {@code limit} events are
 * unread, so a fast front cannot pile up blocks behind a slower back.
 */
final class SegmentFeed {
    /** A block on front port {@code port} (an index into the plan's ports). */
    record Out(int port, Block block) {
    }

    /** An annotation of front instance {@code source}. */
    record Note(String source, Annotation annotation) {
    }

    private final ArrayDeque<Object> events = new ArrayDeque<>();
    private final int limit;
    private boolean attached;
    private boolean done;
    private boolean cancelled;
    private Throwable failure;

    /**
     * A feed.
     *
     * @param limit unread events at which the worker waits while the feed is being read
     */
    SegmentFeed(int limit) {
        this.limit = limit;
    }

    /** Worker side: adds an event; waits while the reader is attached and {@code limit} are unread. */
    synchronized void add(Object event) {
        while (attached && events.size() >= limit && !cancelled) {
            pause("handing on a segment's output");
        }
        events.add(event);
        notifyAll();
    }

    /** Worker side: no more events; {@code why} is the failure that ended the segment, or null. */
    synchronized void finish(Throwable why) {
        done = true;
        failure = why;
        notifyAll();
    }

    /** Reader side: from now on the worker is held to {@code limit} unread events. */
    synchronized void attach() {
        attached = true;
        notifyAll();
    }

    /** Wakes and releases both sides for good. */
    synchronized void cancel() {
        cancelled = true;
        notifyAll();
    }

    /**
     * Reader side: the next event, waiting for it.
     *
     * @return the event, or null when the segment is done (or the run cancelled)
     * @throws RuntimeException the failure that ended the segment, as the worker met it
     */
    synchronized Object next() {
        while (events.isEmpty() && !done && !cancelled) {
            pause("waiting for a segment");
        }
        if (cancelled) {
            return null;
        }
        Object e = events.poll();
        if (e != null) {
            notifyAll();
            return e;
        }
        if (failure instanceof RuntimeException re) {
            throw re;
        }
        if (failure instanceof Error er) {
            throw er;
        }
        if (failure != null) {
            throw new SegmentException(String.valueOf(failure));
        }
        return null;
    }

    /** Waits for a change of this feed; holds its lock. */
    private void pause(String doing) {
        try {
            wait();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new SegmentException("interrupted while " + doing);
        }
    }
}
