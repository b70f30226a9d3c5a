package plumb.cli;

import com.fasterxml.jackson.databind.node.ObjectNode;
import picocli.CommandLine.Command;
import plumb.cli.table.Escape;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.AsimovClosure;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.InjectionSummary;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.InjectionStudy;
import plumb.engine.inference.InjectionToyBatch;
import plumb.engine.inference.InjectionToys;
import plumb.engine.inference.WorkRunner;
import plumb.engine.likelihood.DataSet;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.Callable;

/**
 * {@code plumb inject MODEL --mu X[,X…] --toys N}: toys generated at POI = X, each fitted; the mean
 * fitted POI, bias, pull mean and width, 68 % coverage, nuisance pulls, and with several values
 * the linearity of fitted against injected. {@code --asimov} adds the Asimov closure check,
 * reported first. {@code --first K --count N} runs one batch and writes a part file for
 * {@code plumb merge-toys}.
 */
@Command(name = "inject", mixinStandardHelpOptions = true,
        description = "Signal injection: toy data sets at POI = X, each fitted; bias, pulls, coverage, nuisance "
                + "pulls, linearity over several X, and the Asimov closure check (--asimov).")
final class InjectCommand implements Callable<Integer> {

    /** Toys per injected value when --toys is not given (and --asimov is not asked alone). */
    static final int DEFAULT_TOYS = 1000;

    /** Where the nuisance values of the generating point come from. */
    enum From { nominal, postfit }

    @Mixin ModelInput input;

    @Mixin ClusterOptions cluster;

    @Option(names = "--mu", converter = OptionValues.Finite.class, required = true, split = ",", paramLabel = "X",
            description = "Injected POI value(s); several give the linearity of fitted against injected.")
    List<Double> mu;

    @Option(names = "--toys", converter = OptionValues.NonNegative.class, paramLabel = "N",
            description = "Toys per injected value (default: " + DEFAULT_TOYS + ", or none with --asimov alone).")
    Integer toys;

    @Option(names = "--from", defaultValue = "nominal", paramLabel = "nominal|postfit",
            description = "Nuisance values the toys are generated at: nominal (default), or those of a fit to the "
                    + "observed data with the POI held at X.")
    From from;

    @Option(names = "--no-aux-fluctuation",
            description = "Keep the auxiliary values (constraint centres, Poisson counts) at their generating values.")
    boolean noAuxFluctuation;

    @Option(names = "--asimov", description = "Asimov closure check: a fit to the Asimov data set at each X must return "
            + "every parameter to its generating value within " + InjectionToys.CLOSURE_TOLERANCE + "; reported first.")
    boolean asimov;

    @Option(names = "--nuisances", description = "List every constrained parameter's pull mean and width over the toys "
            + "(the JSON always has them; without this only flagged ones are listed).")
    boolean showNuisances;

    @Option(names = "--first", paramLabel = "K", description = "Batch mode: first toy index (default 0 with --count).")
    Long first;

    @Option(names = "--count", converter = OptionValues.Positive.class, paramLabel = "N",
            description = "Batch mode: run toys K..K+N-1 and write a part file (--json) for 'plumb merge-toys'.")
    Integer count;

    @Option(names = "--json", paramLabel = "FILE", description = "Write the result as JSON ('-' for standard output); "
            + "in batch mode the part file.")
    String json;

    @Option(names = "--fix", paramLabel = "NAME=X", description = "Hold a parameter at X in generation and fits (repeatable).")
    List<String> fix = new ArrayList<>();

    @Option(names = "--threads", converter = OptionValues.Positive.class, paramLabel = "N", description = "Worker threads (default: all cores); results do not depend on it.")
    Integer threads;

    @Option(names = "--seed", paramLabel = "N", defaultValue = "1",
            description = "Seed of the toys (default: ${DEFAULT-VALUE}); equal seeds give equal results.")
    long seed;

    @Option(names = {"--optimizer", "--minimiser"}, paramLabel = "newton|bfgs|reference", defaultValue = "newton",
            description = "Minimiser: newton (default), bfgs (quasi-Newton on gradients) or reference (derivative-free BOBYQA).")
    String minimiser;

    @Option(names = "--explicit-mcstat",
            description = "Minimise the MC-statistics parameters as ordinary variables instead of in closed form.")
    boolean explicitMcStat;

    @Spec CommandSpec spec;

