package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.ExtendWith;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.PortSpec;

/**
 * The raw reader's leg differences ({@link LegDifferences}) against the reader without them: over
 * the seeded corpus of {@link RawReaderOracleTest} (every format, NaN, infinities, clipped codes,
 * gains that overflow), random pairings of 2 to 9 channels, block sizes, odd read chunks, lent
 * and poisoned blocks, read-ahead on and off, every difference sample is the float difference of
 * the two legs' samples bit for bit, invalid exactly where a leg is or where the difference is not
 * finite, and every other channel is the plain reader's.
 */
@ExtendWith(PoisonAsBefore.class)
class LegDifferencesTest {
    @Test
    void seededCorpusGivesTheLegsDifferenceBitForBit(@TempDir Path dir) throws Exception {
        Random rnd = new Random(0x5eed_d1ffL);
        int diffs = 0;
        int invalidDiffSamples = 0;
        for (int c = 0; c < 60; c++) {
            RawSidecar.Format format = RawSidecar.Format.values()[c % RawSidecar.Format.values().length];
            int nch = 2 + rnd.nextInt(8);
            int frames = rnd.nextInt(4) == 0 ? 64 * (1 + rnd.nextInt(40)) : 1 + rnd.nextInt(3000);
            Path bin = dir.resolve("c" + c + ".raw");
            Files.write(bin, RawReaderOracleTest.corpus(rnd, format, nch, frames));
            StringBuilder json = new StringBuilder("{\"rateHz\": 1e9, \"format\": \"" + format.text + "\", \"markClipped\": "
                    + rnd.nextBoolean() + ", \"channels\": [");
            for (int k = 0; k < nch; k++) {
                json.append(k == 0 ? "" : ", ").append(String.format(Locale.ROOT, "{\"name\": \"leg-%d\", \"gain\": %s, \"offset\": %s}", k,
                        RawReaderOracleTest.gain(rnd, format), RawReaderOracleTest.offset(rnd)));
            }
            Files.writeString(Path.of(bin + ".json"), json.append("]}").toString());
            RawSidecar sc = RawSidecar.read(Path.of(bin + ".json"));
            // a random pairing: some channels paired (either order), the rest left alone
            List<Integer> order = new ArrayList<>();
            for (int k = 0; k < nch; k++) {
                order.add(k);
            }
            Collections.shuffle(order, rnd);
            int pairs = 1 + rnd.nextInt(nch / 2);
            StringBuilder opt = new StringBuilder();
            for (int p = 0; p < pairs; p++) {
                opt.append(p == 0 ? "" : rnd.nextBoolean() ? ", " : ",").append("d").append(p).append('=')
                        .append(sc.names[order.get(2 * p)]).append('-').append(sc.names[order.get(2 * p + 1)]);
            }
            int block = new int[] {1, 7, 64, 1000, 65536}[rnd.nextInt(5)];
            int readBytes = new int[] {RawReader.READ_BYTES, 1, 37, 4099}[rnd.nextInt(4)];
            boolean lend = rnd.nextBoolean();
            boolean ahead = rnd.nextBoolean();
            BlockArrays.poison = lend && rnd.nextBoolean();
            String what = "case " + c + " (" + format.text + ", " + nch + " channels, " + frames + " frames, '" + opt + "', block " + block
                    + ", chunks of " + readBytes + " bytes" + (lend ? ", lent" : "") + (ahead ? ", read ahead" : "") + ")";
            List<AnalogBlock> plain = read(bin, sc, block, ahead, readBytes, "", lend);
            List<AnalogBlock> got = read(bin, sc, block, ahead, readBytes, opt.toString(), lend);
            LegDifferences outs = LegDifferences.parse(opt.toString(), sc.names);
            int nout = outs.names.length;
            assertEquals(nch - pairs, nout, what);
            assertEquals(plain.size() / nch * nout, got.size(), what + ": one block per output per span");
            for (int s = 0; s < plain.size() / nch; s++) {
                for (int o = 0; o < nout; o++) {
                    AnalogBlock g = got.get(s * nout + o);
                    AnalogBlock a = plain.get(s * nch + outs.first[o]);
                    String at = what + ": output " + outs.names[o] + ", span " + s;
                    assertEquals(outs.names[o], g.channel(), at);
                    assertEquals(a.firstIndex(), g.firstIndex(), at);
                    assertEquals(a.startFs(), g.startFs(), at);
                    assertEquals(a.length(), g.length(), at);
                    int n = a.length();
                    if (outs.second[o] < 0) {
                        assertArrayEquals(bits(a.volts(), n), bits(g.volts(), n), at);
                        assertArrayEquals(mask(a.invalid(), n), mask(g.invalid(), n), at + ": invalid mask");
                        continue;
                    }
                    diffs++;
                    AnalogBlock b = plain.get(s * nch + outs.second[o]);
                    float[] want = new float[n];
                    boolean[] bad = new boolean[n];
                    for (int i = 0; i < n; i++) {
                        want[i] = a.volts()[i] - b.volts()[i];
                        bad[i] = !a.isValid(i) || !b.isValid(i) || !Float.isFinite(want[i]);
                    }
                    assertArrayEquals(bits(want, n), bits(g.volts(), n), at);
                    for (int i = 0; i < n; i++) {
                        assertEquals(bad[i], !g.isValid(i), at + ": sample " + i + " valid");
                        invalidDiffSamples += bad[i] ? 1 : 0;
                    }
                }
            }
        }
        assertTrue(diffs > 100, "differences compared: " + diffs);
        assertTrue(invalidDiffSamples > 100, "the corpus makes invalid differences: " + invalidDiffSamples);
    }

