package org.lanesift.plugins.differential;

import java.util.List;
import org.lanesift.data.AnalogBlock;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.StageContext;

/**
 * The analog signals of a pair of aligned legs, for the optional outputs {@code diff} (P-N, volts)
 * and {@code common} ((P+N)/2, volts) of mode {@code pair}: one block out per aligned chunk in,
 * computed in one pass over the chunk's primitive arrays (one array per output block, nothing per
 * sample). An output is computed only when it exists (its option is on) and the context says that
 * someone receives it. A sample is invalid where either leg is invalid or not a number.
 *
 * <p>What they are: the differential output voltage VOD is defined on P-N and the offset (common
 * mode) voltage as (P+N)/2 (docs/reference-facts.md#lvds-electrical-levels,
 * docs/reference-facts.md#d-phy-levels-and-states).
 */
final class PairSignals {
    private final StageContext ctx;
    private final int diffPort;
    private final int commonPort;
    private final String diffChannel;
    private final String commonChannel;

    PairSignals(StageContext ctx, String channel) {
        this.ctx = ctx;
        this.diffPort = port(ctx.outputs(), DifferentialPlugin.OUT_DIFF);
        this.commonPort = port(ctx.outputs(), DifferentialPlugin.OUT_COMMON);
        this.diffChannel = channel + " (P-N)";
        this.commonChannel = channel + " (P+N)/2";
    }

    private static int port(List<PortSpec> outs, String name) {
        for (int i = 0; i < outs.size(); i++) {
            if (outs.get(i).name().equals(name)) {
                return i;
            }
        }
        return -1;
    }

    /** Whether any of the two outputs is wanted. */
    boolean wanted() {
        return (diffPort >= 0 && ctx.isConnected(diffPort)) || (commonPort >= 0 && ctx.isConnected(commonPort));
    }

    /**
     * Emits P-N and (P+N)/2 of a two-leg chunk.
     *
     * @param c        the chunk (both legs present)
     * @param index    capture sample number of its first sample (as leg p counts them)
     * @param startFs  time of its first sample, femtoseconds
     * @param periodFs sample period, femtoseconds
     * @param inv      the chunk's invalid samples (either leg invalid or not a number), or null
     */
    void emit(Chunk c, long index, long startFs, double periodFs, long[] inv) {
        int len = c.len();
        float[] p = c.a();
        float[] n = c.b();
        int po = c.ao();
        int no = c.bo();
        if (diffPort >= 0 && ctx.isConnected(diffPort)) {
            float[] d = new float[len];
            for (int i = 0; i < len; i++) {
                d[i] = p[po + i] - n[no + i];
            }
            ctx.emit(diffPort, new AnalogBlock(diffChannel, index, startFs, periodFs, d, len, inv == null ? null : inv.clone()));
        }
        if (commonPort >= 0 && ctx.isConnected(commonPort)) {
            float[] m = new float[len];
            for (int i = 0; i < len; i++) {
                m[i] = (float) (0.5 * ((double) p[po + i] + n[no + i]));
            }
            ctx.emit(commonPort, new AnalogBlock(commonChannel, index, startFs, periodFs, m, len, inv == null ? null : inv.clone()));
        }
    }
}
