package org.lanesift.plugins.si;

import java.util.ArrayDeque;
import java.util.List;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Base of the stages that measure transitions of one analog input: it finds the two levels (from
 * option {@code levelsVolts}, or from the first {@code levelSamples} samples, buffering blocks until
 * then), then feeds every valid sample in order, with its absolute time computed from the capture
 * index (so that any cut into blocks gives the same times), to an {@link EdgeTracker}.
 */
abstract class LevelStage implements Stage {
    final StageContext ctx;
    final String pluginId;
    private final Levels.Collector collector;
    private final ArrayDeque<AnalogBlock> pending = new ArrayDeque<>();
    private Levels levels;
    private EdgeTracker tracker;
    private double t0Fs = Double.NaN;
    double periodFs;
    long firstFs = Long.MAX_VALUE;
    long lastFs = Long.MIN_VALUE;
    long samples;
    String channel = "signal";
    private long nextIndex = Long.MIN_VALUE;

    LevelStage(StageContext ctx, String pluginId) {
        this.ctx = ctx;
        this.pluginId = pluginId;
        List<Double> given = ctx.options().getNumbers("levelsVolts");
        if (!given.isEmpty()) {
            if (given.size() != 2 || !(given.get(1) > given.get(0))) {
                throw new OptionException("levelsVolts", "option 'levelsVolts' of plugin '" + pluginId
                        + "': expected two increasing numbers [low, high] in volts, got " + given);
            }
            levels = new Levels(given.get(0), given.get(1));
        }
        collector = new Levels.Collector(ctx.options().getInt("levelSamples"));
    }

    /** Creates the tracker once the levels are known. */
    abstract EdgeTracker tracker(Levels levels);

    /** Called after the last sample has been fed and the tracker finished. */
    abstract void done(Levels levels);

    Levels levels() {
        return levels;
    }

    @Override
    public void accept(int input, Block block) {
        AnalogBlock b = (AnalogBlock) block;
        if (b.length() == 0) {
            return;
        }
        if (Double.isNaN(t0Fs)) {
            periodFs = b.periodFs();
            t0Fs = b.startFs() - b.firstIndex() * periodFs;
            channel = b.channel();
        } else if (Math.abs(b.periodFs() - periodFs) > 1e-9 * periodFs) {
            throw new org.lanesift.plugin.InputFormatException(pluginId + " '" + ctx.instanceId() + "': channel '" + b.channel()
                    + "' changed its sample period from " + periodFs + " fs to " + b.periodFs() + " fs at sample " + b.firstIndex());
        }
        firstFs = Math.min(firstFs, b.startFs());
        lastFs = Math.max(lastFs, b.endFs());
        samples += b.length();
        if (levels == null) {
            collector.take(b.volts(), 0, b.length(), b.invalid());
            pending.add(b);
            if (!collector.full()) {
                return;
            }
            start();
            drain();
            return;
        }
        feed(b);
    }

    private void start() {
        if (levels == null) {
            levels = collector.levels();
            if (levels == null) {
                throw new org.lanesift.plugin.InputFormatException(pluginId + " '" + ctx.instanceId() + "': the first " + collector.count()
                        + " samples of '" + channel + "' show no two distinct levels; set option levelsVolts [low, high]");
            }
        }
    }

    private void drain() {
        while (!pending.isEmpty()) {
            feed(pending.poll());
        }
    }

    private void feed(AnalogBlock b) {
        if (tracker == null) {
            tracker = tracker(levels);
        }
        if (b.firstIndex() != nextIndex) {
            tracker.gap();
        }
        float[] v = b.volts();
        long g = b.firstIndex();
        long[] inv = b.invalid();
        for (int i = 0; i < b.length(); i++) {
            if (inv != null && (inv[i >>> 6] & (1L << i)) != 0 || !Float.isFinite(v[i])) {
                tracker.gap();
                continue;
            }
            tracker.step(t0Fs + (g + i) * periodFs, v[i]);
        }
        nextIndex = g + b.length();
    }

    @Override
    public void finish() {
        if (samples == 0) {
            throw new org.lanesift.plugin.InputFormatException(pluginId + " '" + ctx.instanceId() + "': input 'signal' received no samples");
        }
        if (tracker == null) {
            start();
            drain();
        }
        tracker.finish();
        done(levels);
    }
}
