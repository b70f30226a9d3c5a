package plumb.cli.io;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.FileSystemException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.nio.file.attribute.PosixFilePermissions;

/**
 * Writes files so that a reader never sees a half-written one and a failure leaves no partial
 * file behind: the content goes to a temporary file in the same directory, which is then
 * renamed over the target (atomic where the file system supports it).
 *
 * <p>Never renames over anything but a regular file: a device, FIFO or socket (/dev/null, a
 * named pipe, /proc/self/fd/1) is written into directly, a symbolic link is followed and the
 * file it names replaced (the link stays), and a directory is refused.
 */
public final class AtomicFiles {

    private AtomicFiles() {
    }

    /** Produces a file's content into a stream. */
    @FunctionalInterface
    public interface Content {
        void writeTo(OutputStream out) throws IOException;
    }

    /**
     * Writes {@code content} to {@code target} via a temporary sibling and a rename. Parent
     * directories are created. On any failure the temporary file is deleted and the target is
     * left as it was.
     *
     * @throws IOException when writing or renaming fails
     */
    public static Path write(Path target, Content content) throws IOException {
        if (Files.isDirectory(target)) throw new FileSystemException(target.toString(), null, "is a directory");
        if (Files.exists(target) && !Files.isRegularFile(target)) {
            // a device, FIFO or socket: its own semantics, no temporary file, never replaced
            try (OutputStream out = Files.newOutputStream(target, StandardOpenOption.WRITE)) {
                content.writeTo(out);
            }
            return target;
        }
        target = followLinks(target);
        Path dir = target.toAbsolutePath().getParent();
        for (Path d = dir; d != null; d = d.getParent()) {
            if (Files.exists(d) && !Files.isDirectory(d)) throw new FileSystemException(d.toString(), null, "not a directory");
            if (Files.isDirectory(d)) break;
        }
        Files.createDirectories(dir);
        Path tmp = Files.createTempFile(dir, "." + target.getFileName() + ".", ".tmp");
        try {
            try (OutputStream out = Files.newOutputStream(tmp)) {
                content.writeTo(out);
            }
            makeReadable(tmp);
            move(tmp, target);
            return target;
        } catch (IOException | RuntimeException e) {
            Files.deleteIfExists(tmp);
            throw e;
        }
    }

    /** The file a chain of symbolic links ends at (existing or not); {@code p} itself if it is no link. */
    static Path followLinks(Path p) throws IOException {
        for (int hops = 0; Files.isSymbolicLink(p); hops++) {
            if (hops == MAX_LINKS) throw new FileSystemException(p.toString(), null, "too many levels of symbolic links");
            Path parent = p.toAbsolutePath().getParent();
            p = parent.resolve(Files.readSymbolicLink(p));
        }
        return p;
    }

    /** As the kernel's limit on link chains. */
    private static final int MAX_LINKS = 40;

    /** {@link #write(Path, Content)} for UTF-8 text. */
    public static Path writeString(Path target, String text) throws IOException {
        byte[] bytes = text.getBytes(StandardCharsets.UTF_8);
        return write(target, out -> out.write(bytes));
    }

    /** Temporary files are created owner-only; the result is an ordinary rw-r--r-- file. */
    private static void makeReadable(Path file) throws IOException {
        try {
            Files.setPosixFilePermissions(file, PosixFilePermissions.fromString("rw-r--r--"));
        } catch (UnsupportedOperationException notPosix) {
            // other file systems keep their default permissions
        }
    }

    /** Renames {@code from} to {@code to}, replacing it; atomically when supported. */
    public static void move(Path from, Path to) throws IOException {
        try {
            Files.move(from, to, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
        } catch (AtomicMoveNotSupportedException e) {
            Files.move(from, to, StandardCopyOption.REPLACE_EXISTING);
        }
    }
}
