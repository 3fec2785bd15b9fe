package org.lanesift.plugins.pixellink;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.testkit.ExternalTool;
import org.lanesift.testkit.StageHarness;

/**
 * The timing node and C header beside the timing JSON. Outside checks: the devicetree source is
 * compiled by {@code dtc} (Debian {@code device-tree-compiler}) and the blob decompiled again, so
 * the values come back through dtc's own parser; property names and the polarity convention
 * (1 = active high) follow the devicetree binding for display timings (from memory;
 * docs/reference-facts.md "Devicetree panel timing"). The header is compiled with
 * {@code gcc -Wall -Werror} into a program that prints its macros. Both must equal the JSON.
 */
class PanelTimingExportTest {
    // a small timing with both syncs, HS active high and VS active low (invented, not a standard mode)
    static final TestLink.Video SMALL = new TestLink.Video(40, 3, 5, 7, 12, 2, 3, 4, true, false, true);

    private static StageHarness decode(TestLink.Video v) {
        Capture c = new Capture(v);
        long frame = (long) v.hTotal() * v.vTotal();
        c.periodFs = 1e15 / 10e6;
        c.firstPixel = 5L * v.hTotal() + 3;
        c.pixels = 3 * frame;
        c.options = new java.util.HashMap<>(Map.of("pictures", "none", "detail", "frames"));
        return c.run();
    }

    @Test
    void timingNodeCompilesWithDtcAndCarriesTheMeasuredValues(@TempDir Path dir) throws Exception {
        Path dtc = ExternalTool.require("dtc");
        try (StageHarness h = decode(SMALL)) {
            Report r = Report.of(h);
            Files.writeString(dir.resolve("t.dts"), Report.text(h, "dut-timing.dts"));
            run(dir, List.of(dtc.toString(), "-q", "-I", "dts", "-O", "dtb", "-o", "t.dtb", "t.dts"));
            run(dir, List.of(dtc.toString(), "-q", "-I", "dtb", "-O", "dts", "-o", "back.dts", "t.dtb"));
            Map<String, Long> p = cells(Files.readString(dir.resolve("back.dts")));
            assertEquals(r.num("pixelClockHz/value"), p.get("clock-frequency"));
            assertEquals(10_000_000L, p.get("clock-frequency"));
            assertEquals(r.num("horizontal/active/value"), p.get("hactive"));
            assertEquals(40L, p.get("hactive"));
            assertEquals(r.num("horizontal/frontPorch/value"), p.get("hfront-porch"));
            assertEquals(r.num("horizontal/syncWidth/value"), p.get("hsync-len"));
            assertEquals(r.num("horizontal/backPorch/value"), p.get("hback-porch"));
            assertEquals(r.num("vertical/active/value"), p.get("vactive"));
            assertEquals(r.num("vertical/frontPorch/value"), p.get("vfront-porch"));
            assertEquals(r.num("vertical/syncWidth/value"), p.get("vsync-len"));
            assertEquals(r.num("vertical/backPorch/value"), p.get("vback-porch"));
            assertEquals(List.of(3L, 5L, 7L, 2L, 3L, 4L), List.of(p.get("hfront-porch"), p.get("hsync-len"), p.get("hback-porch"),
                    p.get("vfront-porch"), p.get("vsync-len"), p.get("vback-porch")));
            // binding convention: 1 = active high
            assertEquals("positive", r.str("horizontal/syncPolarity"));
            assertEquals(1L, p.get("hsync-active"));
            assertEquals("negative", r.str("vertical/syncPolarity"));
            assertEquals(0L, p.get("vsync-active"));
            assertEquals(1L, p.get("de-active"));
            assertTrue(p.containsKey("native-mode"), "native-mode phandle: " + p);
        }
    }

    @Test
    void cHeaderCompilesWithGccAndHoldsTheSameValues(@TempDir Path dir) throws Exception {
        Path gcc = ExternalTool.require("gcc");
        try (StageHarness h = decode(SMALL)) {
            Report r = Report.of(h);
            Files.writeString(dir.resolve("dut-timing.h"), Report.text(h, "dut-timing.h"));
            Files.writeString(dir.resolve("main.c"), "#include <stdio.h>\n#include \"dut-timing.h\"\n#include \"dut-timing.h\"\n"
                    + "int main(void) {\n"
                    + "  printf(\"%lu %d %d %d %d %d %d %d %d %d %d %d %d %d\\n\", DUT_PIXEL_CLOCK_HZ, DUT_H_ACTIVE, DUT_H_FRONT_PORCH,"
                    + " DUT_H_SYNC_LEN, DUT_H_BACK_PORCH, DUT_H_TOTAL, DUT_V_ACTIVE, DUT_V_FRONT_PORCH, DUT_V_SYNC_LEN,"
                    + " DUT_V_BACK_PORCH, DUT_V_TOTAL, DUT_HSYNC_ACTIVE, DUT_VSYNC_ACTIVE, DUT_DE_ACTIVE);\n  return 0;\n}\n");
            run(dir, List.of(gcc.toString(), "-std=c99", "-Wall", "-Wextra", "-Werror", "-o", "main", "main.c"));
            String out = run(dir, List.of(dir.resolve("main").toString())).trim();
            String want = String.join(" ", List.of(String.valueOf(r.num("pixelClockHz/value")), "40", "3", "5", "7",
                    String.valueOf(r.num("horizontal/total/value")), "12", "2", "3", "4", String.valueOf(r.num("vertical/total/value")),
                    "1", "0", "1"));
            assertEquals(want, out);
        }
    }

    @Test
    void deOnlyPanelWritesTheBlankingAsBackPorchAndSaysSo() {
        TestLink.Video deOnly = new TestLink.Video(40, 3, 5, 7, 12, 2, 3, 4, true, true, false);
        try (StageHarness h = decode(deOnly)) {
            String dts = Report.text(h, "dut-timing.dts");
            Map<String, Long> p = cells(dts);
            assertEquals(15L, p.get("hback-porch"), dts);
            assertEquals(0L, p.get("hsync-len"));
            assertFalse(p.containsKey("hsync-active"), dts);
            assertTrue(dts.contains("No HS pulses in the capture"), dts);
        }
    }

    @Test
    void nothingMeasuredWritesNoTimingNode() {
        Capture c = new Capture(SMALL);
        c.periodFs = 1e8;
        c.firstPixel = 0;
        c.pixels = 20; // less than one line
        try (StageHarness h = c.run()) {
            assertTrue(h.outputs("files").stream().noneMatch(a -> ((org.lanesift.data.Artifact) a).fileName().endsWith(".dts")));
        }
    }

    /** Property name to its single cell value, from dtc's decompiled output ({@code name = <0x..>;}). */
    static Map<String, Long> cells(String dts) {
        Map<String, Long> m = new LinkedHashMap<>();
        Matcher x = Pattern.compile("([a-z-]+) = <(0x[0-9a-fA-F]+|\\d+)>;").matcher(dts);
        while (x.find()) {
            m.put(x.group(1), Long.decode(x.group(2)));
        }
        return m;
    }

    static String run(Path dir, List<String> cmd) throws Exception {
        return ExternalTool.run(dir, Duration.ofSeconds(60), cmd);
    }
}
