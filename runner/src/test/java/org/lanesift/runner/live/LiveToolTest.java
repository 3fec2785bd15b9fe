package org.lanesift.runner.live;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class LiveToolTest {
    @TempDir
    Path tmp;

    @Test
    void findsTheSpoolNodesOfAChain() throws Exception {
        Path c = tmp.resolve("c.json");
        Files.writeString(c, "{\"nodes\":[{\"id\":\"cap\",\"plugin\":\"spool\"},{\"id\":\"x\",\"plugin\":\"differential\"}]}");
        assertEquals(List.of("cap"), LiveTool.spoolNodes(c));
    }

    @Test
    void aChainWithoutASpoolNodeIsNamedInTheError() throws Exception {
        Path c = tmp.resolve("c.json");
        Files.writeString(c, "{\"nodes\":[{\"id\":\"x\",\"plugin\":\"csv\"}]}");
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> LiveTool.spoolNodes(c));
        assertTrue(e.getMessage().contains("c.json /nodes: no node with plugin 'spool'"), e.getMessage());
        Path bad = tmp.resolve("bad.json");
        Files.writeString(bad, "{\"nodes\":[");
        assertTrue(assertThrows(IllegalArgumentException.class, () -> LiveTool.spoolNodes(bad)).getMessage().contains("not valid JSON"));
    }
}
