package org.lanesift.bench;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Locale;

/**
 * Writes an invented benchmark capture: a 100 MHz double-edge link (a clock pair and three data
 * pairs, 200 Mb/s per data lane, data transitions half a bit from the clock edges) as eight
 * interleaved float32le legs at 2.5 GS/s, with its raw sidecar and a chain file
 * ({@code raw -> 4 x differential with a fixed threshold -> dual-edge}, no level reports).
 * Legs swing 1.2 V +/- 0.175 V with tanh edges (about 0.3 ns 20-80 %) and +/- 4 mV of
 * deterministic noise; each data lane carries its own pseudo-random bits (a hash of lane and bit index).
 *
 * <p>Usage: {@code java -cp bench/target/benchmarks.jar org.lanesift.bench.DdrCapture FILE [GIGABYTES]}
 * (default 1.0 GB, 8 legs x 4 bytes per frame).
 */
public final class DdrCapture {
    /** Sample rate, samples per second per leg. */
    public static final double RATE_HZ = 2.5e9;
    /** Legs in frame order. */
    public static final String[] LEGS = {"CLK_P", "CLK_N", "D0_P", "D0_N", "D1_P", "D1_N", "D2_P", "D2_N"};
    /** Samples per bit (5 ns at 2.5 GS/s), times 4 so that every edge lies on a quarter sample. */
    private static final int QUARTERS_PER_BIT = 50;
    private static final double SWING_VOLTS = 0.175;
    private static final double COMMON_VOLTS = 1.2;
    /** Edge time constant in samples: tanh(x / tau) goes 20-80 % in about 0.3 ns. */
    private static final double TAU_SAMPLES = 0.55;
    private static final int EDGE_QUARTERS = 24;

    private DdrCapture() {
    }

    /**
     * Writes FILE, FILE.json and FILE-chain.json.
     *
     * @param args file, then optionally gigabytes
     * @throws IOException on write errors
     */
    public static void main(String[] args) throws IOException {
        if (args.length < 1 || args.length > 2) {
            System.err.println("usage: DdrCapture FILE [GIGABYTES]");
            System.exit(2);
        }
        Path file = Path.of(args[0]);
        double gb = args.length > 1 ? Double.parseDouble(args[1]) : 1.0;
        long frames = (long) (gb * 1e9) / (4L * LEGS.length);
        write(file, frames);
        System.out.println(file + ": " + frames + " frames x " + LEGS.length + " float32 legs, " + Files.size(file) + " bytes");
    }

