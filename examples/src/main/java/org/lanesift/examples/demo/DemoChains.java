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
 * (3) correct both and decode.
 */
final class DemoChains {
    private DemoChains() {
    }

    /** Pixel link pairs: output name, P leg, N leg. */
    static final String[][] PIXEL_PAIRS = {{"CLK", "CLK_P", "CLK_N"}, {"D0", "D0_P", "D0_N"}, {"D1", "D1_P", "D1_N"},
        {"D2", "D2_P", "D2_N"}};
    /** Packet link pairs. */
    static final String[][] PACKET_PAIRS = {{"HSCLK", "HSCLK_P", "HSCLK_N"}, {"L0", "L0_P", "L0_N"}, {"L1", "L1_P", "L1_N"}};

    private static String abs(Path p) {
        return p.toAbsolutePath().normalize().toString();
    }

    private static LinkChains.Capture capture(String plugin, Path file, String[][] pairs) {
        List<LinkChains.Pair> list = new ArrayList<>();
        for (String[] p : pairs) {
            list.add(new LinkChains.Pair(p[0], p[1], p[2]));
        }
        return new LinkChains.Capture(plugin, abs(file), list);
    }

    static Map<String, Object> pixelLegs(Path capture) {
        return LinkChains.legs("demo pixel link, pass 1: skew between the two legs of each pair",
                capture("raw", capture, PIXEL_PAIRS));
    }

    static Map<String, Object> pixelLanes(Path capture, Path legTable) {
        return LinkChains.pixelLanes("demo pixel link, pass 2: legs corrected; skew of each data pair against the clock pair",
                capture("raw", capture, PIXEL_PAIRS), abs(legTable), "7142.857ps");
    }

    static Map<String, Object> pixelDecode(Path capture, Path legTable, Path laneTable) {
        return LinkChains.pixelDecode(
                "demo pixel link, pass 3: both skews corrected; 7:1 sampling, frames, timing, eye, ringing, jitter",
                capture("raw", capture, PIXEL_PAIRS), abs(legTable), abs(laneTable), "bits-18");
    }

    static Map<String, Object> packetLegs(Path capture) {
        return LinkChains.legs("demo packet link, pass 1: skew between the two legs of each pair",
                capture("csv", capture, PACKET_PAIRS));
    }

    static Map<String, Object> packetLanes(Path capture, Path legTable) {
        return LinkChains.packetLanes("demo packet link, pass 2: legs corrected; skew of each data lane against the clock",
                capture("csv", capture, PACKET_PAIRS), abs(legTable));
    }

    static Map<String, Object> packetDecode(Path capture, Path legTable, Path laneTable) {
        return LinkChains.packetDecode(
                "demo packet link, pass 3: skews corrected; DDR sampling, packets, commands, init sequence, frames",
                capture("csv", capture, PACKET_PAIRS), abs(legTable), abs(laneTable));
    }
}
