package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Replaying a spool from a start time: what lies before it is passed over through the segment
 * indexes without being read (the summary's {@code bytes} counts what was read), and what comes
 * out is exactly the full replay's samples and findings from the start on.
 */
class SpoolSeekTest {
    @TempDir
    Path tmp;

    private static Thread startDevice(Recording rec, DeviceSimulator.Plan plan) {
        Thread t = new Thread(new DeviceSimulator(rec, plan), "device");
        t.start();
        return t;
    }

    private Path framed(String name, DeviceSimulator.Plan plan) throws Exception {
        Loopback lb = new Loopback(1 << 20);
        Thread dev = startDevice(new Recording(lb.device()), plan);
        Path dir = tmp.resolve(name);
        new Capture(lb::host, dir, new Capture.Settings()).run();
        dev.join();
        return dir;
    }

    @Test
    void framedReplayFromAStartTimeSkipsToTheIndexedFrameAndKeepsOnlyLaterFindings() throws Exception {
        DeviceSimulator.Plan plan = new DeviceSimulator.Plan();
        plan.samplesPerFrame = 1000;
        plan.totalSamples = 200_000;
        plan.corrupt.add(30L); // before the start: not reported
        plan.drop.add(150L); // after it: reported
        Path dir = framed("framed", plan);
        long size = Files.size(SpoolFiles.segment(dir, 1));

        Replayed all = new Replayed(dir);
        assertEquals("[0,30000)[31000,150000)[151000,200000)", all.runsText());
        assertEquals(size, (long) all.field("spool-summary", "bytes"));

        // 1 MHz (the simulator's first rate): sample 120500 is at 120.5 ms
        Replayed from = new Replayed(dir, Map.of("start", "120.5ms"));
        assertEquals("[120500,150000)[151000,200000)", from.runsText());
        assertEquals(1, from.count("stream-gap"));
        assertEquals(0, from.count("stream-corrupt"));
        assertEquals(1000, from.field("stream-gap", "missingSamples"));
        long frameBytes = Framing.HEADER + 8 + 1000 + Framing.TRAILER;
        long read = (long) from.field("spool-summary", "bytes");
        // read from frame 120 on (frames 30 and 150 are missing from the stream: 1 corrupt, kept; 1 dropped)
        assertTrue(read <= size - 119 * frameBytes && read >= size - 121 * frameBytes, "read " + read + " of " + size + " bytes");
        assertEquals(79_500 - 1000, from.samples);
    }

    @Test
    void aStartInTheSecondSegmentPassesOverTheFirstAndClipsTheReconnectGap() throws Exception {
        Deque<Loopback> links = new ArrayDeque<>();
        Loopback first = new Loopback(1 << 20);
        Loopback second = new Loopback(1 << 20);
        links.add(first);
        links.add(second);
        DeviceSimulator.Plan p1 = new DeviceSimulator.Plan();
        p1.samplesPerFrame = 1000;
        p1.totalSamples = 50_000;
        p1.disconnectAfter = 8;
        DeviceSimulator.Plan p2 = new DeviceSimulator.Plan();
        p2.samplesPerFrame = 1000;
        p2.firstFrame = 20;
        p2.totalSamples = 10_000;
        Thread d1 = startDevice(new Recording(first.device()), p1);
        Path dir = tmp.resolve("two");
        Capture.Settings s = new Capture.Settings();
        s.reconnectMs = 5000;
        Capture c = new Capture(() -> {
            Loopback l = links.poll();
            if (l == null) {
                throw new DeviceException("gone");
            }
            if (l == second) {
                startDevice(new Recording(second.device()), p2);
            }
            return l.host();
        }, dir, s);
        s.reconnectMs = 600;
        c.run();
        d1.join();
        long seg2 = Files.size(SpoolFiles.segment(dir, 2));

        assertEquals("[0,9000)[20000,30000)", new Replayed(dir).runsText());
        Replayed inGap = new Replayed(dir, Map.of("start", "15000samples"));
        assertEquals("[20000,30000)", inGap.runsText());
        assertEquals(1, inGap.count("stream-gap"));
        assertEquals(5000, inGap.field("stream-gap", "missingSamples"), "the gap from the start time on");
        assertEquals(seg2, (long) inGap.field("spool-summary", "bytes"), "segment 1 was not read");

        Replayed late = new Replayed(dir, Map.of("start", "25000samples"));
        assertEquals("[25000,30000)", late.runsText());
        assertEquals(0, late.count("stream-gap"));
        assertTrue(late.field("spool-summary", "bytes") < seg2 / 2 + 2 * 1022);
    }

    @Test
    void rawReplayFromAStartTimeSkipsStraightToTheSample() throws Exception {
        Loopback lb = new Loopback(1 << 16);
        DeviceSimulator.Plan plan = new DeviceSimulator.Plan();
        plan.raw = true;
        plan.totalSamples = 777_777;
        Thread dev = startDevice(new Recording(lb.device()), plan);
        Path dir = tmp.resolve("raw");
        Capture.Settings s = new Capture.Settings();
        s.raw = true;
        s.rateHz = 2e6;
        new Capture(lb::host, dir, s).run();
        dev.join();
        Replayed from = new Replayed(dir, Map.of("start", "250ms")); // 2 MHz: sample 500000
        assertEquals("[500000,777777)", from.runsText());
        assertEquals(277_777, (long) from.field("spool-summary", "bytes"));
    }

    @Test
    void aNegativeStartNamesTheOption() throws Exception {
        DeviceSimulator.Plan plan = new DeviceSimulator.Plan();
        plan.totalSamples = 10_000;
        Path dir = framed("neg", plan);
        Exception e = assertThrows(RuntimeException.class, () -> new Replayed(dir, Map.of("start", "-1s")));
        String m = e.getMessage() + " " + e.getCause();
        assertTrue(m.contains("'start'"), m);
    }
}
