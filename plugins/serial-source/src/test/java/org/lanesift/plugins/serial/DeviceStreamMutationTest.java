package org.lanesift.plugins.serial;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.SeededMutations;

/**
 * The short fuzzing session of plain {@code mvn verify} for the device-stream parser (issue 18
 * item 8): seeded mutations ({@link SeededMutations}) of well-formed streams built with
 * {@link Framing}, decoded in reads of varying size with occasional reconnects, through the
 * checked decoder of {@link DeviceStreamFuzzTest}. The coverage-guided run is {@code -Pfuzz}.
 */
class DeviceStreamMutationTest {
    @Test
    void deviceStream() throws Exception {
        List<byte[]> seeds = new ArrayList<>();
        List<String> names = new ArrayList<>();
        int[][] shapes = {{0, 1, 2, 3}, {0, 2, 1, 3}, {1, 2, 3}, {0, 0, 1}, {0, 5, 6}, {3, 4, 0, 1}};
        for (int[] seqs : shapes) {
            java.io.ByteArrayOutputStream out = new java.io.ByteArrayOutputStream();
            for (int seq : seqs) {
                byte[] payload = new byte[8 + 24];
                Framing.putU64(payload, 0, seq * 24L);
                for (int i = 8; i < payload.length; i++) {
                    payload[i] = (byte) DeviceSimulator.sample(seq * 24L + i - 8);
                }
                out.writeBytes(Framing.encode(FrameType.DATA, seq, payload));
            }
            seeds.add(out.toByteArray());
            names.add("frames " + java.util.Arrays.toString(seqs));
        }
        int n = SeededMutations.run(seeds, names, 1500, 18_006, s -> DeviceStreamFuzzTest.BOUND.check(s.length, () -> decode(s)));
        System.out.println("device stream: " + n + " mutated inputs; " + DeviceStreamFuzzTest.BOUND.summary());
    }

    /** Decodes a stream in reads of 1 to 64 bytes, with a reconnect now and then, all drawn from the bytes' hash. */
    private static void decode(byte[] stream) {
        SplittableRandom r = new SplittableRandom(java.util.Arrays.hashCode(stream));
        SpoolDecoder dec = DeviceStreamFuzzTest.checkedDecoder();
        int segment = 0;
        long clock = 1_000_000L;
        dec.beginSegment(segment, clock, -1);
        for (int at = 0; at < stream.length;) {
            if (r.nextInt(16) == 0) {
                long closed = clock + r.nextInt(1000);
                clock = closed + r.nextInt(100_000);
                dec.beginSegment(++segment, clock, closed);
            }
            int k = Math.min(stream.length - at, 1 + r.nextInt(64));
            dec.feed(stream, at, k);
            at += k;
        }
        dec.endSegment();
    }
}
