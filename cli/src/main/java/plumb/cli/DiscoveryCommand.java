package plumb.cli;

import com.fasterxml.jackson.databind.node.ObjectNode;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.WorkRunner;
import plumb.engine.inference.Discovery;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.ToyPValue;

import java.io.PrintWriter;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code plumb discovery MODEL}: the test of μ = 0 with q0, observed and expected. */
@Command(name = "discovery", mixinStandardHelpOptions = true,
        description = "Discovery test of POI = 0 with the q0 statistic: observed and expected (Asimov) significance; "
                + "with --toys the observed p-value from background-only toys.")
final class DiscoveryCommand implements Callable<Integer> {

    @Mixin ModelInput input;
    @Mixin FitOptions fit;

    @Mixin ClusterOptions cluster;

    @Option(names = "--toys", converter = OptionValues.Positive.class, paramLabel = "N", description = "Also the p-value from N background-only toys.")
    Integer toys;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output).")
    String json;

    @picocli.CommandLine.Parameters(index = "1..*", arity = "0..*", paramLabel = "MORE",
            description = "Further models, one per signal hypothesis: the local p-value across them and the global "
                    + "significance of the largest excess (look-elsewhere effect).")
    java.util.List<java.nio.file.Path> more;

    @Option(names = "--label", paramLabel = "KEY",
            description = "With several models: the label that orders them, e.g. mass (default: the first numeric label all have).")
    String label;

    @Option(names = "--reference", paramLabel = "C0", defaultValue = "0.5",
            description = "With several models: reference level of q0 whose up-crossings are counted (default: ${DEFAULT-VALUE}).")
    double reference;

    @Option(names = "--figure", paramLabel = "DIR",
            description = "With several models: draw the local p-value curve into DIR/local-p.png and .svg.")
    String figure;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        if (toys != null && toys < 1) throw new InputException("--toys must be at least 1, got " + toys);
        if (more != null && !more.isEmpty()) return scan();
        ModelInput.Loaded l = input.load();
        CompiledModel m = l.compiled();
        if (toys != null) FitOptions.requireCount("--toys", toys, m);
        DiscoveryTests c = compute(l, fit, toys, cluster);
        PoiData d = c.data();
        Discovery.Significance observed = c.observed(), expected = c.expected();
        ToyPValue toy = c.toy();
        PrintWriter out = spec.commandLine().getOut();
        if (json != null) Outputs.write(json, Json.write(DiscoveryJson.of(m, c.data(), c.observed(), c.expected(), c.toy(), fit.seed)), out);
        if (!"-".equals(json)) print(out, l, d, observed, expected, toy);
        return ExitCodes.OK;
    }

    /** Several models: the scan, the look-elsewhere effect, its table, JSON and figure. */
    private int scan() {
        java.nio.file.Path figureDir = WhatIf.figureDir(figure);
        java.util.List<java.nio.file.Path> files = new java.util.ArrayList<>();
        files.add(input.file);
        files.addAll(more);
        DiscoveryScan.Result r = DiscoveryScan.compute(files, fit, label, reference, toys);
        PrintWriter out = spec.commandLine().getOut();
        if (json != null) Outputs.write(json, Json.write(DiscoveryScanJson.of(r)), out);
        if (!"-".equals(json)) {
            out.print(plumb.cli.table.TableFormat.TEXT.render(DiscoveryScanJson.table(r)));
            out.print(DiscoveryScanJson.summary(r));
        }
        if (figureDir != null) {
            WhatIf.writeFigure(figureDir, "local-p", plumb.cli.plot.LookElsewhereFigure.of(r.scan(), r.key(),
                    r.toys() == null ? Double.NaN : r.toys().zGlobal()), out);
        }
        out.flush();
        return ExitCodes.OK;
    }

    /**
     * The discovery tests of one model.
     *
     * @param observed null for a blinded model
     * @param toy      null without toys
     */
    record DiscoveryTests(PoiData data, Discovery.Significance observed, Discovery.Significance expected, ToyPValue toy) { }

    /**
     * The observed (unless blinded) and expected q0 tests of {@code l} with the shared options, and
     * with {@code toys} (null: none) the observed p-value from background-only toys.
     *
     * @throws InputException for options that do not fit the model
     * @throws ComputationException when a needed fit fails
     */
    static DiscoveryTests compute(ModelInput.Loaded l, FitOptions fit, Integer toys) {
        return compute(l, fit, toys, null);
    }

    /** As above, the toys run where {@code cluster} says (null: threads). */
    static DiscoveryTests compute(ModelInput.Loaded l, FitOptions fit, Integer toys, ClusterOptions cluster) {
        CompiledModel m = l.compiled();
        // The expected significance is on the Asimov set at --asimov-poi (default 1); --data asimov
        // then tests that same set.
        double expectedPoi = fit.asimovPoi == null ? 1.0 : fit.asimovPoi;
        if (m.poi() < 0) throw new InputException(l.file() + ": the model names no parameter of interest (poi)");
        if (!(expectedPoi >= m.lower(m.poi()) && expectedPoi <= m.upper(m.poi()))) {
            throw new InputException(String.format(Locale.ROOT, "--asimov-poi %s is outside the POI range [%s, %s]",
                    expectedPoi, m.lower(m.poi()), m.upper(m.poi())));
        }
        PoiData d = PoiData.resolve(l.file(), m, fit, expectedPoi, expectedPoi);
        Discovery.Significance observed = null, expected;
        ToyPValue toy = null;
        try {
            expected = Discovery.compute(m, d.expected(), d.settings(), d.held(), d.heldValues());
            if (!d.blinded()) {
                observed = Discovery.compute(m, d.data(), d.settings(), d.held(), d.heldValues());
                if (toys != null) {
                    try (WorkRunner runner = ClusterOptions.runner(cluster, fit.threadCount());
                         Progress bar = Progress.start("toys", toys)) {
                        toy = Discovery.toys(m, d.data(), d.settings(), d.held(), d.heldValues(), toys, fit.seed,
                                runner, bar.callback());
                    }
                }
            }
        } catch (InferenceException e) {
            throw new ComputationException(e.getMessage());
        }
        return new DiscoveryTests(d, observed, expected, toy);
    }

    private void print(PrintWriter out, ModelInput.Loaded l, PoiData d, Discovery.Significance observed,
                       Discovery.Significance expected, ToyPValue toy) {
        CompiledModel m = l.compiled();
        String poi = m.parameterNames(m.poi());
        out.printf(Locale.ROOT, "Discovery test of %s = 0 for model '%s' (%s)%n", poi, m.name(), l.file());
        out.printf(Locale.ROOT, "  method: profile likelihood ratio q0, one-sided; asymptotic Z = sqrt(q0), p = 1 - Phi(Z)"
                + " (Cowan, Cranmer, Gross, Vitells 2011)%n");
        if (observed == null) {
            out.println("  observed: none, the model is blinded");
        } else {
            out.printf(Locale.ROOT, "  observed (%s): best fit %s = %s, q0 = %s, Z = %s sigma, p = %s%n",
                    d.kind().equals("asimov") ? "Asimov data set at " + poi + " = " + Numbers.plain(d.asimovPoi())
                            : "observed data", poi, Numbers.plain(observed.muHat()), Numbers.plain(observed.q0()),
                    Numbers.fixed(observed.z(), 3), Numbers.plain(observed.p()));
        }
        out.printf(Locale.ROOT, "  expected (Asimov data set at %s = %s): q0 = %s, Z = %s sigma, p = %s%n", poi,
                Numbers.plain(d.expectedPoi()), Numbers.plain(expected.q0()), Numbers.fixed(expected.z(), 3),
                Numbers.plain(expected.p()));
        if (toy != null) {
            out.printf(Locale.ROOT, "  toys (background only, nuisances at their fit with %s = 0, seed %d): "
                    + "p = %s ± %s (%d of %d toys with q0 >= observed; %d failed fits left out), Z = %s sigma%n",
                    poi, fit.seed, Numbers.plain(toy.p()), Numbers.plain(toy.error()), toy.exceeding(),
                    toy.toys() - toy.failed(), toy.failed(), Numbers.fixed(toy.z(), 3));
            if (toy.exceeding() == 0) {
                out.printf(Locale.ROOT, "  (no toy reached the observed q0: p is below about %s; throw more toys)%n",
                        Numbers.plain(3.0 / Math.max(1, toy.toys() - toy.failed())));
            }
        }
        out.flush();
    }
}
