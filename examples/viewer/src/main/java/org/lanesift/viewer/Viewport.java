package org.lanesift.viewer;

/**
 * Which span of time the waveform area shows: the time at its left edge and the time one pixel
 * column spans. Zooming keeps the time under a chosen column in place; panning moves by pixels.
 * Mutable, owned by the UI thread (or by the snapshot writer).
 */
public final class Viewport {
    /** Narrowest zoom: one pixel column per this fraction of a sample period is pointless below it. */
    public static final double MIN_FS_PER_PX = 1.0;

    private double leftFs;
    private double fsPerPx;
    private int widthPx;

    /**
     * A viewport.
     *
     * @param leftFs  time at the left edge, femtoseconds
     * @param fsPerPx time one column spans, femtoseconds
     * @param widthPx width of the waveform area, pixels
     */
    public Viewport(double leftFs, double fsPerPx, int widthPx) {
        this.leftFs = leftFs;
        this.fsPerPx = Math.max(MIN_FS_PER_PX, fsPerPx);
        this.widthPx = Math.max(1, widthPx);
    }

    /**
     * Time at the left edge.
     *
     * @return femtoseconds
     */
    public double leftFs() {
        return leftFs;
    }

    /**
     * Time one pixel column spans.
     *
     * @return femtoseconds per pixel
     */
    public double fsPerPx() {
        return fsPerPx;
    }

    /**
     * Width of the waveform area.
     *
     * @return pixels
     */
    public int widthPx() {
        return widthPx;
    }

    /**
     * Time just after the right edge.
     *
     * @return femtoseconds
     */
    public double rightFs() {
        return leftFs + fsPerPx * widthPx;
    }

    /**
     * Span shown.
     *
     * @return femtoseconds
     */
    public double spanFs() {
        return fsPerPx * widthPx;
    }

    /**
     * Column of a time (may be outside the area).
     *
     * @param tFs a time, femtoseconds
     * @return pixels from the left edge
     */
    public double xOf(double tFs) {
        return (tFs - leftFs) / fsPerPx;
    }

    /**
     * Time at a column.
     *
     * @param x pixels from the left edge
     * @return femtoseconds
     */
    public double timeOf(double x) {
        return leftFs + x * fsPerPx;
    }

    /**
     * Changes the width, keeping the left time and the scale.
     *
     * @param px new width, pixels
     */
    public void resize(int px) {
        widthPx = Math.max(1, px);
    }

    /**
     * Shows {@code [startFs, startFs + spanFs)} across the width.
     *
     * @param startFs left time, femtoseconds
     * @param spanFs  span, femtoseconds
     */
    public void show(double startFs, double spanFs) {
        fsPerPx = Math.max(MIN_FS_PER_PX, spanFs / widthPx);
        leftFs = startFs;
    }

    /**
     * Centres a time, keeping the scale.
     *
     * @param tFs the time, femtoseconds
     */
    public void centre(double tFs) {
        leftFs = tFs - spanFs() / 2;
    }

    /**
     * Zooms by a factor around a column: the time under it stays under it.
     *
     * @param factor  above 1 zooms out, below 1 zooms in
     * @param anchorX the column that keeps its time
     */
    public void zoom(double factor, double anchorX) {
        double t = timeOf(anchorX);
        fsPerPx = Math.max(MIN_FS_PER_PX, fsPerPx * factor);
        leftFs = t - anchorX * fsPerPx;
    }

    /**
     * Moves the view by a number of columns.
     *
     * @param px positive moves later in time
     */
    public void pan(double px) {
        leftFs += px * fsPerPx;
    }
}
