package org.lanesift.viewer;

import java.util.ArrayList;
import java.util.Collections;
import java.util.Comparator;
import java.util.List;
import org.lanesift.annotation.Annotation;

/**
 * The annotations of one track, sorted by start time, with the longest span among them so that
 * the ones touching a time window are found by binary search rather than by a scan.
 */
public final class NoteTrack {
    private final String name;
    private final List<Annotation> notes;
    private final long[] startsFs;
    private final long longestFs;

    /**
     * A track.
     *
     * @param name  the track name the plugins gave
     * @param notes its annotations, any order
     */
    public NoteTrack(String name, List<Annotation> notes) {
        this.name = name;
        List<Annotation> sorted = new ArrayList<>(notes);
        sorted.sort(Comparator.comparingLong(Annotation::startFs).thenComparingLong(Annotation::endFs));
        this.notes = Collections.unmodifiableList(sorted);
        this.startsFs = new long[sorted.size()];
        long longest = 0;
        for (int i = 0; i < sorted.size(); i++) {
            Annotation a = sorted.get(i);
            startsFs[i] = a.startFs();
            longest = Math.max(longest, a.endFs() - a.startFs());
        }
        this.longestFs = longest;
    }

    /**
     * Track name.
     *
     * @return the name
     */
    public String name() {
        return name;
    }

    /**
     * Every annotation, by start time.
     *
     * @return unmodifiable list
     */
    public List<Annotation> notes() {
        return notes;
    }

    /**
     * Index of the first annotation that may reach into {@code [fromFs, ...)}: no annotation
     * before it ends at or after {@code fromFs}.
     *
     * @param fromFs a time, femtoseconds
     * @return an index into {@link #notes()}
     */
    public int firstReaching(double fromFs) {
        double t = fromFs - longestFs;
        int lo = 0;
        int hi = startsFs.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (startsFs[mid] < t) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }
}
