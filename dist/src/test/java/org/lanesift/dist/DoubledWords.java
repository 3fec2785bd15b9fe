package org.lanesift.dist;

import java.util.Locale;

/**
 * The naming rule for output files: a name says the signal and what was measured once, without a
 * word followed by itself or by a word it begins ("eye-eye.png", "ring-ringing.json").
 */
final class DoubledWords {
    /** Words shorter than this are not compared as prefixes ("p" is no stem of "panel"). */
    static final int MIN_STEM = 3;

    private DoubledWords() {
    }

    /**
     * The first doubled pair of words in a file name, or null when there is none.
     *
     * @param fileName a file name (any folder part is ignored, the last extension is dropped)
     * @return the pair as "a b", or null
     */
    static String find(String fileName) {
        String name = fileName.substring(fileName.lastIndexOf('/') + 1);
        int dot = name.lastIndexOf('.');
        if (dot > 0) {
            name = name.substring(0, dot);
        }
        String[] words = name.toLowerCase(Locale.ROOT).split("[-_. ]+");
        for (int i = 1; i < words.length; i++) {
            String a = words[i - 1];
            String b = words[i];
            String shorter = a.length() <= b.length() ? a : b;
            String longer = a.length() <= b.length() ? b : a;
            if (a.equals(b) || (shorter.length() >= MIN_STEM && longer.startsWith(shorter))) {
                return a + " " + b;
            }
        }
        return null;
    }
}
