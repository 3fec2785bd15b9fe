package org.lanesift.plugins.discovery;

import java.nio.charset.StandardCharsets;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Collects the clock's and the lanes' edges (bounded by {@code maxBits}) and, when wired, follows
 * the line states of the lanes' legs (counters only), runs the
 * {@link DiscoveryEngine} at the end and emits the report, the picture sheet and the chain file.
 */
final class DiscoveryStage implements Stage {
    private final StageContext ctx;
    private final EdgeCollector clock;
    private final EdgeCollector[] lanes;
    private final String[] names;
    private final int maxBits;
    private final int sheetPictures;
    private final String capture;
    private String clockName = "clock";
    private long firstFs = Long.MAX_VALUE;
    private long lastFs = Long.MIN_VALUE;

    /** Per data lane, the state pattern of its legs; null when the legs are not wired. */
    private final LineStatePattern[] legs;

    DiscoveryStage(StageContext ctx, int lanes, int maxBits, int sheetPictures, String capture, boolean withLegs) {
        this.ctx = ctx;
        this.maxBits = maxBits;
        this.sheetPictures = sheetPictures;
        this.capture = capture;
        // a clock period carries at most 16 bits per lane; two clock transitions per period
        this.clock = new EdgeCollector(2 * maxBits);
        this.lanes = new EdgeCollector[lanes];
        this.names = new String[lanes];
        for (int k = 0; k < lanes; k++) {
            this.lanes[k] = new EdgeCollector(maxBits);
            names[k] = "lane" + k;
        }
        this.legs = withLegs ? new LineStatePattern[lanes] : null;
        for (int k = 0; withLegs && k < lanes; k++) {
            legs[k] = new LineStatePattern();
        }
    }

    @Override
    public void accept(int input, Block block) {
        if (input > lanes.length) {
            int leg = input - lanes.length - 1;
            legs[leg / 2].accept(leg % 2 == 0, (AnalogBlock) block);
            return;
        }
        Edges e = (Edges) block;
        firstFs = Math.min(firstFs, e.startFs());
        lastFs = Math.max(lastFs, e.endFs());
        if (input == 0) {
            clockName = e.channel();
            clock.accept(e, true);
        } else {
            names[input - 1] = e.channel();
            lanes[input - 1].accept(e, false);
        }
    }

    @Override
    public void finish() {
        int n = lanes.length;
        boolean[] init = new boolean[n];
        long[][] t = new long[n][];
        int[] c = new int[n];
        for (int k = 0; k < n; k++) {
            init[k] = lanes[k].initialLevel;
            t[k] = lanes[k].times;
            c[k] = lanes[k].count;
        }
        LinkEdgesInput in = new LinkEdgesInput(clockName, clock.rising, clock.nRising, clock.falling, clock.nFalling, names, init, t, c);
        Hypotheses h = new DiscoveryEngine(maxBits).discover(in);
        LineStates states = legs == null ? null : LineStates.of(legs);
        String id = ctx.instanceId();
        long s = firstFs == Long.MAX_VALUE ? 0 : firstFs;
        long e = Math.max(s, lastFs);
        ctx.emit(0, new Artifact(id, s, e, id + "-hypotheses.json", "application/json",
                HypothesesReport.json(h, in, states).getBytes(StandardCharsets.UTF_8)));
        ctx.emit(0, new Artifact(id, s, e, id + "-hypotheses.md", "text/markdown",
                HypothesesReport.markdown(h, in, states, id).getBytes(StandardCharsets.UTF_8)));
        ctx.emit(0, new Artifact(id, s, e, id + "-pictures.png", "image/png", ContactSheet.png(h.pictures(), sheetPictures)));
        ctx.emit(0, new Artifact(id, s, e, id + "-chain.json", "application/json",
                ChainFile.json(h, in, capture).getBytes(StandardCharsets.UTF_8)));
    }
}
