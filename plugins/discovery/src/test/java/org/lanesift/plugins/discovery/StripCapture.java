package org.lanesift.plugins.discovery;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.lanesift.runner.output.VcdWriter;

/**
 * Writes the README's sample capture of the demo scenario's undocumented indicator strip link
 * (invented): a 48 x 30 picture in 16-bit colour and a few command bursts over two lanes, words
 * of 8 bits sent LSB first, word k on lane k mod 2, the sync 0xB8 read LSB first, a length
 * field (word 1) and a
 * CRC-16/MCRF4XX checksum after every burst, double-edge clock that pauses between bursts. The
 * signals are 1-bit VCD wires {@code strip.CLK}, {@code strip.D0}, {@code strip.D1} (ports
 * {@code CLK}, {@code D0}, {@code D1}), written with the runner's VCD writer.
 *
 * <pre>
 * mvn -o -q -pl plugins/discovery -am test-compile
 * java -cp "$(cat classpath)" org.lanesift.plugins.discovery.StripCapture examples/strip/strip.vcd
 * </pre>
 *
 * ({@code StripCaptureTest} regenerates it and compares it with the bundled file, so the
 * bundled file and this generator cannot drift apart.)
 */
final class StripCapture {
    static final String SYNC_WIRE = "00011101";

    private StripCapture() {
    }

    /** The strip link: the same content for the same code (seeded). */
    static LinkFormatGenerator.Link link() {
        return new LinkFormatGenerator(2026).fixed(8, false, "double-edge", 2, LaneDistribution.WORD, SYNC_WIRE, true,
                CrcCatalogueTest.byName("CRC-16/MCRF4XX"), true, PixelFormat.RGB565, 48, 30);
    }

    /** Writes the capture into {@code vcd}. */
    static void write(Path vcd) throws IOException {
        LinkEdgesInput in = link().input;
        Path spool = Files.createTempDirectory("strip-spool");
        try (VcdWriter w = new VcdWriter(vcd, spool, "Lanesift sample capture: the demo's indicator strip link (invented)")) {
            w.declare("strip", "CLK");
            w.declare("strip", "D0");
            w.declare("strip", "D1");
            w.edges("strip", "CLK", DiscoveryReportTest.clockEdges(in));
            w.edges("strip", "D0", DiscoveryReportTest.laneEdges(in, 0));
            w.edges("strip", "D1", DiscoveryReportTest.laneEdges(in, 1));
        } finally {
            Files.deleteIfExists(spool); // the writer empties it at close
        }
    }

    /** @param args the VCD file to write */
    public static void main(String[] args) throws IOException {
        write(Path.of(args[0]));
    }
}
