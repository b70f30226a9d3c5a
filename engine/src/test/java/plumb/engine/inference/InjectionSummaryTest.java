package plumb.engine.inference;

import org.apache.commons.math3.stat.descriptive.DescriptiveStatistics;
import org.junit.jupiter.api.Test;
import plumb.engine.minimise.MinimumStatus;

import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

class InjectionSummaryTest {

    /** Toys with known numbers: every 10th fails, every 25th converges without an error. */
    private static ToyFit[] toys(int n, double injected, long seed) {
        Random r = new Random(seed);
        ToyFit[] t = new ToyFit[n];
        for (int i = 0; i < n; i++) {
            double err = 0.4 + 0.1 * r.nextDouble();
            double poi = injected + 0.05 + err * 1.1 * r.nextGaussian();
            double[] pulls = {0.3 + r.nextGaussian(), 0.5 * r.nextGaussian(), i % 7 == 0 ? Double.NaN : r.nextGaussian()};
            MinimumStatus s = i % 10 == 3 ? MinimumStatus.LINE_SEARCH_FAILED : MinimumStatus.CONVERGED;
            t[i] = new ToyFit(i, s, poi, i % 25 == 4 ? Double.NaN : err, pulls);
        }
        return t;
    }

    /**
     * Mean, standard deviation (N − 1) and their errors against commons-math 3.6.1
     * DescriptiveStatistics; error of a mean s/√N, of a standard deviation s/√(2(N−1)) and of a
     * fraction √(p(1−p)/N) (common practice, Gaussian approximations).
     */
    @Test
    void statisticsOfUsableToys() {
        double x = 2.5;
        ToyFit[] fits = toys(400, x, 7);
        InjectionSummary s = InjectionSummary.of(x, fits, new String[] {"a", "b", "c"});
        DescriptiveStatistics poi = new DescriptiveStatistics(), pull = new DescriptiveStatistics();
        int covered = 0, failed = 0, noError = 0;
        for (ToyFit f : fits) {
            if (f.status() != MinimumStatus.CONVERGED) {
                failed++;
                continue;
            }
            if (Double.isNaN(f.poiError())) {
                noError++;
                continue;
            }
            poi.addValue(f.poi());
            pull.addValue((f.poi() - x) / f.poiError());
            if (Math.abs(f.poi() - x) <= f.poiError()) covered++;
        }
        long n = poi.getN();
        assertEquals(400, s.toys());
        assertEquals(n, s.converged());
        assertEquals(Map.of("LINE_SEARCH_FAILED", failed, InjectionSummary.NO_ERROR, noError), s.nonConverged());
        assertEquals(poi.getMean(), s.mean(), 1e-12);
        assertEquals(poi.getStandardDeviation() / Math.sqrt(n), s.meanError(), 1e-12);
        assertEquals(poi.getMean() - x, s.bias(), 1e-12);
        assertEquals(pull.getMean(), s.pullMean(), 1e-12);
        assertEquals(pull.getStandardDeviation(), s.pullWidth(), 1e-12);
        assertEquals(pull.getStandardDeviation() / Math.sqrt(n), s.pullMeanError(), 1e-12);
        assertEquals(pull.getStandardDeviation() / Math.sqrt(2.0 * (n - 1)), s.pullWidthError(), 1e-12);
        double p = covered / (double) n;
        assertEquals(p, s.coverage68(), 1e-15);
        assertEquals(Math.sqrt(p * (1 - p) / n), s.coverage68Error(), 1e-15);
    }

    /**
     * Nuisance pulls: mean and width over usable toys with a finite pull, flagged beyond 3 standard
     * errors from 0 and 1. "a" is shifted by 0.3 (≈ 6 SE at N ≈ 350), "b" has width 0.5, "c" is N(0, 1).
     */
    @Test
    void nuisancePullsAreFlaggedBeyondThreeStandardErrors() {
        ToyFit[] fits = toys(400, 1, 11);
        InjectionSummary s = InjectionSummary.of(1, fits, new String[] {"a", "b", "c"});
        DescriptiveStatistics c = new DescriptiveStatistics();
        for (ToyFit f : fits) if (f.usable() && !Double.isNaN(f.nuisancePulls()[2])) c.addValue(f.nuisancePulls()[2]);
        InjectionSummary.NuisancePull pc = s.nuisances().get(2);
        assertEquals(c.getN(), pc.toys());
        assertEquals(c.getMean(), pc.pullMean(), 1e-12);
        assertEquals(c.getStandardDeviation(), pc.pullWidth(), 1e-12);
        assertTrue(s.nuisances().get(0).flagged());
        assertTrue(s.nuisances().get(1).flagged());
        assertFalse(pc.flagged());
    }

    /** The sums run in index order: the same toys give the same bits (the base of byte-identical merges). */
    @Test
    void sameToysSameBits() {
        InjectionSummary a = InjectionSummary.of(1, toys(300, 1, 3), new String[] {"a", "b", "c"});
        InjectionSummary b = InjectionSummary.of(1, toys(300, 1, 3), new String[] {"a", "b", "c"});
        assertEquals(a, b);
    }
}
