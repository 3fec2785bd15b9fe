package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

class ViewportTest {
    @Test
    void zoomKeepsTheTimeUnderTheAnchorColumn() {
        Viewport v = new Viewport(1_000, 10, 800);
        double before = v.timeOf(200);
        v.zoom(0.5, 200);
        assertEquals(before, v.timeOf(200), 1e-9);
        assertEquals(5, v.fsPerPx(), 1e-12);
        v.zoom(8, 200);
        assertEquals(before, v.timeOf(200), 1e-9);
        assertEquals(40, v.fsPerPx(), 1e-12);
    }

    @Test
    void panShowAndCentreMoveTheAxis() {
        Viewport v = new Viewport(0, 10, 100);
        v.pan(25);
        assertEquals(250, v.leftFs(), 1e-9);
        assertEquals(1250, v.rightFs(), 1e-9);
        v.show(5_000, 2_000);
        assertEquals(20, v.fsPerPx(), 1e-12);
        assertEquals(5_000 + 20 * 37.5, v.timeOf(37.5), 1e-9);
        assertEquals(37.5, v.xOf(v.timeOf(37.5)), 1e-9);
        v.centre(100_000);
        assertEquals(100_000, v.timeOf(50), 1e-9);
        v.zoom(1e-9, 0);
        assertEquals(Viewport.MIN_FS_PER_PX, v.fsPerPx(), 0);
    }
}
