package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.atomic.AtomicInteger;
import java.time.Duration;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.ToolHarness;
import org.lanesift.testkit.Poll;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code lanesift simulate-device} on one end of a socat pty pair (Debian package socat), a
 * capture on the other, as the README shows. Skips without socat unless env CI=true.
 */
class DeviceSimToolTest {
    @TempDir
    Path tmp;

    @Test
    void simulatorToolOnAPtyIsCapturedFromTheOtherEndAndStopsOnTheHostsStop() throws Exception {
        Path a = tmp.resolve("ttyHost");
        Path b = tmp.resolve("ttyDevice");
        Process socat = PtyCaptureTest.ptyPair(a, b, tmp.resolve("socat.log"));
        try {
            ByteArrayOutputStream err = new ByteArrayOutputStream();
            AtomicInteger code = new AtomicInteger(-1);
            Thread dev = new Thread(() -> {
                ToolHarness.Result r = ToolHarness.of(new DeviceSimTool()).option("port", b.toString()).option("mb", "2")
                        .option("faults", "drop=5").run();
                err.writeBytes(r.err().getBytes(StandardCharsets.UTF_8));
                code.set(r.code());
            }, "simulate-device");
            dev.start();
            Path dir = tmp.resolve("spool");
            JSerialCommPorts ports = new JSerialCommPorts();
            Capture c = new Capture(() -> ports.open(a.toString(), 115200), dir, new Capture.Settings());
            Capture.Result[] result = {null};
            Thread cap = new Thread(() -> {
                try {
                    result[0] = c.run();
                } catch (Exception e) {
                    throw new IllegalStateException(e);
                }
            }, "capture");
            cap.start();
            int spf = new DeviceSimulator.Plan().samplesPerFrame;
            long frames = (2_000_000L + spf - 1) / spf;
            long wantFrames = frames - 1; // frame 5 dropped
            Poll.until(Duration.ofSeconds(60), "the spool to hold " + wantFrames + " frames",
                    () -> c.writer() != null && c.writer().frames() >= wantFrames);
            assertTrue(dev.isAlive(), "the simulator keeps the port open after the last sample until the host stops it");
            c.stop(); // sends STOP
            cap.join(30_000);
            dev.join(30_000);
            assertEquals(0, code.get(), err.toString(StandardCharsets.UTF_8));
            assertTrue(err.toString(StandardCharsets.UTF_8).contains("the host stopped the stream"), err.toString(StandardCharsets.UTF_8));
            assertEquals(wantFrames, result[0].frames());
            Replayed p = new Replayed(dir);
            assertEquals(1, p.count("stream-gap"));
            assertEquals(2_000_000L - spf, p.samples);
        } finally {
            socat.destroy();
            socat.waitFor();
        }
    }

    @Test
    void withoutAPortItSaysWhatIsMissing() {
        ToolHarness.Result r = ToolHarness.of(new DeviceSimTool(new FakePorts())).option("mb", "1").run();
        assertEquals(2, r.code());
        assertEquals("missing required option '--port=NAME'", r.err().trim());
    }

    /** Ports that are never there. */
    static final class FakePorts implements SerialPorts {
        @Override
        public java.util.List<PortInfo> list() {
            return java.util.List.of();
        }

        @Override
        public SerialLink open(String name, int baudRate) {
            throw new DeviceException("--port " + name + ": no such port");
        }
    }

    @Test
    void aPortThatCannotBeOpenedIsExitOneNamingIt() {
        ToolHarness.Result r = ToolHarness.of(new DeviceSimTool(new FakePorts())).option("port", "/dev/nothing-here").run();
        assertEquals(1, r.code());
        assertTrue(r.err().contains("/dev/nothing-here"), r.err());
    }
}
