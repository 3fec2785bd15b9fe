package org.lanesift.plugin;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Map;
import org.junit.jupiter.api.Test;

class SegmentSupportTest {
    @Test
    void aPluginThatDeclaresNothingCannotRunInSegments() {
        OptionValues v = OptionValues.validate(OptionsTest.D, Map.of("file", "x.csv"));
        SegmentSupport s = OptionsTest.D.segmentSupport(v);
        assertFalse(s.supported());
        assertTrue(s.blocker().contains("'rx'"), s.blocker());
    }

    @Test
    void supportMayDependOnTheOptions() {
        PluginDescriptor d = PluginDescriptor.builder("shift")
                .option(OptionSpec.bool("learn", false, "learn from the whole capture"))
                .segments(o -> o.getBoolean("learn") ? SegmentSupport.no("learns from the whole capture; set learn=false")
                        : SegmentSupport.after(64, 250_000))
                .build();
        SegmentSupport yes = d.segmentSupport(OptionValues.validate(d, Map.of()));
        assertTrue(yes.supported());
        assertEquals(64 * 400_000L + 250_000L, yes.warmupFs(400_000.0));
        SegmentSupport no = d.segmentSupport(OptionValues.validate(d, Map.of("learn", true)));
        assertFalse(no.supported());
        assertTrue(no.blocker().contains("learn=false"));
    }

    @Test
    void negativeWarmUpsAndBlankReasonsAreRefused() {
        assertThrows(IllegalArgumentException.class, () -> SegmentSupport.after(-1, 0));
        assertThrows(IllegalArgumentException.class, () -> SegmentSupport.no(" "));
    }
}
