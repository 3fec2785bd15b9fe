package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.ExternalTool;
import org.lanesift.testkit.Poll;
import org.junit.jupiter.api.io.TempDir;

/**
 * Through a real pseudo-terminal pair made by socat (Debian package socat): jSerialComm opens one
 * end for the capture, the simulator (also on jSerialComm) drives the other. Size: system
 * property {@code lanesift.pty.mb} (default 8; the 100 MB run is {@code -Dlanesift.pty.mb=100}).
 * Skips without socat unless env CI=true, where it fails.
 */
class PtyCaptureTest {
    @TempDir
    Path tmp;

    /** Starts socat making a linked pty pair, and waits until both links exist. */
    static Process ptyPair(Path a, Path b, Path log) throws Exception {
        Path socat = ExternalTool.require("socat");
        Process p = new ProcessBuilder(socat.toString(), "-d", "-d", "pty,raw,echo=0,link=" + a, "pty,raw,echo=0,link=" + b)
                .redirectErrorStream(true).redirectOutput(log.toFile()).start();
        Poll.until(Duration.ofSeconds(5), "socat's pty pair " + a + " and " + b, () -> Files.exists(a) && Files.exists(b));
        return p;
    }

    @Test
    void streamThroughAPtyIsSpooledByteExactWithFaultsAnnotated() throws Exception {
        Path a = tmp.resolve("ptyA");
        Path b = tmp.resolve("ptyB");
        Process socat = ptyPair(a, b, tmp.resolve("socat.log"));
        try {
            JSerialCommPorts ports = new JSerialCommPorts();
            SerialLink deviceEnd = ports.open(b.toString(), 115200);
            Recording rec = new Recording(deviceEnd);
            DeviceSimulator.Plan plan = new DeviceSimulator.Plan();
            long mb = Long.getLong("lanesift.pty.mb", 8);
            plan.totalSamples = mb * 1_000_000L;
            plan.closeAtEnd = false;
            plan.drop.add(3L);
            plan.corrupt.add(7L);
            DeviceSimulator sim = new DeviceSimulator(rec, plan);
            Thread dev = new Thread(sim, "device");
            dev.start();
            Path dir = tmp.resolve("spool");
            Capture c = new Capture(() -> ports.open(a.toString(), 115200), dir, new Capture.Settings());
            Capture.Result[] result = {null};
            Exception[] failure = {null};
            Thread cap = new Thread(() -> {
                try {
                    result[0] = c.run();
                } catch (Exception e) {
                    failure[0] = e;
                }
            }, "capture");
            long t0 = System.nanoTime();
            cap.start();
            dev.join(600_000);
            Poll.until(Duration.ofSeconds(120), "the spool to hold every byte the device sent",
                    () -> c.writer() != null && c.writer().bytes() >= rec.bytes());
            double secs = (System.nanoTime() - t0) / 1e9;
            System.out.printf("pty: %d bytes in %.2f s = %.1f MB/s%n", rec.bytes(), secs, rec.bytes() / 1e6 / secs);
            c.stop();
            cap.join(30_000);
            sim.stop();
            deviceEnd.close();
            assertEquals(null, failure[0]);
            assertEquals(rec.bytes(), result[0].bytes(), "bytes sent = bytes spooled");
            assertEquals(rec.digest(), Recording.spoolDigest(dir, 1, result[0].segments()), "SHA-256 end to end");
            Replayed p = new Replayed(dir);
            assertEquals(2, p.count("stream-gap"));
            assertEquals(1, p.count("stream-corrupt"));
            assertEquals(plan.totalSamples - 2 * plan.samplesPerFrame, p.samples);
        } finally {
            socat.destroy();
            socat.waitFor();
        }
    }
}
