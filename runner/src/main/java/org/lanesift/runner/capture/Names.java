package org.lanesift.runner.capture;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * Turns channel names from capture headers into port names: every run of characters outside
 * {@code [A-Za-z0-9_-]} becomes one '_', leading and trailing '_' are dropped, an empty result
 * becomes {@code ch<N>} (N = 1-based column), and a name already taken gets {@code _2}, {@code _3}...
 * (compared without regard to case).
 */
final class Names {
    private Names() {
    }

    static String sanitize(String raw) {
        StringBuilder sb = new StringBuilder(raw.length());
        boolean under = false;
        for (int i = 0; i < raw.length(); i++) {
            char c = raw.charAt(i);
            boolean ok = (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '_' || c == '-';
            if (ok) {
                sb.append(c);
                under = c == '_';
            } else if (!under) {
                sb.append('_');
                under = true;
            }
        }
        int s = 0;
        int e = sb.length();
        while (s < e && sb.charAt(s) == '_') {
            s++;
        }
        while (e > s && sb.charAt(e - 1) == '_') {
            e--;
        }
        return sb.substring(s, e);
    }

    /** Sanitises and de-duplicates a list of raw names. */
    static List<String> ports(List<String> raw) {
        List<String> out = new ArrayList<>(raw.size());
        Set<String> taken = new HashSet<>();
        for (int i = 0; i < raw.size(); i++) {
            String base = sanitize(raw.get(i));
            if (base.isEmpty()) {
                base = "ch" + (i + 1);
            }
            String name = base;
            for (int k = 2; taken.contains(name.toLowerCase(Locale.ROOT)); k++) {
                name = base + "_" + k;
            }
            taken.add(name.toLowerCase(Locale.ROOT));
            out.add(name);
        }
        return out;
    }
}
