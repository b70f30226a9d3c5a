package plumb.cli;

import plumb.cli.io.AtomicFiles;
import plumb.cli.io.IoErrors;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.Path;

/**
 * Result files of the commands: written whole or not at all ({@link AtomicFiles}), or to standard
 * output when the name is "-". Devices and pipes are written into, never replaced.
 */
public final class Outputs {

    private Outputs() {
    }

    /** Writes text to the file {@code target}, or to {@code out} when target is "-". */
    public static void write(String target, String text, PrintWriter out) {
        if ("-".equals(target)) {
            out.print(text);
            out.flush();
            return;
        }
        try {
            AtomicFiles.writeString(Path.of(target), text);
        } catch (IOException | RuntimeException e) {
            throw cannotWrite(target, e);
        }
    }

    /** "cannot write FILE: cause", exit status 2; the cause in a user's words (permission denied, …). */
    public static InputException cannotWrite(Object target, Exception e) {
        return new InputException("cannot write " + target + ": " + cause(e));
    }

    /**
     * The end of a command whose result files are written, with their failure when there is one:
     * the failure on standard error, exit status 1 (not an exception, which would make Main
     * replace the result file with the bare failure); exit status 0 when {@code failure} is null.
     */
    public static int failedAfterWriting(picocli.CommandLine.Model.CommandSpec spec, String failure) {
        if (failure == null) return ExitCodes.OK;
        spec.commandLine().getErr().println("plumb " + spec.name() + ": " + plumb.cli.table.Escape.controls(failure));
        spec.commandLine().getErr().flush();
        return ExitCodes.FAILED;
    }

    /** The reason of an I/O failure without the path. */
    public static String cause(Exception e) {
        if (e instanceof UncheckedIOException u) return IoErrors.describe(u.getCause());
        if (e instanceof IOException io) return IoErrors.describe(io);
        return e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
    }
}
