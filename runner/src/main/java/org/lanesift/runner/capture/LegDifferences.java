package org.lanesift.runner.capture;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.lanesift.data.BitSets;
import org.lanesift.plugin.OptionException;

/**
 * The {@code differences} option of the {@code raw} source: pairs of legs read as one difference
 * channel, {@code P - N} in volts, straight from the interleaved frames, so the legs themselves are
 * never handed on. The text is a comma-separated list of {@code NAME=P-N}, where P and N are port
 * names of the capture's channels and NAME is the new port's name (docs/capture-raw.md,
 * "Leg differences"). A port name may itself hold '-': the split is the one position where both
 * sides name a channel, and more than one is an error.
 *
 * <p>Outputs, in channel order: a P leg's place is taken by its difference, an N leg has none,
 * every other channel is itself. A difference sample is {@code vp - vn} in float arithmetic, where
 * {@code vp} and {@code vn} are the legs' volts exactly as the reader would hand them on, so it
 * equals the difference a {@code differential} receiver in mode {@code pair} takes of the two
 * legs bit for bit. It is invalid when either leg's sample is, or when the difference of two
 * finite legs is too large for a float.
 */
final class LegDifferences {
    /** The option's name. */
    static final String OPTION = "differences";

    /** Port names of the outputs. */
    final String[] names;
    /** Per output: the channel read (the P leg of a difference). */
    final int[] first;
    /** Per output: the N leg of a difference, or -1 for a channel handed on as it is. */
    final int[] second;
    /** Port help text per output. */
    final String[] help;

    private LegDifferences(String[] names, int[] first, int[] second, String[] help) {
        this.names = names;
        this.first = first;
        this.second = second;
        this.help = help;
    }

    /** Whether any pair is read as a difference (otherwise the outputs are the channels). */
    boolean any() {
        for (int s : second) {
            if (s >= 0) {
                return true;
            }
        }
        return false;
    }

    /** The outputs when no difference is asked for: every channel as it is. */
    static LegDifferences none(String[] channels) {
        int n = channels.length;
        int[] first = new int[n];
        int[] second = new int[n];
        for (int k = 0; k < n; k++) {
            first[k] = k;
            second[k] = -1;
        }
        return new LegDifferences(channels.clone(), first, second, new String[n]);
    }

    /**
     * Parses the option against the capture's port names.
     *
     * @param text     the option's text; blank for none
     * @param channels the capture's port names, in frame order
     * @return the outputs
     * @throws OptionException naming the option and the entry when the text is not a list of
     *                         {@code NAME=P-N} over distinct channels with new, distinct names
     */
    static LegDifferences parse(String text, String[] channels) {
        if (text == null || text.isBlank()) {
            return none(channels);
        }
        Map<String, Integer> index = new HashMap<>();
        for (int k = 0; k < channels.length; k++) {
            index.put(channels[k], k);
        }
        Map<Integer, Integer> pairOfP = new HashMap<>();
        Map<Integer, String> nameOfP = new HashMap<>();
        Set<Integer> used = new HashSet<>();
        Set<String> newNames = new HashSet<>();
        for (String raw : text.split(",", -1)) {
            String e = raw.trim();
            int eq = e.indexOf('=');
            if (eq <= 0 || eq == e.length() - 1) {
                throw bad("entry '" + e + "': expected NAME=P-N (a new port name, then the P and N legs' port names)");
            }
            String name = e.substring(0, eq).trim();
            String legs = e.substring(eq + 1).trim();
            if (!Names.sanitize(name).equals(name) || name.isEmpty()) {
                throw bad("entry '" + e + "': '" + name + "' is not a port name (expected letters, digits, '_' and '-')");
            }
            int[] pn = split(e, legs, index, channels);
            for (int leg : pn) {
                if (!used.add(leg)) {
                    throw bad("entry '" + e + "': channel '" + channels[leg] + "' is already a leg of another difference");
                }
            }
            if (!newNames.add(name.toLowerCase(Locale.ROOT))) {
                throw bad("entry '" + e + "': port name '" + name + "' is given twice");
            }
            pairOfP.put(pn[0], pn[1]);
            nameOfP.put(pn[0], name);
        }
        List<String> names = new ArrayList<>();
        List<int[]> outs = new ArrayList<>();
        List<String> help = new ArrayList<>();
        for (int k = 0; k < channels.length; k++) {
            if (pairOfP.containsKey(k)) {
                int n = pairOfP.get(k);
                names.add(nameOfP.get(k));
                outs.add(new int[] {k, n});
                help.add("difference " + channels[k] + " - " + channels[n] + " (channels " + k + " and " + n + ", volts)");
            } else if (!used.contains(k)) {
                if (newNames.contains(channels[k].toLowerCase(Locale.ROOT))) {
                    throw bad("port name '" + channels[k] + "' is a channel of the capture that is not a leg of any difference;"
                            + " expected a difference named otherwise");
                }
                names.add(channels[k]);
                outs.add(new int[] {k, -1});
                help.add(null);
            }
        }
        int n = names.size();
        int[] first = new int[n];
        int[] second = new int[n];
        for (int o = 0; o < n; o++) {
            first[o] = outs.get(o)[0];
            second[o] = outs.get(o)[1];
        }
        return new LegDifferences(names.toArray(String[]::new), first, second, help.toArray(String[]::new));
    }

