package org.lanesift.runner.link;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.lanesift.plugin.OptionException;

/** The outputs field sift writes into its chain: what was asked, plus the artifacts and annotations its report reads. */
class SiftOutputsTest {
    @Test
    void theArtifactsAreAlwaysKept() {
        assertEquals(List.of("standard"), SiftTool.outputs("standard"));
        assertEquals(List.of("binary", "annotations", "artifacts"), SiftTool.outputs("binary, annotations"));
        assertEquals(List.of("vcd", "artifacts", "annotations"), SiftTool.outputs("vcd"));
        assertEquals(List.of("artifacts", "annotations"), SiftTool.outputs("none"));
        assertEquals(List.of("by-products"), SiftTool.outputs("by-products"), "no form given: the standard forms, artifacts included");
    }

    @Test
    void unknownNamesAndSingleOutputsAreRefused() {
        OptionException e = assertThrows(OptionException.class, () -> SiftTool.outputs("vcd,panel.frames"));
        assertTrue(e.getMessage().contains("unknown output name 'panel.frames'; expected one or more of: none, standard"), e.getMessage());
        e = assertThrows(OptionException.class, () -> SiftTool.outputs("none,csv"));
        assertTrue(e.getMessage().contains("'none' cannot be combined"), e.getMessage());
    }
}
