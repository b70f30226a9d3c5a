package plumb.cli.io;

import java.io.IOException;
import java.nio.file.AccessDeniedException;
import java.nio.file.DirectoryNotEmptyException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.FileSystemException;
import java.nio.file.NoSuchFileException;
import java.nio.file.NotDirectoryException;

/**
 * An I/O failure in a user's words: the cause (permission denied, not a directory, no space
 * left on device, …) without the path, which the caller's message names already.
 */
public final class IoErrors {

    private IoErrors() {
    }

    public static String describe(IOException e) {
        if (e instanceof AccessDeniedException) return "permission denied";
        if (e instanceof NotDirectoryException) return "not a directory";
        if (e instanceof DirectoryNotEmptyException) return "directory not empty";
        if (e instanceof FileAlreadyExistsException) return "already exists";
        if (e instanceof FileSystemException f && f.getReason() != null) return lowerFirst(f.getReason());
        if (e instanceof NoSuchFileException) return "no such file or directory";
        String what = e.getMessage() == null ? "" : e.getMessage().lines().findFirst().orElse("").strip();
        return what.isEmpty() ? e.getClass().getSimpleName() : lowerFirst(what);
    }

    /** "Not a directory" reads "not a directory" inside a sentence. */
    private static String lowerFirst(String s) {
        if (s.length() > 1 && Character.isUpperCase(s.charAt(0)) && Character.isLowerCase(s.charAt(1))) {
            return Character.toLowerCase(s.charAt(0)) + s.substring(1);
        }
        return s;
    }
}
