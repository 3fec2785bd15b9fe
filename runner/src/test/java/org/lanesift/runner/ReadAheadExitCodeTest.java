package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.Chain;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.runner.capture.RawSource;

/**
 * A raw capture that shrinks while the read-ahead thread reads it is still bad input, reported as
 * the command line reports it: exit code 2 and one line naming the file, no stack trace.
 */
class ReadAheadExitCodeTest {
    @Test
    void aFileThatShrinksWhileReadAheadIsBadInput(@TempDir Path dir) throws Exception {
        Path bin = dir.resolve("shrinks.raw");
        int frames = 8 * 1024;
        ByteBuffer bb = ByteBuffer.allocate(frames * 2 * 4).order(ByteOrder.LITTLE_ENDIAN);
        for (int i = 0; i < 2 * frames; i++) {
            bb.putFloat((float) Math.sin(i * 0.01));
        }
        Files.write(bin, bb.array());
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e9, \"format\": \"float32le\", \"channels\": [{\"name\": \"p\"}, {\"name\": \"n\"}]}");
        // a stage that cuts the file to a block and a half when the first block reaches it; the
        // thread reading ahead meets the end of the file at the second or the third block
        PluginProvider cutter = new PluginProvider() {
            @Override
            public PluginDescriptor descriptor() {
                return PluginDescriptor.builder("cutter").input(PortSpec.of("in", DataKind.ANALOG, "anything")).build();
            }

            @Override
            public Stage open(StageContext context) {
                return new Stage() {
                    private boolean cut;

                    @Override
                    public void accept(int input, Block block) {
                        if (!cut) {
                            cut = true;
                            try (FileChannel ch = FileChannel.open(bin, StandardOpenOption.WRITE)) {
                                ch.truncate(1536L * 8);
                            } catch (IOException e) {
                                throw new UncheckedIOException(e);
                            }
                        }
                    }
                };
            }
        };
        PluginRegistry reg = new PluginRegistry().add(new RawSource()).add(cutter);
        RuntimeException e;
        try (Chain c = Chain.builder(reg).add("cap", "raw", Map.of("file", bin.toString(), "blockSamples", 1024)).add("cut", "cutter")
                .wire("cap.p", "cut").build()) {
            e = assertThrows(RuntimeException.class, c::run);
        }
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code;
        try (PrintStream ps = new PrintStream(err, true, StandardCharsets.UTF_8)) {
            code = Failures.report(e, ps, false);
        }
        String line = err.toString(StandardCharsets.UTF_8);
        assertEquals(Failures.BAD_INPUT, code, line);
        assertTrue(line.contains("shrinks.raw") && line.contains("shrank while reading"), line);
        assertEquals(1, line.strip().lines().count(), line);
    }
}
