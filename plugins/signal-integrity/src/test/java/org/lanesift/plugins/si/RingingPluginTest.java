package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.lanesift.plugins.si.EdgeMetricsPluginTest.in;
import static org.lanesift.plugins.si.EdgeMetricsPluginTest.square;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.function.DoubleUnaryOperator;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

class RingingPluginTest {

    static String json(StageHarness h, String suffix) {
        for (Artifact a : h.outputs("files", Artifact.class)) {
            if (a.fileName().endsWith(suffix)) {
                return new String(a.content(), StandardCharsets.UTF_8);
            }
        }
        throw new AssertionError("no " + suffix);
    }

    @Test
    void ngspiceProbeModelRecoversInductanceAndFrequency(@TempDir Path dir) throws Exception {
        // External check: ngspice (Debian package) transient of src/test/spice/probe-step.cir, a 1 V step
        // through R = 20 ohm, L = 100 nH (ground lead), C = 10 pF (probe tip). Series RLC theory:
        // omega0 = 1/sqrt(LC) = 1e9 rad/s, alpha = R/(2L) = 1e8 1/s, ring (damped) frequency
        // sqrt(omega0^2 - alpha^2)/(2 pi) = 158.36 MHz, zeta = 0.1, Q = 5.
        AnalogBlock sig = Spice.run("probe-step.cir", "probe-step.out", dir);
        StageHarness h = StageHarness.of(new RingingPlugin(), Map.of("probeCapacitancePf", 10.0));
        for (AnalogBlock b : Synth.split(sig, 4096)) {
            h.push("signal", b);
        }
        h.finish();
        String j = json(h, "-ringing.json");
        double l = 100e-9;
        double c = 10e-12;
        double ringHz = Math.sqrt(1 / (l * c) - Math.pow(20 / (2 * l), 2)) / (2 * Math.PI);
        assertTrue(in(j, "summary", "loopInductanceNh") > 0, j);
        assertEquals(100, in(j, "summary", "loopInductanceNh"), 5, j);
        assertEquals(ringHz, in(j, "summary", "ringHz"), 0.01 * ringHz, j);
        assertEquals(0.1, in(j, "summary", "dampingRatio"), 0.01, j);
        assertEquals(5, in(j, "summary", "q"), 0.5, j);
        assertTrue(EyeDiagramPluginTest.num(j, "fitted") >= 6, j);
        Annotation a = h.annotations("ringing").get(0);
        String advice = a.fields().get("advice").value().toString();
        assertTrue(advice.contains("158 MHz") && advice.contains("10 cm ground lead") && advice.contains("ground spring"), advice);
        SynthSignals.save(h.outputs("files", Artifact.class).get(0));

        // the same simulated waveform through edge-metrics: second-order step overshoot (textbook)
        // exp(-pi zeta / sqrt(1 - zeta^2)) = 72.9 % for zeta = 0.1
        StageHarness em = StageHarness.of(new EdgeMetricsPlugin(), Map.of("levelsVolts", List.of(0.0, 1.0)));
        em.push("signal", sig).finish();
        String ej = EdgeMetricsPluginTest.json(em);
        assertEquals(100 * Math.exp(-Math.PI * 0.1 / Math.sqrt(0.99)), in(ej, "overshoot", "mean"), 0.5, ej);
        assertEquals(100 * Math.exp(-Math.PI * 0.1 / Math.sqrt(0.99)), in(ej, "undershoot", "mean"), 0.5, ej);
        for (Artifact art : em.outputs("files", Artifact.class)) {
            SynthSignals.save(new Artifact(art.channel(), art.startFs(), art.endFs(), "spice-" + art.fileName(), art.mediaType(), art.content()));
        }
    }

    @Test
    void ngspiceRcStepRiseTimeTimesBandwidth(@TempDir Path dir) throws Exception {
        // External check: ngspice transient of src/test/spice/rc-step.cir (R = 50 ohm, C = 2 pF, tau = 100 ps);
        // textbook single-pole result t10-90 * BW = ln(9)/(2 pi) = 0.3497 with BW = 1/(2 pi R C).
        AnalogBlock sig = Spice.run("rc-step.cir", "rc-step.out", dir);
        StageHarness h = StageHarness.of(new EdgeMetricsPlugin(), Map.of());
        h.push("signal", sig).finish();
        String j = EdgeMetricsPluginTest.json(h);
        double bw = 1 / (2 * Math.PI * 50 * 2e-12);
        assertEquals(0.3497, in(j, "rise1090", "mean") * 1e-12 * bw, 0.002, j);
        assertEquals(0.3497, in(j, "fall1090", "mean") * 1e-12 * bw, 0.002, j);
    }

    @Test
    void fitOfASyntheticSecondOrderRingWithNoise() {
        // Analytic second-order step response (textbook) with zeta = 0.05 at f0 = 300 MHz, plus 5 mV noise
        double zeta = 0.05;
        double f0 = 300e6;
        double w0 = 2 * Math.PI * f0;
        double wd = w0 * Math.sqrt(1 - zeta * zeta);
        DoubleUnaryOperator step = t -> 1 - Math.exp(-zeta * w0 * t) * (Math.cos(wd * t) + zeta / Math.sqrt(1 - zeta * zeta) * Math.sin(wd * t));
        AnalogBlock sig = Synth.withNoise(Synth.analog("s", 20e9, 20 * 2000, square(100e-9, step)), 0.005, 11);
        StageHarness h = StageHarness.of(new RingingPlugin(), Map.of("levelsVolts", List.of(0.0, 1.0), "probeCapacitancePf", 1.0));
        h.push("signal", sig).finish();
        String j = json(h, "-ringing.json");
        assertEquals(wd / (2 * Math.PI), in(j, "summary", "ringHz"), 0.002 * f0, j);
        assertEquals(f0, in(j, "summary", "naturalHz"), 0.002 * f0, j);
        assertEquals(zeta, in(j, "summary", "dampingRatio"), 0.003, j);
        // 1 pF at 300 MHz: L = 1/((2 pi 300e6)^2 1e-12) = 281.4 nH
        assertEquals(281.4, in(j, "summary", "loopInductanceNh"), 2, j);
    }

    @Test
    void noRingOnAnRcStep() {
        double tau = 1e-9;
        AnalogBlock sig = Synth.analog("rc", 20e9, 20 * 1000, square(50 * tau, t -> 1 - Math.exp(-t / tau)));
        StageHarness h = StageHarness.of(new RingingPlugin(), Map.of("levelsVolts", List.of(0.0, 1.0)));
        h.push("signal", sig).finish();
        String j = json(h, "-ringing.json");
        assertEquals(0, EyeDiagramPluginTest.num(j, "fitted"), j);
        assertTrue(h.annotations("ringing").get(0).label().startsWith("no ringing was fitted"), j);
    }

    @Test
    void adviceNamesFrequencyInductanceAndLength() {
        // 180 MHz with 6.5 pF: L = 1/((2 pi 180e6)^2 6.5e-12) = 120.3 nH, about 12 cm at 1 nH/mm
        double l = RingingPlugin.inductance(180e6, 6.5e-12);
        assertEquals(120.3e-9, l, 0.1e-9);
        String a = RingingPlugin.advice(180e6, l, 6.5, 8);
        assertEquals("the ring at 180 MHz fits about 120 nH of loop inductance with 6.5 pF at the tip, roughly a 12 cm ground lead: "
                + "use a short ground spring or a solder-in tip with a ground a few mm away", a);
        assertTrue(RingingPlugin.advice(2e9, 3e-9, 2, 5).contains("already short"));
    }
}
