package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;

/**
 * The float32le converter spreads frames to the channels tile by tile and skips the double
 * arithmetic when gain is 1 and offset 0; every sample must still be {@code (float) (code * gain +
 * offset)} bit for bit (docs/capture-raw.md), with non-finite results marked invalid, for blocks
 * that cut the tiles anywhere.
 */
class Float32TilesTest {
    private static float code(SplittableRandom r) {
        return switch (r.nextInt(40)) {
            case 0 -> Float.NaN;
            case 1 -> -0.0f;
            case 2 -> Float.NEGATIVE_INFINITY;
            case 3 -> Float.MIN_VALUE * r.nextInt(1, 1000);
            case 4 -> Float.MAX_VALUE;
            default -> (float) (r.nextGaussian() * 2);
        };
    }

    @Test
    void everySampleIsTheFormulaBitForBit(@TempDir Path dir) throws Exception {
        SplittableRandom r = new SplittableRandom(1919);
        for (int channels : new int[] {1, 3, 8, 9}) {
            int frames = 3 * RawConverter.Float32.TILE_VALUES / channels + 77;
            float[][] codes = new float[channels][frames];
            ByteBuffer bb = ByteBuffer.allocate(frames * channels * 4).order(ByteOrder.LITTLE_ENDIAN);
            for (int i = 0; i < frames; i++) {
                for (int k = 0; k < channels; k++) {
                    codes[k][i] = code(r);
                    bb.putFloat(codes[k][i]);
                }
            }
            Path bin = dir.resolve("c" + channels + ".raw");
            Files.write(bin, bb.array());
            double[] gain = new double[channels];
            double[] offset = new double[channels];
            StringBuilder ch = new StringBuilder();
            for (int k = 0; k < channels; k++) {
                // every other channel with gain 1 and offset 0 (the direct path), the rest scaled
                gain[k] = k % 2 == 0 ? 1.0 : 0.37 * (k + 1);
                offset[k] = k % 2 == 0 ? 0.0 : -0.125 * k;
                ch.append(k == 0 ? "" : ", ").append("{\"name\": \"c").append(k).append("\"")
                        .append(k % 2 == 0 ? "" : ", \"gain\": " + gain[k] + ", \"offset\": " + offset[k]).append("}");
            }
            Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e9, \"format\": \"float32le\", \"channels\": [" + ch + "]}");
            for (int block : new int[] {1000, 8191, 65536}) {
                Collected c = Collected.run(new RawSource(), Map.of("file", bin.toString(), "blockSamples", block));
                for (int k = 0; k < channels; k++) {
                    List<AnalogBlock> bs = c.blocks("c" + k).stream().map(AnalogBlock.class::cast).toList();
                    int i = 0;
                    for (AnalogBlock b : bs) {
                        for (int s = 0; s < b.length(); s++, i++) {
                            float want = (float) (codes[k][i] * gain[k] + offset[k]);
                            boolean invalid = b.invalid() != null && BitSets.get(b.invalid(), s);
                            String at = channels + " channels, blocks of " + block + ", channel " + k + ", frame " + i;
                            assertEquals(!Float.isFinite(want), invalid, at);
                            if (Float.isFinite(want)) {
                                assertEquals(Float.floatToRawIntBits(want), Float.floatToRawIntBits(b.volts()[s]), at);
                            }
                        }
                    }
                    assertEquals(frames, i);
                }
            }
        }
    }
}
