package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.ExtendWith;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.Chain;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The read-ahead thread of the raw and packed-logic readers ({@link ReadAhead}) changes nothing a
 * receiver sees: over a seeded corpus every block (lent or not, poisoned after use or not) equals
 * the block of the plain path; an error met in the background surfaces from the same {@code next}
 * call, as the same exception; the thread runs only where it can help (more than one block, not
 * turned off) and is gone once the reader is closed, also after a stage downstream failed.
 */
@ExtendWith(PoisonAsBefore.class)
class ReadAheadTest {
    @AfterEach
    void restore() {
        System.clearProperty("lanesift.readAhead");
    }

    /** Live read-ahead threads of a file (the thread is named after it). */
    private static long aheadThreads(Path file) {
        String name = ReadAhead.THREAD_PREFIX + file.getFileName();
        return Thread.getAllStackTraces().keySet().stream().filter(t -> t.isAlive() && t.getName().equals(name)).count();
    }

    private static Path rawFile(Path dir, String name, SplittableRandom r, int channels, int frames) throws IOException {
        Path bin = dir.resolve(name);
        ByteBuffer bb = ByteBuffer.allocate(frames * channels * 4).order(ByteOrder.LITTLE_ENDIAN);
        for (int i = 0; i < frames * channels; i++) {
            int pick = r.nextInt(50);
            bb.putFloat(pick == 0 ? Float.NaN : pick == 1 ? Float.POSITIVE_INFINITY : (float) r.nextGaussian());
        }
        Files.write(bin, bb.array());
        StringBuilder ch = new StringBuilder();
        for (int k = 0; k < channels; k++) {
            ch.append(k == 0 ? "" : ", ").append("{\"name\": \"c").append(k).append("\", \"gain\": ").append(0.5 + k).append("}");
        }
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e9, \"format\": \"float32le\", \"channels\": [" + ch + "]}");
        return bin;
    }

    private static Path logicFile(Path dir, String name, SplittableRandom r, int samples) throws IOException {
        Path bin = dir.resolve(name);
        byte[] b = new byte[samples];
        for (int i = 0; i < samples; i++) {
            b[i] = (byte) r.nextInt(256);
        }
        Files.write(bin, b);
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 5e8, \"format\": \"logic8\", \"channels\": [{\"name\": \"a\", \"bit\": 1},"
                + " {\"name\": \"b\", \"bit\": 6}, {\"name\": \"c\", \"bit\": 7}]}");
        return bin;
    }

    /** Copies of every block a reader hands out, in order, and whether a read-ahead thread was seen while they arrived. */
    private record Read(List<Block> blocks, boolean threadSeen) {
    }

    private static Read readAll(CaptureReader r, Path file, boolean lend) throws IOException {
        List<Block> copies = new ArrayList<>();
        boolean[] seen = {false};
        boolean[] flags = new boolean[r.ports().size()];
        Arrays.fill(flags, lend);
        r.lend(flags);
        while (r.next((k, b) -> {
            if (copies.size() < 3 * flags.length) {
                // the thread starts at the first call if at all, and lives until close
                seen[0] |= aheadThreads(file) > 0;
            }
            if (b instanceof AnalogBlock a) {
                copies.add(new AnalogBlock(a.channel(), a.firstIndex(), a.startFs(), a.periodFs(), Arrays.copyOf(a.volts(), a.length()),
                        a.length(), a.invalid() == null ? null : a.invalid().clone()));
            } else {
                LogicBlock l = (LogicBlock) b;
                copies.add(new LogicBlock(l.channel(), l.firstIndex(), l.startFs(), l.periodFs(), l.bits().clone(), l.length(), null));
            }
        })) {
            // copied as they arrive
        }
        return new Read(copies, seen[0]);
    }

    private static void assertSameBlocks(List<Block> want, List<Block> got, String what) {
        assertEquals(want.size(), got.size(), what + ": blocks");
        for (int i = 0; i < want.size(); i++) {
            Block w = want.get(i);
            Block g = got.get(i);
            String at = what + ", block " + i;
            assertEquals(w.channel(), g.channel(), at);
            assertEquals(w.startFs(), g.startFs(), at);
            if (w instanceof AnalogBlock a) {
                AnalogBlock b = (AnalogBlock) g;
                assertEquals(a.firstIndex(), b.firstIndex(), at);
                assertEquals(a.length(), b.length(), at);
                int[] x = new int[a.length()];
                int[] y = new int[a.length()];
                for (int s = 0; s < x.length; s++) {
                    x[s] = Float.floatToRawIntBits(a.volts()[s]);
                    y[s] = Float.floatToRawIntBits(b.volts()[s]);
                }
                assertArrayEquals(x, y, at);
                assertArrayEquals(a.invalid(), b.invalid(), at + ": invalid mask");
            } else {
                LogicBlock a = (LogicBlock) w;
                LogicBlock b = (LogicBlock) g;
                assertEquals(a.firstIndex(), b.firstIndex(), at);
                assertEquals(a.length(), b.length(), at);
                assertArrayEquals(a.bits(), b.bits(), at);
            }
        }
    }

    @Test
    void everyBlockIsThatOfThePlainPath(@TempDir Path dir) throws Exception {
        SplittableRandom r = new SplittableRandom(0x19_0002L);
        int files = 0;
        for (int round = 0; round < 6; round++) {
            int channels = 1 + r.nextInt(9);
            int block = new int[] {1, 7, 64, 1000, 4097}[r.nextInt(5)];
            int frames = 1 + r.nextInt(20_000);
            Path raw = rawFile(dir, "corpus" + files++ + ".raw", r, channels, frames);
            RawSidecar sc = RawSidecar.read(Path.of(raw + ".json"));
            Path logic = logicFile(dir, "corpus" + files++ + ".la", r, frames);
            PackedLogicSidecar lsc = PackedLogicSidecar.read(Path.of(logic + ".json"));
            int logicBlock = 64 * (1 + r.nextInt(40));
            for (boolean lend : new boolean[] {false, true}) {
                for (boolean poison : new boolean[] {false, true}) {
                    BlockArrays.poison = poison;
                    String what = channels + " ch, " + frames + " frames, blocks of " + block + (lend ? ", lent" : "") + (poison ? ", poisoned" : "");
                    Read plain;
                    Read ahead;
                    try (RawReader p = new RawReader(raw, sc, block, false, 0, 0, false);
                         RawReader a = new RawReader(raw, sc, block, false, 0, 0, true)) {
                        plain = readAll(p, raw, lend);
                        ahead = readAll(a, raw, lend);
                    }
                    assertFalse(plain.threadSeen(), what);
                    assertEquals(frames > block, ahead.threadSeen(), what + ": read ahead exactly when there is more than one block");
                    assertSameBlocks(plain.blocks(), ahead.blocks(), "raw, " + what);
                    try (PackedLogicReader p = new PackedLogicReader(logic, lsc, logicBlock, false, false);
                         PackedLogicReader a = new PackedLogicReader(logic, lsc, logicBlock, false, true)) {
                        plain = readAll(p, logic, lend);
                        ahead = readAll(a, logic, lend);
                    }
                    assertEquals(frames > logicBlock, ahead.threadSeen(), what);
                    assertSameBlocks(plain.blocks(), ahead.blocks(), "packed logic, blocks of " + logicBlock + ", " + what);
                    assertEquals(0, aheadThreads(raw) + aheadThreads(logic), "no thread left after close");
                }
            }
        }
    }

    /** The exception a reader throws when its file is cut to {@code keepFrames} after it was opened, and the blocks it emitted first. */
    private record Failure(Exception thrown, int blocks) {
    }

    private static Failure shrinkAndRead(Path dir, String name, boolean ahead, boolean logic) throws Exception {
        SplittableRandom r = new SplittableRandom(5);
        Path f = logic ? logicFile(dir, name, r, 4 * 256) : rawFile(dir, name, r, 3, 4 * 256);
        int frameBytes = logic ? 1 : 12;
        CaptureReader rd = logic ? new PackedLogicReader(f, PackedLogicSidecar.read(Path.of(f + ".json")), 256, false, ahead)
                : new RawReader(f, RawSidecar.read(Path.of(f + ".json")), 256, false, 0, 0, ahead);
        try (rd; FileChannel ch = FileChannel.open(f, StandardOpenOption.WRITE)) {
            // the size was checked when the reader opened; now the file loses the end of its second block
            ch.truncate(256L * frameBytes + 100L * frameBytes);
            int[] blocks = {0};
            assertTrue(rd.next((k, b) -> blocks[0]++), "the first block is whole");
            if (ahead) {
                // wait until the thread has met the end of the file, so the error comes from there
                ReadAhead<?> spans = logic ? ((PackedLogicReader) rd).readAhead() : ((RawReader) rd).readAhead();
                long end = System.nanoTime() + 10_000_000_000L;
                while (!spans.readAheadDone() && System.nanoTime() < end) {
                    Thread.onSpinWait();
                }
                assertTrue(spans.readAheadDone(), "the thread read the second block");
            }
            Exception e = assertThrows(Exception.class, () -> {
                while (rd.next((k, b) -> blocks[0]++)) {
                    // until it fails
                }
            });
            return new Failure(e, blocks[0]);
        } finally {
            assertEquals(0, aheadThreads(f), "no thread left after close");
        }
    }

    @Test
    void anErrorInTheBackgroundIsThrownAsOnTheCallersThread(@TempDir Path dir) throws Exception {
        for (boolean logic : new boolean[] {false, true}) {
            Failure plain = shrinkAndRead(dir, "plain" + logic + ".bin", false, logic);
            Failure ahead = shrinkAndRead(dir, "ahead" + logic + ".bin", true, logic);
            assertTrue(plain.thrown() instanceof CaptureFormatException, plain.thrown()::toString);
            assertSame(plain.thrown().getClass(), ahead.thrown().getClass());
            assertEquals(plain.thrown().getMessage().replace("plain", "ahead"), ahead.thrown().getMessage());
            assertTrue(ahead.thrown().getMessage().contains("ahead" + logic + ".bin") && ahead.thrown().getMessage().contains("shrank"),
                    ahead.thrown().getMessage());
            assertEquals(plain.blocks(), ahead.blocks(), "the same blocks came before the error");
            assertEquals(logic ? 3 : 3, ahead.blocks(), "the first block of every channel");
        }
    }

    /** A sink that fails on its second block. */
    private static final class FailsOnSecond implements PluginProvider {
        @Override
        public PluginDescriptor descriptor() {
            return PluginDescriptor.builder("fails-on-second").input(PortSpec.of("in", DataKind.ANALOG, "anything")).readsLentBlocks().build();
        }

        @Override
        public Stage open(StageContext context) {
            return new Stage() {
                private int blocks;

                @Override
                public void accept(int input, Block block) {
                    if (++blocks == 2) {
                        throw new IllegalStateException("a stage downstream failed");
                    }
                }
            };
        }
    }

    @Test
    void theThreadEndsWithTheChainAlsoWhenAStageFails(@TempDir Path dir) throws Exception {
        Path f = rawFile(dir, "fails.raw", new SplittableRandom(8), 2, 10 * 512);
        PluginRegistry reg = new PluginRegistry().add(new RawSource()).add(new FailsOnSecond());
        Chain c = Chain.builder(reg).add("cap", "raw", Map.of("file", f.toString(), "blockSamples", 512)).add("s", "fails-on-second")
                .wire("cap.c0", "s").build();
        try (c) {
            RuntimeException e = assertThrows(RuntimeException.class, c::run);
            assertTrue(String.valueOf(e.getMessage()).contains("a stage downstream failed"), e::toString);
            assertEquals(1, aheadThreads(f), "the read-ahead was running");
        }
        assertEquals(0, aheadThreads(f), "closing the chain ended the thread");
    }

    @Test
    void offForOneBlockAndWhenTurnedOff(@TempDir Path dir) throws Exception {
        SplittableRandom r = new SplittableRandom(3);
        Path f = rawFile(dir, "off.raw", r, 2, 3000);
        RawSidecar sc = RawSidecar.read(Path.of(f + ".json"));
        try (RawReader one = new RawReader(f, sc, 3000, false, 0, 0, true)) {
            assertFalse(readAll(one, f, true).threadSeen(), "one block: nothing to overlap");
        }
        try (RawReader window = new RawReader(f, sc, 1000, false, 500, 1000, true)) {
            assertFalse(readAll(window, f, true).threadSeen(), "a window of one block");
        }
        try (RawReader two = new RawReader(f, sc, 1000, false, 500, 1001, true)) {
            assertTrue(readAll(two, f, true).threadSeen(), "a window of two blocks");
        }
        Path logic = logicFile(dir, "off.la", r, 3000);
        List<Boolean> seen = new ArrayList<>();
        PluginProvider probe = new PluginProvider() {
            @Override
            public PluginDescriptor descriptor() {
                return PluginDescriptor.builder("probe").input(PortSpec.of("in", DataKind.ANY, "anything")).build();
            }

            @Override
            public Stage open(StageContext context) {
                return new Stage() {
                    @Override
                    public void accept(int input, Block block) {
                        seen.add(aheadThreads(f) + aheadThreads(logic) > 0);
                    }
                };
            }
        };
        PluginRegistry reg = new PluginRegistry().add(new RawSource()).add(new PackedLogicSource()).add(probe);
        for (String how : new String[] {"on", "option", "property"}) {
            seen.clear();
            if (how.equals("property")) {
                System.setProperty("lanesift.readAhead", "false");
            }
            for (String src : new String[] {"raw", "packed-logic"}) {
                Map<String, Object> o = new java.util.HashMap<>(Map.of("file", (src.equals("raw") ? f : logic).toString(), "blockSamples", 512));
                if (how.equals("option")) {
                    o.put("readAhead", false);
                }
                try (Chain c = Chain.builder(reg).add("cap", src, o).add("p", "probe").wire(src.equals("raw") ? "cap.c1" : "cap.b", "p").build()) {
                    c.run();
                }
            }
            assertEquals(how.equals("on"), seen.contains(true), "read-ahead " + how);
        }
    }
}
