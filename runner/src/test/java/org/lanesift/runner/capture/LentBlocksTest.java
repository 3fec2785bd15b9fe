package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotSame;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.ExtendWith;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.Chain;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.testkit.BlockKeeper;

/**
 * The ownership rule of lent blocks (host-api {@code Block}, "Ownership") as the raw and
 * packed-logic sources apply it: blocks are lent only to receivers that declared
 * {@code readsLentBlocks}, never to a tap or host sink, and a receiver that declared it but keeps
 * a block sees that block poisoned: the test mode that makes such a stage fail its own tests.
 */
@ExtendWith(PoisonAsBefore.class)
class LentBlocksTest {
    private static Path rawCapture(Path dir, int frames) throws Exception {
        Path bin = dir.resolve("legs.raw");
        ByteBuffer bb = ByteBuffer.allocate(frames * 2 * 4).order(ByteOrder.LITTLE_ENDIAN);
        for (int i = 0; i < frames; i++) {
            bb.putFloat((float) Math.sin(i * 0.1)).putFloat((float) -Math.sin(i * 0.1));
        }
        Files.write(bin, bb.array());
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e9, \"format\": \"float32le\", \"channels\": [{\"name\": \"p\"}, {\"name\": \"n\"}]}");
        return bin;
    }

    private static Chain chain(Path bin, BlockKeeper a, BlockKeeper b, List<Block> tapped) {
        PluginRegistry reg = new PluginRegistry().add(new RawSource()).add(a).add(b);
        var cb = Chain.builder(reg).add("cap", "raw", Map.of("file", bin.toString(), "blockSamples", 256))
                .add("a", a.descriptor().id()).add("b", b.descriptor().id()).wire("cap.p", "a").wire("cap.n", "b");
        if (tapped != null) {
            cb.tap("cap.n", tapped::add);
        }
        return cb.build();
    }

    @Test
    void aKeeperThatDeclaredItReadsLentBlocksSeesThemPoisoned(@TempDir Path dir) throws Exception {
        BlockArrays.poison = true;
        BlockKeeper liar = new BlockKeeper("keeps-lent", DataKind.ANALOG, true);
        BlockKeeper honest = new BlockKeeper("keeps-own", DataKind.ANALOG, false);
        // 5 full blocks of 256 frames and a short one
        try (Chain c = chain(rawCapture(dir, 5 * 256 + 100), liar, honest, null)) {
            c.run();
        }
        assertEquals(6, liar.kept().size());
        assertEquals(5, liar.changed(), "every full block lent to a stage that kept it was recycled under it");
        AnalogBlock first = (AnalogBlock) liar.kept().get(0);
        AnalogBlock third = (AnalogBlock) liar.kept().get(2);
        assertSame(first.volts(), third.volts(), "two sets of arrays are used in turn");
        assertNotSame(first.volts(), ((AnalogBlock) liar.kept().get(1)).volts());
        assertEquals(0, honest.changed(), "a stage that did not declare it gets blocks of its own to keep");
        assertEquals(0, ((AnalogBlock) honest.kept().get(0)).volts()[0], 0);
    }

    @Test
    void withoutPoisonAKeptLentBlockStillChangesTwoSpansLater(@TempDir Path dir) throws Exception {
        BlockArrays.poison = false;
        BlockKeeper liar = new BlockKeeper("keeps-lent", DataKind.ANALOG, true);
        BlockKeeper honest = new BlockKeeper("keeps-own", DataKind.ANALOG, false);
        try (Chain c = chain(rawCapture(dir, 4 * 256), liar, honest, null)) {
            c.run();
        }
        assertEquals(2, liar.changed(), "blocks 0 and 1 were overwritten by blocks 2 and 3");
        assertEquals(0, honest.changed());
    }

    @Test
    void anOutputWithATapIsNotLent(@TempDir Path dir) throws Exception {
        BlockArrays.poison = true;
        BlockKeeper liar = new BlockKeeper("keeps-lent", DataKind.ANALOG, true);
        BlockKeeper liar2 = new BlockKeeper("keeps-lent2", DataKind.ANALOG, true);
        List<Block> tapped = new ArrayList<>();
        try (Chain c = chain(rawCapture(dir, 3 * 256), liar, liar2, tapped)) {
            c.run();
        }
        assertEquals(0, liar2.changed(), "a host tap may keep blocks, so output n is not lent");
        assertEquals(3, tapped.size());
        float[] want = new float[256];
        for (int i = 0; i < 256; i++) {
            want[i] = (float) ((float) -Math.sin(i * 0.1) * 1.0 + 0.0); // volts = code * gain + offset: -0 becomes +0
        }
        assertArrayEquals(want, ((AnalogBlock) tapped.get(0)).volts());
        assertTrue(liar.changed() > 0, "output p has no tap and is lent");
    }

    @Test
    void packedLogicLendsTheSameWay(@TempDir Path dir) throws Exception {
        BlockArrays.poison = true;
        Path bin = dir.resolve("la.bin");
        byte[] words = new byte[4 * 128];
        for (int i = 0; i < words.length; i++) {
            words[i] = (byte) (i * 37 + (i >> 3));
        }
        Files.write(bin, words);
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 5e8, \"format\": \"logic8\", \"channels\": [{\"name\": \"clk\", \"bit\": 5},"
                + " {\"name\": \"d0\", \"bit\": 0}]}");
        BlockKeeper liar = new BlockKeeper("keeps-lent", DataKind.LOGIC, true);
        BlockKeeper honest = new BlockKeeper("keeps-own", DataKind.LOGIC, false);
        PluginRegistry reg = new PluginRegistry().add(new PackedLogicSource()).add(liar).add(honest);
        try (Chain c = Chain.builder(reg).add("cap", "packed-logic", Map.of("file", bin.toString(), "blockSamples", 128))
                .add("a", "keeps-lent").add("b", "keeps-own").wire("cap.clk", "a").wire("cap.d0", "b").build()) {
            c.run();
        }
        assertEquals(4, liar.kept().size());
        assertEquals(4, liar.changed());
        assertEquals(0, honest.changed());
        assertFalse(liar.kept().get(0) == honest.kept().get(0));
    }
}
