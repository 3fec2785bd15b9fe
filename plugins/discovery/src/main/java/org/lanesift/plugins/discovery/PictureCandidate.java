package org.lanesift.plugins.discovery;

/**
 * A candidate picture: the data bursts decoded with one pixel format and cut into lines.
 *
 * @param format       pixel format
 * @param lineLength   pixels per line, from the autocorrelation peak of the pixel values
 * @param lines        whole lines
 * @param rgb          0xRRGGBB pixels, {@code lineLength * lines}
 * @param smoothness   mean of the horizontal and vertical neighbour-pixel correlations (-1 to 1), less
 *                     {@link PictureFinder#DEPTH_PENALTY} where a same-size reading explains the bits better
 * @param horizontal   correlation of each pixel with its right neighbour
 * @param vertical     correlation of each pixel with the one below
 * @param hypothesis   the framing hypothesis it was decoded under (word length, bit order, lanes)
 */
record PictureCandidate(PixelFormat format, int lineLength, int lines, int[] rgb, double smoothness, double horizontal,
                        double vertical, String hypothesis) {
}
