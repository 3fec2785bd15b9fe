package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;
import org.lanesift.chain.Chain;
import org.lanesift.plugin.PluginRegistry;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** A decoder that throws while following a live spool stops its chain, never the capture. */
class DecoderFailureTest {
    @TempDir
    Path tmp;

    @Test
    void throwingDecoderDoesNotStopTheCapture() throws Exception {
        Loopback lb = new Loopback(1 << 20);
        Recording rec = new Recording(lb.device());
        DeviceSimulator.Plan plan = new DeviceSimulator.Plan();
        plan.totalSamples = 4_000_000;
        Path dir = tmp.resolve("spool");
        AtomicInteger blocks = new AtomicInteger();
        Chain chain = Chain.builder(new PluginRegistry().add(new SpoolSourceProvider()))
                .add("cap", "spool", Map.of("dir", dir.toString(), "follow", true, "blockSamples", 4096))
                .outputs((id, port, block) -> {
                    if (blocks.incrementAndGet() == 20) {
                        throw new IllegalStateException("decoder fault injected by the test");
                    }
                })
                .build();
        Throwable[] chainFailure = {null};
        Thread decode = new Thread(() -> {
            try {
                chain.run();
            } catch (Throwable t) {
                chainFailure[0] = t;
            }
        }, "decode");
        decode.start();
        Thread dev = new Thread(new DeviceSimulator(rec, plan), "device");
        dev.start();
        Capture.Result r = new Capture(lb::host, dir, new Capture.Settings()).run();
        dev.join();
        decode.join(30_000);
        assertNotNull(chainFailure[0], "the chain reported the decoder's failure");
        assertEquals(20, blocks.get(), "decoding stopped at the fault");
        assertEquals(rec.bytes(), r.bytes(), "the capture kept every byte regardless");
        assertEquals(rec.digest(), Recording.spoolDigest(dir, 1, r.segments()));
        assertTrue(Files.exists(dir.resolve(SpoolFiles.CLOSED)));
        Replayed again = new Replayed(dir);
        assertEquals("[0,4000000)", again.runsText(), "and it decodes completely later");
    }
}
