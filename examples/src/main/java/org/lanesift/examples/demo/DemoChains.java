package org.lanesift.examples.demo;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.lanesift.runner.link.LinkChains;

/**
 * The chain files the demo writes and runs, built by the runner's {@link LinkChains} (the same
 * three passes the {@code sift} command runs): (1) estimate the skew between the two legs of
 * every pair, (2) correct it and estimate the skew of every data pair against the clock pair,
 * (3) correct both and decode. Every path in them is relative to the chain file's folder, so the
 * output folder can be moved or copied whole.
 */
final class DemoChains {
    private DemoChains() {
    }

    /** Pixel link pairs: output name, P leg, N leg. */
    static final String[][] PIXEL_PAIRS = {{"CLK", "CLK_P", "CLK_N"}, {"D0", "D0_P", "D0_N"}, {"D1", "D1_P", "D1_N"},
        {"D2", "D2_P", "D2_N"}};
    /** Packet link pairs. */
    static final String[][] PACKET_PAIRS = {{"HSCLK", "HSCLK_P", "HSCLK_N"}, {"L0", "L0_P", "L0_N"}, {"L1", "L1_P", "L1_N"}};

    /** A path as a chain file in {@code chainDir} names it: relative, '/' between names on every system. */
    private static String rel(Path chainDir, Path p) {
        Path r = chainDir.toAbsolutePath().normalize().relativize(p.toAbsolutePath().normalize());
        return r.toString().replace(java.io.File.separatorChar, '/');
    }

    private static LinkChains.Capture capture(Path chainDir, String plugin, Path file, String[][] pairs) {
        List<LinkChains.Pair> list = new ArrayList<>();
        for (String[] p : pairs) {
            list.add(new LinkChains.Pair(p[0], p[1], p[2]));
        }
        return new LinkChains.Capture(plugin, rel(chainDir, file), list);
    }

    static Map<String, Object> pixelLegs(Path chainDir, Path capture) {
        return LinkChains.legs("demo pixel link, pass 1: skew between the two legs of each pair",
                capture(chainDir, "raw", capture, PIXEL_PAIRS));
    }

    static Map<String, Object> pixelLanes(Path chainDir, Path capture, Path legTable) {
        return LinkChains.pixelLanes("demo pixel link, pass 2: legs corrected; skew of each data pair against the clock pair",
                capture(chainDir, "raw", capture, PIXEL_PAIRS), rel(chainDir, legTable), "7142.857ps");
    }

    static Map<String, Object> pixelDecode(Path chainDir, Path capture, Path legTable, Path laneTable) {
        return LinkChains.pixelDecode(
                "demo pixel link, pass 3: both skews corrected; 7:1 sampling, frames, timing, eye, ringing, jitter",
                capture(chainDir, "raw", capture, PIXEL_PAIRS), rel(chainDir, legTable), rel(chainDir, laneTable), "bits-18");
    }

    static Map<String, Object> packetLegs(Path chainDir, Path capture) {
        return LinkChains.legs("demo packet link, pass 1: skew between the two legs of each pair",
                capture(chainDir, "csv", capture, PACKET_PAIRS));
    }

    static Map<String, Object> packetLanes(Path chainDir, Path capture, Path legTable) {
        return LinkChains.packetLanes("demo packet link, pass 2: legs corrected; skew of each data lane against the clock",
                capture(chainDir, "csv", capture, PACKET_PAIRS), rel(chainDir, legTable));
    }

    static Map<String, Object> packetDecode(Path chainDir, Path capture, Path legTable, Path laneTable) {
        return LinkChains.packetDecode(
                "demo packet link, pass 3: skews corrected; DDR sampling, packets, commands, init sequence, frames",
                capture(chainDir, "csv", capture, PACKET_PAIRS), rel(chainDir, legTable), rel(chainDir, laneTable));
    }
}
