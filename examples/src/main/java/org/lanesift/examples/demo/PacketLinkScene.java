package org.lanesift.examples.demo;

import java.io.ByteArrayOutputStream;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/**
 * Part (b) of the demo scenario: the invented "Siftlet-64" also has a 32 x 24 status display on a
 * two-lane packet link (D-PHY style: low-power single-ended states between high-speed bursts; DSI
 * packets inside). The capture holds the display controller's init sequence and two command-mode
 * frame writes. Six legs (clock P/N, lane 0 P/N, lane 1 P/N) are probed single-ended at 2.5 GS/s.
 *
 * <p>Electrical model (D-PHY levels from docs/reference-facts.md#d-phy-levels-and-states, from memory): LP high
 * 1.2 V, LP low 0 V; HS legs 100 mV / 300 mV (200 mV swing around 200 mV); HS unit interval 5 ns
 * (200 Mb/s per lane); continuous DDR clock (100 MHz) with its edges in the middle of the data
 * bits. Each burst: LP-11, LP-01 (60 ns), LP-00 (60 ns), HS-0 (150 ns), sync byte 0xB8, bytes
 * LSB first (byte k on lane k mod 2), trail (the last bit inverted, 60 ns), LP-11.
 *
 * <p>The controller, its vendor commands and their parameters are invented; the delays a real
 * controller needs (tens of milliseconds after sleep-out) are scaled down to microseconds so the
 * capture stays small (documented in docs/demo-scenario.md).
 */
public final class PacketLinkScene {
    /** Channel names in recording order. */
    public static final String[] CHANNELS = {"HSCLK_P", "HSCLK_N", "L0_P", "L0_N", "L1_P", "L1_N"};
    /** Picture size. */
    public static final int WIDTH = 32, HEIGHT = 24;
    /** HS unit interval, femtoseconds. */
    public static final double UI_FS = 5e6;
    /** Skew of lanes 0 and 1 against the clock pair, ps. */
    public static final double[] LANE_SKEW_PS = {90, -140};
    /** Skew of each N leg against its P leg (clock, lane 0, lane 1), ps. */
    public static final double[] LEG_SKEW_PS = {20, -35, 45};

    private static final double LP_HIGH = 1.2;
    private static final double HS_HIGH = 0.3;
    private static final double HS_LOW = 0.1;

    private PacketLinkScene() {
    }

    /**
     * One display command as sent.
     *
     * @param dataType packet data type (0x05, 0x15, 0x39)
     * @param command  the command byte
     * @param params   its parameters
     * @param delayAfterUs delay the host waits after it, microseconds
     */
    public record Command(int dataType, int command, byte[] params, double delayAfterUs) {
    }

    /** What the capture contains. */
    public record Truth(List<Command> commands, List<int[]> pictures, double[] laneSkewPs, double[] legSkewPs) {
    }

    /** The rendered capture. */
    public record Capture(String[] channels, float[][] volts, double sampleRateHz, Truth truth) {
    }

    /**
     * The init sequence of the invented controller.
     *
     * @return commands in order
     */
    public static List<Command> initSequence() {
        List<Command> c = new ArrayList<>();
        c.add(new Command(0x05, 0x01, new byte[0], 15));                                  // soft reset
        c.add(new Command(0x39, 0xB0, bytes(0x5A, 0xA5), 2));                             // vendor: unlock (invented)
        c.add(new Command(0x39, 0xC1, bytes(0x23, 0x10, 0x44), 2));                       // vendor: power (invented)
        c.add(new Command(0x39, 0xE0, bytes(0x00, 0x07, 0x0F, 0x1A, 0x2C, 0x3B, 0x4A, 0x5F), 2)); // vendor: gamma (invented)
        c.add(new Command(0x15, 0x3A, bytes(0x77), 2));                                   // pixel format: 24 bit
        c.add(new Command(0x15, 0x36, bytes(0x08), 2));                                   // address mode
        c.add(new Command(0x15, 0x35, bytes(0x00), 2));                                   // tearing effect on
        c.add(new Command(0x05, 0x11, new byte[0], 20));                                  // exit sleep
        c.add(new Command(0x05, 0x29, new byte[0], 5));                                   // display on
        return c;
    }

