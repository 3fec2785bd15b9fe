package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.List;
import java.util.Map;
import java.util.Properties;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.annotation.Annotation;

/**
 * A spool of three segments whose device counts its sample index from 0 again after each
 * reconnect: the replay places each segment after the one before by the wall-clock time between
 * the previous segment's close marker and the segment's opening, read per segment (the source
 * reads each close marker once, not after every chunk). The clock times are set by hand, so the
 * estimated gaps are exact numbers here, and every sample is checked against the simulator's
 * function of the device's own index.
 */
class ReconnectClockReplayTest {
    @TempDir
    Path tmp;

    @Test
    void eachReconnectGapComesFromItsOwnSegmentsClockTimes() throws Exception {
        Deque<Loopback> links = new ArrayDeque<>();
        List<DeviceSimulator.Plan> plans = new ArrayList<>();
        long[] samplesPerSegment = {9000, 5000, 3000};
        for (long n : samplesPerSegment) {
            links.add(new Loopback(1 << 20));
            DeviceSimulator.Plan p = new DeviceSimulator.Plan();
            p.samplesPerFrame = 1000;
            p.totalSamples = 50_000;
            p.disconnectAfter = n / 1000 - 1; // frames 0 .. n/1000-1, each device counting from 0
            if (plans.size() == samplesPerSegment.length - 1) {
                p.totalSamples = n;
                p.disconnectAfter = -1;
            }
            plans.add(p);
        }
        Path dir = tmp.resolve("spool");
        Capture.Settings s = new Capture.Settings();
        s.reconnectMs = 5000;
        List<Thread> devices = new ArrayList<>();
        Capture c = new Capture(() -> {
            Loopback l = links.poll();
            if (l == null) {
                throw new DeviceException("gone");
            }
            Thread t = new Thread(new DeviceSimulator(l.device(), plans.get(devices.size())), "device");
            devices.add(t);
            t.start();
            return l.host();
        }, dir, s);
        s.reconnectMs = 600; // after the last link ends, give up quickly
        Capture.Result r = c.run();
        for (Thread t : devices) {
            t.join();
        }
        assertEquals(3, r.segments());
        double rateHz = SpoolHeader.read(dir).rateHz();
        // segment 2 opened 7 ms after segment 1 closed, segment 3 13 ms after segment 2 closed
        setClock(SpoolFiles.segmentClosed(dir, 1), "closedEpochMs", 1_000_000);
        setClock(SpoolFiles.segmentInfo(dir, 2), "openedEpochMs", 1_000_007);
        setClock(SpoolFiles.segmentClosed(dir, 2), "closedEpochMs", 1_000_100);
        setClock(SpoolFiles.segmentInfo(dir, 3), "openedEpochMs", 1_000_113);
        long gap1 = Math.round(0.007 * rateHz);
        long gap2 = Math.round(0.013 * rateHz);

        Replayed p = new Replayed(dir, Map.of(), true);
        long s2 = 9000 + gap1;
        long s3 = s2 + 5000 + gap2;
        assertEquals("[0,9000)[" + s2 + "," + (s2 + 5000) + ")[" + s3 + "," + (s3 + 3000) + ")", p.runsText());
        List<Annotation> gaps = p.annotations.stream().filter(a -> a.kind().equals("stream-gap")).toList();
        assertEquals(2, gaps.size(), gaps.toString());
        assertEquals(gap1, ((Number) gaps.get(0).fields().get("missingSamples").value()).longValue());
        assertEquals(gap2, ((Number) gaps.get(1).fields().get("missingSamples").value()).longValue());
        for (Annotation g : gaps) {
            assertEquals("reconnect", g.fields().get("cause").value());
            assertEquals("estimate", g.fields().get("length").value());
        }
    }

    private static void setClock(Path file, String key, long epochMs) throws Exception {
        Properties p = SpoolFiles.read(file);
        p.setProperty(key, Long.toString(epochMs));
        SpoolFiles.writeAtomically(file, p);
    }
}
