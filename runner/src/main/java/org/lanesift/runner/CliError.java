package org.lanesift.runner;

/**
 * Bad input found by the command line itself (an unknown instance in {@code --input}, a missing
 * file, an unwritable output directory): exit code 2, the message printed as one line.
 */
final class CliError extends org.lanesift.plugin.InputException {
    private static final long serialVersionUID = 1L;

    CliError(String message) {
        super(message);
    }

    CliError(String message, Throwable cause) {
        super(message, cause);
    }
}