    /**
     * The status picture of frame {@code k}, packed 0xRRGGBB.
     *
     * @param k frame number
     * @return {@code WIDTH * HEIGHT} colours
     */
    public static int[] picture(int k) {
        int[] px = new int[WIDTH * HEIGHT];
        for (int y = 0; y < HEIGHT; y++) {
            for (int x = 0; x < WIDTH; x++) {
                int r = x * 255 / (WIDTH - 1);
                int g = y * 255 / (HEIGHT - 1);
                int b = 128;
                boolean ring = Math.abs(Math.hypot(x - 15.5, y - 11.5) - 8) < 1.2;
                if (ring) {
                    r = g = b = 255;
                }
                if (y == 20 && x < 4 + 12 * k) {
                    r = 255;
                    g = b = 0; // a level bar that grows from frame to frame
                }
                px[y * WIDTH + x] = (r << 16) | (g << 8) | b;
            }
        }
        return px;
    }

    private static byte[] bytes(int... v) {
        byte[] b = new byte[v.length];
        for (int i = 0; i < v.length; i++) {
            b[i] = (byte) v[i];
        }
        return b;
    }

    private static byte[] packetOf(Command c) {
        return switch (c.dataType()) {
            case 0x05 -> DsiEncoder.shortPacket(0, 0x05, c.command(), 0);
            case 0x15 -> DsiEncoder.shortPacket(0, 0x15, c.command(), c.params()[0] & 0xFF);
            default -> {
                byte[] p = new byte[1 + c.params().length];
                p[0] = (byte) c.command();
                System.arraycopy(c.params(), 0, p, 1, c.params().length);
                yield DsiEncoder.longPacket(0, c.dataType(), p);
            }
        };
    }

    private static final byte[] EOTP = DsiEncoder.shortPacket(0, 0x08, 0x0F, 0x0F);

    /** One burst: its packets' bytes and the LP time after it. */
    private record Burst(byte[] bytes, double gapAfterFs) {
    }

