package org.lanesift.kit;

/**
 * A program for {@link FramePicturesTest}: encodes a picture from a shutdown hook, as a run does
 * when Ctrl-C stops it, and prints how many PNG bytes it made or what went wrong.
 */
final class PictureAtShutdown {
    private PictureAtShutdown() {
    }

    public static void main(String[] args) {
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            try {
                byte[] png = FramePictures.png(3, 2, new int[] {1, 2, 3, 4, 5, 6});
                System.out.println("png " + png.length);
            } catch (RuntimeException e) {
                System.out.println("failed: " + e);
            }
            System.out.flush();
        }));
        System.exit(0);
    }
}
