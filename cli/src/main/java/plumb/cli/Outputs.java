package plumb.cli;

import plumb.cli.io.AtomicFiles;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;

/** Result files of the commands: written whole or not at all ({@link AtomicFiles}), or to standard output. */
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
            throw new InputException("cannot write " + target + ": " + e.getMessage());
        }
    }
}
