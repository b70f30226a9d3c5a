package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import picocli.CommandLine.Command;
import plumb.cli.table.Escape;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.engine.compile.CompiledModel;
import plumb.engine.model.ParameterKind;
import plumb.engine.inference.FitChecks;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.Pulls;
import plumb.cli.table.Table;
import plumb.cli.table.TableFormat;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;

/** {@code plumb fit MODEL}: maximum-likelihood fit with pulls and constraints. */
@Command(name = "fit", mixinStandardHelpOptions = true,
        description = "Maximum-likelihood fit: every parameter's value, error, pull and constraint.")
final class FitCommand implements Callable<Integer> {

    @Mixin ModelInput input;
    @Mixin FitOptions fit;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Option(names = "--show-mcstat", description = "List the MC-statistics parameters in the table too.")
    boolean showMcStat;

    @Option(names = "--show-bin-factors", description = "List the per-bin free factors (binFactors) in the table too.")
    boolean showBinFactors;

    @Option(names = "--intervals", arity = "0..*", paramLabel = "NAME",
            description = "Add asymmetric 68%% profile-likelihood intervals (errorLow/errorHigh) for the POI and the parameters named.")
    List<String> intervals;

    @Option(names = "--starts", paramLabel = "N",
            description = "Also fit from N seeded random starts (--seed) within ±2 pre-fit widths of the nominal values, "
                    + "keep the lowest minimum and list the distinct minima found.")
    Integer starts;

