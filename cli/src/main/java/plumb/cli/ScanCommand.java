package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.cli.table.Table;
import plumb.cli.table.TableFormat;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.ProfileScan;

import java.io.PrintWriter;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code plumb scan MODEL --parameter NAME}: profile likelihood scan with 68 % and 95 % intervals. */
@Command(name = "scan", mixinStandardHelpOptions = true,
        description = "Profile likelihood scan of one parameter, with the 68%% and 95%% intervals found by root-finding.")
final class ScanCommand implements Callable<Integer> {

    @Mixin ModelInput input;
    @Mixin FitOptions fit;

    @Option(names = "--parameter", paramLabel = "NAME", description = "Parameter to scan (default: the POI).")
    String parameter;

    @Option(names = "--points", converter = OptionValues.ScanPoints.class, paramLabel = "N", defaultValue = "21", description = "Scan points (default: ${DEFAULT-VALUE}).")
    int points;

    @Option(names = "--range", paramLabel = "LO:HI",
            description = "Scan range (default: best fit ± 3 errors, clipped to the parameter's range).")
    String range;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (points < 2) throw new InputException("--points must be at least 2, got " + points);
        double[] lohi = range == null ? null : parseRange(range);
        CompiledModel m = input.load().compiled();
        FitOptions.requireCount("--points", points, m);
        int k = resolve(m, parameter);
        FitOptions.Prepared p = fit.prepare(m, 1.0);
        for (int h : p.held()) {
            if (h == k) throw new InputException("--parameter " + m.parameterNames(k) + " is held by --fix; it cannot be scanned");
        }
        if (m.fixed(k)) throw new InputException("--parameter " + m.parameterNames(k) + " is fixed in the model; it cannot be scanned");
        if (lohi != null && (lohi[0] < m.lower(k) || lohi[1] > m.upper(k))) {
            throw new InputException(String.format(Locale.ROOT, "--range %s reaches outside the range [%s, %s] of %s",
                    range, m.lower(k), m.upper(k), m.parameterNames(k)));
        }
        FitResult best = new Fitter(m, p.data(), p.settings(), p.held(), p.heldValues()).fit();
        ScanProfile c = compute(m, p, k, best, lohi, points, fit.threadCount());
        List<ProfileScan.Point> pts = c.points();
        List<ProfileScan.Interval> intervals = c.intervals();
        PrintWriter out = spec.commandLine().getOut();
        if (json != null) Outputs.write(json, Json.write(ScanJson.of(m, p, k, best, pts, intervals)), out);
        if (!"-".equals(json)) printTable(out, m, k, best, pts, intervals);
        long failed = c.failedRefits();
        if (failed > 0) {
            spec.commandLine().getErr().printf(Locale.ROOT, "plumb scan: %d refits did not converge; their values are null%n", failed);
        }
        return ExitCodes.OK;
    }

    /** The scanned points and the 68 % and 95 % intervals. */
    record ScanProfile(List<ProfileScan.Point> points, List<ProfileScan.Interval> intervals) {
        /** Scan points and interval ends whose refits did not converge. */
        long failedRefits() {
            long failed = points.stream().filter(x -> Double.isNaN(x.nllAboveMin())).count();
            for (ProfileScan.Interval iv : intervals) if (iv.failure() != null) failed++;
            return failed;
        }
    }

    /**
     * Scans parameter {@code k} around the best fit {@code best} of the prepared data over
     * {@code lohi} (null: the engine's default range, {@link ProfileScan#defaultRange}), the points
     * re-based to the lowest −ln L found ({@link ProfileScan#rebased}).
     *
     * @throws ComputationException when the best fit did not converge
     */
    static ScanProfile compute(CompiledModel m, FitOptions.Prepared p, int k, FitResult best, double[] lohi, int points,
                            int threads) {
        if (!best.converged()) throw new ComputationException("the best fit did not converge (" + best.status() + "); no scan");
        if (lohi == null) lohi = ProfileScan.defaultRange(m, best, k);
        ProfileScan scan = new ProfileScan(m, p.data(), p.settings(), p.held(), p.heldValues(), best);
        List<ProfileScan.Point> pts;
        try (Progress bar = Progress.start("scan " + m.parameterNames(k), points)) {
            pts = ProfileScan.rebased(scan.points(k, lohi[0], lohi[1], points, threads, bar.callback()));
        }
        List<ProfileScan.Interval> intervals = scan.intervals(k, new double[] {ProfileScan.LEVEL_68, ProfileScan.LEVEL_95}, threads);
        return new ScanProfile(pts, intervals);
    }

    static int resolve(CompiledModel m, String name) {
        if (name == null) {
            if (m.poi() < 0) throw new InputException("--parameter: the model names no POI; give a parameter name");
            return m.poi();
        }
        int k = m.indexOf(name);
        if (k < 0) throw new InputException("--parameter " + name + ": the model has no parameter '" + name + "'");
        return k;
    }

    static double[] parseRange(String text) {
        int colon = text.indexOf(':', 1);   // from 1: a leading minus sign is not the separator
        if (colon < 0) throw new InputException("--range " + text + ": expected LO:HI");
        try {
            double lo = Double.parseDouble(text.substring(0, colon)), hi = Double.parseDouble(text.substring(colon + 1));
            if (!(lo < hi) || !Double.isFinite(lo) || !Double.isFinite(hi)) {
                throw new InputException("--range " + text + ": LO must be below HI, both finite");
            }
            return new double[] {lo, hi};
        } catch (NumberFormatException e) {
            throw new InputException("--range " + text + ": expected two numbers LO:HI");
        }
    }

    private void printTable(PrintWriter out, CompiledModel m, int k, FitResult best, List<ProfileScan.Point> pts,
                            List<ProfileScan.Interval> intervals) {
        String name = m.parameterNames(k);
        out.printf(Locale.ROOT, "Profile likelihood scan of %s: best fit %s%n", name,
                Table.measurement(best.values()[k], best.errors()[k]));
        Table.Builder t = Table.builder(null, name, "2ΔNLL", "");
        for (ProfileScan.Point x : pts) {
            double d2 = 2 * x.nllAboveMin();
            int bar = Double.isFinite(d2) ? (int) Math.round(Math.min(d2, 10) * 4) : 0;
            t.row(Table.number(x.value(), 5), Double.isFinite(d2) ? Numbers.fixed(d2, 4) : Table.MISSING, "#".repeat(bar));
        }
        out.print(TableFormat.TEXT.render(t.build()));
        for (ProfileScan.Interval iv : intervals) {
            out.printf(Locale.ROOT, "  %s interval (2ΔNLL = %s): [%s, %s]%n", iv.level() == ProfileScan.LEVEL_68 ? "68%" : "95%",
                    Numbers.plain(iv.level()), end(iv.low()), end(iv.high()));
        }
        out.flush();
    }

    private static String end(double v) {
        return Double.isFinite(v) ? Numbers.plain(v) : "not reached";
    }
}
