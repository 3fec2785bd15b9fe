package org.lanesift.chain;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.fakes.Counter;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Calibration wires: a result computed over the whole capture (here the largest or smallest
 * sample) reaches a stage before its first data block, in the same run, on two levels.
 */
class CalibrationPassesTest {
    /** Emits the largest (or smallest) sample seen as a text artifact at the end, and one annotation. */
    static final PluginProvider EXTREME = new PluginProvider() {
        @Override
        public PluginDescriptor descriptor() {
            return PluginDescriptor.builder("test.extreme").option(OptionSpec.choice("which", "max", "max or min", "max", "min"))
                    .input(PortSpec.of("in", DataKind.ANALOG, "samples"))
                    .output(PortSpec.of("value", DataKind.ARTIFACT, "the extreme as text")).build();
        }

        @Override
        public Stage open(StageContext ctx) {
            boolean max = ctx.options().getString("which").equals("max");
            return new Stage() {
                double v = max ? Double.NEGATIVE_INFINITY : Double.POSITIVE_INFINITY;

                @Override
                public void accept(int input, Block block) {
                    AnalogBlock a = (AnalogBlock) block;
                    for (int i = 0; i < a.length(); i++) {
                        v = max ? Math.max(v, a.volts()[i]) : Math.min(v, a.volts()[i]);
                    }
                }

                @Override
                public void finish() {
                    ctx.annotate(Annotation.on(ctx.instanceId(), "extreme").span(0, 0).label(Double.toString(v)).build());
                    ctx.emit(0, new Artifact(ctx.instanceId(), 0, 0, ctx.instanceId() + ".txt", "text/plain",
                            Double.toString(v).getBytes(StandardCharsets.UTF_8)));
                }
            };
        }
    };

    /** Subtracts the value on its calibration input from every sample; refuses data before the value. */
    static final PluginProvider SUBTRACT = new PluginProvider() {
        @Override
        public PluginDescriptor descriptor() {
            return PluginDescriptor.builder("test.subtract")
                    .input(PortSpec.of("in", DataKind.ANALOG, "samples"))
                    .input(PortSpec.calibration("value", DataKind.ARTIFACT, "what to subtract"))
                    .output(PortSpec.of("out", DataKind.ANALOG, "samples minus the value")).build();
        }

        @Override
        public Stage open(StageContext ctx) {
            return new Stage() {
                double value = Double.NaN;

                @Override
                public void accept(int input, Block block) {
                    if (input == 1) {
                        value = Double.parseDouble(new String(((Artifact) block).content(), StandardCharsets.UTF_8));
                        return;
                    }
                    if (Double.isNaN(value)) {
                        throw new IllegalStateException("data before the calibration value");
                    }
                    AnalogBlock a = (AnalogBlock) block;
                    float[] out = new float[a.length()];
                    for (int i = 0; i < out.length; i++) {
                        out[i] = (float) (a.volts()[i] - value);
                    }
                    ctx.emit(0, new AnalogBlock(a.channel(), a.firstIndex(), a.startFs(), a.periodFs(), out, out.length, null));
                }
            };
        }
    };

    private static PluginRegistry registry() {
        return new PluginRegistry().add(new Counter()).add(EXTREME).add(SUBTRACT);
    }

    @Test
    void twoLevelsOfCalibrationRunBeforeTheDecodeInOneRun() {
        List<Float> out = new ArrayList<>();
        List<String> notes = new ArrayList<>();
        List<String> results = new ArrayList<>();
        long[] lastProgress = new long[2];
        ChainBuilder b = Chain.builder(registry())
                .add("cap", "test.ramp", Map.of("blocks", 3, "size", 100))
                .add("hi", "test.extreme", Map.of("which", "max"))
                .add("lo", "test.extreme", Map.of("which", "min"))
                .add("s1", "test.subtract").add("s2", "test.subtract")
                .wire("cap", "hi").wire("cap", "s1.in").wire("hi", "s1.value")
                .wire("s1", "lo").wire("s1", "s2.in").wire("lo", "s2.value")
                .tap("s2.out", blk -> {
                    AnalogBlock a = (AnalogBlock) blk;
                    for (int i = 0; i < a.length(); i++) {
                        out.add(a.volts()[i]);
                    }
                })
                .annotations((id, a) -> notes.add(id + ":" + a.label()))
                .outputs((id, port, blk) -> {
                    if (blk instanceof Artifact art) {
                        results.add(art.fileName() + "=" + new String(art.content(), StandardCharsets.UTF_8));
                    }
                })
                .progress((d, t) -> {
                    lastProgress[0] = d;
                    lastProgress[1] = t;
                });
        try (Chain c = b.build()) {
            assertEquals(List.of("cap", "s1", "s2"), c.instanceIds(), "estimators run in calibration passes only");
            c.run();
        }
        // the ramp is 0..299: s1 subtracts its maximum 299, s2 the minimum of s1's output, -299
        assertEquals(300, out.size());
        for (int i = 0; i < 300; i++) {
            assertEquals(i, out.get(i), 0.0, "sample " + i);
        }
        assertEquals(List.of("hi:299.0", "lo:-299.0"), notes, "each estimator's finding once, none from the passes repeated");
        assertEquals(List.of("hi.txt=299.0", "lo.txt=-299.0"), results, "calibration results are results too, once each");
        assertEquals(900, lastProgress[1], "three passes over 300 samples");
        assertEquals(900, lastProgress[0]);
    }

    @Test
    void withoutTheCalibrationPortTheValueWouldArriveTooLate() {
        // the same stage with an ordinary input: the value comes at the end, after the data, and the stage refuses
        PluginProvider late = new PluginProvider() {
            @Override
            public PluginDescriptor descriptor() {
                return PluginDescriptor.builder("test.late").input(PortSpec.of("in", DataKind.ANALOG, "samples"))
                        .input(PortSpec.of("value", DataKind.ARTIFACT, "ordinary input"))
                        .output(PortSpec.of("out", DataKind.ANALOG, "out")).build();
            }

            @Override
            public Stage open(StageContext ctx) throws Exception {
                return SUBTRACT.open(ctx);
            }
        };
        ChainBuilder b = Chain.builder(registry().add(late)).add("cap", "test.ramp").add("hi", "test.extreme")
                .add("s", "test.late").wire("cap", "hi").wire("cap", "s.in").wire("hi", "s.value");
        try (Chain c = b.build()) {
            StageFailure f = assertThrows(StageFailure.class, c::run);
            assertTrue(f.getMessage().contains("data before the calibration value"), f.getMessage());
        }
    }

    @Test
    void externalInputsCannotBeReadTwice() {
        ChainBuilder b = Chain.builder(registry()).input("x", DataKind.ANALOG).add("hi", "test.extreme").add("s", "test.subtract")
                .wire("x", "hi").wire("x", "s.in").wire("hi", "s.value");
        ChainException e = assertThrows(ChainException.class, b::build);
        assertTrue(e.getMessage().contains("external input 'x' cannot be read again"), e.getMessage());
    }
}
