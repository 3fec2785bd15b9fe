package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.Arrays;
import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.WordStream;

/** The three kinds of VCD variable, each on its own, and the identifier-code table. */
class VcdSignalTest {

    @Test
    void scalarMakesEdgesOnLevelChangesAndUnknownSpansForXAndZ() {
        VcdScalar s = new VcdScalar(0, "top.clk", "!");
        s.port("clk");
        assertEquals(DataKind.EDGES, s.dataKind());
        s.start(0);
        s.set(10, (byte) '0'); // first value ends the unknown span from the start; level stays low: no edge
        s.set(20, (byte) '1');
        s.set(25, (byte) '1'); // no change, no edge
        s.set(30, (byte) 'x');
        s.set(40, (byte) '1'); // back from x at the same level: a span, no edge
        s.set(50, (byte) '0');
        Edges e = (Edges) s.take(0, 60, false, 1);
        assertEquals("clk", e.channel());
        assertFalse(e.initialLevel());
        assertArrayEquals(new long[] {20, 50}, Arrays.copyOf(e.timesFs(), e.count()));
        assertArrayEquals(new long[] {0, 10, 30, 40}, Arrays.copyOf(e.invalidSpans(), 2 * e.invalidCount()));
        // the next block starts at the level this one ended with; an open x span is cut at the seam
        s.set(70, (byte) 'z');
        Edges e2 = (Edges) s.take(60, 80, false, 1);
        assertFalse(e2.initialLevel());
        assertEquals(0, e2.count());
        assertArrayEquals(new long[] {70, 80}, Arrays.copyOf(e2.invalidSpans(), 2 * e2.invalidCount()));
        Edges e3 = (Edges) s.take(80, 90, true, 1);
        assertArrayEquals(new long[] {80, 90}, Arrays.copyOf(e3.invalidSpans(), 2 * e3.invalidCount()));
    }

    @Test
    void scalarDumpOffMakesTheRestUnknown() {
        VcdScalar s = new VcdScalar(0, "a", "!");
        s.port("a");
        s.start(0);
        s.set(0, (byte) '1');
        s.dumpOff(30);
        Edges e = (Edges) s.take(0, 50, true, 1);
        assertArrayEquals(new long[] {0}, Arrays.copyOf(e.timesFs(), e.count()));
        assertArrayEquals(new long[] {30, 50}, Arrays.copyOf(e.invalidSpans(), 2 * e.invalidCount()));
    }

    @Test
    void vectorHoldsEachValueAsAWordWithFlags() {
        VcdVector v = new VcdVector(1, 8, "top.bus", "#");
        v.port("bus");
        assertEquals(DataKind.WORDS, v.dataKind());
        assertEquals("8-bit vector 'top.bus' as words", v.help(1));
        v.start(0);
        v.set(0, 0x12, false);
        v.set(10, 0x34, true);
        v.dumpOff(20);
        v.dumpOn();
        v.set(30, 0x56, false);
        WordStream w = (WordStream) v.take(0, 35, false, 1);
        assertEquals(3, w.count());
        assertEquals(0x12, w.values()[0]);
        assertEquals(WordStream.FLAG_SUSPECT, w.flags()[1]);
        assertEquals(0, w.values()[2]); // the dumpoff value: suspect, 0
        assertEquals(WordStream.FLAG_SUSPECT, w.flags()[2]);
        // the value after $dumpon is still open: it appears in the last block, flagged gap-before
        WordStream last = (WordStream) v.take(35, 50, true, 1);
        assertEquals(1, last.count());
        assertEquals(0x56, last.values()[0]);
        assertEquals(WordStream.FLAG_GAP_BEFORE, last.flags()[0]);
        assertEquals(30, last.wordStartFs()[0]);
        assertEquals(50, last.wordEndFs()[0]);
    }

    @Test
    void realIsSampledAndHeldOnTheGridWithUnknownPointsInvalid() {
        VcdReal r = new VcdReal(2, "top.v", "$");
        r.port("v");
        assertEquals(DataKind.ANALOG, r.dataKind());
        r.start(0);
        r.set(25, 1.5);
        r.dumpOff(55);
        AnalogBlock a = (AnalogBlock) r.take(0, 70, false, 10);
        // grid points 0..60 fs: unknown before the first value, 1.5 from 30 to 50, unknown from 60
        assertEquals(7, a.length());
        assertFalse(a.isValid(0));
        assertFalse(a.isValid(2));
        assertTrue(a.isValid(3));
        assertEquals(1.5f, a.volts()[5]);
        assertFalse(a.isValid(6));
        r.set(75, -0.25);
        AnalogBlock b = (AnalogBlock) r.take(70, 90, true, 10);
        assertEquals(7, b.firstIndex());
        assertFalse(b.isValid(0)); // still off at 70
        assertEquals(-0.25f, b.volts()[1]);
    }

    @Test
    void codesOfAnyLengthAreFoundAndUnknownOnesNamed() throws Exception {
        VcdCodes codes = new VcdCodes();
        VcdScalar a = new VcdScalar(0, "a", "!");
        VcdScalar b = new VcdScalar(1, "b", "abcdefghijk"); // longer than 9: the string table
        codes.put("!", a);
        codes.put("abcdefghijk", b);
        assertSame(a, codes.find("!"));
        assertSame(b, codes.find("abcdefghijk"));
        assertNull(codes.find("?"));
        VcdTokens tk = new VcdTokens(new ByteArrayInputStream("1! 0abcdefghijk\n1?".getBytes(StandardCharsets.US_ASCII)),
                Path.of("t.vcd"));
        assertTrue(tk.next());
        assertSame(a, codes.find(tk, 1));
        assertTrue(tk.next());
        assertSame(b, codes.find(tk, 1));
        assertTrue(tk.next());
        CaptureFormatException e = assertThrows(CaptureFormatException.class, () -> codes.find(tk, 1));
        assertTrue(e.getMessage().contains("unknown identifier code '?'"), e.getMessage());
        assertTrue(e.getMessage().startsWith("t.vcd line 2: "), e.getMessage());
    }
}
