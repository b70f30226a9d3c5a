package plumb.engine.likelihood;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.special.Gamma;
import org.junit.jupiter.api.Test;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ConstraintType;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.ModelOptions;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * −ln L with every constant (docs/model-format.md, "Likelihood") against log-probabilities from
 * commons-math 3.6.1 (PoissonDistribution, NormalDistribution): a general-purpose reference.
 */
class NllConstantsTest {

    @Test
    void nominalNllIsMinusTheSumOfLogProbabilities() {
        for (ModelOptions.McStatConstraint mc : ModelOptions.McStatConstraint.values()) {
            CompiledModel m = ModelCompiler.compile(TestModels.mixed(11, mc));
            DataSet d = DataSet.observed(m);
            BinnedNll nll = new BinnedNll(m, d, true);
            double[] x = m.nominal();
            double[] nu = new double[m.nBins()];
            nll.expectedBins(x, nu);
            double expected = 0;
            for (int b = 0; b < m.nBins(); b++) {
                // integer counts: the Poisson pmf itself
                expected -= new PoissonDistribution(nu[b]).logProbability((int) d.counts()[b]);
            }
            for (int i = 0; i < m.nAll(); i++) {
                if (m.constraintType(i) == ConstraintType.GAUSSIAN) {
                    expected -= new NormalDistribution(d.aux()[i], m.width(i)).logDensity(x[i]);
                } else if (m.constraintType(i) == ConstraintType.POISSON) {
                    // τγ − m ln(τγ) + ln Γ(m+1): the Poisson term with a real-valued count m
                    double lambda = m.tau(i) * x[i], count = d.aux()[i];
                    expected += lambda - count * Math.log(lambda) + Gamma.logGamma(count + 1);
                }
            }
            double got = nll.value(x);
            assertEquals(expected, got, 1e-9 * Math.abs(expected), mc + " " + Arrays.toString(nu));
        }
    }
}
