package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

class ESeriesTest {
    // IEC 60063 (preferred number series for resistors and capacitors), tables of E12, E24 and E96;
    // typed in from the standard's tables (from memory: no copy of the document at hand). The E96
    // implementation is the rounded geometric series, so this list checks it independently.
    static final int[] IEC_E12 = {10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82};
    static final int[] IEC_E24 = {10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91};
    static final int[] IEC_E96 = {
        100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169, 174,
        178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309,
        316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511, 523, 536, 549,
        562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976};

    static int[] times10(int[] a) {
        int[] b = new int[a.length];
        for (int i = 0; i < a.length; i++) {
            b[i] = a[i] * 10;
        }
        return b;
    }

    @Test
    void seriesMatchIec60063() {
        assertArrayEquals(times10(IEC_E12), ESeries.E12.mantissas());
        assertArrayEquals(times10(IEC_E24), ESeries.E24.mantissas());
        assertArrayEquals(IEC_E96, ESeries.E96.mantissas());
        assertEquals(96, IEC_E96.length);
    }

    @Test
    void e12IsEveryOtherE24Value() {
        // structure of IEC 60063: each series is every other value of the next finer one
        int[] e24 = ESeries.E24.mantissas();
        int[] e12 = ESeries.E12.mantissas();
        for (int i = 0; i < e12.length; i++) {
            assertEquals(e24[2 * i], e12[i]);
        }
    }

    @Test
    void snapsOnALogScaleAcrossDecades() {
        // worked by hand: 450 lies between E24 430 and 470; ln(450/430) = 0.0455 > ln(470/450) = 0.0435, so 470
        assertArrayEquals(new double[] {430, 470, 470}, ESeries.E24.snap(450), 1e-9);
        // E96 442 / 453: ln(453/450) = 0.0066 < ln(450/442) = 0.0179, so 453
        assertArrayEquals(new double[] {442, 453, 453}, ESeries.E96.snap(450), 1e-9);
        // 950 ohm (20:1): E96 931 / 953 -> 953
        assertEquals(953, ESeries.E96.snap(950)[2], 1e-9);
        // across a decade: 9.9 k between 9.76 k and 10 k -> 10 k
        assertArrayEquals(new double[] {9760, 10000, 10000}, ESeries.E96.snap(9900), 1e-9);
        // exact values stay; small values work
        assertArrayEquals(new double[] {4.7, 4.7, 4.7}, ESeries.E12.snap(4.7), 1e-12);
        assertEquals(0.1, ESeries.E24.snap(0.1)[2], 1e-15);
    }
}
