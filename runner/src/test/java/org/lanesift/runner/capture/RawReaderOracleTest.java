package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.ExtendWith;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.AnalogBlock;

/**
 * The bulk raw reader gives bit for bit the samples and invalid marks of the per-sample reader it
 * replaced ({@link PerSampleRawOracle}), over a seeded corpus: every format and byte order, one to
 * nine channels, gains and offsets from the smallest to the largest the sidecar allows (negative
 * too), clipped end codes with and without markClipped, NaN, infinities, -0, subnormal and
 * overflowing float codes, block sizes from 1 frame up, read chunks of odd sizes, windows, and
 * with its blocks lent (and poisoned after use) or not, read ahead on a second thread or not.
 */
@ExtendWith(PoisonAsBefore.class)
class RawReaderOracleTest {
    private static final RawSidecar.Format[] FORMATS = RawSidecar.Format.values();

    /** Read chunk sizes: the reader's own, and odd ones that cut frames and tiles anywhere. */
    private static final int[] CHUNK_BYTES = {RawReader.READ_BYTES, 1, 37, 1000, 4099, 65_531};

    @Test
    void seededCorpusMatchesThePerSampleReader(@TempDir Path dir) throws Exception {
        Random rnd = new Random(0x5eed_0019L);
        int cases = 0;
        for (int round = 0; round < 12; round++) {
            for (RawSidecar.Format format : FORMATS) {
                checkCase(dir, rnd, format, "c" + cases++);
            }
        }
        assertEquals(12 * FORMATS.length, cases);
    }

    private static void checkCase(Path dir, Random rnd, RawSidecar.Format format, String name) throws Exception {
        int nch = 1 + rnd.nextInt(9);
        int frames = rnd.nextInt(4) == 0 ? 64 * (1 + rnd.nextInt(40)) : rnd.nextInt(3000);
        Path bin = dir.resolve(name + ".raw");
        Files.write(bin, corpus(rnd, format, nch, frames));
        StringBuilder json = new StringBuilder("{\"rateHz\": 2.5e9, \"format\": \"" + format.text + "\", \"startTimeS\": "
                + (rnd.nextBoolean() ? "0" : "-3.2e-7") + ", \"markClipped\": " + rnd.nextBoolean() + ", \"channels\": [");
        for (int k = 0; k < nch; k++) {
            json.append(k == 0 ? "" : ", ").append(String.format(Locale.ROOT, "{\"name\": \"ch%d\", \"gain\": %s, \"offset\": %s}", k,
                    gain(rnd, format), offset(rnd)));
        }
        Files.writeString(Path.of(bin + ".json"), json.append("]}").toString());
        RawSidecar sc = RawSidecar.read(Path.of(bin + ".json"));
        byte[] bytes = Files.readAllBytes(bin);
        int[] blockChoices = {1, 7, 64, 65, 1000, 2049, 65536};
        for (int pass = 0; pass < 3; pass++) {
            int block = blockChoices[rnd.nextInt(blockChoices.length)];
            long first = frames == 0 || rnd.nextBoolean() ? 0 : rnd.nextInt(frames);
            long count = rnd.nextBoolean() ? 0 : rnd.nextInt(frames + 2);
            boolean lend = rnd.nextBoolean();
            boolean ahead = rnd.nextBoolean();
            BlockArrays.poison = lend && rnd.nextBoolean();
            int readBytes = CHUNK_BYTES[rnd.nextInt(CHUNK_BYTES.length)];
            String what = name + " (" + format.text + ", " + nch + " ch, " + frames + " frames, block " + block + ", first " + first
                    + ", count " + count + ", chunks of " + readBytes + " bytes" + (lend ? ", lent" : "")
                    + (BlockArrays.poison ? ", poisoned" : "") + (ahead ? ", read ahead" : "") + ")";
            compare(bin, sc, bytes, block, first, count, lend, ahead, readBytes, what);
        }
    }