    /** More random starts than anyone waits for: a typo, refused. */
    static final int MAX_STARTS = 100_000;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        CompiledModel m = input.load().compiled();
        FitOptions.Prepared p = fit.prepare(m, 1.0);
        int[] intervalParams = intervals == null ? new int[0] : ProfileIntervals.resolve(m, p, intervals);
        if (starts != null && (starts < 0 || starts > MAX_STARTS)) {
            throw new InputException("--starts " + starts + ": must be between 0 and " + MAX_STARTS);
        }
        Fitter fitter = new Fitter(m, p.data(), p.settings(), p.held(), p.heldValues());
        FitResult r = starts == null ? fitter.fit() : fitter.fitWithRandomStarts(starts, fit.seed);
        Map<Integer, double[]> profile = ProfileIntervals.withKinks(m, p, r, intervalParams, fit.threadCount());
        PrintWriter out = spec.commandLine().getOut();
        if (json != null) {
            ObjectNode root = ProfileIntervals.addTo(FitJson.of(m, p, r), m, profile);
            if (starts != null) root.put("starts", starts);
            if (!r.converged()) root.put("failure", "the fit did not converge (" + r.status() + ")");
            Outputs.write(json, Json.write(root), out);
        }
        if (!"-".equals(json)) {
            printTable(out, m, p, r);
            ProfileIntervals.print(out, m, r, profile);
            printOtherMinima(out, m, r);
        }
        for (String w : checkWarnings(m, r)) spec.commandLine().getErr().println("plumb fit: warning: " + Escape.controls(w));
        if (!r.converged()) {
            spec.commandLine().getErr().printf("plumb fit: the fit did not converge (%s)%n", r.status());
            return ExitCodes.FAILED;
        }
        return ExitCodes.OK;
    }

    /** The other minima the fit met, and why parameters on a kink carry a profile interval. */
    static void printOtherMinima(PrintWriter out, CompiledModel m, FitResult r) {
        if (r.anyAtKink()) {
            out.println("on kink: the minimum lies on the kink of a linear or exponential interpolation at 0; the symmetric");
            out.println("  error is one side's curvature, the profile-likelihood interval above spans the kink.");
        }
        if (!r.severalMinima()) {
            out.flush();
            return;
        }
        out.printf(Locale.ROOT, "several minima: -ln L has %d other minim%s; the fit reports the lowest.%n",
                r.otherMinima().size(), r.otherMinima().size() == 1 ? "um" : "a");
        for (FitResult.OtherMinimum o : r.otherMinima()) {
            StringBuilder b = new StringBuilder();
            for (int i : o.mostDifferent(m, r, FitJson.MOST_DIFFERENT)) {
                b.append(b.length() == 0 ? "" : ", ").append(m.parameterNames(i)).append(' ')
                        .append(Numbers.fixed(o.values()[i], 2)).append(" (here ").append(Numbers.fixed(r.values()[i], 2))
                        .append(')');
            }
            out.printf(Locale.ROOT, "  -ln L above the best by +%s at %s%n", String.format(Locale.ROOT, "%.6f", o.nllAboveBest()), b);
        }
        out.flush();
    }

    /** Warnings for the report's run summary: other minima met, parameters ending on a kink. */
    static List<String> minimaWarnings(CompiledModel m, FitResult r) {
        List<String> out = new ArrayList<>();
        if (r.severalMinima()) {
            FitResult.OtherMinimum o = r.otherMinima().get(0);
            List<String> names = new ArrayList<>();
            for (int i : o.mostDifferent(m, r, FitJson.MOST_DIFFERENT)) names.add(m.parameterNames(i));
            out.add(String.format(Locale.ROOT, "the model has several minima: the fit met %d other minim%s of -ln L "
                            + "(the nearest %.4g above, differing most in %s); results use the lowest",
                    r.otherMinima().size(), r.otherMinima().size() == 1 ? "um" : "a", o.nllAboveBest(), String.join(", ", names)));
        }
        for (int i = 0; i < m.nAll(); i++) {
            if (r.atKink()[i]) {
                out.add(String.format(Locale.ROOT, "%s ends on the kink of its interpolation at 0: its symmetric error is one "
                        + "side's curvature; fit.json carries its profile interval", m.parameterNames(i)));
            }
        }
        return out;
    }

    /** The warning of {@link FitChecks}: a near-singular Hessian with its degenerate direction. */
    static List<String> checkWarnings(CompiledModel m, FitResult r) {
        List<String> out = new ArrayList<>();
        FitChecks c = r.checks();
        if (r.converged() && c.nearSingular()) {
            List<String> names = new ArrayList<>();
            for (int i : c.degenerate()) names.add(m.parameterNames(i));
            out.add(c.smallestEigenvalue() == 0
                    ? "the Hessian is not positive definite: some combination of the parameters is not constrained by the data"
                    : String.format(Locale.ROOT, "the Hessian is near-singular (smallest eigenvalue of the correlation matrix %.2g): "
                            + "the data do not constrain a combination of %s; their errors and correlations are not meaningful",
                    c.smallestEigenvalue(), String.join(", ", names)));
        }
        return out;
    }

    private static boolean degenerate(FitResult r, int i) {
        for (int d : r.checks().degenerate()) if (d == i) return true;
        return false;
    }

    private static String decimals(double v) {
        return Double.isFinite(v) ? Numbers.fixed(v, 2) : Table.MISSING;
    }

    private void printTable(PrintWriter out, CompiledModel m, FitOptions.Prepared p, FitResult r) {
        out.printf(Locale.ROOT, "Maximum-likelihood fit of '%s' to the %s data%s%n", m.name(), p.kind(),
                p.asimovPoi() == null ? "" : String.format(Locale.ROOT, " (Asimov at %s = %s)",
                        m.poi() >= 0 ? m.parameterNames(m.poi()) : "poi", Numbers.plain(p.asimovPoi())));
        out.printf(Locale.ROOT, "status %s, -ln L = %.6f, %d evaluations, %.1f ms%n%n", r.status(), r.nll(),
                r.evaluations(), r.seconds() * 1e3);
        Table.Builder t = Table.builder(null, "parameter", "value ± error", "pull", "constraint", "");
        int hiddenGamma = 0, flaggedGamma = 0, hiddenBinFactors = 0;
        for (int i = 0; i < m.nAll(); i++) {
            double pull = Pulls.pull(m, r, i), cons = Pulls.constraint(m, r, i);
            boolean pulled = Math.abs(pull) > 1, constrained = cons < 0.5;
            if (m.kind(i) == ParameterKind.MC_STATISTICS && !showMcStat) {
                hiddenGamma++;
                if (pulled || constrained) flaggedGamma++;
                continue;
            }
            if (m.kind(i) == ParameterKind.BIN_FACTOR && !showBinFactors) {
                hiddenBinFactors++;
                continue;
            }
            String flags = (i == m.poi() ? "POI " : "") + (pulled ? "pulled " : "") + (constrained ? "constrained " : "")
                    + (r.atKink()[i] ? "on kink " : "")
                    + (r.checks().bound()[i] < 0 ? "at lower bound" : r.checks().bound()[i] > 0 ? "at upper bound" : "")
                    + (degenerate(r, i) ? "degenerate" : "");
            String shown = r.held()[i] ? Table.number(r.values()[i], 4) + " (fixed)"
                    : r.checks().bound()[i] != 0 ? Table.number(r.values()[i], 4) + " (bound)"
                    // rounded to a huge error the value would read 0: its own digits instead
                    : degenerate(r, i) ? Table.number(r.values()[i], 4) + " ± " + Table.number(r.errors()[i], 2)
                    : Table.measurement(r.values()[i], r.errors()[i]);
            t.row(m.parameterNames(i), shown,
                    decimals(pull), decimals(cons), flags.strip());
        }
        out.print(TableFormat.TEXT.render(t.build()));
        if (hiddenGamma > 0) {
            out.printf("(%d MC-statistics parameters not listed, %d of them flagged; --show-mcstat lists them)%n",
                    hiddenGamma, flaggedGamma);
        }
        if (hiddenBinFactors > 0) {
            out.printf("(%d per-bin free factors not listed; --show-bin-factors lists them)%n", hiddenBinFactors);
        }
        out.println("pull = (value - prefit value)/prefit width, flagged 'pulled' when |pull| > 1;");
        out.println("constraint = error/prefit width, flagged 'constrained' when < 0.5.");
        out.flush();
    }
}