    @Override
    public Integer call() {
        ModelInput.Loaded loaded = input.load();
        boolean batch = first != null || count != null;
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        boolean table = !"-".equals(json);
        InjectionRun c = compute(loaded, batch, table ? out : null);
        CompiledModel m = loaded.compiled();
        if (batch) {
            ToyBatchFiles.write(c.toyFits(), json, out);
            if (table) {
                out.printf(Locale.ROOT, "wrote toys %d..%d of each value to %s; merge the parts with 'plumb merge-toys'%n",
                        c.toyFits().first(), c.toyFits().first() + c.toyFits().count() - 1, json);
            }
            return ExitCodes.OK;
        }
        List<InjectionSummary> summaries = c.summaries();
        List<String> failures = new ArrayList<>();
        if (c.closureFailed()) failures.add("the Asimov closure check failed");
        for (InjectionSummary s : summaries) {
            if (s.toys() > 0 && s.converged() == 0) {
                failures.add(String.format(Locale.ROOT, "no toy fit at %s = %s converged", m.parameterNames(m.poi()),
                        Numbers.plain(s.injected())));
            }
        }
        if (json != null) {
            var root = c.toJson();
            if (!failures.isEmpty()) Json.failed(root, String.join("; ", failures));
            Outputs.write(json, Json.write(root), out);
        }
        if (table && c.toyFits().count() > 0) printSummaries(out, summaries, showNuisances, m.parameterNames(m.poi()));
        for (String f : failures) {
            err.println("plumb inject: " + Escape.controls(f) + (f.startsWith("the Asimov") && table ? " (see above)" : ""));
        }
        err.flush();
        return failures.isEmpty() ? ExitCodes.OK : ExitCodes.FAILED;
    }

    /**
     * The outcome of an injection run.
     *
     * @param toyFits  the toys' results
     * @param closures  per injected value the Asimov closure check (empty without --asimov)
     * @param summaries per injected value the toys' summary (empty in batch mode)
     */
    record InjectionRun(CompiledModel model, InjectionToyBatch toyFits, List<AsimovClosure> closures,
                    List<InjectionSummary> summaries) {
        boolean closureFailed() {
            return closures.stream().anyMatch(c -> !c.passed());
        }

        /** The result file of docs/cli-contract.md. */
        ObjectNode toJson() {
            return InjectionJson.of(toyFits, model, closures, summaries);
        }
    }

    /**
     * The toys (and with --asimov the closure checks) of every injected value, as the options say.
     *
     * @param batch  batch mode (--first/--count): no summaries
     * @param table  where to print the run's header and closure lines as they come, or null
     * @throws InputException for options that do not fit the model
     * @throws ComputationException when a generating point's fit to the observed data fails
     */
    InjectionRun compute(ModelInput.Loaded loaded, boolean batch, PrintWriter table) {
        CompiledModel m = loaded.compiled();
        FitOptions options = fitOptions();
        int perValue = checkOptions(m, batch);
        Map<Integer, Double> fixes = options.fixes(m);
        if (m.poi() < 0) throw new InputException(loaded.file() + ": the model names no parameter of interest (poi)");
        if (fixes.containsKey(m.poi())) throw new InputException("--fix: the POI " + m.parameterNames(m.poi()) + " cannot be held in an injection");
        if (m.fixed(m.poi())) throw new InputException(loaded.file() + ": the POI " + m.parameterNames(m.poi()) + " is fixed in the model");
        for (double x : mu) {
            if (!(x >= m.lower(m.poi()) && x <= m.upper(m.poi()))) {
                throw new InputException(String.format(Locale.ROOT, "--mu %s is outside the POI range [%s, %s]",
                        Numbers.plain(x), Numbers.plain(m.lower(m.poi())), Numbers.plain(m.upper(m.poi()))));
            }
        }
        boolean postfit = from == From.postfit;
        if (postfit && !DataSet.observed(m).anyChannel()) {
            throw new InputException("--from postfit: every channel of the model is blinded, there is no fit to start from");
        }
        int[] held = fixes.keySet().stream().mapToInt(Integer::intValue).toArray();
        double[] heldValues = fixes.values().stream().mapToDouble(Double::doubleValue).toArray();
        FitSettings settings = options.settings();
        InjectionToys engine = new InjectionToys(m, settings, held, heldValues);
        int[] pulled = engine.pulledParameters();
        checkMemory(perValue, pulled.length);
        int threadCount = options.threadCount();

        InjectionStudy study = new InjectionStudy(engine, mu, postfit);
        for (int k = 0; k < mu.size(); k++) {
            FitResult c = study.conditionalFit(k);
            if (c != null && !c.converged()) {
                throw new ComputationException(String.format(Locale.ROOT,
                        "the fit to the observed data with %s = %s did not converge (%s); use --from nominal",
                        m.parameterNames(m.poi()), Numbers.plain(mu.get(k)), c.status()));
            }
        }

        if (table != null) {
            table.printf(Locale.ROOT, "Signal injection into '%s': %s = %s, %d toys each, nuisances at %s values, %s, seed %d%n",
                    m.name(), m.parameterNames(m.poi()), joined(), perValue, from == From.postfit ? "post-fit" : "nominal",
                    noAuxFluctuation ? "auxiliary values held" : "auxiliary values fluctuated", seed);
            table.flush();
        }

        List<AsimovClosure> closures = new ArrayList<>();
        if (asimov) {
            if (table != null) table.printf("%nAsimov closure (fit to the Asimov data set from the nominal values):%n");
            for (int k = 0; k < mu.size(); k++) {
                AsimovClosure c = study.closure(k);
                closures.add(c);
                if (table != null) printClosure(table, m, c);
            }
            if (table != null) table.flush();
        }

        List<InjectionToyBatch.ValueFits> injections = new ArrayList<>();
        long firstToy = first == null ? 0 : first;
        try (WorkRunner runner = ClusterOptions.runner(cluster, threadCount)) {
            for (int k = 0; k < mu.size(); k++) {
                try (Progress bar = Progress.start(String.format(Locale.ROOT, "toys at %s = %s", m.parameterNames(m.poi()),
                        Numbers.plain(mu.get(k))), perValue)) {
                    injections.add(study.toys(k, seed, !noAuxFluctuation, firstToy, perValue, runner, bar.callback()));
                }
            }
        }
        InjectionToyBatch toyFits = new InjectionToyBatch(runIdentity(loaded, m, fixes, settings), m.labels(),
                study.nuisanceNames(), firstToy, perValue, injections);
        return new InjectionRun(m, toyFits, closures, batch ? List.of() : toyFits.summaries());
    }

