package plumb.validation.bench;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;

import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;

/**
 * The table of {@code bench-compare}: the same JMH benchmarks run with an older and a newer
 * benchmarks jar, one row per benchmark and parameter set, the two scores with JMH's errors and
 * their ratio new/old, and the same for the process CPU time per operation where the runs had
 * {@link CpuTimeProfiler}. Reads a plan file, one benchmark a line:
 * {@code NAME<TAB>OLD.json<TAB>NEW.json}, each file JMH's JSON result of that benchmark's run
 * ({@code -rf json -rff FILE}), or {@code -} where that jar has no such benchmark. A run that left
 * no result (the benchmark threw) shows as failed. Scores of time modes are put in the newer
 * run's unit when the older one reported another.
 */
public final class BenchComparison {

    private static final ObjectMapper JSON = new ObjectMapper();

    /** One score of a JMH result file, with the CPU time per operation (null where not measured). */
    record Score(String benchmark, String mode, Map<String, String> params, Value time, Value cpu) {
    }

    /** A score with JMH's error (NaN where it has none) and its unit. */
    record Value(double score, double error, String unit) {
    }

    /**
     * One line of the table; {@code note} says what stands in for a missing score or a missing
     * parameter; the CPU cells are empty where the runs did not measure it.
     */
    record Row(String benchmark, String params, String mode, String old, String recent, String ratio,
               String oldCpu, String recentCpu, String cpuRatio, String note) {
    }

    private BenchComparison() {
    }

    /** {@code BenchComparison PLAN OLD_LABEL NEW_LABEL}: prints the table to standard output. */
    public static void main(String[] args) throws IOException {
        if (args.length != 3) {
            System.err.println("usage: BenchComparison PLAN OLD_LABEL NEW_LABEL");
            System.exit(2);
        }
        print(rows(Path.of(args[0])), args[1], args[2], System.out);
    }

    /** The rows of every benchmark of the plan file, in its order. */
    static List<Row> rows(Path plan) throws IOException {
        List<Row> rows = new ArrayList<>();
        for (String line : Files.readAllLines(plan, StandardCharsets.UTF_8)) {
            if (line.isBlank()) continue;
            String[] f = line.split("\t");
            if (f.length != 3) throw new IllegalArgumentException(plan + ": expected NAME, OLD and NEW separated by tabs: " + line);
            rows.addAll(compare(f[0], scores(f[1], f[0]), scores(f[2], f[0])));
        }
        return rows;
    }

