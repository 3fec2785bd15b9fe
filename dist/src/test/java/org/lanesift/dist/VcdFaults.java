package org.lanesift.dist;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Injects faults into a VCD of one-bit signals (as Icarus Verilog writes them: a header, then
 * {@code #time} lines and scalar changes such as {@code 1!}), for the fault suite. Times are in
 * the file's ticks. The initial values (those at the first time stamp) are never moved.
 */
final class VcdFaults {
    private record Change(long t, String id, char v) {
    }

    private final String header;
    private final Map<String, String> idOf = new LinkedHashMap<>();
    private final List<Change> changes = new ArrayList<>();
    private final long firstT;

    VcdFaults(List<String> lines) {
        StringBuilder h = new StringBuilder();
        boolean inHeader = true;
        long t = -1;
        long first = Long.MIN_VALUE;
        for (String l : lines) {
            if (inHeader) {
                h.append(l).append('\n');
                String[] w = l.trim().split("\\s+");
                if (w.length >= 5 && w[0].equals("$var")) {
                    idOf.put(w[4], w[3]);
                }
                inHeader = !l.startsWith("$enddefinitions");
                continue;
            }
            String s = l.trim();
            if (s.startsWith("#")) {
                t = Long.parseLong(s.substring(1));
                if (first == Long.MIN_VALUE) {
                    first = t;
                }
            } else if (!s.isEmpty() && !s.startsWith("$") && (s.charAt(0) == '0' || s.charAt(0) == '1' || s.charAt(0) == 'x')) {
                changes.add(new Change(t, s.substring(1), s.charAt(0)));
            }
        }
        this.header = h.toString();
        this.firstT = first;
    }

    private String id(String signal) {
        String id = idOf.get(signal);
        if (id == null) {
            throw new IllegalArgumentException("no signal " + signal + " in " + idOf.keySet());
        }
        return id;
    }

    /** The level of a signal just before time t. */
    private char levelBefore(String id, long t) {
        char v = 'x';
        for (Change c : changes) {
            if (c.t >= t) {
                break;
            }
            if (c.id.equals(id)) {
                v = c.v;
            }
        }
        return v;
    }

    /** A pulse of the opposite level, {@code widthTicks} long, starting at {@code atTicks}. */
    VcdFaults glitch(String signal, long atTicks, long widthTicks) {
        String id = id(signal);
        char v = levelBefore(id, atTicks);
        char o = v == '1' ? '0' : '1';
        changes.add(new Change(atTicks, id, o));
        changes.add(new Change(atTicks + widthTicks, id, v));
        return sort();
    }

    /** The signal holds its level from {@code fromTicks} to {@code toTicks} (changes in between are dropped). */
    VcdFaults hold(String signal, long fromTicks, long toTicks) {
        String id = id(signal);
        char held = levelBefore(id, fromTicks);
        char after = levelBefore(id, toTicks + 1);
        changes.removeIf(c -> c.id.equals(id) && c.t >= fromTicks && c.t <= toTicks);
        if (after != held) {
            changes.add(new Change(toTicks, id, after));
        }
        return sort();
    }

    /** Every change of the signal after the initial values comes {@code deltaTicks} later. */
    VcdFaults delay(String signal, long deltaTicks) {
        String id = id(signal);
        changes.replaceAll(c -> c.id.equals(id) && c.t > firstT ? new Change(c.t + deltaTicks, c.id, c.v) : c);
        return sort();
    }

    private VcdFaults sort() {
        changes.sort(Comparator.comparingLong(Change::t)); // stable: order within one time kept
        return this;
    }

    String text() {
        StringBuilder out = new StringBuilder(header);
        long at = Long.MIN_VALUE;
        for (Change c : changes) {
            if (c.t != at) {
                out.append('#').append(c.t).append('\n');
                at = c.t;
            }
            out.append(c.v).append(c.id).append('\n');
        }
        return out.toString();
    }
}