    /** The shared fit options, filled from this command's own (inject has no --data). */
    private FitOptions fitOptions() {
        FitOptions o = new FitOptions();
        o.fix = fix;
        o.threads = threads;
        o.seed = seed;
        o.minimiser = minimiser;
        o.explicitMcStat = explicitMcStat;
        return o;
    }

    /** Checks option combinations; returns the toys per injected value. */
    private int checkOptions(CompiledModel m, boolean batch) {
        Set<Double> seen = new HashSet<>();
        for (double x : mu) {
            if (!Double.isFinite(x)) throw new InputException("--mu " + x + " is not a finite number");
            if (!seen.add(x)) throw new InputException("--mu " + Numbers.plain(x) + " is given twice");
        }
        if (batch) {
            if (toys != null) throw new InputException("--toys cannot be combined with --first/--count (the batch size is --count)");
            if (count == null) throw new InputException("--first needs --count (the number of toys of the batch)");
            if (count < 1) throw new InputException("--count must be at least 1, got " + count);
            if (first != null && first < 0) throw new InputException("--first must be at least 0, got " + first);
            if (first != null && first > Long.MAX_VALUE - count) throw new InputException("--first " + first + " is too large");
            if (asimov) throw new InputException("--asimov cannot be combined with --first/--count (batches hold toys only)");
            if (json == null) throw new InputException("--count needs --json FILE: a batch is written as a part file for 'plumb merge-toys'");
            return count;
        }
        int n = toys != null ? toys : asimov ? 0 : DEFAULT_TOYS;
        if (n < 0 || (n == 0 && !asimov)) throw new InputException("--toys must be at least 1, got " + n);
        return n;
    }

    /** Refuses a run whose toy results would not all fit in memory (the engine's policy). */
    private void checkMemory(int perValue, int pulls) {
        plumb.engine.inference.MemoryBudget.requireInjectionToys(perValue, mu.size(), pulls,
                String.format(Locale.ROOT, "--toys %d (%d toys x %d injected values, every toy's fit kept)", perValue,
                        perValue, mu.size()),
                "run fewer toys, or batches (--first/--count, then 'plumb merge-toys')");
    }