    /** Reads through the bulk reader, copying each block as it arrives, and compares it with the oracle's conversion of the same frames. */
    private static void compare(Path bin, RawSidecar sc, byte[] bytes, int block, long first, long count, boolean lend, boolean ahead,
            int readBytes, String what) throws Exception {
        int nch = sc.names.length;
        List<AnalogBlock> copies = new ArrayList<>();
        try (RawReader r = new RawReader(bin, sc, block, false, first, count, ahead, readBytes, "")) {
            boolean[] flags = new boolean[nch];
            java.util.Arrays.fill(flags, lend);
            r.lend(flags);
            while (r.next((k, b) -> {
                AnalogBlock a = (AnalogBlock) b;
                copies.add(new AnalogBlock(a.channel(), a.firstIndex(), a.startFs(), a.periodFs(), a.volts().clone(), a.length(),
                        a.invalid() == null ? null : a.invalid().clone()));
            })) {
                // each span is copied as it arrives
            }
        }
        long frames = bytes.length / sc.frameBytes();
        long end = count == 0 || count >= frames - first ? frames : first + count;
        long pos = first;
        int i = 0;
        while (pos < end) {
            int n = (int) Math.min(Math.min(block, CsvReader.MAX_SPAN_VALUES / nch), end - pos);
            PerSampleRawOracle.Result want = PerSampleRawOracle.convert(sc, bytes, pos, n);
            for (int k = 0; k < nch; k++) {
                AnalogBlock got = copies.get(i++);
                String at = what + ": channel " + k + ", block at frame " + pos;
                assertEquals(sc.names[k], got.channel(), at);
                assertEquals(pos, got.firstIndex(), at);
                assertEquals(n, got.length(), at);
                assertEquals(n, got.volts().length, at + ": the array is as long as the block");
                assertArrayEquals(bits(want.volts()[k]), bits(java.util.Arrays.copyOf(got.volts(), n)), at);
                assertArrayEquals(want.invalid()[k], got.invalid(), at + ": invalid mask");
            }
            pos += n;
        }
        assertEquals(copies.size(), i, what + ": no extra blocks");
    }

    private static int[] bits(float[] v) {
        int[] b = new int[v.length];
        for (int i = 0; i < v.length; i++) {
            b[i] = Float.floatToRawIntBits(v[i]);
        }
        return b;
    }

    static byte[] corpus(Random rnd, RawSidecar.Format format, int nch, int frames) {
        int values = frames * nch;
        ByteBuffer bb = ByteBuffer.allocate(values * format.bytes)
                .order(format == RawSidecar.Format.INT16BE ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN);
        for (int i = 0; i < values; i++) {
            int pick = rnd.nextInt(20);
            switch (format) {
                case UINT8, INT8 -> bb.put((byte) (pick == 0 ? 0 : pick == 1 ? 255 : pick == 2 ? 127 : pick == 3 ? 128 : rnd.nextInt(256)));
                case INT16LE, INT16BE -> bb.putShort((short) (pick == 0 ? Short.MIN_VALUE : pick == 1 ? Short.MAX_VALUE
                        : pick == 2 ? 0 : rnd.nextInt(65536)));
                default -> bb.putFloat(floatCode(rnd, pick));
            }
        }
        return bb.array();
    }

    private static float floatCode(Random rnd, int pick) {
        return switch (pick) {
            case 0 -> Float.NaN;
            case 1 -> Float.intBitsToFloat(0x7fc0_0000 | rnd.nextInt(0x40_0000)); // other NaN payloads
            case 2 -> rnd.nextBoolean() ? Float.POSITIVE_INFINITY : Float.NEGATIVE_INFINITY;
            case 3 -> -0.0f;
            case 4 -> Float.MIN_VALUE * rnd.nextInt(1000); // subnormal
            case 5 -> Float.MAX_VALUE * (rnd.nextFloat() - 0.5f); // overflows with a gain above 1
            case 6 -> Float.intBitsToFloat(rnd.nextInt()); // any bit pattern
            default -> (float) (rnd.nextGaussian() * 0.4);
        };
    }

    static String gain(Random rnd, RawSidecar.Format format) {
        double maxCode = format == RawSidecar.Format.FLOAT32LE ? 1 : 32768;
        double[] choices = {1, -1, 1e-4, -2.7e-5, 3.3e-3 * rnd.nextDouble() + 1e-9, 1.5e-30, 0.9e30 / maxCode, -0.9e30 / maxCode, 2.0};
        return Double.toString(choices[rnd.nextInt(choices.length)]);
    }

    static String offset(Random rnd) {
        double[] choices = {0, -1.2, 1.25, 1e29, -1e-3 * rnd.nextDouble()};
        return Double.toString(choices[rnd.nextInt(choices.length)]);
    }

    @Test
    void corpusReachesEveryInvalidCase(@TempDir Path dir) throws Exception {
        // the corpus is only worth something if it makes invalid marks in every format
        Random rnd = new Random(7);
        for (RawSidecar.Format format : FORMATS) {
            Path bin = dir.resolve(format.text + ".raw");
            Files.write(bin, corpus(rnd, format, 2, 500));
            Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e6, \"format\": \"" + format.text
                    + "\", \"channels\": [{\"name\": \"a\"}, {\"name\": \"b\", \"gain\": -2}]}");
            RawSidecar sc = RawSidecar.read(Path.of(bin + ".json"));
            PerSampleRawOracle.Result want = PerSampleRawOracle.convert(sc, Files.readAllBytes(bin), 0, 500);
            assertTrue(want.invalid()[0] != null && want.invalid()[1] != null, format.text + ": the corpus has invalid samples");
            compare(bin, sc, Files.readAllBytes(bin), 64, 0, 0, true, true, RawReader.READ_BYTES, format.text);
        }
    }
}
