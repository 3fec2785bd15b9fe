package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class CaptureSetFileTest {
    @TempDir
    Path dir;

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
        "{\"format\": \"x\", \"shared\": \"A\", \"acquisitions\": []}|/format: expected \"lanesift-capture-set/1\"",
        "{\"format\": \"lanesift-capture-set/1\", \"acquisitions\": []}|/shared: expected the name of the channel every acquisition holds",
        "{\"format\": \"lanesift-capture-set/1\", \"shared\": \"A\", \"acquisitions\": [{\"name\": \"a\", \"file\": \"a.bin\"}]}"
                + "|/acquisitions: expected an array of 2 to 64 objects {name, file}",
        "{\"format\": \"lanesift-capture-set/1\", \"shared\": \"A\", \"acquisitions\": [{\"name\": \"a\", \"file\": \"a.bin\"},"
                + " {\"name\": \"a\", \"file\": \"b.bin\"}]}|/acquisitions/1/name: expected a name no other acquisition has",
        "{\"format\": \"lanesift-capture-set/1\", \"shared\": \"A\", \"searchS\": -1, \"acquisitions\": []}"
                + "|/searchS: expected a positive number of seconds, found -1",
        "{\"format\": \"lanesift-capture-set/1\", \"shared\": \"A\", \"trigger\": 1, \"acquisitions\": []}"
                + "|/trigger: unknown field; expected format, shared, acquisitions, searchS"})
    void badSetFilesNameTheFieldAndWhatWasExpected(String json, String message) throws IOException {
        Path f = dir.resolve("bench.set.json");
        Files.writeString(f, json);
        CaptureFormatException e = assertThrows(CaptureFormatException.class, () -> CaptureSetFile.read(f));
        assertEquals("bench.set.json: " + message, e.getMessage());
    }

    @org.junit.jupiter.api.Test
    void pathsAreRelativeToTheSetFile() throws IOException {
        Path sub = Files.createDirectories(dir.resolve("bench"));
        Path f = sub.resolve("s.json");
        Files.writeString(f, "{\"format\": \"lanesift-capture-set/1\", \"shared\": \"A\", \"acquisitions\": [{\"name\": \"a\","
                + " \"file\": \"a.bin\"}, {\"name\": \"b\", \"file\": \"../b.bin\"}]}");
        CaptureSetFile s = CaptureSetFile.read(f);
        assertEquals(sub.toAbsolutePath().resolve("a.bin"), s.acquisitions.get(0).file());
        assertEquals(dir.toAbsolutePath().resolve("b.bin"), s.acquisitions.get(1).file());
    }
}