    private static List<AnalogBlock> read(Path bin, RawSidecar sc, int block, boolean ahead, int readBytes, String differences,
            boolean lend) throws Exception {
        List<AnalogBlock> copies = new ArrayList<>();
        try (RawReader r = new RawReader(bin, sc, block, false, 0, 0, ahead, readBytes, differences)) {
            boolean[] flags = new boolean[r.ports().size()];
            Arrays.fill(flags, lend);
            r.lend(flags);
            while (r.next((k, b) -> {
                AnalogBlock a = (AnalogBlock) b;
                copies.add(new AnalogBlock(a.channel(), a.firstIndex(), a.startFs(), a.periodFs(), a.volts().clone(), a.length(),
                        a.invalid() == null ? null : a.invalid().clone()));
            })) {
                // each span is copied as it arrives
            }
        }
        return copies;
    }

    private static int[] bits(float[] v, int n) {
        int[] b = new int[n];
        for (int i = 0; i < n; i++) {
            b[i] = Float.floatToRawIntBits(v[i]);
        }
        return b;
    }

    private static boolean[] mask(long[] inv, int n) {
        boolean[] m = new boolean[n];
        for (int i = 0; i < n && inv != null; i++) {
            m[i] = BitSets.get(inv, i);
        }
        return m;
    }

    @Test
    void portsTakeThePlaceOfTheirPLegs() {
        String[] ch = {"clk_p", "clk_n", "trig", "d0_n", "d0_p"};
        LegDifferences d = LegDifferences.parse(" clk = clk_p-clk_n ,d0=d0_p-d0_n", ch);
        assertArrayEquals(new String[] {"clk", "trig", "d0"}, d.names);
        assertArrayEquals(new int[] {0, 2, 4}, d.first);
        assertArrayEquals(new int[] {1, -1, 3}, d.second);
        assertTrue(d.any());
        assertTrue(!LegDifferences.parse("  ", ch).any());
        assertArrayEquals(ch, LegDifferences.parse("", ch).names);
    }

    @Test
    void aHyphenInAPortNameSplitsWhereBothSidesAreChannels() {
        String[] ch = {"lane-0-p", "lane-0-n", "lane-0"};
        LegDifferences d = LegDifferences.parse("l0=lane-0-p-lane-0-n", ch);
        assertArrayEquals(new String[] {"l0", "lane-0"}, d.names);
        assertArrayEquals(new int[] {0, 2}, d.first);
        assertArrayEquals(new int[] {1, -1}, d.second);
    }

    @Test
    void badTextIsAnOptionErrorNamingTheEntry() {
        String[] ch = {"a", "b", "c", "a-b", "b-c"};
        expect("entry 'x'", "x", ch, "expected NAME=P-N");
        expect("=a-b", "=a-b", ch, "expected NAME=P-N");
        expect("x=", "x=", ch, "expected NAME=P-N");
        expect("x y=a-b", "x y=a-b", ch, "is not a port name");
        expect("x=a-q", "x=a-q", ch, "expected P-N with P and N port names");
        expect("x=a-a", "x=a-a", ch, "the same channel");
        expect("x=a-b-c", "x=a-b-c", ch, "more than one way");
        expect("y=a-c", "x=a-b, y=a-c", ch, "already a leg of another difference");
        expect("x=c-b-c", "x=a-b, x=c-b-c", ch, "given twice");
        expect("c", "c=a-b", ch, "not a leg of any difference");
        expect("entry ''", "x=a-b,", ch, "expected NAME=P-N");
    }

    private static void expect(String entry, String text, String[] ch, String what) {
        OptionException e = assertThrows(OptionException.class, () -> LegDifferences.parse(text, ch), text);
        assertTrue(e.getMessage().startsWith("option 'differences' of plugin 'raw': "), e.getMessage());
        assertTrue(e.getMessage().contains(entry), e.getMessage());
        assertTrue(e.getMessage().contains(what), e.getMessage());
    }

    @Test
    void aDifferencePortSaysWhatItIs(@TempDir Path dir) throws Exception {
        Path bin = dir.resolve("x.raw");
        Files.write(bin, new byte[4 * 3 * 10]);
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e6, \"format\": \"float32le\", \"channels\": [{\"name\": \"p\"},"
                + " {\"name\": \"n\"}, {\"name\": \"t\"}]}");
        try (RawReader r = new RawReader(bin, RawSidecar.read(Path.of(bin + ".json")), 4, true, 0, 0, false, RawReader.READ_BYTES,
                "v=p-n")) {
            List<PortSpec> ports = r.ports();
            assertEquals(List.of("v", "t"), ports.stream().map(PortSpec::name).toList());
            assertEquals("difference p - n (channels 0 and 1, volts)", ports.get(0).help());
        }
    }
}
