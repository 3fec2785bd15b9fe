package org.lanesift.testkit;

import java.io.File;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Assertions;
import org.junit.jupiter.api.Assumptions;

/**
 * Finds an external program (from a Debian package: iverilog, vvp, ngspice, socat, dtc from
 * device-tree-compiler, gcc; python3 with a module such as numpy from python3-numpy) that a test
 * needs. Outside CI a missing program skips the test; under {@code CI=true} it fails it, so a green
 * CI run means the check really ran. Every module's tests use this one rule.
 */
public final class ExternalTool {
    private ExternalTool() {
    }

    /**
     * Returns the program's path, or skips (fails under CI) when it is not on the PATH.
     *
     * @param program program name, such as {@code iverilog}
     * @return its path
     */
    public static Path require(String program) {
        Path p = find(program);
        if (p == null) {
            String msg = program + " is not installed (Debian package; .ci/run installs it)";
            if (underCi()) {
                throw new AssertionError(msg + " and CI=true, so this check must run");
            }
            Assumptions.abort(msg);
        }
        return p;
    }

    /** Debian's Python: Debian's {@code python3-*} packages install their modules for it alone. */
    static final Path DEBIAN_PYTHON = Path.of("/usr/bin/python3");

    /**
     * Returns the path of Debian's {@code python3} ({@code /usr/bin/python3}; {@code python3} from
     * the PATH where there is none) once it has imported a module, or skips (fails under CI) when
     * either is missing: the same rule as {@link #require}, for a reference library such as numpy
     * (Debian package {@code python3-numpy}). A {@code python3} earlier on the PATH (a version
     * manager's) is not taken: it may carry another build of the module, or none, and the checks
     * name Debian's package as their reference. The bench scripts choose the same way
     * (bench/scripts/python.sh).
     *
     * @param module  the module to import, such as {@code numpy}
     * @param debian  the Debian package that provides it, for the message
     * @return the path of python3
     * @throws IOException          if python3 cannot be started
     * @throws InterruptedException if the test is interrupted while waiting
     */
    public static Path requirePythonModule(String module, String debian) throws IOException, InterruptedException {
        Path python = Files.isExecutable(DEBIAN_PYTHON) ? DEBIAN_PYTHON : require("python3");
        Process p = new ProcessBuilder(python.toString(), "-c", "import " + module)
                .redirectInput(ProcessBuilder.Redirect.from(new java.io.File("/dev/null")))
                .redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        boolean ended = p.waitFor(60, TimeUnit.SECONDS);
        if (!ended) {
            p.destroyForcibly();
        }
        if (!ended || p.exitValue() != 0) {
            String msg = python + " cannot import " + module + " (Debian package " + debian + ")";
            if (underCi()) {
                throw new AssertionError(msg + " and CI=true, so this check must run");
            }
            Assumptions.abort(msg);
        }
        return python;
    }

    /**
     * Whether the tests run under CI ({@code CI=true} in the environment), where every external
     * check must run.
     *
     * @return true under CI
     */
    public static boolean underCi() {
        return "true".equalsIgnoreCase(System.getenv("CI"));
    }

    /**
     * Runs a program in a folder and returns what it wrote (standard output and error together);
     * fails the test, with that text, when it exits with a non-zero code or outlives the timeout
     * (then it is stopped).
     *
     * @param dir     working folder; the output goes to a file {@code <program>-output.txt} there
     * @param timeout longest run
     * @param command program and arguments
     * @return its output
     * @throws IOException if the program cannot be started or its output read
     * @throws InterruptedException if the test is interrupted while waiting
     */
    public static String run(Path dir, Duration timeout, List<String> command) throws IOException, InterruptedException {
        Path log = dir.resolve(Path.of(command.get(0)).getFileName() + "-output.txt");
        Process p = new ProcessBuilder(command).directory(dir.toFile()).redirectInput(ProcessBuilder.Redirect.from(new java.io.File("/dev/null")))
                .redirectErrorStream(true).redirectOutput(log.toFile()).start();
        if (!p.waitFor(timeout.toMillis(), TimeUnit.MILLISECONDS)) {
            p.destroyForcibly();
            Assertions.fail(command + " did not finish in " + timeout.toSeconds() + " s");
        }
        String out = Files.readString(log);
        if (p.exitValue() != 0) {
            Assertions.fail(command + " exited with " + p.exitValue() + ": " + out);
        }
        return out;
    }

    /**
     * Looks a program up on the PATH.
     *
     * @param program name
     * @return its path, or null
     */
    public static Path find(String program) {
        String path = System.getenv("PATH");
        if (path == null) {
            return null;
        }
        for (String dir : path.split(File.pathSeparator)) {
            Path p = Path.of(dir, program);
            if (Files.isRegularFile(p) && Files.isExecutable(p)) {
                return p;
            }
        }
        return null;
    }
}
