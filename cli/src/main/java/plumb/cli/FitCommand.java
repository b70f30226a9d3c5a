package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.engine.compile.CompiledModel;
import plumb.engine.model.ParameterKind;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Fitter;
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

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        CompiledModel m = input.load().compiled();
        FitOptions.Prepared p = fit.prepare(m, 1.0);
        int[] intervalParams = intervals == null ? new int[0] : ProfileIntervals.resolve(m, p, intervals);
        FitResult r = new Fitter(m, p.data(), p.settings(), p.held(), p.heldValues()).fit();
        Map<Integer, double[]> profile = intervals == null || !r.converged() ? Map.of()
                : ProfileIntervals.compute(m, p, r, intervalParams, fit.threadCount());
        PrintWriter out = spec.commandLine().getOut();
        if (json != null) Outputs.write(json, Json.write(ProfileIntervals.addTo(toJson(m, p, r), m, profile)), out);
        if (!"-".equals(json)) {
            printTable(out, m, p, r);
            ProfileIntervals.print(out, m, r, profile);
        }
        if (!r.converged()) {
            spec.commandLine().getErr().printf("plumb fit: the fit did not converge (%s)%n", r.status());
            return ExitCodes.FAILED;
        }
        return ExitCodes.OK;
    }

    /** The fit result file of docs/cli-contract.md. */
    static ObjectNode toJson(CompiledModel m, FitOptions.Prepared p, FitResult r) {
        ObjectNode root = Json.result(m.labels, p.kind());
        if (p.asimovPoi() != null) root.put("asimovPoi", p.asimovPoi());
        root.put("converged", r.converged());
        root.put("status", r.status().name());
        Json.put(root, "nll", r.nll());
        ArrayNode params = root.putArray("parameters");
        for (int i = 0; i < m.nAll; i++) {
            ObjectNode o = params.addObject();
            o.put("name", m.parameterNames[i]);
            o.put("kind", m.kind[i].name().toLowerCase(Locale.ROOT));
            Json.put(o, "value", r.values()[i]);
            Json.put(o, "error", r.errors()[i]);
            Json.put(o, "prefitValue", m.nominal[i]);
            Json.put(o, "prefitWidth", m.prefitWidth[i]);
            Json.put(o, "pull", pull(m, r, i));
            Json.put(o, "constraint", constraint(m, r, i));
            o.put("fixed", r.held()[i]);
        }
        ObjectNode corr = root.putObject("correlation");
        List<Integer> free = new ArrayList<>();
        for (int i = 0; i < m.nParams; i++) if (!r.held()[i]) free.add(i);
        ArrayNode names = corr.putArray("names");
        free.forEach(i -> names.add(m.parameterNames[i]));
        ArrayNode matrix = corr.putArray("matrix");
        for (int i : free) {
            ArrayNode row = matrix.addArray();
            for (int j : free) Json.add(row, r.correlation(i, j, m.nParams));
        }
        ObjectNode timing = root.putObject("timing");
        timing.put("seconds", r.seconds());
        timing.put("evaluations", r.evaluations());
        return root;
    }

    /** (value − prefitValue)/prefitWidth, NaN for free parameters. */
    static double pull(CompiledModel m, FitResult r, int i) {
        return (r.values()[i] - m.nominal[i]) / m.prefitWidth[i];
    }

    /** error/prefitWidth, NaN for free parameters. */
    static double constraint(CompiledModel m, FitResult r, int i) {
        return r.errors()[i] / m.prefitWidth[i];
    }

    private static String decimals(double v) {
        return Double.isFinite(v) ? Numbers.fixed(v, 2) : Table.MISSING;
    }

    private void printTable(PrintWriter out, CompiledModel m, FitOptions.Prepared p, FitResult r) {
        out.printf(Locale.ROOT, "Maximum-likelihood fit of '%s' to the %s data%s%n", m.name, p.kind(),
                p.asimovPoi() == null ? "" : String.format(Locale.ROOT, " (Asimov at %s = %s)",
                        m.poi >= 0 ? m.parameterNames[m.poi] : "poi", Numbers.plain(p.asimovPoi())));
        out.printf(Locale.ROOT, "status %s, -ln L = %.6f, %d evaluations, %.1f ms%n%n", r.status(), r.nll(),
                r.evaluations(), r.seconds() * 1e3);
        Table.Builder t = Table.builder(null, "parameter", "value ± error", "pull", "constraint", "");
        int hiddenGamma = 0, flaggedGamma = 0, hiddenBinFactors = 0;
        for (int i = 0; i < m.nAll; i++) {
            double pull = pull(m, r, i), cons = constraint(m, r, i);
            boolean pulled = Math.abs(pull) > 1, constrained = cons < 0.5;
            if (m.kind[i] == ParameterKind.MC_STATISTICS && !showMcStat) {
                hiddenGamma++;
                if (pulled || constrained) flaggedGamma++;
                continue;
            }
            if (m.kind[i] == ParameterKind.BIN_FACTOR && !showBinFactors) {
                hiddenBinFactors++;
                continue;
            }
            String flags = (i == m.poi ? "POI " : "") + (pulled ? "pulled " : "") + (constrained ? "constrained" : "");
            t.row(m.parameterNames[i],
                    r.held()[i] ? Table.number(r.values()[i], 4) + " (fixed)" : Table.measurement(r.values()[i], r.errors()[i]),
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
