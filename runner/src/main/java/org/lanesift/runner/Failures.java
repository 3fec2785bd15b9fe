package org.lanesift.runner;

import java.io.PrintStream;
import java.nio.file.AccessDeniedException;
import java.nio.file.FileSystemException;
import org.lanesift.chain.StageFailure;
import org.lanesift.plugin.DeviceFailure;
import org.lanesift.plugin.Echo;
import org.lanesift.plugin.InputException;
import org.lanesift.plugin.OutputException;
import picocli.CommandLine;

/**
 * Turns any failure into an exit code and one line on stderr, by the type of what was thrown and
 * never by its message: {@link InputException} and its subtypes (options, chain files, captures,
 * outputs, command-line errors) and picocli's parameter errors are bad input, exit 2, their message
 * the line; a {@link DeviceFailure} is exit 1 with its message; anything else, thrown by a stage, a
 * tool or the host itself, is a bug: exit 1, "internal error", and a hint to rerun with
 * {@code --debug} for the stack trace. A stack trace follows only with {@code --debug}.
 */
final class Failures {
    /** Exit code for bad input. */
    static final int BAD_INPUT = 2;
    /** Exit code for internal errors and failed devices. */
    static final int INTERNAL = 1;
    /** The longest error line, in characters of the message; control characters are escaped. */
    static final int MAX_LINE_CHARS = 1000;
    /** The hint printed with an internal error. */
    static final String DEBUG_HINT = "(rerun with --debug for the stack trace)";

    private Failures() {
    }

    /**
     * Reports a failure.
     *
     * @param t     what was thrown
     * @param err   standard error
     * @param debug whether to add the stack trace
     * @return the exit code
     */
    static int report(Throwable t, PrintStream err, boolean debug) {
        Throwable original = t;
        if (root(t) instanceof OutOfMemoryError oom) {
            t = oom;
        }
        int code;
        String line;
        if (t instanceof OutOfMemoryError) {
            code = INTERNAL;
            line = "out of memory (maximum heap " + (Runtime.getRuntime().maxMemory() >> 20)
                    + " MB); give Java more with JAVA_TOOL_OPTIONS=-Xmx4g or use smaller blocks";
        } else if (t instanceof CommandLine.ParameterException p) {
            code = BAD_INPUT;
            String cmd = commandLabel(p.getCommandLine());
            line = cmd + ": " + p.getMessage() + " (see: " + cmd + " --help)";
        } else if (t instanceof StageFailure sf) {
            Throwable cause = sf.getCause() == null ? sf : sf.getCause();
            if (cause instanceof OutputException) {
                code = BAD_INPUT;
                line = cause.getMessage();
            } else if (cause instanceof InputException || cause instanceof DeviceFailure) {
                code = cause instanceof InputException ? BAD_INPUT : INTERNAL;
                String m = cause.getMessage();
                line = m == null || m.isBlank() ? sf.getMessage() : prefixInstance(sf.instanceId(), m);
            } else {
                code = INTERNAL;
                line = "internal error in instance '" + sf.instanceId() + "', please report: " + cause + " " + DEBUG_HINT;
            }
        } else if (t instanceof InputException || t instanceof DeviceFailure) {
            code = t instanceof InputException ? BAD_INPUT : INTERNAL;
            line = t.getMessage();
        } else {
            code = INTERNAL;
            line = "internal error, please report: " + t + " " + DEBUG_HINT;
        }
        // whatever a message echoed from the input, the line stays one short printable line
        err.println(Echo.of(oneLine(line == null ? t.toString() : line), MAX_LINE_CHARS));
        if (debug) {
            original.printStackTrace(err);
        }
        err.flush();
        return code;
    }

    /** A message for a root cause; file-system errors otherwise carry only the path. */
    static String describe(Throwable root) {
        if (root instanceof java.nio.file.NoSuchFileException f) {
            return "no such file: " + f.getFile() + lookedIn(f.getFile());
        } else if (root instanceof AccessDeniedException f) {
            return "permission denied: " + f.getFile();
        } else if (root instanceof FileSystemException f) {
            return f.getFile() + ": " + (f.getReason() == null ? f.getClass().getSimpleName() : f.getReason());
        }
        return root.getMessage();
    }

    private static String prefixInstance(String id, String m) {
        return m.contains("'" + id + "'") ? m : "instance '" + id + "': " + m;
    }

    /** {@code lanesift} followed by the command path, such as {@code lanesift probe divider}. */
    static String commandLabel(CommandLine cl) {
        StringBuilder sb = new StringBuilder();
        for (CommandLine c = cl; c != null && c.getParent() != null; c = c.getParent()) {
            sb.insert(0, " " + c.getCommandName());
        }
        return "lanesift" + sb;
    }

    /** The innermost cause. */
    static Throwable root(Throwable t) {
        Throwable r = t;
        for (int i = 0; i < 50 && r.getCause() != null && r.getCause() != r; i++) {
            r = r.getCause();
        }
        return r;
    }

    /** Collapses a message to one line. */
    static String oneLine(String s) {
        return s.replace("\r\n", " ").replace('\n', ' ').replace('\r', ' ');
    }

    /** Names the folder a missing file was looked for in, as an absolute path. */
    private static String lookedIn(String file) {
        if (file == null) {
            return "";
        }
        java.nio.file.Path dir = java.nio.file.Path.of(file).toAbsolutePath().normalize().getParent();
        return dir == null ? "" : " (looked in folder " + dir + ")";
    }
}
