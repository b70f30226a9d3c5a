package plumb.cli.table;

/**
 * Escaping of untrusted text (names come from user model files) for each output language.
 * Hand-written because each rule is a few lines; pulling in a library for them would add a
 * dependency to the runnable jar without making the rules clearer.
 */
public final class Escape {

    private Escape() {
    }

    /**
     * One terminal line: control characters (C0, DEL, C1 and the line and paragraph separators)
     * become visible escapes ({@code \n}, {@code \r}, {@code \t}, {@code \e}, else
     * {@code \u001b} style), so a name from a file cannot move the cursor, ring the bell or start
     * a new line. A backslash stays as it is.
     */
    public static String controls(String s) {
        StringBuilder out = null;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            boolean control = c < 0x20 || (c >= 0x7f && c <= 0x9f) || c == '\u2028' || c == '\u2029';
            if (!control) {
                if (out != null) out.append(c);
                continue;
            }
            if (out == null) out = new StringBuilder(s.length() + 16).append(s, 0, i);
            switch (c) {
                case '\n' -> out.append("\\n");
                case '\r' -> out.append("\\r");
                case '\t' -> out.append("\\t");
                case 0x1b -> out.append("\\e");
                default -> out.append(String.format("\\u%04x", (int) c));
            }
        }
        return out == null ? s : out.toString();
    }

    /** HTML text and attribute values: {@code & < > " '} become character references. */
    public static String html(String s) {
        StringBuilder out = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '&' -> out.append("&amp;");
                case '<' -> out.append("&lt;");
                case '>' -> out.append("&gt;");
                case '"' -> out.append("&quot;");
                case '\'' -> out.append("&#39;");
                default -> out.append(c);
            }
        }
        return out.toString();
    }

    /**
     * LaTeX text mode: the ten special characters {@code \ & % $ # _ { } ~ ^} are escaped, and
     * a few symbols that appear in our tables (± and Greek letters of observables) become math
     * commands so that the table compiles with plain pdflatex. Line breaks become spaces.
     */
    public static String latex(String s) {
        StringBuilder out = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '\\' -> out.append("\\textbackslash{}");
                case '&', '%', '$', '#', '_', '{', '}' -> out.append('\\').append(c);
                case '~' -> out.append("\\textasciitilde{}");
                case '^' -> out.append("\\textasciicircum{}");
                case '±' -> out.append("$\\pm$");
                case '−' -> out.append("$-$");
                case '–' -> out.append("--");
                case '×' -> out.append("$\\times$");
                case 'γ' -> out.append("$\\gamma$");
                case 'μ' -> out.append("$\\mu$");
                case 'σ' -> out.append("$\\sigma$");
                case 'θ' -> out.append("$\\theta$");
                case 'Δ' -> out.append("$\\Delta$");
                case '\n', '\r' -> out.append(' ');
                default -> out.append(c);
            }
        }
        return out.toString();
    }

    /** Markdown table cell: pipes and backslashes are escaped, line breaks become spaces. */
    public static String markdownCell(String s) {
        StringBuilder out = new StringBuilder(s.length() + 8);
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '|' -> out.append("\\|");
                case '\\' -> out.append("\\\\");
                case '\n', '\r' -> out.append(' ');
                default -> out.append(c);
            }
        }
        return out.toString();
    }

    /**
     * CSV field after RFC 4180 section 2: a field holding a comma, a double quote, CR or LF is
     * enclosed in double quotes and each double quote inside is doubled. Fields with leading or
     * trailing spaces are quoted too, so spreadsheet programs keep the spaces.
     */
    public static String csvField(String s) {
        boolean quote = false;
        for (int i = 0; i < s.length() && !quote; i++) {
            char c = s.charAt(i);
            quote = c == ',' || c == '"' || c == '\n' || c == '\r';
        }
        if (!s.isEmpty() && (s.charAt(0) == ' ' || s.charAt(s.length() - 1) == ' ')) quote = true;
        return quote ? '"' + s.replace("\"", "\"\"") + '"' : s;
    }
}
