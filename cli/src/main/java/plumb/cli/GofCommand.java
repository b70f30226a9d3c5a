package plumb.cli;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import plumb.cli.table.Table;
import plumb.cli.table.TableFormat;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.WorkRunner;
import plumb.engine.inference.GoodnessOfFit;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.ToyPValue;

import java.io.PrintWriter;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code plumb gof MODEL}: saturated-model goodness of fit, with a per-channel breakdown. */
@Command(name = "gof", mixinStandardHelpOptions = true,
        description = "Goodness of fit with the saturated-model statistic (Baker-Cousins): value, degrees of freedom, "
                + "asymptotic p-value, per-channel breakdown; with --toys the p-value from toys.")
final class GofCommand implements Callable<Integer> {

    @Mixin ModelInput input;
    @Mixin FitOptions fit;

    @Mixin ClusterOptions cluster;

    @Option(names = "--toys", converter = OptionValues.Positive.class, paramLabel = "N", description = "Also the p-value from N toys drawn at the best fit.")
    Integer toys;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (toys != null && toys < 1) throw new InputException("--toys must be at least 1, got " + toys);
        ModelInput.Loaded l = input.load();
        CompiledModel m = l.compiled();
        if (toys != null) FitOptions.requireCount("--toys", toys, m);
        FitOptions.Prepared p = fit.prepare(m, 1.0);
        GofTests c = compute(m, p, fit, toys, cluster);
        GoodnessOfFit.Result r = c.result();
        ToyPValue toy = c.toy();
        PrintWriter out = spec.commandLine().getOut();
        if (json != null) Outputs.write(json, Json.write(GofJson.of(m, p, c.result(), c.toy(), fit.seed)), out);
        if (!"-".equals(json)) print(out, l, p, r, toy);
        return ExitCodes.OK;
    }

    /** The saturated-model test, and with toys (else null) its p-value from toys. */
    record GofTests(GoodnessOfFit.Result result, ToyPValue toy) { }

    /**
     * The goodness of fit to the prepared data; with {@code toys} (null: none) also from toys
     * drawn at the best fit, seeded by the options.
     *
     * @throws ComputationException when the fit fails
     */
    static GofTests compute(CompiledModel m, FitOptions.Prepared p, FitOptions fit, Integer toys) {
        return compute(m, p, fit, toys, null);
    }

    /** As above, the toys run where {@code cluster} says (null: threads). */
    static GofTests compute(CompiledModel m, FitOptions.Prepared p, FitOptions fit, Integer toys, ClusterOptions cluster) {
        try {
            GoodnessOfFit.Result r = GoodnessOfFit.compute(m, p.data(), p.settings(), p.held(), p.heldValues());
            ToyPValue toy = null;
            if (toys != null) {
                try (WorkRunner runner = ClusterOptions.runner(cluster, fit.threadCount());
                     Progress bar = Progress.start("toys", toys)) {
                    toy = GoodnessOfFit.toys(m, p.data(), r.statistic(), r.fit().values(), p.settings(), p.held(),
                            p.heldValues(), toys, fit.seed, runner, bar.callback());
                }
            }
            return new GofTests(r, toy);
        } catch (InferenceException e) {
            throw new ComputationException(e.getMessage());
        }
    }

    private void print(PrintWriter out, ModelInput.Loaded l, FitOptions.Prepared p, GoodnessOfFit.Result r, ToyPValue toy) {
        CompiledModel m = l.compiled();
        out.printf(Locale.ROOT, "Goodness of fit of model '%s' (%s) to the %s data%s%n", m.name(), l.file(), p.kind(),
                p.asimovPoi() == null ? "" : " (Asimov at POI = " + Numbers.plain(p.asimovPoi()) + ")");
        out.println("  method: saturated-model statistic 2 sum[nu - n + n ln(n/nu)] plus constraint terms "
                + "(Baker, Cousins 1984), chi-square asymptotics");
        out.printf(Locale.ROOT, "  statistic = %s, ndof = %d, p = %s (asymptotic)%n", Numbers.plain(r.statistic()),
                r.ndof(), r.ndof() > 0 ? Numbers.plain(r.p()) : "- (no degrees of freedom)");
        if (toy != null) {
            out.printf(Locale.ROOT, "  p = %s ± %s from %d toys at the best fit (seed %d; %d of them at least as large; "
                    + "%d failed fits left out)%n", Numbers.plain(toy.p()), Numbers.plain(toy.error()),
                    toy.toys() - toy.failed(), fit.seed, toy.exceeding(), toy.failed());
        }
        Table.Builder t = Table.builder(null, "channel", "bins", "statistic", "statistic/bin");
        for (int c = 0; c < m.nChannels(); c++) {
            int bins = r.channelBins()[c];
            double s = r.channelStatistic()[c];
            t.row(m.channelNames(c), bins == 0 ? "not fitted" : Integer.toString(bins), Table.number(s, 4),
                    bins == 0 ? Table.MISSING : Table.number(s / bins, 3));
        }
        t.row("constraints", "", Table.number(r.constraintStatistic(), 4), "");
        out.print(TableFormat.TEXT.render(t.build()).replaceAll("(?m)^", "  "));
        out.flush();
    }
}
