package plumb.engine.model;

import java.util.Locale;

/**
 * A model file that breaks a rule of docs/model-format.md. The message is one line naming the
 * file, the JSON path of the first offending value and what was expected there.
 */
public final class ModelException extends RuntimeException {

    private final String file;
    private final String path;

    public ModelException(String file, String path, String format, Object... args) {
        super(compose(file, path, String.format(Locale.ROOT, format, args)));
        this.file = file;
        this.path = path;
    }

    private static String compose(String file, String path, String what) {
        StringBuilder b = new StringBuilder();
        if (file != null) b.append(file).append(": ");
        if (path != null && !path.isEmpty()) b.append(path).append(": ");
        return b.append(what).toString();
    }

    /** The model file, or null when the model did not come from a file. */
    public String file() {
        return file;
    }

    /** The JSON path of the offending value ({@code channels[0].edges[2]}), or "" for the whole file. */
    public String path() {
        return path;
    }
}
