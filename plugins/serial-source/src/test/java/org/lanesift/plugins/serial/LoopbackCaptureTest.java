package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.Properties;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Simulator over the in-memory loopback, capture into a spool, replay with the spool source. */
class LoopbackCaptureTest {
    @TempDir
    Path tmp;

    private static Thread startDevice(Recording rec, DeviceSimulator.Plan plan) {
        Thread t = new Thread(new DeviceSimulator(rec, plan), "device");
        t.start();
        return t;
    }

    @Test
    void cleanStreamIsSpooledByteExactAndReplaysEverySample() throws Exception {
        Loopback lb = new Loopback(1 << 20);
        Recording rec = new Recording(lb.device());
        DeviceSimulator.Plan plan = new DeviceSimulator.Plan();
        plan.totalSamples = 3_000_000 + 123; // not a whole number of frames
        Thread dev = startDevice(rec, plan);
        Path dir = tmp.resolve("spool");
        Capture.Result r = new Capture(lb::host, dir, new Capture.Settings()).run();
        dev.join();
        assertEquals("disconnect", r.reason(), "the simulator closes the link at the end");
        assertEquals(rec.bytes(), r.bytes());
        assertEquals(rec.digest(), Recording.spoolDigest(dir, 1, r.segments()));
        assertNotNull(r.device());
        assertEquals("lanesift-sim", SpoolHeader.read(dir).model());
        Replayed p = new Replayed(dir);
        assertEquals("[0,3000123)", p.runsText());
        assertEquals(0, p.count("stream-gap"));
        assertEquals(0, p.count("stream-corrupt"));
        Properties closed = SpoolFiles.read(dir.resolve(SpoolFiles.CLOSED));
        assertEquals(Long.toString(r.bytes()), closed.getProperty("bytes"));
    }

    @Test
    void everyInjectedFaultIsAnnotatedAndNoBitsAreInvented() throws Exception {
        Loopback lb = new Loopback(1 << 20);
        Recording rec = new Recording(lb.device());
        DeviceSimulator.Plan plan = new DeviceSimulator.Plan();
        plan.samplesPerFrame = 1000;
        plan.totalSamples = 40_000;
        plan.drop.add(5L);
        plan.corrupt.add(10L);
        plan.duplicate.add(15L);
        plan.stallMs.put(20L, 400L);
        Thread dev = startDevice(rec, plan);
        Path dir = tmp.resolve("spool");
        Capture.Result r = new Capture(lb::host, dir, new Capture.Settings()).run();
        dev.join();
        assertEquals(rec.digest(), Recording.spoolDigest(dir, 1, r.segments()), "all bytes that arrived are kept, corrupt ones too");
        assertEquals(2, r.gaps(), "the capture-side index sees the two sequence jumps");
        assertEquals(1, r.crcFailures() > 0 ? 1 : 0);
        Replayed p = new Replayed(dir);
        // frames 5 and 10 are missing, frame 15 once only; the stall loses nothing
        assertEquals("[0,5000)[6000,10000)[11000,40000)", p.runsText());
        assertEquals(2, p.count("stream-gap"));
        assertEquals(1, p.count("stream-corrupt"));
        assertEquals(1, p.count("stream-duplicate"));
        var gap = p.annotations.stream().filter(a -> a.kind().equals("stream-gap")).findFirst().orElseThrow();
        assertEquals(1000, gap.fields().get("missingSamples").asDouble());
        assertEquals(1, gap.fields().get("missingFrames").asDouble());
        assertEquals(Math.round(5000 * 1e15 / 1e6), gap.startFs(), "the gap spans the missing samples' time");
        assertEquals(Math.round(6000 * 1e15 / 1e6), gap.endFs());
    }

    @Test
    void disconnectClosesTheSegmentAndReconnectResumesInANewOne() throws Exception {
        Deque<Loopback> links = new ArrayDeque<>();
        Loopback first = new Loopback(1 << 20);
        Loopback second = new Loopback(1 << 20);
        links.add(first);
        links.add(second);
        Recording rec1 = new Recording(first.device());
        Recording rec2 = new Recording(second.device());
        DeviceSimulator.Plan p1 = new DeviceSimulator.Plan();
        p1.samplesPerFrame = 1000;
        p1.totalSamples = 50_000;
        p1.disconnectAfter = 8;
        DeviceSimulator.Plan p2 = new DeviceSimulator.Plan();
        p2.samplesPerFrame = 1000;
        p2.firstFrame = 20;
        p2.totalSamples = 10_000;
        Thread d1 = startDevice(rec1, p1);
        Path dir = tmp.resolve("spool");
        Capture.Settings s = new Capture.Settings();
        s.reconnectMs = 5000;
        Capture c = new Capture(() -> {
            Loopback l = links.poll();
            if (l == null) {
                throw new DeviceException("gone");
            }
            if (l == second) {
                startDevice(rec2, p2);
            }
            return l.host();
        }, dir, s);
        s.reconnectMs = 600; // after the second link ends, give up quickly
        Capture.Result r = c.run();
        d1.join();
        assertEquals(2, r.segments());
        assertEquals(rec1.digest(), Recording.spoolDigest(dir, 1, 1));
        assertEquals(rec2.digest(), Recording.spoolDigest(dir, 2, 2));
        assertTrue(Files.exists(SpoolFiles.segmentClosed(dir, 1)));
        assertEquals("disconnect", SpoolFiles.read(SpoolFiles.segmentClosed(dir, 1)).getProperty("reason"));
        Replayed p = new Replayed(dir);
        assertEquals("[0,9000)[20000,30000)", p.runsText());
        assertEquals(1, p.count("stream-gap"));
        assertEquals("reconnect", p.annotations.stream().filter(a -> a.kind().equals("stream-gap")).findFirst().orElseThrow()
                .fields().get("cause").value());
    }

    @Test
    void rawModeSpoolsAndReplaysPlainBytes() throws Exception {
        Loopback lb = new Loopback(1 << 16);
        Recording rec = new Recording(lb.device());
        DeviceSimulator.Plan plan = new DeviceSimulator.Plan();
        plan.raw = true;
        plan.totalSamples = 777_777;
        Thread dev = startDevice(rec, plan);
        Path dir = tmp.resolve("raw");
        Capture.Settings s = new Capture.Settings();
        s.raw = true;
        s.rateHz = 2e6;
        Capture.Result r = new Capture(lb::host, dir, s).run();
        dev.join();
        assertEquals(rec.digest(), Recording.spoolDigest(dir, 1, 1));
        assertEquals(777_777, r.bytes());
        Replayed p = new Replayed(dir);
        assertEquals("[0,777777)", p.runsText());
    }
}
