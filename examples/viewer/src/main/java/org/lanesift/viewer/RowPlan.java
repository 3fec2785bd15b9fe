package org.lanesift.viewer;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Orders the rows of the waveform area. Channel rows come in capture order; a logic row and a
 * note track are placed under the channel row they belong to, found by name:
 *
 * <ol>
 *   <li>the name up to its first '.' is the <em>stem</em> ({@code "D0.levels"} has stem {@code D0});</li>
 *   <li>it belongs to the row named exactly the stem, else to the last row whose name is the stem
 *       followed by '_' (the legs {@code D0_P}, {@code D0_N} of pair {@code D0});</li>
 *   <li>a track whose stem matches no row goes to the bottom, sorted by name.</li>
 * </ol>
 *
 * A logic row thus follows the legs it was decoded from, and the decoder's tracks follow it.
 */
public final class RowPlan {
    /** Most lanes a note row stacks. */
    public static final int MAX_LANES = 3;

    private RowPlan() {
    }

    /**
     * Plans the rows.
     *
     * @param analog analog channels, in capture order
     * @param logic  logic signals (capture logic channels and decoded ones)
     * @param tracks annotation tracks
     * @return rows, top to bottom
     */
    public static List<Row> plan(List<AnalogTrace> analog, List<LogicTrace> logic, List<NoteTrack> tracks) {
        List<Row> rows = new ArrayList<>();
        for (AnalogTrace a : analog) {
            rows.add(new Row(a.name(), a, null, null, 1, null));
        }
        for (LogicTrace l : logic) {
            int at = ownerIndex(rows, l.name());
            Row r = new Row(l.name(), null, l, null, 1, at < 0 ? null : rows.get(at).name());
            rows.add(at < 0 ? rows.size() : afterChildren(rows, at), r);
        }
        Map<String, NoteTrack> free = new java.util.TreeMap<>();
        Map<Integer, List<NoteTrack>> hung = new LinkedHashMap<>();
        int channelRows = rows.size();
        for (NoteTrack t : tracks) {
            int at = ownerIndex(rows.subList(0, channelRows), t.name());
            if (at < 0) {
                free.put(t.name(), t);
            } else {
                hung.computeIfAbsent(at, k -> new ArrayList<>()).add(t);
            }
        }
        List<Row> out = new ArrayList<>();
        for (int i = 0; i < channelRows; i++) {
            Row owner = rows.get(i);
            out.add(owner);
            List<NoteTrack> mine = new ArrayList<>(hung.getOrDefault(i, List.of()));
            mine.sort(java.util.Comparator.comparing(NoteTrack::name));
            for (NoteTrack t : mine) {
                out.add(new Row(t.name(), null, null, t, lanesFor(t), owner.name()));
            }
        }
        for (NoteTrack t : free.values()) {
            out.add(new Row(t.name(), null, null, t, lanesFor(t), null));
        }
        return out;
    }

    /** Index after the row at {@code at} and the logic rows already hung under it. */
    private static int afterChildren(List<Row> rows, int at) {
        int i = at + 1;
        while (i < rows.size() && rows.get(i).owner() != null && rows.get(i).owner().equals(rows.get(at).name())) {
            i++;
        }
        return i;
    }

    /**
     * The row a name belongs under, by the stem rule.
     *
     * @param rows candidate rows
     * @param name a track or signal name
     * @return the index, or -1
     */
    static int ownerIndex(List<Row> rows, String name) {
        int dot = name.indexOf('.');
        String stem = dot < 0 ? name : name.substring(0, dot);
        int leg = -1;
        for (int i = 0; i < rows.size(); i++) {
            String n = rows.get(i).name();
            if (n.equals(stem) && !n.equals(name)) {
                return i;
            }
            if (n.equals(stem) && rows.get(i).notes() == null) {
                return i;
            }
            if (n.startsWith(stem + "_") && rows.get(i).owner() == null) {
                leg = i;
            }
        }
        return leg;
    }

    /**
     * Lanes a track needs: the most annotations that overlap at one time, at most {@link #MAX_LANES}.
     *
     * @param t the track
     * @return 1 to {@link #MAX_LANES}
     */
    static int lanesFor(NoteTrack t) {
        java.util.PriorityQueue<Long> ends = new java.util.PriorityQueue<>();
        int most = 1;
        for (var a : t.notes()) {
            while (!ends.isEmpty() && ends.peek() < a.startFs()) {
                ends.poll();
            }
            ends.add(a.endFs());
            most = Math.max(most, ends.size());
            if (most >= MAX_LANES) {
                return MAX_LANES;
            }
        }
        return most;
    }
}
