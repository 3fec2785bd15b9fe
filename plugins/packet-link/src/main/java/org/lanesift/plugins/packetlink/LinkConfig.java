package org.lanesift.plugins.packetlink;

import java.util.Locale;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;

/** The validated options of one instance, with the cross-option checks. */
final class LinkConfig {
    final int lanes;
    final boolean dsi;
    final boolean lpStates;
    final double lpHighVolts;
    final double lpLowVolts;
    final double hsCmMinVolts;
    final double hsCmMaxVolts;
    final long minStateFs;
    final long syncWire;
    final int syncBits;
    final int wordBits;
    final boolean msbFirst;
    final boolean independent;
    final int groupWords;
    final boolean dropTrail;
    /** Framed, no line states: a pause between sampled bits longer than this ends a burst (0: off). */
    final long burstGapFs;
    /** Framed, no line states: a run of at least this many equal bits ends a burst (0: off). */
    final int idleBits;
    /** Framed, no line states: an occurrence of the sync on a word boundary starts a new burst. */
    final boolean syncRestart;
    /** Framed: bits of the sync pattern that may differ where it is sought. */
    final int syncErrors;
    final int pngFrames;
    final long maxBurstBytes;
    final int maxLogEntries;
    final long maxFramePixels;

    private LinkConfig(PluginDescriptor d, OptionValues o) {
        lanes = o.getInt("lanes");
        dsi = o.getString("profile").equals("dsi");
        lpHighVolts = o.getDouble("lpHighVolts");
        lpLowVolts = o.getDouble("lpLowVolts");
        hsCmMinVolts = o.getDouble("hsCommonMinVolts");
        hsCmMaxVolts = o.getDouble("hsCommonMaxVolts");
        String where = "plugin '" + PacketLinkPlugin.ID + "': ";
        if (!(lpLowVolts < lpHighVolts)) {
            throw new OptionException("lpLowVolts", where + "option 'lpLowVolts' (" + lpLowVolts + " V) must be below 'lpHighVolts' (" + lpHighVolts + " V)");
        }
        if (!(hsCmMinVolts < hsCmMaxVolts) || hsCmMaxVolts >= lpLowVolts) {
            throw new OptionException("hsCommonMaxVolts", where + "options 'hsCommonMinVolts' < 'hsCommonMaxVolts' < 'lpLowVolts' expected, got "
                    + hsCmMinVolts + ", " + hsCmMaxVolts + ", " + lpLowVolts + " V");
        }
        double st = o.getTime("minStateTime").toFs(Double.NaN, Double.NaN);
        if (!(st >= 0) || st > 1e12) {
            throw new OptionException("minStateTime", where + "option 'minStateTime' must be 0 to 1 ms, got " + o.getTime("minStateTime"));
        }
        minStateFs = Math.round(st);
        if (dsi) {
            for (String f : new String[] {"lpStates", "syncPattern", "syncBits", "wordBits", "bitOrder", "laneDistribution", "groupWords", "dropTrail", "burstGap", "idleBits", "syncRestart", "syncErrors"}) {
                OptionSpec spec = d.option(f);
                if (!o.asMap().get(f).equals(spec.defaultValue())) {
                    throw new OptionException(f, where + "option '" + f + "' belongs to profile 'framed'; profile 'dsi' fixes it "
                            + "(sync byte B8, 8-bit words LSB first, byte k on lane k mod N)");
                }
            }
        }
        lpStates = dsi || o.getBoolean("lpStates");
        syncBits = o.getInt("syncBits");
        wordBits = o.getInt("wordBits");
        msbFirst = o.getString("bitOrder").equals("msb");
        independent = o.getString("laneDistribution").equals("independent");
        groupWords = o.getInt("groupWords");
        dropTrail = dsi || o.getBoolean("dropTrail");
        double gap = o.getTime("burstGap").toFs(Double.NaN, Double.NaN);
        if (!(gap >= 0) || gap > 1e15) {
            throw new OptionException("burstGap", where + "option 'burstGap' must be 0 to 1 s, got " + o.getTime("burstGap"));
        }
        burstGapFs = Math.round(gap);
        idleBits = o.getInt("idleBits");
        if ((burstGapFs > 0 || idleBits > 0) && lpStates) {
            throw new OptionException(burstGapFs > 0 ? "burstGap" : "idleBits", where + "options 'burstGap' and 'idleBits' cut bursts "
                    + "of links without line states; set 'lpStates' to false (with line states the legs mark the bursts)");
        }
        syncRestart = o.getBoolean("syncRestart");
        syncErrors = o.getInt("syncErrors");
        if (syncRestart && lpStates) {
            throw new OptionException("syncRestart", where + "option 'syncRestart' cuts bursts of links without line states; set "
                    + "'lpStates' to false (with line states the legs mark the bursts)");
        }
        if (syncRestart && groupWords > 0) {
            throw new OptionException("groupWords", where + "option 'groupWords' cannot be combined with 'syncRestart' "
                    + "(bursts of any length are cut at each sync; use one or the other)");
        }
        if ((burstGapFs > 0 || idleBits > 0) && groupWords > 0) {
            throw new OptionException("groupWords", where + "option 'groupWords' cannot be combined with 'burstGap' or 'idleBits' "
                    + "(bursts of any length are cut at their boundaries; use one or the other)");
        }
        String hex = o.getString("syncPattern").trim();
        if (hex.startsWith("0x") || hex.startsWith("0X")) {
            hex = hex.substring(2);
        }
        if (hex.isEmpty() != (syncBits == 0)) {
            throw new OptionException("syncBits", where + "option 'syncBits' must be 0 exactly when 'syncPattern' is empty, got syncBits="
                    + syncBits + " and syncPattern='" + o.getString("syncPattern") + "'");
        }
        long pattern = 0;
        if (!hex.isEmpty()) {
            if (!hex.matches("[0-9A-Fa-f]{1,16}")) {
                throw new OptionException("syncPattern", where + "option 'syncPattern' must be 1 to 16 hex digits, got '" + o.getString("syncPattern") + "'");
            }
            pattern = Long.parseUnsignedLong(hex.toLowerCase(Locale.ROOT), 16);
            if (syncBits < 64 && (pattern >>> syncBits) != 0) {
                throw new OptionException("syncPattern", where + "option 'syncPattern' 0x" + hex + " has bits above 'syncBits' = " + syncBits);
            }
        }
        if (syncRestart && syncBits == 0) {
            throw new OptionException("syncRestart", where + "option 'syncRestart' needs a sync pattern ('syncPattern' and 'syncBits')");
        }
        if (syncErrors > 0 && 4 * syncErrors >= syncBits) {
            throw new OptionException("syncErrors", where + "option 'syncErrors' (" + syncErrors + ") must be below a quarter of 'syncBits' ("
                    + syncBits + "), or the pattern matches too much of the data");
        }
        // wire order: wire bit j is bit j of syncWire
        syncWire = syncBits == 0 ? 0 : msbFirst ? Long.reverse(pattern) >>> (64 - syncBits) : pattern;
        pngFrames = o.getInt("pngFrames");
        maxBurstBytes = o.getLong("maxBurstBytes");
        maxLogEntries = o.getInt("maxLogEntries");
        maxFramePixels = o.getLong("maxFramePixels");
        if (groupWords > 0 && (long) groupWords * wordBits > maxBurstBytes * 8) {
            throw new OptionException("groupWords", where + "option 'groupWords' x 'wordBits' exceeds 'maxBurstBytes' x 8 bits");
        }
    }

    static LinkConfig of(PluginDescriptor d, OptionValues o) {
        return new LinkConfig(d, o);
    }

    /** Whether bursts are found in the bits: from pauses, idle runs or syncs (framed profile, no line states). */
    boolean gapBursts() {
        return !lpStates && (burstGapFs > 0 || idleBits > 0 || syncRestart);
    }

    int inputsPerLane() {
        return lpStates ? 3 : 1;
    }

    int maxBits() {
        return (int) Math.min(Integer.MAX_VALUE - 128, maxBurstBytes * 8);
    }
}