    /** Every setting the toys' results depend on (the engine's run identity); batches merge only when these are equal. */
    private ObjectNode runIdentity(ModelInput.Loaded loaded, CompiledModel m, Map<Integer, Double> fixes, FitSettings s) {
        List<String> fixed = new ArrayList<>();
        fixes.forEach((i, v) -> fixed.add(m.parameterNames(i) + "=" + v));
        return InjectionToyBatch.runIdentity(m.name(), loaded.sha256(), m.parameterNames(m.poi()), mu, from.name(),
                !noAuxFluctuation, seed, fixed, s);
    }

    private static void printClosure(PrintWriter out, CompiledModel m, AsimovClosure c) {
        out.printf(Locale.ROOT, "  %s = %-8s %s, fitted %s = %s, largest |fitted - generating| = %s (%s): %s%n",
                m.parameterNames(m.poi()), Numbers.plain(c.injected()), c.fit().status(), m.parameterNames(m.poi()),
                Numbers.plain(c.fit().values()[m.poi()]), String.format(Locale.ROOT, "%.2e", c.maxDeviation()),
                c.worstParameter() >= 0 ? m.parameterNames(c.worstParameter()) : "-",
                c.passed() ? "passed" : "FAILED (tolerance " + InjectionToys.CLOSURE_TOLERANCE + ")");
    }

    /** The terminal table of the toys (shared with merge-toys). */
    static void printSummaries(PrintWriter out, List<InjectionSummary> summaries, boolean allNuisances, String poi) {
        out.printf("%nToys (pull = (fitted - injected)/error; errors of pull widths: Gaussian approximation):%n");
        out.printf("  %-10s %6s %9s %18s %10s %15s %15s %15s%n", "injected", "toys", "converged", "mean fitted",
                "bias", "pull mean", "pull width", "coverage 68%");
        for (InjectionSummary s : summaries) {
            out.printf(Locale.ROOT, "  %-10s %6d %9d %18s %10s %15s %15s %15s%s%n", Numbers.plain(s.injected()), s.toys(),
                    s.converged(), pm(s.mean(), s.meanError(), 4), Numbers.fixed(s.bias(), 4),
                    pm(s.pullMean(), s.pullMeanError(), 3), pm(s.pullWidth(), s.pullWidthError(), 3),
                    pm(s.coverage68(), s.coverage68Error(), 3), s.converged() > 1 && s.flagged() ? "  <- off by > 3 SE" : "");
            if (!s.nonConverged().isEmpty()) out.printf("  %10s not converged: %s%n", "", s.nonConverged());
        }
        out.printf(Locale.ROOT, "  flag: pull mean or width, or coverage, more than 3 standard errors from 0, 1 and %.4f%n",
                InjectionSummary.GAUSSIAN_68);
        var line = plumb.engine.inference.InjectionLinearity.through(summaries);
        if (line != null) {
            out.printf(Locale.ROOT, "%nLinearity (mean fitted %s = offset + slope x injected, weighted least squares):%n", poi);
            out.printf(Locale.ROOT, "  slope %s, offset %s%n", pm(line.slope(), line.slopeError(), 4),
                    pm(line.offset(), line.offsetError(), 4));
        }
        for (InjectionSummary s : summaries) {
            int flagged = 0;
            for (InjectionSummary.NuisancePull p : s.nuisances()) if (p.flagged()) flagged++;
            out.printf(Locale.ROOT, "%nNuisance pulls (fitted - generating)/error at %s = %s: %d of %d flagged "
                    + "(mean or width more than 3 SE from 0 and 1)%s%n", poi, Numbers.plain(s.injected()), flagged,
                    s.nuisances().size(), allNuisances || flagged == 0 ? "" : "; --nuisances lists all");
            if (flagged == 0 && !allNuisances) continue;
            out.printf("  %-32s %15s %15s%n", "parameter", "pull mean", "pull width");
            for (InjectionSummary.NuisancePull p : s.nuisances()) {
                if (!allNuisances && !p.flagged()) continue;
                out.printf(Locale.ROOT, "  %-32s %15s %15s%s%n", p.parameter(), pm(p.pullMean(), p.pullMeanError(), 3),
                        pm(p.pullWidth(), p.pullWidthError(), 3), p.flagged() ? "  <- flagged" : "");
            }
        }
        out.flush();
    }

    private static String pm(double v, double e, int decimals) {
        return Numbers.fixed(v, decimals) + " ± " + Numbers.fixed(e, decimals);
    }

    private String joined() {
        StringBuilder b = new StringBuilder();
        for (double x : mu) b.append(b.length() == 0 ? "" : ", ").append(Numbers.plain(x));
        return b.toString();
    }
}
