package org.lanesift.dist.sift;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/**
 * A packet link capture made in the test tree for the {@code sift} tests: a continuous DDR clock
 * of 120 MHz (UI 4.17 ns) with its edges in the middle of the data bits, two data lanes, one display
 * command per high-speed burst (DCS short writes with 0 or 1 parameter, long writes), its own skews,
 * jitter, noise and ringing. D-PHY levels and entry sequence from
 * docs/reference-facts.md#d-phy-levels-and-states; packet header, ECC and checksum from
 * docs/reference-facts.md#dsi-packets-ecc-and-checksum (checked in {@code PacketLinkCaptureTest}).
 */
final class PacketLinkCapture {
    static final double UI_S = 1 / 240e6; // 120 MHz DDR clock: 10.42 samples per UI, so edges fall at every sample phase
    static final double RATE_HZ = 2.5e9;
    /** Injected skew of each N leg against its P leg, ps: clock, lane 0, lane 1. */
    static final double[] LEG_SKEW_PS = {-24, 41, -16};
    /** Injected delay of each data lane's P leg against the clock's P leg, ps. */
    static final double[] LANE_SKEW_PS = {-110, 75};

    /**
     * One command as sent.
     *
     * @param dataType 0x05, 0x15 or 0x39
     * @param command  the DCS command byte
     * @param params   its parameters
     */
    record Command(int dataType, int command, int[] params) {
    }

    final List<Command> commands = new ArrayList<>();
    /** A fault for the fault suite: the command of this index (a long write) is sent with one payload bit flipped after its checksum was computed; -1 for none. */
    int corruptCommand = -1;

    /** ECC bit i is the XOR of these header bits (docs/reference-facts.md#dsi-packets-ecc-and-checksum). */
    private static final int[][] ECC_BITS = {
        {0, 1, 2, 4, 5, 7, 10, 11, 13, 16, 20, 21, 22, 23},
        {0, 1, 3, 4, 6, 8, 10, 12, 14, 17, 20, 21, 22, 23},
        {0, 2, 3, 5, 6, 9, 11, 12, 15, 18, 20, 21, 22},
        {1, 2, 3, 7, 8, 9, 13, 14, 15, 19, 20, 21, 23},
        {4, 5, 6, 7, 8, 9, 16, 17, 18, 19, 20, 22, 23},
        {10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 21, 22, 23}};

    static int ecc(int b0, int b1, int b2) {
        int h = b0 | b1 << 8 | b2 << 16;
        int e = 0;
        for (int i = 0; i < 6; i++) {
            int x = 0;
            for (int bit : ECC_BITS[i]) {
                x ^= h >> bit & 1;
            }
            e |= x << i;
        }
        return e;
    }

    /** CRC-16, polynomial 0x1021 reflected (0x8408), initial 0xFFFF, no final XOR. */
    static int crc16(int[] bytes) {
        int crc = 0xFFFF;
        for (int b : bytes) {
            crc ^= b & 0xFF;
            for (int k = 0; k < 8; k++) {
                crc = (crc & 1) != 0 ? crc >>> 1 ^ 0x8408 : crc >>> 1;
            }
        }
        return crc;
    }

    /** The packet bytes of a command. */
    static int[] packet(Command c) {
        if (c.dataType() != 0x39) {
            int p = c.params().length == 0 ? 0 : c.params()[0];
            return new int[] {c.dataType(), c.command(), p, ecc(c.dataType(), c.command(), p)};
        }
        int[] payload = new int[c.params().length + 1];
        payload[0] = c.command();
        System.arraycopy(c.params(), 0, payload, 1, c.params().length);
        int wc = payload.length;
        int[] out = new int[4 + wc + 2];
        out[0] = 0x39;
        out[1] = wc & 0xFF;
        out[2] = wc >> 8;
        out[3] = ecc(out[0], out[1], out[2]);
        System.arraycopy(payload, 0, out, 4, wc);
        int crc = crc16(payload);
        out[4 + wc] = crc & 0xFF;
        out[5 + wc] = crc >> 8;
        return out;
    }

    private void commands(Random rnd) {
        int[] shortNoParam = {0x11, 0x29, 0x13, 0x38};
        int[] shortOneParam = {0x36, 0x3A, 0x35, 0x51, 0x53};
        int[] longCmd = {0xB1, 0xC2, 0xD4, 0xE0, 0xE1, 0xF3};
        for (int i = 0; i < 30; i++) {
            switch (i % 3) {
                case 0 -> commands.add(new Command(0x05, shortNoParam[rnd.nextInt(shortNoParam.length)], new int[0]));
                case 1 -> commands.add(new Command(0x15, shortOneParam[rnd.nextInt(shortOneParam.length)], new int[] {rnd.nextInt(256)}));
                default -> {
                    int[] p = new int[96 + rnd.nextInt(160)];
                    for (int k = 0; k < p.length; k++) {
                        p[k] = rnd.nextInt(256);
                    }
                    commands.add(new Command(0x39, longCmd[rnd.nextInt(longCmd.length)], p));
                }
            }
        }
    }

