package plumb.cli.build;

import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.Sample;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The cut flow that {@code plumb build} writes beside its model ({@code NAME.cutflow.csv} for
 * {@code NAME.json}), read back so that {@code plumb report} on a built model shows it. A file
 * whose final rows do not hold the model's histogram totals belongs to another build: it is left
 * out with a warning rather than shown beside a model it does not describe.
 */
public final class CutFlowFile {

    /** The columns of the CSV file, in order. */
    public static final List<String> COLUMNS = List.of("region", "sample", "step", "weighted", "events");

    private CutFlowFile() {
    }

    /** The cut-flow files' common stem: the model file without .json or .json.gz, plus ".cutflow". */
    public static Path stem(Path modelFile) {
        String name = modelFile.getFileName().toString();
        if (name.endsWith(".json.gz")) name = name.substring(0, name.length() - 8);
        else if (name.endsWith(".json")) name = name.substring(0, name.length() - 5);
        return modelFile.resolveSibling(name + ".cutflow");
    }

    /**
     * The cut flow written beside {@code modelFile}, or an empty list when there is none, or when
     * it cannot be read or does not match {@code model} (then with a line in {@code warnings}).
     */
    public static List<CutFlowRow> readBeside(Path modelFile, Model model, List<String> warnings) {
        Path csv = Path.of(stem(modelFile) + ".csv");
        if (!Files.isRegularFile(csv)) return List.of();
        try {
            List<CutFlowRow> rows = read(csv);
            String mismatch = mismatch(rows, model);
            if (mismatch == null) return rows;
            warnings.add(csv + " does not describe this model (" + mismatch + "): its cut flow is not shown");
        } catch (IOException | IllegalArgumentException e) {
            warnings.add(csv + ": cannot read the cut flow (" + e.getMessage() + "): it is not shown");
        }
        return List.of();
    }

    /** The rows of a cut-flow CSV file (RFC 4180, the header line first). */
    public static List<CutFlowRow> read(Path csv) throws IOException {
        List<String> lines = Files.readAllLines(csv);
        if (lines.isEmpty() || !cells(lines.get(0)).equals(COLUMNS)) {
            throw new IllegalArgumentException("line 1 is not the header " + String.join(",", COLUMNS));
        }
        List<CutFlowRow> rows = new ArrayList<>();
        for (int i = 1; i < lines.size(); i++) {
            if (lines.get(i).isEmpty()) continue;
            List<String> c = cells(lines.get(i));
            if (c.size() != COLUMNS.size()) {
                throw new IllegalArgumentException("line " + (i + 1) + " has " + c.size() + " fields, expected " + COLUMNS.size());
            }
            try {
                rows.add(new CutFlowRow(c.get(0), c.get(1), c.get(2), Double.parseDouble(c.get(3)), Long.parseLong(c.get(4))));
            } catch (NumberFormatException e) {
                throw new IllegalArgumentException("line " + (i + 1) + ": not a number: " + e.getMessage());
            }
        }
        return rows;
    }

    /** The fields of one CSV line: commas separate, double quotes enclose, a doubled quote is one quote. */
    static List<String> cells(String line) {
        List<String> out = new ArrayList<>();
        StringBuilder cell = new StringBuilder();
        boolean quoted = false;
        for (int i = 0; i < line.length(); i++) {
            char ch = line.charAt(i);
            if (quoted) {
                if (ch != '"') cell.append(ch);
                else if (i + 1 < line.length() && line.charAt(i + 1) == '"') cell.append(line.charAt(++i));
                else quoted = false;
            } else if (ch == '"') {
                quoted = true;
            } else if (ch == ',') {
                out.add(cell.toString());
                cell.setLength(0);
            } else {
                cell.append(ch);
            }
        }
        if (quoted) throw new IllegalArgumentException("a quoted field is not closed: " + line);
        out.add(cell.toString());
        return out;
    }

    /** Why the final rows disagree with the model's histograms, or null when every one holds its total. */
    static String mismatch(List<CutFlowRow> rows, Model model) {
        boolean any = false;
        for (CutFlowRow r : rows) {
            if (!r.step().equals(CutFlowRow.IN_THE_BINS)) continue;
            any = true;
            Channel ch = model.channels().stream().filter(c -> c.name().equals(r.region())).findFirst().orElse(null);
            if (ch == null) return "the model has no channel " + r.region();
            double total;
            if (r.sample().equals(CutFlowRow.DATA)) {
                if (ch.observed() == null) continue;   // blinded since the build
                total = sum(ch.observed());
            } else {
                Sample s = ch.samples().stream().filter(x -> x.name().equals(r.sample())).findFirst().orElse(null);
                if (s == null) return "channel " + r.region() + " has no sample " + r.sample();
                total = sum(s.yields());
            }
            // the same events summed per bin and per step: equal up to the rounding of the two orders
            if (Math.abs(total - r.weighted()) > 1e-9 * Math.max(1, Math.abs(total))) {
                return String.format(Locale.ROOT, "%s/%s: the histogram holds %s, the cut flow %s", r.region(), r.sample(),
                        total, r.weighted());
            }
        }
        return any ? null : "no row '" + CutFlowRow.IN_THE_BINS + "'";
    }

    private static double sum(double[] v) {
        double s = 0;
        for (double x : v) s += x;
        return s;
    }
}
