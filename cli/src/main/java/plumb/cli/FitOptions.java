package plumb.cli;

import picocli.CommandLine.Option;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.DataRequest;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.MemoryBudget;
import plumb.engine.inference.Problem;
import plumb.engine.likelihood.DataSet;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/** Options shared by the fitting commands (docs/cli-contract.md). */
public final class FitOptions {

    /** Which data a command fits. */
    public enum DataChoice { observed, asimov }

    /** Where the nuisance values of an Asimov data set come from. */
    public enum AsimovFrom { postfit, prefit }

    @Option(names = "--data", defaultValue = "observed", paramLabel = "observed|asimov",
            description = "Fit the observed data or the Asimov data set (default: ${DEFAULT-VALUE}).")
    public DataChoice data;

    @Option(names = "--asimov-poi", converter = OptionValues.Finite.class, paramLabel = "X",
            description = "POI value of the Asimov data set (default: 1 for fits, 0 for limits).")
    public Double asimovPoi;

    @Option(names = "--asimov-from", paramLabel = "postfit|prefit",
            description = "Nuisance values of the Asimov data set (default: postfit when observed data exist).")
    public AsimovFrom asimovFrom;

    @Option(names = "--fix", paramLabel = "NAME=X", description = "Hold a parameter at X (repeatable).")
    public List<String> fix = new ArrayList<>();

    @Option(names = "--threads", converter = OptionValues.Positive.class, paramLabel = "N", description = "Worker threads (default: all cores).")
    public Integer threads;

    @Option(names = "--seed", paramLabel = "N", defaultValue = "1",
            description = "Seed of every random number used (default: ${DEFAULT-VALUE}).")
    public long seed;

    @Option(names = {"--optimizer", "--minimiser"}, paramLabel = "newton|bfgs|reference", defaultValue = "newton",
            description = "Minimiser: newton (default), bfgs (quasi-Newton on gradients) or reference (derivative-free BOBYQA, a cross-check).")
    public String minimiser;

    @Option(names = "--explicit-mcstat",
            description = "Minimise the MC-statistics parameters as ordinary variables instead of in closed form.")
    public boolean explicitMcStat;

    /**
     * Refuses {@code option n} (toys, scan points) when their results would not fit in the heap,
     * in one line naming the option, the size and the heap limit (exit status 2); the policy is
     * the engine's ({@link MemoryBudget#requireTaskResults}).
     */
    public static void requireCount(String option, long n, CompiledModel m) {
        MemoryBudget.requireTaskResults(n, m, option + " " + n);
    }

    /** Worker threads to use: --threads, or all cores. */
    public int threadCount() {
        if (threads == null) return Runtime.getRuntime().availableProcessors();
        if (threads < 1) throw new InputException("--threads must be at least 1, got " + threads);
        return threads;
    }

    public FitSettings settings() {
        FitSettings.MinimiserKind o = switch (minimiser.toLowerCase(Locale.ROOT)) {
            case "newton" -> FitSettings.MinimiserKind.NEWTON;
            case "bfgs" -> FitSettings.MinimiserKind.BFGS;
            case "reference" -> FitSettings.MinimiserKind.REFERENCE;
            default -> throw new InputException("--optimizer: unknown minimiser '" + minimiser + "', expected newton, bfgs or reference");
        };
        return FitSettings.defaults().withMinimiser(o).withExplicitGamma(explicitMcStat);
    }

    /** The --fix options resolved against the model: parameter index to value, in the order given. */
    public Map<Integer, Double> fixes(CompiledModel m) {
        Map<Integer, Double> out = new LinkedHashMap<>();
        for (String f : fix) {
            int eq = f.lastIndexOf('=');
            if (eq <= 0) throw new InputException("--fix " + f + ": expected NAME=X");
            String name = f.substring(0, eq);
            int i = m.indexOf(name);
            if (i < 0) throw new InputException("--fix " + f + ": the model has no parameter '" + name + "'");
            double v;
            try {
                v = Double.parseDouble(f.substring(eq + 1));
            } catch (NumberFormatException e) {
                throw new InputException("--fix " + f + ": '" + f.substring(eq + 1) + "' is not a number");
            }
            if (!Double.isFinite(v)) throw new InputException("--fix " + f + ": the value must be a finite number");
            if (out.containsKey(i)) {
                throw new InputException("--fix " + f + ": " + name + " is already held by an earlier --fix; give each parameter once");
            }
            if (!(v >= m.lower(i) && v <= m.upper(i))) {
                throw new InputException(String.format(Locale.ROOT, "--fix %s: %s is outside the range [%s, %s] of %s",
                        f, v, m.lower(i), m.upper(i), name));
            }
            out.put(i, v);
        }
        return out;
    }

    /** The --fix options resolved against the model, by name: what a {@link plumb.engine.inference.Problem} holds. */
    public Map<String, Double> heldByName(CompiledModel m) {
        Map<String, Double> out = new LinkedHashMap<>();
        fixes(m).forEach((i, v) -> out.put(m.parameterNames(i), v));
        return out;
    }

    /** The data asked for with --data, --asimov-poi and --asimov-from. */
    public DataRequest dataRequest() {
        return new DataRequest(data == DataChoice.asimov, asimovPoi, asimovFrom != AsimovFrom.prefit);
    }

    /** The data set a command fits, with everything the result must report about it. */
    public record Prepared(Problem problem, FitResult asimovConditionalFit, Double asimovPoi) {
        public DataSet data() {
            return problem.data();
        }

        public int[] held() {
            return problem.heldIndices();
        }

        public double[] heldValues() {
            return problem.heldValues();
        }

        public FitSettings settings() {
            return problem.settings();
        }

        public String kind() {
            return problem.data().kind();
        }
    }

    /**
     * Resolves the options on a model (the engine's {@link DataRequest#forFit}): the data set
     * (observed, or Asimov at --asimov-poi, default {@code defaultAsimovPoi}), the held parameters
     * and the fit settings.
     */
    public Prepared prepare(CompiledModel m, double defaultAsimovPoi) {
        Map<String, Double> held = heldByName(m);
        FitSettings settings = settings();
        try {
            DataRequest.FitData d = dataRequest().forFit(m, held, settings, defaultAsimovPoi);
            return new Prepared(d.problem(), d.asimovConditionalFit(), d.asimovPoi());
        } catch (DataRequest.Refused e) {
            throw refused(e, null);
        }
    }

    /**
     * A data request the model refuses, in the words of the options that made it (exit status 2).
     *
     * @param file the model file, named where the model lacks what is asked (null: not named)
     */
    InputException refused(DataRequest.Refused e, java.nio.file.Path file) {
        return new InputException(switch (e.reason()) {
            case ALL_BLINDED -> "--data observed: every channel of the model is blinded; use --data asimov";
            case NO_POI -> file != null ? file + ": the model names no parameter of interest (poi)"
                    : "--data asimov: the model names no parameter of interest (poi)";
            case POI_OUT_OF_RANGE -> String.format(Locale.ROOT, "--asimov-poi %s is outside the POI range%s",
                    e.value(), e.getMessage().substring(e.getMessage().indexOf(" [")));
            case POI_HELD -> "--fix: " + e.getMessage().replace(" in a POI test", "");
        });
    }
}
