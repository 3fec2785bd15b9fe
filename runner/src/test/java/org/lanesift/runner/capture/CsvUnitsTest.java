package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.lanesift.data.AnalogBlock;

/**
 * Issue 18 item 2: every spelling of the time and voltage units that tools write reads at the
 * right scale, and an unknown unit is refused naming the column. Prefix values: SI Brochure, 9th
 * edition (BIPM 2019), table 7: milli 10^-3, micro 10^-6 (symbol the Greek letter mu; U+00B5 MICRO
 * SIGN is the legacy code point of the same symbol, and "u" its ASCII stand-in, common practice),
 * nano 10^-9, pico 10^-12, kilo 10^3; the minute, 60 s, from table 8 (non-SI units accepted for use
 * with the SI).
 */
class CsvUnitsTest {
    @TempDir
    Path tmp;

    static final String MICRO_SIGN = "\u00b5";
    static final String GREEK_MU = "\u03bc";

    /** Header unit as written, bytes encoding, femtoseconds per unit. */
    static Stream<Arguments> timeUnits() {
        return Stream.of(
                Arguments.of("s", StandardCharsets.UTF_8, 1e15),
                Arguments.of("ms", StandardCharsets.UTF_8, 1e12),
                Arguments.of("us", StandardCharsets.UTF_8, 1e9),
                Arguments.of(MICRO_SIGN + "s", StandardCharsets.UTF_8, 1e9),
                Arguments.of(MICRO_SIGN + "s", StandardCharsets.ISO_8859_1, 1e9),
                Arguments.of(GREEK_MU + "s", StandardCharsets.UTF_8, 1e9),
                Arguments.of("ns", StandardCharsets.UTF_8, 1e6),
                Arguments.of("ps", StandardCharsets.UTF_8, 1e3),
                Arguments.of("min", StandardCharsets.UTF_8, 60e15));
    }

    private Path write(String name, String text, java.nio.charset.Charset cs) throws Exception {
        Path f = tmp.resolve(name);
        Files.write(f, text.getBytes(cs));
        return f;
    }

    @ParameterizedTest(name = "Time ({0}) in {1}")
    @MethodSource("timeUnits")
    void timeUnitsReadAtTheirScale(String unit, java.nio.charset.Charset cs, double fsPerUnit) throws Exception {
        Path f = write("t.csv", "Time (" + unit + "),CH1 (V)\n0,1\n2,0\n4,1\n6,0\n", cs);
        Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString()));
        AnalogBlock b = c.blocks("CH1").stream().map(AnalogBlock.class::cast).findFirst().orElseThrow();
        assertEquals(2 * fsPerUnit, b.periodFs(), 2 * fsPerUnit * 1e-12, "two units between rows");
    }

    /** Channel unit as written, encoding, volts per unit. */
    static Stream<Arguments> voltUnits() {
        return Stream.of(
                Arguments.of("V", StandardCharsets.UTF_8, 1.0),
                Arguments.of("mV", StandardCharsets.UTF_8, 1e-3),
                Arguments.of("uV", StandardCharsets.UTF_8, 1e-6),
                Arguments.of(MICRO_SIGN + "V", StandardCharsets.UTF_8, 1e-6),
                Arguments.of(MICRO_SIGN + "V", StandardCharsets.ISO_8859_1, 1e-6),
                Arguments.of(GREEK_MU + "V", StandardCharsets.UTF_8, 1e-6),
                Arguments.of("kV", StandardCharsets.UTF_8, 1e3));
    }

    @ParameterizedTest(name = "CH1 ({0}) in {1}")
    @MethodSource("voltUnits")
    void voltUnitsReadAtTheirScale(String unit, java.nio.charset.Charset cs, double voltsPerUnit) throws Exception {
        Path f = write("v.csv", "Time (s),CH1 (" + unit + ")\n0,250\n1e-9,-500\n", cs);
        Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString()));
        assertArrayEquals(new double[] {250 * voltsPerUnit, -500 * voltsPerUnit}, c.analog("CH1"), 1e-4 * voltsPerUnit, "float32 samples");
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("unknownUnits")
    void anUnknownUnitIsRefusedNamingTheColumn(String header, String words) throws Exception {
        Path f = write("u.csv", header + "\n0,1,2\n1e-9,1,2\n", StandardCharsets.UTF_8);
        CaptureFormatException e = assertThrows(CaptureFormatException.class,
                () -> Collected.run(new CsvSource(), Map.of("file", f.toString())));
        assertTrue(e.getMessage().startsWith("u.csv line 1: "), e.getMessage());
        assertTrue(e.getMessage().contains(words), e.getMessage());
        CaptureFormatException i = assertThrows(CaptureFormatException.class, () -> Inspector.inspect(f, Map.of()));
        assertEquals(e.getMessage(), i.getMessage());
    }

    static Stream<Arguments> unknownUnits() {
        return Stream.of(
                Arguments.of("Time (h),CH1 (V),CH2 (V)", "column 1 ('Time'): unknown time unit 'h'; expected s, ms, us"),
                Arguments.of("Time (s),CH1 (V),CH2 (A)", "column 3 ('CH2'): unknown unit 'A'; expected V, mV, uV"),
                Arguments.of("Time (s),CH1 (dBm),CH2 (V)", "column 2 ('CH1'): unknown unit 'dBm'"),
                Arguments.of("Time (s),CH1 (x\u0007y),CH2 (V)", "column 2 ('CH1'): unknown unit 'x\\x07y'"));
    }
}
