package org.lanesift.plugins.packetlink;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.lanesift.chain.Chain;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PluginRegistry;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import org.openjdk.jmh.infra.Blackhole;

/**
 * Packet-link hot paths, time per whole workload, next to plain sequential reads of the same
 * arrays in the same run:
 * <ul>
 * <li>{@code parse}: packet parsing (ECC check, length, CRC-16 of every payload) of 4 MiB of merged
 * burst bytes: long pixel-stream packets of 1020 payload bytes with a short sync packet before each
 * (target at least 200 MB/s); baseline {@code readBytes} sums the same bytes;</li>
 * <li>{@code stage}: the whole plugin through the chain engine on one two-lane burst of 1 MiB
 * (1 + 1 MiB of bits, 8 M bit times per lane): line states from the legs, sync search, bit
 * packing, lane merge, parsing, annotations and the packets output; baseline {@code readBits}
 * reads the same bit values and times.</li>
 * </ul>
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
@Fork(1)
public class PacketLinkBench {
    static final int PARSE_BYTES = 4 << 20;
    static final int STAGE_BYTES = 1 << 20;
    static final long UI_FS = 2_000_000;
    static final double SAMPLE_FS = 10_000_000;

    byte[] merged;
    int mergedLen;
    BitStream[] laneBits;
    AnalogBlock[][] legs;

    /** Fills packets (hsync-start + 1020-byte rgb888 line) into buf up to limit; returns the length used. */
    static int packets(byte[] buf, int limit, Random r) {
        int pos = 0;
        int payload = 1020;
        while (pos + 4 + 6 + payload <= limit) {
            int h = 0x21;
            buf[pos] = 0x21;
            buf[pos + 3] = (byte) Ecc.compute(h);
            pos += 4;
            int lh = 0x3E | payload << 8;
            buf[pos] = 0x3E;
            buf[pos + 1] = (byte) payload;
            buf[pos + 2] = (byte) (payload >> 8);
            buf[pos + 3] = (byte) Ecc.compute(lh);
            pos += 4;
            for (int i = 0; i < payload; i++) {
                buf[pos + i] = (byte) r.nextInt(256);
            }
            int c = PayloadCrc.of(buf, pos, payload);
            pos += payload;
            buf[pos] = (byte) c;
            buf[pos + 1] = (byte) (c >> 8);
            pos += 2;
        }
        return pos;
    }

    @Setup
    public void setup() {
        Random r = new Random(1);
        merged = new byte[PARSE_BYTES];
        mergedLen = packets(merged, PARSE_BYTES, r);
        byte[] burst = new byte[STAGE_BYTES];
        int len = packets(burst, STAGE_BYTES, r);
        int lanes = 2;
        long hsStart = 1_000_000_000L;
        int perLane = (len + 1) / 2;
        int bits = 32 + 8 + perLane * 8 + 32;
        long hsEnd = hsStart + bits * UI_FS;
        laneBits = new BitStream[lanes];
        for (int k = 0; k < lanes; k++) {
            long[] v = new long[BitSets.words(bits)];
            int p = 32;
            for (int j = 0; j < 8; j++) {
                BitSets.set(v, p++, (0xB8 >> j & 1) != 0);
            }
            for (int i = k; i < len; i += lanes) {
                for (int j = 0; j < 8; j++) {
                    BitSets.set(v, p++, (burst[i] >> j & 1) != 0);
                }
            }
            boolean trail = !BitSets.get(v, p - 1);
            while (p < bits) {
                BitSets.set(v, p++, trail);
            }
            long[] t = new long[bits];
            long[] edge = new long[bits];
            for (int i = 0; i < bits; i++) {
                t[i] = hsStart + i * UI_FS;
                edge[i] = t[i] / UI_FS;
            }
            laneBits[k] = new BitStream("bits" + k, 0, hsEnd + 1_000_000_000L, bits, v, t, edge, new long[v.length], null,
                    new long[bits], new long[bits], new long[v.length], UI_FS);
        }
        int samples = (int) ((hsEnd + 1_000_000_000L) / SAMPLE_FS);
        legs = new AnalogBlock[lanes][2];
        for (int k = 0; k < lanes; k++) {
            float[] pp = new float[samples];
            float[] nn = new float[samples];
            for (int i = 0; i < samples; i++) {
                long tt = Math.round(i * SAMPLE_FS);
                if (tt < hsStart - 200_000_000L || tt >= hsEnd) {
                    pp[i] = 1.2f;
                    nn[i] = 1.2f;
                } else if (tt < hsStart - 100_000_000L) {
                    pp[i] = 0f;
                    nn[i] = 1.2f;
                } else if (tt < hsStart) {
                    pp[i] = 0f;
                    nn[i] = 0f;
                } else {
                    pp[i] = 0.1f;
                    nn[i] = 0.3f;
                }
            }
            legs[k][0] = new AnalogBlock("lane" + k + "p", 0, 0, SAMPLE_FS, pp, samples, null);
            legs[k][1] = new AnalogBlock("lane" + k + "n", 0, 0, SAMPLE_FS, nn, samples, null);
        }
    }

    static final class Counter implements PacketParser.Listener {
        long packets;
        long payload;
        long sum;

        @Override
        public void packet(int offset, int header, int eccResult, int payloadOffset, int payloadLength, int checksumRx, int checksumCalc) {
            packets++;
            payload += payloadLength;
            sum += checksumRx ^ checksumCalc ^ header;
        }
    }

    @Benchmark
    public void parse(Blackhole bh) {
        Counter c = new Counter();
        bh.consume(PacketParser.parse(merged, 0, mergedLen, c));
        bh.consume(c.packets + c.payload + c.sum);
    }

    @Benchmark
    public long readBytes() {
        long s = 0;
        byte[] d = merged;
        for (int i = 0; i < mergedLen; i++) {
            s += d[i];
        }
        return s;
    }

    @Benchmark
    public void stage(Blackhole bh) {
        PluginRegistry reg = new PluginRegistry().add(new PacketLinkPlugin());
        List<Object> out = new ArrayList<>();
        long[] notes = new long[1];
        var b = Chain.builder(reg).add("dsi", PacketLinkPlugin.ID, Map.of("lanes", 2));
        for (int k = 0; k < 2; k++) {
            b.input("p" + k, DataKind.ANALOG).wire("p" + k, "dsi.lane" + k + "p");
            b.input("n" + k, DataKind.ANALOG).wire("n" + k, "dsi.lane" + k + "n");
            b.input("b" + k, DataKind.BITS).wire("b" + k, "dsi.bits" + k);
        }
        b.outputs((id, port, block) -> out.add(block));
        b.annotations((src, a) -> notes[0]++);
        try (Chain c = b.build()) {
            for (int k = 0; k < 2; k++) {
                c.push("b" + k, laneBits[k]);
                c.push("p" + k, legs[k][0]);
                c.push("n" + k, legs[k][1]);
            }
            c.finish();
        }
        bh.consume(out.size() + notes[0]);
    }

    @Benchmark
    public long readBits() {
        long s = 0;
        for (BitStream b : laneBits) {
            long[] v = b.values();
            for (long x : v) {
                s += x;
            }
            long[] t = b.timesFs();
            for (int i = 0; i < b.count(); i++) {
                s += t[i];
            }
        }
        for (AnalogBlock[] l : legs) {
            for (AnalogBlock a : l) {
                float[] f = a.volts();
                for (int i = 0; i < a.length(); i++) {
                    s += (long) f[i];
                }
            }
        }
        return s;
    }
}
