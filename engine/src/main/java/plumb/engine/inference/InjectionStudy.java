package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;

import java.util.ArrayList;
import java.util.List;
import java.util.function.IntConsumer;

/**
 * An injection study of one problem: toys generated at each of several injected POI values and
 * fitted, and the Asimov closure check at each. The one implementation behind
 * {@code plumb inject} and the report's injection section: the generating points, the seeds of
 * the values ({@link InjectionToys#injectionSeed}) and the nuisances whose pulls are kept.
 */
public final class InjectionStudy {

    private final InjectionToys toys;
    private final List<Double> injected;
    private final List<DataSets.Generated> points = new ArrayList<>();

    /**
     * Makes the generating point of every injected value: the nominal nuisance values, or with
     * {@code postfit} those of a fit to the observed data with the POI held at the value (check
     * {@link #conditionalFit} before using it).
     *
     * @param toys the toys of a model with its settings and held parameters
     */
    public InjectionStudy(InjectionToys toys, List<Double> injected, boolean postfit) {
        this.toys = toys;
        this.injected = List.copyOf(injected);
        for (double x : this.injected) points.add(toys.generatingPoint(x, postfit));
    }

    public List<Double> injected() {
        return injected;
    }

    /** The fit to the observed data that set the k-th generating point, or null for a nominal one. */
    public FitResult conditionalFit(int k) {
        return points.get(k).conditionalFit();
    }

    /** The Asimov closure check at the k-th injected value. */
    public AsimovClosure closure(int k) {
        return toys.closure(points.get(k).values());
    }

    /**
     * Toys {@code first} .. {@code first + count − 1} at the k-th injected value, seeded from
     * ({@code seed}, k), on {@code runner}.
     *
     * @param progress called once per finished toy, or null
     */
    public InjectionToyBatch.ValueFits toys(int k, long seed, boolean fluctuateAux, long first, int count,
                                            WorkRunner runner, IntConsumer progress) {
        ToyFit[] fits = toys.run(points.get(k).values(), InjectionToys.injectionSeed(seed, k), fluctuateAux, first, count,
                runner, progress);
        return new InjectionToyBatch.ValueFits(injected.get(k), fits);
    }

    /** Names of the nuisances whose pulls each toy keeps, in index order. */
    public String[] nuisanceNames() {
        CompiledModel m = toys.model();
        int[] pulled = toys.pulledParameters();
        String[] names = new String[pulled.length];
        for (int k = 0; k < pulled.length; k++) names[k] = m.parameterNames(pulled[k]);
        return names;
    }
}
