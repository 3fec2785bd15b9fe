package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Source plugin {@code raw}: interleaved binary samples (uint8, int8, int16le, int16be or
 * float32le) described by a JSON sidecar (rate, format, channel names, gain and offset to volts).
 * One ANALOG output per channel. Rules in docs/capture-raw.md.
 */
public final class RawSource implements PluginProvider {
    /** The option of the raw and packed-logic sources that turns the read-ahead thread off ({@link ReadAhead}). */
    static final OptionSpec READ_AHEAD = OptionSpec.bool("readAhead", true, "read the next block on a second thread while"
            + " this one is decoded (false: one thread; the system property lanesift.readAhead=false turns it off everywhere)");
    static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("raw")
            .name("Raw binary capture")
            .description("Reads interleaved binary samples with a JSON sidecar giving rateHz, format and channels"
                    + " [{name, gain, offset}]; volts = code * gain + offset.")
            .option(OptionSpec.text("file", null, "path of the binary file"))
            .option(OptionSpec.text("sidecar", "", "path of the JSON sidecar; empty = the file's path + \".json\""))
            .option(OptionSpec.integer("blockSamples", 65536L, 1, 1 << 24, "frames per block (per channel)"))
            .option(OptionSpec.integer("firstFrame", 0L, 0, Long.MAX_VALUE, "first frame to read (0 = the start);"
                    + " sample times stay those of the whole capture"))
            .option(OptionSpec.integer("frameCount", 0L, 0, Long.MAX_VALUE, "frames to read from firstFrame (0 = to the end)"))
            .option(READ_AHEAD)
            .option(OptionSpec.text(LegDifferences.OPTION, "", "pairs of legs read as one difference channel each, straight"
                    + " from the frames: NAME=P-N[, NAME=P-N...] with P and N channel port names; the legs are then no outputs"
                    + " (docs/capture-raw.md, \"Leg differences\")"))
            .outputs(RawSource::ports)
            .build();

    /** For the ServiceLoader. */
    public RawSource() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) throws IOException {
        return new ReaderStage(reader(context.options(), false), context);
    }

    /** The sidecar a raw or packed-logic source reads: its {@code sidecar} option, or the file's path + ".json". */
    static Path sidecarOf(OptionValues o) {
        String s = o.getString("sidecar");
        return s.isEmpty() ? Path.of(o.getString("file") + ".json") : Path.of(s);
    }

    static RawReader reader(OptionValues o, boolean headerOnly) throws IOException {
        return new RawReader(Path.of(o.getString("file")), RawSidecar.read(sidecarOf(o)), o.getInt("blockSamples"), headerOnly,
                o.getLong("firstFrame"), o.getLong("frameCount"), o.getBoolean("readAhead") && ReadAhead.allowed(), RawReader.READ_BYTES,
                o.getString(LegDifferences.OPTION));
    }

    /**
     * The frame layout of a raw capture, for hosts that cut it into segments.
     *
     * @param frames      frames (samples per channel) in the file
     * @param periodFs    sample period
     * @param startFs     time of frame 0
     * @param blockFrames frames per block as the source emits them
     */
    public record Layout(long frames, double periodFs, long startFs, int blockFrames) {
        /**
         * Time of a frame, as the source stamps the block starting there.
         *
         * @param frame frame index
         * @return femtoseconds
         */
        public long timeOf(long frame) {
            return startFs + Math.round(frame * periodFs);
        }
    }

    /**
     * Reads the layout of the capture the options name.
     *
     * @param o validated options of a {@code raw} instance
     * @return the layout
     * @throws IOException if the file or sidecar cannot be read
     */
    public static Layout layout(OptionValues o) throws IOException {
        try (RawReader r = reader(o, true)) {
            return new Layout(r.total(), r.periodFs(), r.startFs(), r.blockFrames());
        }
    }

    private static List<PortSpec> ports(OptionValues o) {
        try (RawReader r = reader(o, true)) {
            return r.ports();
        } catch (IOException e) {
            throw new CaptureFormatException(Path.of(o.getString("file")), 0, "cannot read: " + e.getMessage(), e);
        }
    }
}
