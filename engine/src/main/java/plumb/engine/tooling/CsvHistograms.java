package plumb.engine.tooling;

import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelException;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The long-format CSV histogram table of docs/import-format.md: a header naming the columns
 * {@link #COLUMNS} (any order), then one row per (region, sample, variation, side, bin). Names
 * cannot hold commas or quotes (the model's name rule), so a plain split is enough; lines starting
 * with {@code #} and blank lines are skipped.
 */
public final class CsvHistograms {

    public static final List<String> COLUMNS = List.of("region", "sample", "variation", "side", "bin", "low", "high",
            "content", "error");

    private CsvHistograms() {
    }

    /** Reads every row; a malformed cell throws {@link ModelException} naming the file, line and column. */
    public static List<HistogramRow> read(Path file) {
        String source = file.toString();
        try (BufferedReader in = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            return read(in, source);
        } catch (IOException e) {
            throw new ModelException(source, "", "cannot read: %s", e.getMessage());
        } catch (java.io.UncheckedIOException e) {
            throw new ModelException(source, "", "cannot read: %s", e.getCause().getMessage());
        }
    }

    static List<HistogramRow> read(BufferedReader in, String source) throws IOException {
        int[] col = null;
        List<HistogramRow> rows = new ArrayList<>();
        String line;
        for (int number = 1; (line = in.readLine()) != null; number++) {
            if (line.isBlank() || line.startsWith("#")) continue;
            String[] cells = line.split(",", -1);
            for (int i = 0; i < cells.length; i++) cells[i] = cells[i].strip();
            if (col == null) {
                col = header(cells, source, number);
                continue;
            }
            rows.add(row(cells, col, source, number));
        }
        if (col == null) throw new ModelException(source, "", "empty: expected a header line naming the columns %s", COLUMNS);
        if (rows.isEmpty()) throw new ModelException(source, "", "no rows after the header");
        return rows;
    }

    private static int[] header(String[] cells, String source, int line) {
        int[] col = new int[COLUMNS.size()];
        Arrays.fill(col, -1);
        for (int i = 0; i < cells.length; i++) {
            int k = COLUMNS.indexOf(cells[i]);
            String at = "line " + line + ", column " + (i + 1);
            if (k < 0) throw new ModelException(source, at, "unknown column \"%s\", expected one of %s", cells[i], COLUMNS);
            if (col[k] >= 0) throw new ModelException(source, at, "column \"%s\" appears twice", cells[i]);
            col[k] = i;
        }
        for (int k = 0; k < col.length; k++) {
            if (col[k] < 0) throw new ModelException(source, "line " + line, "the header lacks the column \"%s\"", COLUMNS.get(k));
        }
        return col;
    }

    private static HistogramRow row(String[] cells, int[] col, String source, int line) {
        HistogramRow.Where where = column -> "line " + line + ", column " + column;
        if (cells.length != COLUMNS.size()) {
            throw new ModelException(source, "line " + line, "%d cells, expected %d like the header", cells.length, COLUMNS.size());
        }
        String region = cells[col[0]], sample = cells[col[1]], variation = cells[col[2]];
        String sideText = cells[col[3]];
        HistogramRow.Side side = HistogramRow.Side.of(sideText);
        if (side == null) {
            throw new ModelException(source, where.at("side"), "\"%s\", expected nominal, up, down, kappa_up or kappa_down", sideText);
        }
        int bin = -1;
        String binText = cells[col[4]];
        if (!side.kappa()) {
            try {
                bin = Integer.parseInt(binText);
            } catch (NumberFormatException e) {
                bin = -2;
            }
            if (bin < 0) throw new ModelException(source, where.at("bin"), "\"%s\", expected a bin index from 0", binText);
        } else if (!binText.isEmpty()) {
            throw new ModelException(source, where.at("bin"), "\"%s\", a kappa row has no bin: leave it empty", binText);
        }
        double low = number(cells[col[5]], source, where, "low", true);
        double high = number(cells[col[6]], source, where, "high", true);
        double content = number(cells[col[7]], source, where, "content", false);
        double error = number(cells[col[8]], source, where, "error", true);
        return new HistogramRow(region, sample, variation.isEmpty() ? null : variation, side, bin, low, high, content,
                error, where);
    }

    private static double number(String text, String source, HistogramRow.Where where, String column, boolean optional) {
        if (text.isEmpty()) {
            if (optional) return Double.NaN;
            throw new ModelException(source, where.at(column), "empty, expected a number");
        }
        double x;
        try {
            x = Double.parseDouble(text);
        } catch (NumberFormatException e) {
            throw new ModelException(source, where.at(column), "\"%s\" is not a number", text);
        }
        if (!Double.isFinite(x)) throw new ModelException(source, where.at(column), "\"%s\", must be finite", text);
        return x;
    }

    /** Writes the histograms of a model as a table that {@link #read} and {@link HistogramImport} turn back into it. */
    public static void write(Model m, Writer out) throws IOException {
        out.write(String.join(",", COLUMNS) + "\n");
        for (Channel ch : m.channels()) {
            if (ch.observed() != null) histogram(out, ch, HistogramRow.DATA, "", "nominal", ch.observed(), null);
            for (Sample s : ch.samples()) {
                histogram(out, ch, s.name(), "", "nominal", s.yields(), s.mcError());
                for (Variation v : s.variations()) {
                    if (v.norm() != null) {
                        out.write(ch.name() + "," + s.name() + "," + v.parameter() + ",kappa_up,,,," + num(v.norm().up()) + ",\n");
                        out.write(ch.name() + "," + s.name() + "," + v.parameter() + ",kappa_down,,,," + num(v.norm().down()) + ",\n");
                    }
                    if (v.shape() != null) {
                        histogram(out, ch, s.name(), v.parameter(), "up", v.shape().up(), null);
                        histogram(out, ch, s.name(), v.parameter(), "down", v.shape().down(), null);
                    }
                }
            }
        }
    }

    private static void histogram(Writer out, Channel ch, String sample, String variation, String side, double[] values,
                                  double[] errors) throws IOException {
        StringBuilder b = new StringBuilder();
        for (int i = 0; i < values.length; i++) {
            b.setLength(0);
            b.append(ch.name()).append(',').append(sample).append(',').append(variation).append(',').append(side)
                    .append(',').append(i).append(',');
            if (ch.edges() != null) b.append(num(ch.edges()[i])).append(',').append(num(ch.edges()[i + 1]));
            else b.append(',');
            b.append(',').append(num(values[i])).append(',');
            if (errors != null) b.append(num(errors[i]));
            out.write(b.append('\n').toString());
        }
    }

    /** Shortest text that reads back to the same double. */
    private static String num(double x) {
        if (x == Math.rint(x) && Math.abs(x) < 1e15) return Long.toString((long) x);
        return Double.toString(x);
    }
}