    /**
     * Renders the capture.
     *
     * @param imp impairments
     * @return six channels and the ground truth
     */
    public static Capture render(Impairments imp) {
        List<Command> sent = new ArrayList<>();
        List<Burst> bursts = new ArrayList<>();
        for (Command c : initSequence()) {
            sent.add(c);
            bursts.add(new Burst(concat(packetOf(c), EOTP), c.delayAfterUs() * 1e9));
        }
        List<int[]> pics = new ArrayList<>();
        for (int k = 0; k < 2; k++) {
            int[] pic = picture(k);
            pics.add(pic);
            Command col = new Command(0x39, 0x2A, bytes(0, 0, 0, WIDTH - 1), 0);
            Command page = new Command(0x39, 0x2B, bytes(0, 0, 0, HEIGHT - 1), 0);
            sent.add(col);
            sent.add(page);
            for (int y = 0; y < HEIGHT; y++) {
                byte[] line = new byte[WIDTH * 3];
                for (int x = 0; x < WIDTH; x++) {
                    int c = pic[y * WIDTH + x];
                    line[3 * x] = (byte) (c >> 16);
                    line[3 * x + 1] = (byte) (c >> 8);
                    line[3 * x + 2] = (byte) c;
                }
                Command mw = new Command(0x39, y == 0 ? 0x2C : 0x3C, line, y == HEIGHT - 1 ? 10 : 0.3);
                sent.add(mw);
                byte[] b = packetOf(mw);
                if (y == 0) {
                    b = concat(packetOf(col), packetOf(page), b);
                }
                bursts.add(new Burst(concat(b, EOTP), mw.delayAfterUs() * 1e9));
            }
        }
        Random rnd = new Random(imp.seed());
        LegSynth.Track clkP = new LegSynth.Track(HS_LOW);
        LegSynth.Track clkN = new LegSynth.Track(HS_HIGH);
        LegSynth.Track[] dp = {new LegSynth.Track(LP_HIGH), new LegSynth.Track(LP_HIGH)};
        LegSynth.Track[] dn = {new LegSynth.Track(LP_HIGH), new LegSynth.Track(LP_HIGH)};
        double t = 2e9; // 2 us of LP-11 before the first burst
        for (Burst b : bursts) {
            // LP-11 -> LP-01 -> LP-00
            long tLp01 = Math.round(t);
            long tLp00 = Math.round(t + 60e6);
            double hsStart = Math.ceil((t + 120e6) / UI_FS) * UI_FS; // HS-0 starts on the UI grid
            double syncStart = hsStart + 30 * UI_FS;                 // 150 ns of HS-0
            double end = syncStart;
            for (int lane = 0; lane < 2; lane++) {
                dp[lane].to(tLp01, 0, LegSynth.SLOW);
                dn[lane].to(tLp01 + legSkew(lane), LP_HIGH, LegSynth.SLOW);
                dn[lane].to(tLp00 + legSkew(lane), 0, LegSynth.SLOW);
                hs(dp[lane], dn[lane], lane, hsStart, false, rnd, imp);
                // sync byte then this lane's bytes
                ByteArrayOutputStream o = new ByteArrayOutputStream();
                o.write(0xB8);
                for (int i = lane; i < b.bytes().length; i += 2) {
                    o.write(b.bytes()[i]);
                }
                byte[] lb = o.toByteArray();
                double bt = syncStart;
                boolean last = false;
                for (byte x : lb) {
                    for (int i = 0; i < 8; i++) {
                        last = ((x >> i) & 1) == 1;
                        hs(dp[lane], dn[lane], lane, bt, last, rnd, imp);
                        bt += UI_FS;
                    }
                }
                hs(dp[lane], dn[lane], lane, bt, !last, rnd, imp);       // trail: last bit inverted
                double lp11 = bt + 12 * UI_FS;                            // 60 ns of trail
                dp[lane].to(Math.round(lp11), LP_HIGH, LegSynth.SLOW);
                dn[lane].to(Math.round(lp11) + legSkew(lane), LP_HIGH, LegSynth.SLOW);
                end = Math.max(end, lp11);
            }
            t = end + Math.max(b.gapAfterFs(), 200e6);
        }
        double endFs = t + 1e9;
        // continuous DDR clock: a transition in the middle of every unit interval
        for (long m = 0; (m + 0.5) * UI_FS < endFs; m++) {
            double tc = (m + 0.5) * UI_FS + jitter(rnd, imp, (m + 0.5) * UI_FS);
            boolean high = (m & 1) == 0;
            clkP.to(Math.round(tc), high ? HS_HIGH : HS_LOW, LegSynth.FAST);
            clkN.to(Math.round(tc + LEG_SKEW_PS[0] * 1000), high ? HS_LOW : HS_HIGH, LegSynth.FAST);
        }
        double periodFs = 1e15 / imp.sampleRateHz();
        int n = (int) Math.ceil(endFs / periodFs);
        LegSynth synth = new LegSynth(imp.ringFrequencyHz(), imp.ringDamping(), 4e6);
        LegSynth.Track[] all = {clkP, clkN, dp[0], dn[0], dp[1], dn[1]};
        float[][] volts = new float[6][];
        for (int c = 0; c < 6; c++) {
            LegSynth.Track tr = all[c];
            volts[c] = synth.render(tr.t, tr.v, tr.k, tr.n, tr.initial, 0, periodFs, n, imp.instrumentBandwidthHz(),
                    imp.noiseRmsVolts(), imp.commonModeOffsetVolts(), new Random(imp.seed() * 37 + c));
        }
        return new Capture(CHANNELS.clone(), volts, imp.sampleRateHz(),
                new Truth(sent, pics, LANE_SKEW_PS.clone(), LEG_SKEW_PS.clone()));
    }

    private static long legSkew(int lane) {
        return Math.round(LEG_SKEW_PS[lane + 1] * 1000);
    }

    private static double jitter(Random rnd, Impairments imp, double tFs) {
        return rnd.nextGaussian() * imp.randomJitterRmsPs() * 1000
                + imp.periodicJitterPs() * 1000 * Math.sin(2 * Math.PI * imp.periodicJitterHz() * tFs * 1e-15);
    }

    private static void hs(LegSynth.Track p, LegSynth.Track n, int lane, double tFs, boolean one, Random rnd, Impairments imp) {
        double tt = tFs + jitter(rnd, imp, tFs) + rnd.nextGaussian() * imp.laneJitterRmsPs() * 1000 + LANE_SKEW_PS[lane] * 1000;
        p.to(Math.round(tt), one ? HS_HIGH : HS_LOW, LegSynth.FAST);
        n.to(Math.round(tt) + legSkew(lane), one ? HS_LOW : HS_HIGH, LegSynth.FAST);
    }

    private static byte[] concat(byte[]... parts) {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        for (byte[] p : parts) {
            o.writeBytes(p);
        }
        return o.toByteArray();
    }
}