    /** The P and N channels of "P-N": the one split at a '-' where both sides are channels. */
    private static int[] split(String entry, String legs, Map<String, Integer> index, String[] channels) {
        int[] found = null;
        for (int i = legs.indexOf('-'); i >= 0; i = legs.indexOf('-', i + 1)) {
            Integer p = index.get(legs.substring(0, i).trim());
            Integer n = index.get(legs.substring(i + 1).trim());
            if (p != null && n != null) {
                if (found != null) {
                    throw bad("entry '" + entry + "': '" + legs + "' splits into two legs in more than one way");
                }
                found = new int[] {p, n};
            }
        }
        if (found == null) {
            throw bad("entry '" + entry + "': expected P-N with P and N port names of the capture's channels ("
                    + String.join(", ", channels) + ")");
        }
        if (found[0] == found[1]) {
            throw bad("entry '" + entry + "': P and N are the same channel");
        }
        return found;
    }

    private static OptionException bad(String msg) {
        return new OptionException(OPTION, "option '" + OPTION + "' of plugin 'raw': " + msg);
    }

    /**
     * Fills the outputs' rows {@code [row, row + frames)} from the legs' rows {@code [0, frames)}.
     *
     * @param legs      every channel's volts for the chunk
     * @param legMasks  every channel's invalid samples for the chunk (rows from 0), null entries for none
     * @param frames    frames in the chunk
     * @param out       one array per output
     * @param row       row of the chunk's first frame in the outputs
     * @param outMasks  where the outputs' invalid samples are marked
     */
    void fill(float[][] legs, long[][] legMasks, int frames, float[][] out, int row, RawConverter.Masks outMasks) {
        for (int o = 0; o < first.length; o++) {
            float[] a = legs[first[o]];
            float[] y = out[o];
            long[] ma = legMasks[first[o]];
            if (second[o] < 0) {
                System.arraycopy(a, 0, y, row, frames);
                if (ma != null) {
                    orInto(ma, frames, outMasks.of(o), row);
                }
                continue;
            }
            float[] b = legs[second[o]];
            long[] mb = legMasks[second[o]];
            boolean ok = true;
            for (int i = 0; i < frames; i++) {
                float d = a[i] - b[i];
                y[row + i] = d;
                ok &= Math.abs(d) <= Float.MAX_VALUE;
            }
            if (ma != null) {
                orInto(ma, frames, outMasks.of(o), row);
            }
            if (mb != null) {
                orInto(mb, frames, outMasks.of(o), row);
            }
            if (!ok) {
                // a leg that is not finite (already marked), or two finite legs too far apart for a float
                long[] m = outMasks.of(o);
                for (int i = 0; i < frames; i++) {
                    if (!Float.isFinite(y[row + i])) {
                        RawConverter.mark(m, row + i);
                    }
                }
            }
        }
    }

    /** ORs bits {@code [0, n)} of {@code src} into {@code dst} from bit {@code at}. */
    private static void orInto(long[] src, int n, long[] dst, int at) {
        for (int w = 0, words = BitSets.words(n); w < words; w++) {
            long v = src[w];
            if (v == 0) {
                continue;
            }
            for (long m = v; m != 0; m &= m - 1) {
                int i = (w << 6) + Long.numberOfTrailingZeros(m);
                if (i < n) {
                    RawConverter.mark(dst, at + i);
                }
            }
        }
    }
}
