import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.FloatBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;

/**
 * The memory-speed yardstick of vs-script.sh: reads a file of little-endian float32 values front
 * to back through one reused 4 MiB buffer and sums them, the least any decoder of the file must
 * do. Prints the sum (so the work is not optimised away), the bytes and the time of the read loop
 * in seconds, JVM start excluded. Run as a single-file program: {@code java ReadSum.java FILE}.
 */
public final class ReadSum {
    private ReadSum() {
    }

    public static void main(String[] args) throws IOException {
        long t0 = System.nanoTime();
        ByteBuffer buf = ByteBuffer.allocateDirect(4 << 20).order(ByteOrder.LITTLE_ENDIAN);
        double sum = 0;
        long bytes = 0;
        try (FileChannel ch = FileChannel.open(Path.of(args[0]), StandardOpenOption.READ)) {
            while (ch.read(buf) > 0 || buf.position() > 0) {
                buf.flip();
                FloatBuffer f = buf.asFloatBuffer();
                int n = f.remaining();
                float s = 0;
                for (int i = 0; i < n; i++) {
                    s += f.get(i);
                }
                sum += s;
                bytes += 4L * n;
                buf.position(4 * n);
                buf.compact();
                if (n == 0) {
                    break; // fewer than 4 bytes left
                }
            }
        }
        double seconds = (System.nanoTime() - t0) / 1e9;
        System.out.printf(java.util.Locale.ROOT, "sum %.6e bytes %d seconds %.3f%n", sum, bytes, seconds);
    }
}
