package plumb.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;

/** Writing result files without ever leaving a partial one: a temporary file, then a rename. */
public final class Outputs {

    private Outputs() {
    }

    /** Writes text to {@code target}, or to {@code out} when target is "-". */
    public static void write(String target, String text, PrintWriter out) {
        if ("-".equals(target)) {
            out.print(text);
            out.flush();
            return;
        }
        write(Path.of(target), text.getBytes(StandardCharsets.UTF_8));
    }

    /** Writes bytes to a temporary file beside {@code target}, then renames it into place. */
    public static void write(Path target, byte[] bytes) {
        Path abs = target.toAbsolutePath();
        Path dir = abs.getParent();
        try {
            if (dir != null) Files.createDirectories(dir);
            Path tmp = Files.createTempFile(dir, "." + abs.getFileName() + ".", ".tmp");
            try {
                Files.write(tmp, bytes);
                try {
                    Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
                } catch (AtomicMoveNotSupportedException e) {
                    Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING);
                }
            } finally {
                Files.deleteIfExists(tmp);
            }
        } catch (IOException e) {
            throw new InputException("cannot write " + target + ": " + e.getMessage());
        }
    }
}
