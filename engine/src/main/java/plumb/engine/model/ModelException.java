package plumb.engine.model;

import java.util.Locale;

/**
 * A model file that breaks a rule of docs/model-format.md. The message is one line naming the
 * file, the JSON path of the first offending value and what was expected there.
 */
public final class ModelException extends RuntimeException {

    private static final long serialVersionUID = 1L;

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
        return oneLine(b.append(what).toString());
    }

    /**
     * Control characters of names and keys (a newline, ESC) made visible as \n, \e, \u0007:
     * the message stays one line and cannot drive a terminal.
     */
    static String oneLine(String s) {
        StringBuilder out = new StringBuilder(s.length());
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c >= 0x20 && (c < 0x7f || c > 0x9f) && c != '\u2028' && c != '\u2029') {
                out.append(c);
                continue;
            }
            switch (c) {
                case '\n' -> out.append("\\n");
                case '\r' -> out.append("\\r");
                case '\t' -> out.append("\\t");
                case 0x1b -> out.append("\\e");
                default -> out.append(String.format(Locale.ROOT, "\\u%04x", (int) c));
            }
        }
        return out.toString();
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
