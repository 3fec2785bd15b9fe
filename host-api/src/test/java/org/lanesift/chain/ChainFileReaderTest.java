package org.lanesift.chain;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The chain file's shape, and where its errors point. */
class ChainFileReaderTest {
    @TempDir
    Path tmp;

    ChainFile read(String json) throws Exception {
        Path f = tmp.resolve("sub/c.json");
        Files.createDirectories(f.getParent());
        Files.writeString(f, json);
        return new ChainFileReader().read(f, "c.json");
    }

    @Test
    void readsNodesWiresOptionsAndResolvesRelativeFiles() throws Exception {
        ChainFile cf = read("""
                {"description": "two", "nodes": [
                  {"id": "cap", "plugin": "csv", "options": {"file": "x.csv", "rateHz": 2.5e9, "lanes": 4, "on": true, "list": [1, 2.5]}},
                  {"id": "abs", "plugin": "csv", "options": {"file": "/data/y.csv"}}],
                 "wires": [{"from": "cap.CH1", "to": "abs"}]}
                """);
        ChainSpec s = cf.spec();
        assertEquals("two", cf.description());
        assertEquals(2, s.nodes().size());
        ChainSpec.Node cap = s.nodes().get(0);
        assertEquals(tmp.resolve("sub/x.csv").toString(), cap.options().get("file"));
        assertEquals(2.5e9, cap.options().get("rateHz"));
        assertEquals(4L, cap.options().get("lanes"));
        assertEquals(true, cap.options().get("on"));
        assertEquals(List.of(1L, 2.5), cap.options().get("list"));
        assertEquals("/data/y.csv", s.nodes().get(1).options().get("file"));
        assertEquals(new ChainSpec.Wire("cap.CH1", "abs"), s.wires().get(0));
    }

    /** Every option naming a file resolves like 'file' does (issue 16): a skew table next to the chain is found from any directory. */
    @Test
    void everyFileOptionResolvesAgainstTheChainFolder() throws Exception {
        ChainFile cf = read("""
                {"nodes": [
                  {"id": "raw", "plugin": "raw", "options": {"file": "../cap.bin", "sidecar": "cap.json"}},
                  {"id": "fix", "plugin": "deskew", "options": {"offsetsFile": "skew/t.json", "name": "not/a/path"}},
                  {"id": "pix", "plugin": "pixel-link", "options": {"mappingFile": "m.json", "mapping": "bits-18"}},
                  {"id": "eye", "plugin": "eye-diagram", "options": {"maskFile": "/masks/a.txt"}},
                  {"id": "sp", "plugin": "spool", "options": {"dir": "spool"}}]}
                """);
        List<ChainSpec.Node> n = cf.spec().nodes();
        assertEquals(tmp.resolve("cap.bin").toString(), n.get(0).options().get("file"));
        assertEquals(tmp.resolve("sub/cap.json").toString(), n.get(0).options().get("sidecar"));
        assertEquals(tmp.resolve("sub/skew/t.json").toString(), n.get(1).options().get("offsetsFile"));
        assertEquals("not/a/path", n.get(1).options().get("name"));
        assertEquals(tmp.resolve("sub/m.json").toString(), n.get(2).options().get("mappingFile"));
        assertEquals("bits-18", n.get(2).options().get("mapping"));
        assertEquals("/masks/a.txt", n.get(3).options().get("maskFile"));
        assertEquals(tmp.resolve("sub/spool").toString(), n.get(4).options().get("dir"));
    }

    @Test
    void wiresAreOptional() throws Exception {
        assertEquals(0, read("{\"nodes\": [{\"id\": \"a\", \"plugin\": \"p\"}]}").spec().wires().size());
    }

    @Test
    void errorsPointIntoTheFile() {
        ChainFileException e = assertThrows(ChainFileException.class,
                () -> read("{\"nodes\": [{\"id\": \"a\", \"plugin\": \"p\"}], \"wires\": [{\"from\": \"a.x\", \"to\": \"a.y\", \"via\": 1}]}"));
        assertEquals("/wires/0/via", e.pointer());
        assertTrue(e.getMessage().startsWith("c.json /wires/0/via: unknown key 'via'; expected one of: from, to"), e.getMessage());
        ChainFileException syntax = assertThrows(ChainFileException.class, () -> read("{\n\"nodes\": [\n}"));
        assertEquals(3, syntax.line());
        assertEquals("c.json line 3 column 1 at /nodes/0: expected a value, found '}'", syntax.getMessage());
        assertEquals("/nodes/0", syntax.pointer());
        ChainFileException slash = assertThrows(ChainFileException.class,
                () -> read("{\"nodes\": [{\"id\": \"a\", \"plugin\": \"p\", \"options\": {\"a/b\": null}}]}"));
        assertEquals("/nodes/0/options/a~1b", slash.pointer(), "RFC 6901 escaping");
        ChainFileException empty = assertThrows(ChainFileException.class, () -> read("{\"nodes\": []}"));
        assertEquals("/nodes", empty.pointer());
    }

    @Test
    void aLongCycleIsFoundAndNamed() {
        ChainFileException e = assertThrows(ChainFileException.class, () -> read("""
                {"nodes": [{"id": "a", "plugin": "p"}, {"id": "b", "plugin": "p"}, {"id": "c", "plugin": "p"}, {"id": "d", "plugin": "p"}],
                 "wires": [{"from": "d", "to": "a"}, {"from": "a", "to": "b"}, {"from": "b", "to": "c"}, {"from": "c", "to": "a"}]}
                """));
        assertEquals("/wires/3", e.pointer());
        assertTrue(e.getMessage().contains("a -> b -> c -> a"), e.getMessage());
    }

    @Test
    void aTooLargeFileIsRefusedWithoutReadingIt() throws Exception {
        Path f = tmp.resolve("big.json");
        try (var ch = java.nio.channels.FileChannel.open(f, java.nio.file.StandardOpenOption.CREATE_NEW, java.nio.file.StandardOpenOption.WRITE)) {
            ch.position(org.lanesift.json.JsonReader.DEFAULT_MAX_BYTES + 10);
            ch.write(java.nio.ByteBuffer.wrap(new byte[] {' '}));
        }
        ChainFileException e = assertThrows(ChainFileException.class, () -> new ChainFileReader().read(f, "big.json"));
        assertTrue(e.getMessage().contains("at most " + org.lanesift.json.JsonReader.DEFAULT_MAX_BYTES + " bytes"), e.getMessage());
    }
}