    /**
     * Writes the capture and its two JSON files.
     *
     * @param file   binary file
     * @param frames frames (samples per leg)
     * @throws IOException on write errors
     */
    public static void write(Path file, long frames) throws IOException {
        float[] edge = new float[2 * EDGE_QUARTERS + 1];
        for (int q = -EDGE_QUARTERS; q <= EDGE_QUARTERS; q++) {
            edge[q + EDGE_QUARTERS] = (float) Math.tanh(q / 4.0 / TAU_SAMPLES);
        }
        int[] seeds = {0x1234567, 0x2345678, 0x3456789};
        int lanes = 4;
        long noise = 0x9E3779B97F4A7C15L;
        int chunkFrames = 1 << 16;
        ByteBuffer bb = ByteBuffer.allocate(chunkFrames * 4 * LEGS.length).order(ByteOrder.LITTLE_ENDIAN);
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.WRITE,
                StandardOpenOption.TRUNCATE_EXISTING)) {
            for (long i = 0; i < frames; i++) {
                long q = 4 * i;
                for (int lane = 0; lane < lanes; lane++) {
                    // the clock toggles at bit boundaries; the data lanes half a bit later
                    long shifted = q - (lane == 0 ? 0 : QUARTERS_PER_BIT / 2);
                    long bit = Math.floorDiv(shifted, QUARTERS_PER_BIT);
                    int intoBit = (int) (shifted - bit * QUARTERS_PER_BIT);
                    double level;
                    int before = level(lane, bit - 1, seeds);
                    int now = level(lane, bit, seeds);
                    int after = level(lane, bit + 1, seeds);
                    if (intoBit <= EDGE_QUARTERS && before != now) {
                        level = (now == 1 ? 1 : -1) * edge[intoBit + EDGE_QUARTERS];
                    } else if (QUARTERS_PER_BIT - intoBit <= EDGE_QUARTERS && after != now) {
                        level = (after == 1 ? 1 : -1) * edge[intoBit - QUARTERS_PER_BIT + EDGE_QUARTERS];
                    } else {
                        level = now == 1 ? 1 : -1;
                    }
                    noise = noise * 6364136223846793005L + 1442695040888963407L;
                    double n1 = ((noise >>> 40) / (double) (1L << 24) - 0.5) * 0.008;
                    double n2 = ((noise >>> 16 & 0xFFFFFF) / (double) (1L << 24) - 0.5) * 0.008;
                    bb.putFloat((float) (COMMON_VOLTS + SWING_VOLTS * level + n1));
                    bb.putFloat((float) (COMMON_VOLTS - SWING_VOLTS * level + n2));
                }
                if (!bb.hasRemaining()) {
                    flush(ch, bb);
                }
            }
            flush(ch, bb);
        }
        StringBuilder channels = new StringBuilder();
        for (int k = 0; k < LEGS.length; k++) {
            channels.append(k == 0 ? "" : ", ").append("{\"name\": \"").append(LEGS[k]).append("\"}");
        }
        Files.writeString(Path.of(file + ".json"), String.format(Locale.ROOT,
                "{\"rateHz\": %.4g, \"format\": \"float32le\", \"channels\": [%s]}%n", RATE_HZ, channels));
        Files.writeString(Path.of(file + "-chain.json"), chainJson(file.getFileName().toString()));
    }

    private static void flush(FileChannel ch, ByteBuffer bb) throws IOException {
        bb.flip();
        while (bb.hasRemaining()) {
            ch.write(bb);
        }
        bb.clear();
    }

    /** Level of a lane's bit: the clock alternates; a data lane's bit is one bit of a mixing hash of its seed and the bit index. */
    private static int level(int lane, long bit, int[] seeds) {
        if (lane == 0) {
            return (int) (bit & 1);
        }
        long z = (bit + 1) * 0x9E3779B97F4A7C15L ^ (long) seeds[lane - 1] << 32;
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return (int) ((z ^ (z >>> 31)) & 1);
    }

    /** The chain: raw, one fixed-threshold differential per pair, dual-edge; names shared with {@link ColdPass}. */
    static String chainJson(String binName) {
        StringBuilder n = new StringBuilder();
        n.append("{\"nodes\": [\n  {\"id\": \"cap\", \"plugin\": \"raw\", \"options\": {\"file\": \"").append(binName).append("\"}},\n");
        String[] pairs = {"CLK", "D0", "D1", "D2"};
        StringBuilder w = new StringBuilder();
        for (String p : pairs) {
            n.append("  {\"id\": \"rx-").append(p).append("\", \"plugin\": \"differential\", \"options\": ").append(DIFF_OPTIONS_JSON)
                    .append("},\n");
            w.append("  {\"from\": \"cap.").append(p).append("_P\", \"to\": \"rx-").append(p).append(".p\"},\n");
            w.append("  {\"from\": \"cap.").append(p).append("_N\", \"to\": \"rx-").append(p).append(".n\"},\n");
            w.append("  {\"from\": \"rx-").append(p).append(".edges\", \"to\": \"sampler.").append(p.equals("CLK") ? "clock" : "lane" + p.charAt(1))
                    .append("\"},\n");
        }
        n.append("  {\"id\": \"sampler\", \"plugin\": \"dual-edge\", \"options\": {\"mode\": \"ddr\", \"lanes\": 3}}\n],\n\"wires\": [\n");
        String wires = w.toString();
        return n + wires.substring(0, wires.length() - 2) + "\n]}\n";
    }

    static final String DIFF_OPTIONS_JSON = "{\"thresholdVolts\": 0.0, \"hysteresisVolts\": 0.05, \"levelReport\": false}";
}
