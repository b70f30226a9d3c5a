package plumb.engine.inference;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.PoissonSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.likelihood.DataSet;

/**
 * Toy data sets (docs/model-format.md, "Generated data sets"): n_b ~ Poisson(ν_b(θ_gen)), each
 * Gaussian centre ~ N(θ_gen, w), each Poisson count m ~ Poisson(τγ_gen). Toy i of a run draws
 * from its own generator seeded by (seed, i) (docs/engine.md section 6), so a toy is a pure function of
 * (model, generating point, seed, index): results do not depend on threads or batches.
 */
public final class Toys {

    private Toys() {
    }

    /** The seed of toy {@code index}: one SplitMix64 step of seed + index·φ (golden-ratio increment). */
    public static long toySeed(long seed, long index) {
        long z = seed + (index + 1) * 0x9E3779B97F4A7C15L;
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }

    /** The random generator of toy {@code index} of a run with {@code seed}. */
    public static UniformRandomProvider random(long seed, long index) {
        return RandomSource.XO_RO_SHI_RO_128_PP.create(toySeed(seed, index));
    }

    /**
     * Toy number {@code index}.
     *
     * @param expected      expected count of every bin at the generating point ({@link DataSets#expectedCounts})
     * @param values        the generating point (nAll, γ included)
     * @param channels      channels the toy's fits use (the others' counts are drawn but do not count)
     * @param fluctuateAux  draw the auxiliary values too (false: keep them at the generating values)
     */
    public static DataSet generate(CompiledModel m, double[] expected, double[] values, boolean[] channels,
                                   long seed, long index, boolean fluctuateAux) {
        UniformRandomProvider rng = random(seed, index);
        double[] counts = new double[m.nBins()];
        for (int b = 0; b < m.nBins(); b++) counts[b] = poisson(rng, expected[b]);
        double[] aux = DataSets.generatingAux(m, values);
        if (fluctuateAux) {
            ZigguratSampler.NormalizedGaussian gauss = ZigguratSampler.NormalizedGaussian.of(rng);
            for (int i = 0; i < m.nAll(); i++) {
                if (m.constraintType(i) == ConstraintType.GAUSSIAN) aux[i] = values[i] + m.width(i) * gauss.sample();
                else if (m.constraintType(i) == ConstraintType.POISSON) aux[i] = poisson(rng, m.tau(i) * values[i]);
            }
        }
        return DataSet.of(m, "toy", counts, channels, aux);
    }

    private static double poisson(UniformRandomProvider rng, double mean) {
        return mean > 0 ? PoissonSampler.of(rng, mean).sample() : 0;
    }
}
