package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.time.Duration;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.Poll;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.Chain;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginRegistry;

/**
 * A follower that opens a spool before the device has identified itself waits for the final
 * header: it never times samples with the provisional rate written before the exchange.
 */
class ProvisionalHeaderTest {
    /** True while some thread sleeps in the spool source's wait for a final header. */
    static boolean followerWaits() {
        for (Map.Entry<Thread, StackTraceElement[]> e : Thread.getAllStackTraces().entrySet()) {
            if (e.getKey().getState() != Thread.State.TIMED_WAITING) {
                continue;
            }
            for (StackTraceElement f : e.getValue()) {
                if (f.getClassName().equals(SpoolSourceStage.class.getName()) && f.getMethodName().equals("start")) {
                    return true;
                }
            }
        }
        return false;
    }

    @TempDir
    Path tmp;

    @Test
    void aFollowerWaitsForTheRateTheDeviceReports() throws Exception {
        Path dir = tmp.resolve("spool");
        SpoolWriter w = new SpoolWriter(dir, new SpoolHeader(true, 1, 8, "", ""), true);
        assertTrue(SpoolHeader.isProvisional(dir));
        List<LogicBlock> got = new ArrayList<>();
        Chain chain = Chain.builder(new PluginRegistry().add(new SpoolSourceProvider()))
                .add("cap", "spool", Map.of("dir", dir.toString(), "follow", true, "blockSamples", 64))
                .outputs((id, port, block) -> {
                    if (port.equals("ch0")) {
                        got.add((LogicBlock) block);
                    }
                })
                .build();
        Thread decode = new Thread(chain::run, "decode");
        decode.start();
        // the follower is up and waits, seeing only the provisional header
        Poll.until(Duration.ofSeconds(20), "the spool follower to wait for the final header", ProvisionalHeaderTest::followerWaits);
        w.updateHeader(new SpoolHeader(true, 50e6, 8, "sim", "1"));
        assertFalse(SpoolHeader.isProvisional(dir));
        byte[] payload = new byte[8 + 256];   // sample index 0, then 256 samples
        Framing.putU64(payload, 0, 0);
        byte[] frame = Framing.encode(FrameType.DATA, 0, payload);
        w.append(frame, 0, frame.length);
        w.close("stop");
        decode.join(20_000);
        assertFalse(decode.isAlive(), "the follower ended with the closed spool");
        assertFalse(got.isEmpty());
        assertEquals(20e6, got.get(0).periodFs(), 1e-6, "50 MS/s from the final header, not 1 Hz");
        chain.close();
    }
}
