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
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.Yields;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code plumb yields MODEL}: pre-fit and post-fit yields per channel, sample and bin, with uncertainties. */
@Command(name = "yields", mixinStandardHelpOptions = true,
        description = "Pre-fit and post-fit yields per channel, sample and bin, with uncertainties, totals and data.")
final class YieldsCommand implements Callable<Integer> {

    @Mixin ModelInput input;
    @Mixin FitOptions fit;

    @Option(names = "--format", paramLabel = "text|markdown|csv|latex", defaultValue = "text",
            description = "Table format (default: ${DEFAULT-VALUE}).")
    String format;

    @Option(names = "--out", paramLabel = "FILE", description = "Write the tables to FILE instead of the terminal.")
    String outFile;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        TableFormat tf;
        try {
            tf = TableFormat.parse(format);
        } catch (IllegalArgumentException e) {
            throw new InputException("--format: " + e.getMessage());
        }
        CompiledModel m = input.load().compiled();
        FitOptions.Prepared p = fit.prepare(m, 1.0);
        Fitter fitter = new Fitter(m, p.data(), p.settings(), p.held(), p.heldValues());
        List<Yields.ChannelYields> yields = compute(m, p, fitter, fitter.fit());
        if (json != null) Outputs.write(json, Json.write(YieldsJson.of(m, p, yields)), spec.commandLine().getOut());
        if (!"-".equals(json) || outFile != null) {
            StringBuilder text = new StringBuilder();
            for (Table t : tables(m, yields)) {
                text.append(tf.render(t));
                if (tf != TableFormat.CSV) text.append('\n');
            }
            Outputs.write(outFile == null ? "-" : outFile, text.toString(), spec.commandLine().getOut());
        }
        return ExitCodes.OK;
    }

    /**
     * Pre-fit and post-fit yields around {@code best}, the fit made by {@code fitter} (whose
     * likelihood gives the full post-fit covariance).
     *
     * @throws ComputationException when the fit did not converge or its covariance is not positive definite
     */
    static List<Yields.ChannelYields> compute(CompiledModel m, FitOptions.Prepared p, Fitter fitter, FitResult best) {
        if (!best.converged()) throw new ComputationException("the best fit did not converge (" + best.status() + "); no post-fit yields");
        PostfitCovariance cov = PostfitCovariance.of(fitter.likelihood(), best);
        if (cov == null) throw new ComputationException("the post-fit covariance is not positive definite; no post-fit errors");
        double[] prefitValues = m.nominal().clone();
        for (int i = 0; i < p.held().length; i++) prefitValues[p.held()[i]] = p.heldValues()[i];
        return Yields.compute(m, p.data(), prefitValues, best.held(), best, cov);
    }

    /** Per channel a pre-fit and a post-fit table: one row per bin and a sum row; samples, total, data, data/total. */
    static List<Table> tables(CompiledModel m, List<Yields.ChannelYields> yields) {
        List<Table> out = new ArrayList<>();
        for (int c = 0; c < yields.size(); c++) {
            Yields.ChannelYields ch = yields.get(c);
            for (boolean post : new boolean[] {false, true}) {
                List<String> header = new ArrayList<>();
                header.add("bin");
                for (Yields.SampleYields s : ch.samples()) header.add(s.name());
                header.add("total");
                header.add("data");
                header.add("data/total");
                Table.Builder t = Table.builder(String.format(Locale.ROOT, "%s yields, channel %s", post ? "Post-fit" : "Pre-fit", ch.name()),
                        header.toArray(String[]::new));
                Yields.Band total = post ? ch.totalPostfit() : ch.totalPrefit();
                int nb = total.values().length;
                double observedSum = 0;
                for (int b = 0; b < nb; b++) {
                    List<String> row = new ArrayList<>();
                    row.add(binLabel(m, c, b));
                    for (Yields.SampleYields s : ch.samples()) {
                        Yields.Band band = post ? s.postfit() : s.prefit();
                        row.add(Table.measurement(band.values()[b], band.errors()[b]));
                    }
                    row.add(Table.measurement(total.values()[b], total.errors()[b]));
                    addData(row, ch.observed() == null ? Double.NaN : ch.observed()[b], total.values()[b]);
                    if (ch.observed() != null) observedSum += ch.observed()[b];
                    t.row(row);
                }
                List<String> sum = new ArrayList<>();
                sum.add("sum");
                for (Yields.SampleYields s : ch.samples()) {
                    Yields.Band band = post ? s.postfit() : s.prefit();
                    sum.add(Table.measurement(band.sum(), band.sumError()));
                }
                sum.add(Table.measurement(total.sum(), total.sumError()));
                addData(sum, ch.observed() == null ? Double.NaN : observedSum, total.sum());
                t.row(sum);
                out.add(t.build());
            }
        }
        return out;
    }

    private static void addData(List<String> row, double observed, double total) {
        if (Double.isNaN(observed)) {
            row.add(Table.MISSING);
            row.add(Table.MISSING);
        } else {
            row.add(Numbers.plain(observed));
            row.add(Table.number(observed / total, 3));
        }
    }

    private static String binLabel(CompiledModel m, int c, int b) {
        double[] e = m.edges(c);
        return e == null ? Integer.toString(b) : Numbers.plain(e[b]) + "–" + Numbers.plain(e[b + 1]);
    }
}