    void write(Path file, String[] legNames, long seed) throws IOException {
        Random rnd = new Random(seed);
        commands(rnd);
        // per lane: the P and N level of every unit interval
        Levels[] lanes = {new Levels(), new Levels()};
        for (Levels l : lanes) {
            l.state(1.2, 1.2, 60);
        }
        for (int ci = 0; ci < commands.size(); ci++) {
            Command c = commands.get(ci);
            int[] bytes = packet(c);
            if (ci == corruptCommand) {
                bytes[6] ^= 0x10; // a payload byte (header 4, command byte 1): the checksum no longer matches
            }
            int start = lanes[0].size();
            for (int lane = 0; lane < 2; lane++) {
                Levels l = lanes[lane];
                l.pad(start);
                l.state(1.2, 1.2, 25);      // LP-11
                l.state(0.0, 1.2, 15);      // LP-01, 60 ns
                l.state(0.0, 0.0, 15);      // LP-00, 60 ns
                l.hs(0, 38);                // HS-0, 152 ns
                l.hsByte(0xB8);             // sync byte
                int last = 0;
                for (int k = lane; k < bytes.length; k += 2) {
                    l.hsByte(bytes[k]);
                    last = bytes[k] >> 7 & 1;
                }
                l.hs(1 - last, 15);         // trail: the last bit inverted
                l.state(1.2, 1.2, 30);      // LP-11
            }
            int end = Math.max(lanes[0].size(), lanes[1].size());
            lanes[0].pad(end);
            lanes[1].pad(end);
        }
        int slots = lanes[0].size();
        int samples = (int) (slots * UI_S * RATE_HZ) - 8;
        LegWaves waves = new LegWaves(RATE_HZ, samples, 250e-12, seed + 1);
        float[][] volts = new float[6][];
        double[] clkP = new double[slots];
        double[] clkN = new double[slots];
        for (int s = 0; s < slots; s++) {
            clkP[s] = s % 2 == 0 ? 0.3 : 0.1;
            clkN[s] = s % 2 == 0 ? 0.1 : 0.3;
        }
        double base = 1e-9;
        // the clock's edges in the middle of the data bits: half a unit interval later
        volts[0] = waves.leg(clkP, UI_S, base + UI_S / 2, 20e-12, 0.05, 900e6, 0.004);
        volts[1] = waves.leg(clkN, UI_S, base + UI_S / 2 + LEG_SKEW_PS[0] * 1e-12, 20e-12, 0.05, 900e6, 0.004);
        for (int lane = 0; lane < 2; lane++) {
            double d = base + LANE_SKEW_PS[lane] * 1e-12;
            volts[2 + 2 * lane] = waves.leg(lanes[lane].p(), UI_S, d, 20e-12, 0.05, 900e6, 0.004);
            volts[3 + 2 * lane] = waves.leg(lanes[lane].n(), UI_S, d + LEG_SKEW_PS[lane + 1] * 1e-12, 20e-12, 0.05, 900e6, 0.004);
        }
        LegWaves.writeCsv(file, RATE_HZ, legNames, volts);
    }

    /** The P and N levels of one lane, one per unit interval. */
    private static final class Levels {
        private double[] p = new double[1024];
        private double[] n = new double[1024];
        private int size;

        int size() {
            return size;
        }

        void state(double pv, double nv, int uis) {
            for (int i = 0; i < uis; i++) {
                if (size == p.length) {
                    p = java.util.Arrays.copyOf(p, 2 * size);
                    n = java.util.Arrays.copyOf(n, 2 * size);
                }
                p[size] = pv;
                n[size++] = nv;
            }
        }

        /** HS bit levels: 1 is P 300 mV / N 100 mV, 0 the other way (200 mV swing around 200 mV). */
        void hs(int bit, int uis) {
            state(bit == 1 ? 0.3 : 0.1, bit == 1 ? 0.1 : 0.3, uis);
        }

        void hsByte(int b) {
            for (int k = 0; k < 8; k++) {
                hs(b >> k & 1, 1); // least significant bit first
            }
        }

        /** LP-11 up to the given length. */
        void pad(int to) {
            state(1.2, 1.2, Math.max(0, to - size));
        }

        double[] p() {
            return java.util.Arrays.copyOf(p, size);
        }

        double[] n() {
            return java.util.Arrays.copyOf(n, size);
        }
    }
}
