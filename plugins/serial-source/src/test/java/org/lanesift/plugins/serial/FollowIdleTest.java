package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.Chain;
import org.lanesift.chain.StageFailure;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginRegistry;

/**
 * Issue 18: following a spool whose capture died (data, then nothing, never closed) ends after the
 * documented idle time ({@code followIdleSeconds}) with a device failure, keeping what was decoded,
 * instead of waiting for ever; so does waiting for a header that never becomes final.
 */
class FollowIdleTest {
    @TempDir
    Path tmp;

    private static Chain follower(Path dir, List<LogicBlock> got) {
        return Chain.builder(new PluginRegistry().add(new SpoolSourceProvider()))
                .add("cap", "spool", Map.of("dir", dir.toString(), "follow", true, "blockSamples", 64, "followIdleSeconds", 0.5))
                .outputs((id, port, block) -> {
                    if (port.equals("ch0")) {
                        got.add((LogicBlock) block);
                    }
                })
                .build();
    }

    @Test
    void aDeadCaptureEndsTheFollowerAfterTheIdleTime() throws Exception {
        Path dir = tmp.resolve("spool");
        SpoolWriter w = new SpoolWriter(dir, new SpoolHeader(true, 50e6, 8, "sim", "1"), false);
        byte[] payload = new byte[8 + 256];
        Framing.putU64(payload, 0, 0);
        byte[] frame = Framing.encode(FrameType.DATA, 0, payload);
        w.append(frame, 0, frame.length);
        // the capture dies here: no close, no more data
        List<LogicBlock> got = new ArrayList<>();
        Chain chain = follower(dir, got);
        StageFailure f = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> assertThrows(StageFailure.class, chain::run));
        assertTrue(f.getCause() instanceof DeviceException, String.valueOf(f.getCause()));
        assertTrue(f.getCause().getMessage().contains("nothing new for 0.500 s and the capture never closed the spool"), f.getCause().getMessage());
        assertEquals(256, got.stream().mapToInt(LogicBlock::length).sum(), "what was written before is decoded");
        chain.close();
    }

    @Test
    void aHeaderThatNeverBecomesFinalEndsTheWait() throws Exception {
        Path dir = tmp.resolve("spool");
        new SpoolWriter(dir, new SpoolHeader(true, 1, 8, "", ""), true);
        Chain chain = follower(dir, new ArrayList<>());
        StageFailure f = assertTimeoutPreemptively(Duration.ofSeconds(30), () -> assertThrows(StageFailure.class, chain::run));
        assertTrue(f.getCause().getMessage().contains("stopped waiting for the capture to start"), f.getCause().getMessage());
        chain.close();
    }
}
