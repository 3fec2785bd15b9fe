package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.function.ToIntFunction;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;

class NoteLayoutTest {
    /** Six pixels a character: a fixed-width measure the tests can reason about. */
    private static final ToIntFunction<String> MONO = s -> 6 * s.length();

    private static Annotation note(long startFs, long endFs, String label) {
        return Annotation.on("t", "k").span(startFs, endFs).label(label).severity(Severity.INFO).build();
    }

    @Test
    void boxesSitAtTheirTimesAndLabelsFitInsideThem() {
        // 1 ns a pixel; a 100 ns box from 50 ns is columns 50..150
        Viewport v = new Viewport(0, 1_000_000, 1000);
        NoteTrack t = new NoteTrack("t", List.of(note(50_000_000, 150_000_000, "packet 0x39 ok"), note(400_000_000, 410_000_000, "hsync")));
        List<NoteLayout.Placed> p = NoteLayout.layout(t, v, MONO, 2);
        assertEquals(2, p.size());
        assertEquals(50, p.get(0).x0());
        assertEquals(150, p.get(0).x1());
        assertEquals("packet 0x39 ok", p.get(0).label());
        assertEquals(400, p.get(1).x0());
        // 10 px wide, 6 px inside after padding: "hsync" (30 px) cannot show even two characters and an ellipsis
        assertNull(p.get(1).label());
    }

    @Test
    void overlappingNotesTakeSeparateLanesAndTheRestAreCountedAsCrowded() {
        Random rnd = new Random(3);
        List<Annotation> notes = new ArrayList<>();
        for (int i = 0; i < 400; i++) {
            long s = rnd.nextInt(1_000_000) * 1000L;
            notes.add(note(s, s + rnd.nextInt(50_000) * 1000L, "n" + i));
        }
        Viewport v = new Viewport(0, 1_000_000, 1000);
        List<NoteLayout.Placed> p = NoteLayout.layout(new NoteTrack("t", notes), v, MONO, 3);
        assertEquals(400, p.size(), "every note in view is placed or counted");
        for (int i = 0; i < p.size(); i++) {
            for (int j = i + 1; j < p.size(); j++) {
                NoteLayout.Placed a = p.get(i);
                NoteLayout.Placed b = p.get(j);
                if (!a.crowded() && !b.crowded() && a.lane() == b.lane()) {
                    assertTrue(a.x1() < b.x0() || b.x1() < a.x0(), "boxes " + a + " and " + b + " overlap in one lane");
                }
            }
        }
        assertTrue(p.stream().anyMatch(NoteLayout.Placed::crowded), "400 notes in 1000 px need more than 3 lanes");
        assertTrue(p.stream().allMatch(x -> x.lane() >= 0 && x.lane() < 3));
    }

    @Test
    void aLongNoteThatStartedBeforeTheViewIsStillFound() {
        List<Annotation> notes = new ArrayList<>();
        notes.add(note(0, 10_000_000_000L, "whole capture"));
        for (int i = 0; i < 1000; i++) {
            notes.add(note(i * 1000L, i * 1000L + 10, "tick"));
        }
        Viewport v = new Viewport(5_000_000_000.0, 1000, 500);
        List<NoteLayout.Placed> p = NoteLayout.layout(new NoteTrack("t", notes), v, MONO, 2);
        assertEquals(1, p.size());
        assertEquals("whole capture", p.get(0).label());
        assertTrue(p.get(0).x0() < 0 && p.get(0).x1() > 500);
    }

    @Test
    void labelsAreCutWithAnEllipsisOrLeftOut() {
        assertEquals("abcdef", NoteLayout.fit("abcdef", 36, MONO));
        assertEquals("abc\u2026", NoteLayout.fit("abcdef", 24, MONO));
        assertEquals("ab\u2026", NoteLayout.fit("abcdef", 18, MONO));
        assertNull(NoteLayout.fit("abcdef", 17, MONO));
        assertFalse(NoteLayout.fit("abcdef", 30, MONO).equals("abcdef"));
    }
}
