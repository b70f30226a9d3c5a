package plumb.cli.table;

import java.util.List;
import java.util.Locale;

/**
 * The output languages of a {@link Table}. Used by the report (files beside each figure) and by
 * terminal commands ({@code --format}); {@link #parse(String)} reads the option's value.
 */
public enum TableFormat {
    /** Aligned columns for the terminal: numbers right-aligned, a rule under the header. */
    TEXT("txt") {
        @Override
        public String render(Table table) {
            int n = table.columns();
            int[] width = new int[n];
            for (int c = 0; c < n; c++) {
                width[c] = displayWidth(table.header().get(c));
                for (List<String> row : table.rows()) width[c] = Math.max(width[c], displayWidth(row.get(c)));
            }
            boolean[] right = numericColumns(table);
            StringBuilder out = new StringBuilder();
            if (table.title() != null) out.append(table.title()).append('\n');
            appendTextRow(out, table.header(), width, right);
            for (int c = 0; c < n; c++) {
                if (c > 0) out.append("  ");
                out.append("-".repeat(width[c]));
            }
            out.append('\n');
            for (List<String> row : table.rows()) appendTextRow(out, row, width, right);
            return out.toString();
        }
    },
    /** GitHub-flavoured Markdown pipe table, numeric columns marked right-aligned. */
    MARKDOWN("md") {
        @Override
        public String render(Table table) {
            StringBuilder out = new StringBuilder();
            if (table.title() != null) out.append("**").append(Escape.markdownCell(table.title())).append("**\n\n");
            appendMarkdownRow(out, table.header());
            boolean[] right = numericColumns(table);
            out.append('|');
            for (boolean r : right) out.append(r ? " ---: |" : " --- |");
            out.append('\n');
            for (List<String> row : table.rows()) appendMarkdownRow(out, row);
            return out.toString();
        }
    },
    /** RFC 4180 CSV: header line first, CRLF line ends, no title (it is not data). */
    CSV("csv") {
        @Override
        public String render(Table table) {
            StringBuilder out = new StringBuilder();
            appendCsvRow(out, table.header());
            for (List<String> row : table.rows()) appendCsvRow(out, row);
            return out.toString();
        }
    },
    /** A LaTeX {@code tabular} with {@code \hline} rules; needs no package beyond the kernel. */
    LATEX("tex") {
        @Override
        public String render(Table table) {
            boolean[] right = numericColumns(table);
            StringBuilder out = new StringBuilder();
            if (table.title() != null) out.append("% ").append(Escape.latex(table.title())).append('\n');
            out.append("\\begin{tabular}{");
            for (boolean r : right) out.append(r ? 'r' : 'l');
            out.append("}\n\\hline\n");
            appendLatexRow(out, table.header());
            out.append("\\hline\n");
            for (List<String> row : table.rows()) appendLatexRow(out, row);
            out.append("\\hline\n\\end{tabular}\n");
            return out.toString();
        }
    },
    /** An HTML {@code <table>} fragment; numeric cells carry {@code class="num"}. */
    HTML("html") {
        @Override
        public String render(Table table) {
            boolean[] right = numericColumns(table);
            StringBuilder out = new StringBuilder("<table>\n");
            if (table.title() != null) out.append("<caption>").append(Escape.html(table.title())).append("</caption>\n");
            out.append("<thead><tr>");
            for (int c = 0; c < table.columns(); c++) {
                out.append(right[c] ? "<th class=\"num\">" : "<th>").append(Escape.html(table.header().get(c))).append("</th>");
            }
            out.append("</tr></thead>\n<tbody>\n");
            for (List<String> row : table.rows()) {
                out.append("<tr>");
                for (int c = 0; c < row.size(); c++) {
                    out.append(right[c] ? "<td class=\"num\">" : "<td>").append(Escape.html(row.get(c))).append("</td>");
                }
                out.append("</tr>\n");
            }
            out.append("</tbody>\n</table>\n");
            return out.toString();
        }
    };

    private final String extension;

    TableFormat(String extension) {
        this.extension = extension;
    }

    /** Renders the whole table in this format. */
    public abstract String render(Table table);

    /** File name extension (without the dot) for files in this format. */
    public String extension() {
        return extension;
    }

    /**
     * Reads a format name as typed on the command line: {@code text}, {@code markdown} (or
     * {@code md}), {@code csv}, {@code latex} (or {@code tex}), {@code html}; case-insensitive.
     *
     * @throws IllegalArgumentException naming the accepted values when {@code name} is none of them
     */
    public static TableFormat parse(String name) {
        String key = name == null ? "" : name.trim().toLowerCase(Locale.ROOT);
        return switch (key) {
            case "text", "txt" -> TEXT;
            case "markdown", "md" -> MARKDOWN;
            case "csv" -> CSV;
            case "latex", "tex" -> LATEX;
            case "html" -> HTML;
            default -> throw new IllegalArgumentException(
                    "unknown table format '" + name + "', expected text, markdown, csv, latex or html");
        };
    }

    private static boolean[] numericColumns(Table table) {
        boolean[] right = new boolean[table.columns()];
        for (int c = 0; c < right.length; c++) right[c] = table.numericColumn(c);
        return right;
    }

    /** Width in terminal cells, counting code points (our text has no wide East Asian glyphs). */
    private static int displayWidth(String s) {
        return s.codePointCount(0, s.length());
    }

    private static void appendTextRow(StringBuilder out, List<String> cells, int[] width, boolean[] right) {
        StringBuilder line = new StringBuilder();
        for (int c = 0; c < cells.size(); c++) {
            if (c > 0) line.append("  ");
            String cell = cells.get(c).replace('\n', ' ');
            String pad = " ".repeat(width[c] - displayWidth(cell));
            line.append(right[c] ? pad + cell : cell + pad);
        }
        int end = line.length();
        while (end > 0 && line.charAt(end - 1) == ' ') end--;
        out.append(line, 0, end).append('\n');
    }

    private static void appendMarkdownRow(StringBuilder out, List<String> cells) {
        out.append('|');
        for (String cell : cells) out.append(' ').append(Escape.markdownCell(cell)).append(" |");
        out.append('\n');
    }

    private static void appendCsvRow(StringBuilder out, List<String> cells) {
        for (int c = 0; c < cells.size(); c++) {
            if (c > 0) out.append(',');
            out.append(Escape.csvField(cells.get(c)));
        }
        out.append("\r\n");
    }

    private static void appendLatexRow(StringBuilder out, List<String> cells) {
        for (int c = 0; c < cells.size(); c++) {
            if (c > 0) out.append(" & ");
            out.append(Escape.latex(cells.get(c)));
        }
        out.append(" \\\\\n");
    }
}
