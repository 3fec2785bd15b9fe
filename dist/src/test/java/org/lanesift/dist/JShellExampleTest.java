package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;

/** The JShell example of examples/ runs against the plugins on the class path. */
class JShellExampleTest {
    @Test
    void theJShellScriptBuildsAndRunsAChain() throws Exception {
        Path jshell = Path.of(System.getProperty("java.home"), "bin", "jshell");
        assertTrue(Files.isExecutable(jshell), "the JDK running the tests has no jshell at " + jshell);
        Path script = Path.of("..", "examples", "jshell", "differential.jsh");
        assertTrue(Files.exists(script), script.toAbsolutePath().toString());
        // the test class path, less entries that do not exist (jshell refuses those)
        String cp = java.util.Arrays.stream(System.getProperty("java.class.path").split(java.io.File.pathSeparator))
                .filter(e -> Files.exists(Path.of(e))).collect(java.util.stream.Collectors.joining(java.io.File.pathSeparator));
        Process p = new ProcessBuilder(jshell.toString(), "--class-path", cp, script.toString())
                .redirectErrorStream(true).start();
        p.getOutputStream().close();
        boolean done = p.waitFor(120, TimeUnit.SECONDS);
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        if (!done) {
            p.destroyForcibly();
        }
        assertTrue(done, "jshell did not finish: " + out);
        assertEquals(0, p.exitValue(), out);
        // 25 MHz square wave at 5 GS/s for 4 us: 200 transitions, minus the warm-up the receiver holds back
        assertTrue(out.matches("(?s).*\\b(19\\d|200) edges; first at .*"), out);
    }
}
