package org.lanesift.runner.fakes;

import java.nio.charset.StandardCharsets;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.Frame;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.WordStream;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Test-only source that emits one block of every kind per step, with contents that are simple
 * functions of the sample index, so tests can predict every output file exactly:
 * analog volts = (k % 10) / 10 (sample k invalid when k % 50 == 49); logic bit = (k / 3) % 2
 * (unknown for k in [100, 110)); edges toggle at k * period for k % 5 == 0, k > 0; one 8-bit word
 * per 8 samples with value k / 8; one bit per 4 samples; two frames and an artifact at the end;
 * one info annotation per block, a warning at sample 100, an error at the end.
 */
public final class FakeWave implements PluginProvider {
    static final PluginDescriptor D = PluginDescriptor.builder("fake-wave").name("Fake waveform source").version("9.9.9")
            .description("Test source emitting every kind.")
            .option(OptionSpec.integer("samples", 200L, 1, 1_000_000_000L, "samples to emit"))
            .option(OptionSpec.integer("blockSamples", 64L, 8, 1 << 20, "samples per block"))
            .option(OptionSpec.number("periodPs", "ps", 1000.0, 1.0, 1e9, "sample period"))
            .option(OptionSpec.number("startPs", "ps", 0.0, -1e12, 1e12, "time of sample 0"))
            .option(OptionSpec.bool("bug", false, "throw a NullPointerException while producing"))
            .option(OptionSpec.integer("sleepMillis", 0L, 0, 10_000, "pause per block"))
            .option(OptionSpec.bool("logicOnly", false, "emit only logic, edges and words"))
            .output(PortSpec.of("analog", DataKind.ANALOG, "ramp"))
            .output(PortSpec.of("logic", DataKind.LOGIC, "square"))
            .output(PortSpec.of("edges", DataKind.EDGES, "toggles"))
            .output(PortSpec.of("words", DataKind.WORDS, "counter"))
            .output(PortSpec.of("bits", DataKind.BITS, "bits"))
            .output(PortSpec.of("frame", DataKind.FRAME, "pictures"))
            .output(PortSpec.of("report", DataKind.ARTIFACT, "summary"))
            .build();

    @Override
    public PluginDescriptor descriptor() {
        return D;
    }

    @Override
    public Stage open(StageContext ctx) {
        long total = ctx.options().getLong("samples");
        int block = ctx.options().getInt("blockSamples");
        double p = ctx.options().getDouble("periodPs") * 1000.0;
        long start = Math.round(ctx.options().getDouble("startPs") * 1000.0);
        boolean bug = ctx.options().getBoolean("bug");
        long sleep = ctx.options().getLong("sleepMillis");
        boolean logicOnly = ctx.options().getBoolean("logicOnly");
        return new Stage() {
            long k0;

            long t(long k) {
                return start + Math.round(k * p);
            }

            @Override
            public boolean produce() throws Exception {
                if (k0 >= total) {
                    return false;
                }
                if (bug) {
                    Object o = null;
                    o.hashCode();
                }
                if (sleep > 0) {
                    Thread.sleep(sleep);
                }
                int n = (int) Math.min(block, total - k0);
                float[] v = new float[n];
                long[] inv = new long[BitSets.words(n)];
                long[] bits = new long[BitSets.words(n)];
                long[] linv = new long[BitSets.words(n)];
                boolean anyInv = false;
                boolean anyL = false;
                int edgeCount = 0;
                long[] et = new long[n];
                for (int i = 0; i < n; i++) {
                    long k = k0 + i;
                    v[i] = (k % 10) / 10f;
                    if (k % 50 == 49) {
                        BitSets.set(inv, i, true);
                        anyInv = true;
                    }
                    BitSets.set(bits, i, (k / 3) % 2 == 1);
                    if (k >= 100 && k < 110) {
                        BitSets.set(linv, i, true);
                        anyL = true;
                    }
                    if (k > 0 && k % 5 == 0) {
                        et[edgeCount++] = t(k);
                    }
                }
                long s = t(k0);
                long e = t(k0 + n);
                boolean initial = ((k0 == 0 ? 0 : (k0 - 1) / 5) & 1) == 1;
                if (!logicOnly) {
                    ctx.emit(0, new AnalogBlock("ramp", k0, s, p, v, n, anyInv ? inv : null));
                }
                ctx.emit(1, new LogicBlock("square", k0, s, p, bits, n, anyL ? linv : null));
                ctx.emit(2, new Edges("toggle", s, e, initial, et, edgeCount, null, 0));
                int nw = 0;
                long[] wv = new long[n];
                long[] ws = new long[n];
                long[] we = new long[n];
                for (int i = 0; i < n; i++) {
                    long k = k0 + i;
                    if (k % 8 == 0) {
                        wv[nw] = (k / 8) & 0xFF;
                        ws[nw] = t(k);
                        we[nw] = t(k + 8);
                        nw++;
                    }
                }
                ctx.emit(3, new WordStream("counter", s, e, nw, 8, wv, ws, we, new int[nw], new byte[nw]));
                int nb = 0;
                long[] bv = new long[BitSets.words(n)];
                long[] bt = new long[n];
                long[] be = new long[n];
                long[] bs = new long[n];
                long[] bh = new long[n];
                for (int i = 0; i < n; i++) {
                    long k = k0 + i;
                    if (k % 4 == 0) {
                        BitSets.set(bv, nb, (k / 4) % 3 == 0);
                        bt[nb] = t(k);
                        be[nb] = k / 4;
                        bs[nb] = 100_000;
                        bh[nb] = k % 8 == 0 ? org.lanesift.data.BitStream.UNKNOWN_MARGIN : 200_000;
                        nb++;
                    }
                }
                if (!logicOnly) {
                    ctx.emit(4, new BitStream("bits", s, e, nb, bv, bt, be, new long[BitSets.words(n)], null, bs, bh,
                            new long[BitSets.words(n)], 4 * p));
                }
                ctx.annotate(Annotation.on("fake", "block-done").span(s, e).label("block at " + k0)
                        .field("samples", Field.integer(n, "samples")).build());
                if (k0 <= 100 && 100 < k0 + n) {
                    ctx.annotate(Annotation.on("fake", "level-odd").span(t(100), t(101)).label("odd level")
                            .severity(Severity.WARNING).number("volts", 0.25, "V")
                            .field("raw", Field.bytes(new byte[] {0x39, 0x04, 0x00})).build());
                }
                k0 += n;
                ctx.progress(k0, total);
                return true;
            }

            @Override
            public void finish() {
                if (logicOnly) {
                    return;
                }
                long e = t(total);
                ctx.emit(5, new Frame("pic", t(0), e, 0, 4, 3,
                        new int[] {0xFF0000, 0x00FF00, 0x0000FF, 0xFFFFFF, 0, 0x123456, 0x654321, 0x808080, 1, 2, 3, 4},
                        false, false));
                ctx.emit(5, new Frame("pic", t(0), e, 1, 2, 2, new int[] {0xFF0000, 0x00FF00, 0x0000FF, 0xFFFFFF}, true, false));
                ctx.emit(6, new Artifact("summary", t(0), e, ctx.instanceId() + "-summary.txt", "text/plain",
                        ("samples=" + total + "\n").getBytes(StandardCharsets.UTF_8)));
                ctx.annotate(Annotation.on("fake", "end-of-data").span(e, e).label("the end").severity(Severity.ERROR).build());
            }
        };
    }
}
