package org.lanesift.runner;

import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.nio.file.AccessDeniedException;
import java.nio.file.FileSystemException;
import org.lanesift.chain.ChainException;
import org.lanesift.chain.StageFailure;
import org.lanesift.plugin.OptionException;
import org.lanesift.runner.capture.CaptureFormatException;
import picocli.CommandLine;

/**
 * Turns any failure into an exit code and one line on stderr: 2 for bad input (options, chain
 * files, captures, a stage that failed on its input), 1 for internal errors and out of memory. A
 * stack trace follows only with {@code --debug}.
 */
final class Failures {
    /** Exit code for bad input. */
    static final int BAD_INPUT = 2;
    /** Exit code for internal errors. */
    static final int INTERNAL = 1;

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
            String name = commandName(p.getCommandLine());
            String cmd = name.isEmpty() ? "lanesift" : "lanesift " + name;
            line = cmd + ": " + p.getMessage() + " (see: " + cmd + " --help)";
        } else if (t instanceof StageFailure sf) {
            Throwable root = root(sf);
            if (isBug(root)) {
                code = INTERNAL;
                line = "internal error in instance '" + sf.instanceId() + "': " + root + " (run with --debug for the stack trace)";
            } else if (writeFailure(sf) != null) {
                code = BAD_INPUT;
                line = writeFailure(sf);
            } else {
                code = BAD_INPUT;
                String m = describe(root);
                line = m == null || m.isBlank() ? sf.getMessage() : prefixInstance(sf.instanceId(), m);
            }
        } else if (t instanceof CaptureFormatException || t instanceof ChainException || t instanceof OptionException
                || t instanceof CliError) {
            code = BAD_INPUT;
            line = t.getMessage();
        } else if (t instanceof UncheckedIOException u && u.getCause() instanceof FileSystemException) {
            code = BAD_INPUT;
            line = u.getMessage();
        } else if (t instanceof FileSystemException f) {
            code = BAD_INPUT;
            line = describe(f);
        } else {
            code = INTERNAL;
            line = "internal error: " + t + " (run with --debug for the stack trace)";
        }
        err.println(oneLine(line == null ? t.toString() : line));
        if (debug) {
            original.printStackTrace(err);
        }
        err.flush();
        return code;
    }

    /** The message of an output that could not be written (it names the file), or null. */
    private static String writeFailure(Throwable t) {
        for (Throwable c = t; c != null; c = c.getCause() == c ? null : c.getCause()) {
            if (c instanceof UncheckedIOException u && u.getMessage() != null && u.getMessage().startsWith("cannot ")) {
                return u.getMessage();
            }
        }
        return null;
    }

    /** A message for a root cause; file-system errors otherwise carry only the path. */
    static String describe(Throwable root) {
        if (root instanceof java.nio.file.NoSuchFileException f) {
            return "no such file: " + f.getFile();
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

    private static String commandName(CommandLine cl) {
        if (cl == null) {
            return "";
        }
        StringBuilder sb = new StringBuilder();
        for (CommandLine c = cl; c != null && c.getParent() != null; c = c.getParent()) {
            sb.insert(0, c.getCommandName() + (sb.length() > 0 ? " " : ""));
        }
        return sb.toString();
    }

    /** The innermost cause. */
    static Throwable root(Throwable t) {
        Throwable r = t;
        for (int i = 0; i < 50 && r.getCause() != null && r.getCause() != r; i++) {
            r = r.getCause();
        }
        return r;
    }

    /** Failures that point at a defect in the program rather than at the input. */
    private static boolean isBug(Throwable t) {
        return t instanceof NullPointerException || t instanceof ClassCastException || t instanceof IndexOutOfBoundsException
                || t instanceof ArrayStoreException || t instanceof NegativeArraySizeException
                || (t instanceof Error && !(t instanceof OutOfMemoryError));
    }

    /** Collapses a message to one line. */
    static String oneLine(String s) {
        return s.replace("\r\n", " ").replace('\n', ' ').replace('\r', ' ');
    }
}
