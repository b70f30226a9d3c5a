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
import plumb.engine.inference.WorkRunner;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.Impacts;

import java.io.PrintWriter;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code plumb impacts MODEL}: nuisance parameters ranked by their impact on the POI, and the grouped breakdown. */
@Command(name = "impacts", mixinStandardHelpOptions = true,
        description = "Rank nuisance parameters by their impact on the POI (exact refits and linearised), "
                + "and break the POI's uncertainty down by groups.")
final class ImpactsCommand implements Callable<Integer> {

    @Mixin ModelInput input;
    @Mixin FitOptions fit;

    @Mixin ClusterOptions cluster;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Option(names = "--top", converter = OptionValues.Positive.class, paramLabel = "N", description = "Show only the N largest impacts in the table.")
    Integer top;

    @Option(names = "--exact-top", converter = OptionValues.NonNegative.class, paramLabel = "N",
            description = "Refit only the N largest by the linearised ranking (default: all; 0: linearised only).")
    Integer exactTop;

    @Option(names = "--include-mcstat", description = "Rank the MC-statistics parameters too.")
    boolean includeMcStat;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (top != null && top < 1) throw new InputException("--top must be at least 1, got " + top);
        if (exactTop != null && exactTop < 0) throw new InputException("--exact-top must be at least 0, got " + exactTop);
        CompiledModel m = input.load().compiled();
        if (m.poi() < 0) throw new InputException(input.file + ": the model names no parameter of interest (poi)");
        // impacts are shifts of the fitted POI: with the POI held every shift would be zero
        if (fit.fixes(m).containsKey(m.poi())) {
            throw new InputException("--fix: the POI " + m.parameterNames(m.poi()) + " cannot be held; impacts are shifts of its fitted value");
        }
        if (m.fixed(m.poi())) {
            throw new InputException(input.file + ": the POI " + m.parameterNames(m.poi()) + " is fixed in the model; impacts need it free");
        }
        FitOptions.Prepared p = fit.prepare(m, 1.0);
        FitResult best = new Fitter(m, p.data(), p.settings(), p.held(), p.heldValues()).fit();
        ImpactRanking c;
        try (WorkRunner runner = cluster.runner(fit.threadCount())) {
            c = compute(m, p, best, exactTop, includeMcStat, runner);
        }
        List<Impacts.Entry> entries = c.entries();
        Impacts.Breakdown breakdown = c.breakdown();
        PrintWriter out = spec.commandLine().getOut();
        if (json != null) Outputs.write(json, Json.write(ImpactsJson.of(m, p, best, entries, breakdown)), out);
        if (!"-".equals(json)) printTable(out, m, p, best, entries, breakdown);
        long failed = c.failedRefits();
        if (failed > 0) {
            spec.commandLine().getErr().printf(Locale.ROOT,
                    "plumb impacts: %d parameters had refits that did not converge; their shifts are null (see status)%n", failed);
        }
        return ExitCodes.OK;
    }

    /** The ranking (largest first) and the grouped breakdown. */
    record ImpactRanking(List<Impacts.Entry> entries, Impacts.Breakdown breakdown) {
        /** Parameters with a refit that did not converge (their shifts are NaN). */
        long failedRefits() {
            return entries.stream().filter(e -> e.refitted() && !(e.postfit().converged() && e.prefit().converged())).count();
        }
    }

    /**
     * Ranks the impacts around the best fit {@code best} of the prepared data: exact refits for the
     * {@code exactTop} largest by the linearised ranking (null: all), linearised for the rest.
     *
     * @throws ComputationException when the best fit did not converge
     */
    static ImpactRanking compute(CompiledModel m, FitOptions.Prepared p, FitResult best, Integer exactTop,
                            boolean includeMcStat, int threads) {
        return compute(m, p, best, exactTop, includeMcStat, WorkRunner.threads(threads));
    }

    /** As above, the exact refits run by {@code runner} (threads or a cluster; the same numbers). */
    static ImpactRanking compute(CompiledModel m, FitOptions.Prepared p, FitResult best, Integer exactTop,
                            boolean includeMcStat, WorkRunner runner) {
        if (!best.converged() || best.covariance() == null) {
            throw new ComputationException("the best fit did not converge (" + best.status() + "); no impacts");
        }
        Impacts impacts = new Impacts(m, p.data(), p.settings(), p.held(), p.heldValues(), best, includeMcStat);
        int n = impacts.candidates().length;
        int exact = exactTop == null ? n : Math.min(exactTop, n);
        List<Impacts.Entry> entries;
        try (Progress bar = Progress.start("impacts", 4L * exact)) {
            entries = impacts.rank(exact, runner, bar.callback());
        }
        return new ImpactRanking(entries, impacts.breakdown());
    }

    private void printTable(PrintWriter out, CompiledModel m, FitOptions.Prepared p, FitResult best,
                            List<Impacts.Entry> entries, Impacts.Breakdown breakdown) {
        String poi = m.parameterNames(m.poi());
        out.printf(Locale.ROOT, "Impacts on %s = %s (%s data)%n", poi,
                Table.measurement(best.values()[m.poi()], best.errors()[m.poi()]), p.kind());
        int shown = top == null ? entries.size() : Math.min(top, entries.size());
        Table.Builder t = Table.builder(null, "#", "parameter", "pull", "constraint",
                "post-fit +", "post-fit −", "linear +", "pre-fit +", "pre-fit −", "linear pre +", "note");
        for (int i = 0; i < shown; i++) {
            Impacts.Entry e = entries.get(i);
            boolean ok = !e.refitted() || (e.postfit().converged() && e.prefit().converged());
            t.row(Integer.toString(i + 1), e.name(), Numbers.fixed(e.pull(), 2), Numbers.fixed(e.constraint(), 2),
                    shift(e.postfit() == null ? Double.NaN : e.postfit().up()),
                    shift(e.postfit() == null ? Double.NaN : e.postfit().down()),
                    shift(e.linearPostfit().up()),
                    shift(e.prefit() == null ? Double.NaN : e.prefit().up()),
                    shift(e.prefit() == null ? Double.NaN : e.prefit().down()),
                    shift(e.linearPrefit().up()),
                    !e.refitted() ? "linear only" : ok ? "" : "refit failed");
        }
        out.print(TableFormat.TEXT.render(t.build()));
        if (shown < entries.size()) out.printf("  (%d more; --top N shows more)%n", entries.size() - shown);
        out.println("  shifts are refit minus best-fit POI with the parameter held at value ± post-fit error "
                + "(post-fit) or ± pre-fit width (pre-fit); 'linear' is ρ(POI, θ)·σ_POI·Δθ/σ_θ");
        out.println();
        Table.Builder g = Table.builder("Breakdown of the uncertainty on " + poi, "group", "parameters", "error", "error with group fixed");
        g.row("total", "", Table.number(breakdown.total(), 3), "");
        g.row("statistical only", "", Table.number(breakdown.statOnly(), 3), "");
        for (Impacts.Contribution c : breakdown.groups()) {
            g.row(c.group(), Integer.toString(c.members()), Table.number(c.contribution(), 3), Table.number(c.fixedError(), 3));
        }
        out.print(TableFormat.TEXT.render(g.build()));
        out.println("  a group's error is √(total² − error with the group fixed at its best-fit values)");
        out.flush();
    }

    private static String shift(double v) {
        return Double.isNaN(v) ? Table.MISSING : String.format(Locale.ROOT, "%+.4g", v);
    }
}