    /** The scores of one benchmark from its result file; null where the jar has no such benchmark ("-"). */
    static List<Score> scores(String file, String benchmark) throws IOException {
        if (file.equals("-")) return null;
        Path path = Path.of(file);
        List<Score> out = new ArrayList<>();
        if (!Files.isRegularFile(path) || Files.size(path) == 0) return out;
        for (JsonNode r : JSON.readTree(path.toFile())) {
            if (!r.path("benchmark").asText().equals(benchmark)) continue;
            Map<String, String> params = new LinkedHashMap<>();
            for (Iterator<Map.Entry<String, JsonNode>> it = r.path("params").properties().iterator(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> p = it.next();
                params.put(p.getKey(), p.getValue().asText());
            }
            JsonNode cpu = r.path("secondaryMetrics").path(CpuTimeProfiler.LABEL);
            out.add(new Score(benchmark, r.path("mode").asText(), params, value(r.path("primaryMetric")),
                    cpu.isMissingNode() ? null : value(cpu)));
        }
        return out;
    }

    private static Value value(JsonNode metric) {
        return new Value(number(metric.path("score")), number(metric.path("scoreError")), metric.path("scoreUnit").asText());
    }

    /** JMH writes "NaN" as a string where it has no error (fewer than two iterations). */
    private static double number(JsonNode n) {
        return n.isNumber() ? n.asDouble() : n.isTextual() ? parse(n.asText()) : Double.NaN;
    }

    private static double parse(String s) {
        try {
            return Double.parseDouble(s);
        } catch (NumberFormatException e) {
            return Double.NaN;
        }
    }

    /**
     * Rows of one benchmark: each newer score beside the older score of the same mode and the same
     * values of the parameters both have; a parameter only the newer run has is named in the note.
     */
    static List<Row> compare(String benchmark, List<Score> old, List<Score> recent) {
        String name = shortName(benchmark);
        List<Row> rows = new ArrayList<>();
        String noOld = old == null ? "not in old jar" : "failed (no result)";
        String noNew = recent == null ? "not in new jar" : "failed (no result)";
        if (recent == null || recent.isEmpty()) {
            if (old == null || old.isEmpty()) rows.add(row(name, "", "", noOld, null, noNew, null, ""));
            else for (Score o : old) rows.add(row(name, params(o.params()), o.mode(), null, o, noNew, null, ""));
            return rows;
        }
        Set<String> oldKeys = new TreeSet<>();
        if (old != null) for (Score o : old) oldKeys.addAll(o.params().keySet());
        List<Score> unmatched = old == null ? new ArrayList<>() : new ArrayList<>(old);
        for (Score n : recent) {
            String params = params(n.params());
            if (old == null || old.isEmpty()) {
                rows.add(row(name, params, n.mode(), noOld, null, null, n, ""));
                continue;
            }
            Set<String> newOnly = new TreeSet<>(n.params().keySet());
            newOnly.removeAll(oldKeys);
            String note = newOnly.isEmpty() ? "" : "old jar has no parameter " + String.join(", ", newOnly);
            Score o = match(n, old);
            if (o == null) {
                rows.add(row(name, params, n.mode(), "no such parameters in old jar", null, null, n, note));
                continue;
            }
            unmatched.remove(o);
            rows.add(row(name, params, n.mode(), null, o, null, n, note));
        }
        for (Score o : unmatched) rows.add(row(name, params(o.params()), o.mode(), null, o, "no such parameters in new jar", null, ""));
        return rows;
    }

    /** A row from the older and newer score, either standing for its text where missing (null). */
    private static Row row(String name, String params, String mode, String oldText, Score o, String newText, Score n, String note) {
        String[] time = pair(o == null ? null : o.time(), oldText, n == null ? null : n.time(), newText);
        Value oldCpu = o == null ? null : o.cpu(), newCpu = n == null ? null : n.cpu();
        // one run without CPU time: no CPU cells rather than one alone that reads like a comparison
        String[] cpu = o != null && n != null && (oldCpu == null || newCpu == null)
                ? new String[] {"", "", ""} : pair(oldCpu, "", newCpu, "");
        return new Row(name, params, mode, time[0], time[1], time[2], cpu[0], cpu[1], cpu[2], note);
    }

    /**
     * Old cell, new cell and ratio; both in the unit the newer score reads best in (the older one
     * converted) where both are times per operation.
     */
    private static String[] pair(Value o, String oldText, Value n, String newText) {
        if (o == null || n == null) {
            return new String[] {o == null ? orEmpty(oldText) : cell(readable(o)), n == null ? orEmpty(newText) : cell(readable(n)), ""};
        }
        double oldScore = inUnit(o.score(), o.unit(), n.unit());
        if (Double.isNaN(oldScore)) return new String[] {cell(o), cell(n), ""};
        String ratio = String.format(Locale.ROOT, "%.2f", n.score() / oldScore);
        Value shown = readable(n);
        Value old = new Value(inUnit(o.score(), o.unit(), shown.unit()), inUnit(o.error(), o.unit(), shown.unit()), shown.unit());
        return new String[] {cell(old), cell(shown), ratio};
    }

    /** The value in the next larger time unit while it reads 10,000 or more (123,456 ms/op as 123 s/op). */
    static Value readable(Value v) {
        String[] units = {"ns/op", "us/op", "ms/op", "s/op"};
        Value r = v;
        for (int i = 0; i < units.length - 1; i++) {
            if (r.unit().equals(units[i]) && Math.abs(r.score()) >= 1e4) {
                r = new Value(r.score() / 1000, r.error() / 1000, units[i + 1]);
            }
        }
        return r;
    }

    private static String orEmpty(String s) {
        return s == null ? "" : s;
    }

    /** The older score of the same mode whose parameters agree with the newer one's on every parameter both have. */
    private static Score match(Score n, List<Score> old) {
        for (Score o : old) {
            if (!o.mode().equals(n.mode())) continue;
            boolean same = true;
            for (Map.Entry<String, String> p : o.params().entrySet()) {
                String v = n.params().get(p.getKey());
                same &= v == null || v.equals(p.getValue());
            }
            if (same) return o;
        }
        return null;
    }

    /** "FitBenchmark.newtonFit" of "plumb.validation.bench.FitBenchmark.newtonFit". */
    static String shortName(String benchmark) {
        int method = benchmark.lastIndexOf('.');
        int type = method > 0 ? benchmark.lastIndexOf('.', method - 1) : -1;
        return benchmark.substring(type + 1);
    }

    private static String params(Map<String, String> params) {
        List<String> kv = new ArrayList<>();
        for (Map.Entry<String, String> p : params.entrySet()) kv.add(p.getKey() + "=" + p.getValue());
        return String.join(" ", kv);
    }

    private static String cell(Value v) {
        return cell(v.score(), v.error(), v.unit());
    }

    /** "1.86 ± 0.21 ms/op", three significant digits; no error where JMH has none. */
    static String cell(double score, double error, String unit) {
        String s = significant(score);
        if (!Double.isNaN(error)) s += " ± " + significant(error);
        return s + " " + unit;
    }

    static String significant(double v) {
        if (Double.isNaN(v) || Double.isInfinite(v)) return String.valueOf(v);
        if (v == 0) return "0";
        double a = Math.abs(v);
        if (a >= 1e5 || a < 1e-3) return String.format(Locale.ROOT, "%.2e", v);
        int decimals = Math.max(0, 2 - (int) Math.floor(Math.log10(a)));
        return String.format(Locale.ROOT, "%." + decimals + "f", v);
    }

    /** A time-per-operation value in another time unit ("us/op" to "ms/op"); NaN where the units do not convert. */
    static double inUnit(double value, String from, String to) {
        if (from.equals(to)) return value;
        double f = seconds(from), t = seconds(to);
        return Double.isNaN(f) || Double.isNaN(t) ? Double.NaN : value * f / t;
    }

    private static double seconds(String unit) {
        return switch (unit) {
            case "ns/op" -> 1e-9;
            case "us/op" -> 1e-6;
            case "ms/op" -> 1e-3;
            case "s/op" -> 1;
            case "min/op" -> 60;
            default -> Double.NaN;
        };
    }

    /** The table with aligned columns, headed by the two labels; CPU columns where any run measured CPU time. */
    static void print(List<Row> rows, String oldLabel, String newLabel, PrintStream out) {
        boolean cpu = false;
        for (Row r : rows) cpu |= !r.oldCpu().isEmpty() || !r.recentCpu().isEmpty();
        List<String[]> cells = new ArrayList<>();
        cells.add(cpu
                ? new String[] {"benchmark", "params", "mode", "old " + oldLabel, "new " + newLabel, "new/old",
                        "CPU old", "CPU new", "new/old", ""}
                : new String[] {"benchmark", "params", "mode", "old " + oldLabel, "new " + newLabel, "new/old", ""});
        for (Row r : rows) {
            cells.add(cpu
                    ? new String[] {r.benchmark(), r.params(), r.mode(), r.old(), r.recent(), r.ratio(),
                            r.oldCpu(), r.recentCpu(), r.cpuRatio(), r.note()}
                    : new String[] {r.benchmark(), r.params(), r.mode(), r.old(), r.recent(), r.ratio(), r.note()});
        }
        int columns = cells.get(0).length;
        int[] width = new int[columns];
        for (String[] c : cells) {
            for (int i = 0; i < columns; i++) width[i] = Math.max(width[i], c[i].length());
        }
        for (String[] c : cells) {
            StringBuilder line = new StringBuilder();
            for (int i = 0; i < columns; i++) {
                boolean right = i >= 3 && i < columns - 1;
                String pad = " ".repeat(width[i] - c[i].length());
                line.append(right ? pad + c[i] : c[i] + pad).append("  ");
            }
            out.println(line.toString().stripTrailing());
        }
        out.println("new/old: ratio of the scores (per operation: below 1 the new jar is faster); ± is JMH's 99.9 % error"
                + (cpu ? "; CPU: process CPU time per operation (all threads, JIT and GC included)" : ""));
    }
}
