package plumb.engine.inference;

import plumb.engine.minimise.MinimumStatus;

import java.util.ArrayList;
import java.util.Collections;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;

/**
 * What the toys of one injected value say about the fit: the mean fitted POI and its bias, the
 * distribution of the POI pull (μ̂ − X)/σ̂, the coverage of the ±1σ̂ interval, and the pulls of
 * the constrained nuisances. Only toys whose fit converged with a usable error take part; the
 * others are counted by how their fit ended.
 *
 * <p>Errors of the statistics (common practice, large-N Gaussian approximations): the error of a
 * mean is s/√N; the error of a sample standard deviation s is s/√(2(N−1)); the error of a
 * fraction p is the binomial √(p(1−p)/N). Sums run in toy-index order, so equal toys give equal
 * bits whatever the thread count or the batches they were run in.
 *
 * @param injected        the POI value X the toys were generated at
 * @param toys            toys run
 * @param converged       toys that entered the statistics
 * @param nonConverged    the other toys by status name ("NO_ERROR" when the fit converged without a usable error)
 * @param mean            mean fitted POI
 * @param meanError       s/√N
 * @param bias            mean − X
 * @param pullMean        mean of (μ̂ − X)/σ̂
 * @param pullMeanError   its s/√N
 * @param pullWidth       standard deviation of the pull (N − 1 denominator)
 * @param pullWidthError  s/√(2(N−1))
 * @param coverage68      fraction of toys with |μ̂ − X| ≤ σ̂
 * @param coverage68Error √(p(1−p)/N)
 * @param nuisances       pulls of the constrained nuisances, in the order given
 */
public record InjectionSummary(double injected, int toys, int converged, Map<String, Integer> nonConverged,
                               double mean, double meanError, double bias, double pullMean, double pullMeanError,
                               double pullWidth, double pullWidthError, double coverage68, double coverage68Error,
                               List<NuisancePull> nuisances) {

    /** Two-sided interval probability of ±1σ for a Gaussian, 0.6827 (erf(1/√2); common practice). */
    public static final double GAUSSIAN_68 = 0.682689492137086;

    /** A statistic is flagged when it deviates from its ideal value by more than this many standard errors. */
    public static final double FLAG_STANDARD_ERRORS = 3;

    /** Status name counted for toys whose fit converged but gave no usable POI error. */
    public static final String NO_ERROR = "NO_ERROR";

    /**
     * One constrained nuisance's pull (θ̂ − θ_gen)/σ̂ over the toys.
     *
     * @param parameter name
     * @param toys      toys whose pull entered (converged, with a usable error of this parameter)
     * @param flagged   |pullMean| &gt; 3·pullMeanError or |pullWidth − 1| &gt; 3·pullWidthError
     */
    public record NuisancePull(String parameter, int toys, double pullMean, double pullMeanError, double pullWidth,
                               double pullWidthError, boolean flagged) {
    }

    public InjectionSummary {
        nonConverged = Collections.unmodifiableMap(new java.util.LinkedHashMap<>(nonConverged));
        nuisances = List.copyOf(nuisances);
    }

    /**
     * Summarises toys generated at POI value {@code injected}.
     *
     * @param fits           every toy's result, in index order (the order of the sums)
     * @param nuisanceNames  names of the tracked nuisances, in the order of {@link ToyFit#nuisancePulls()}
     */
    public static InjectionSummary of(double injected, ToyFit[] fits, String[] nuisanceNames) {
        int n = 0;
        Map<MinimumStatus, Integer> failed = new EnumMap<>(MinimumStatus.class);
        int noError = 0;
        double[] poi = new double[fits.length], pull = new double[fits.length];
        int covered = 0;
        for (ToyFit f : fits) {
            if (f.usable()) {
                poi[n] = f.poi();
                pull[n] = (f.poi() - injected) / f.poiError();
                if (Math.abs(f.poi() - injected) <= f.poiError()) covered++;
                n++;
            } else if (f.status().isMinimum()) {
                noError++;
            } else {
                failed.merge(f.status(), 1, Integer::sum);
            }
        }
        Map<String, Integer> nonConverged = new java.util.LinkedHashMap<>();
        failed.forEach((k, v) -> nonConverged.put(k.name(), v));
        if (noError > 0) nonConverged.put(NO_ERROR, noError);

        double[] poiStats = meanAndWidth(poi, n);
        double[] pullStats = meanAndWidth(pull, n);
        double p = n > 0 ? (double) covered / n : Double.NaN;

        List<NuisancePull> nuisances = new ArrayList<>(nuisanceNames.length);
        double[] values = new double[fits.length];
        for (int k = 0; k < nuisanceNames.length; k++) {
            int nk = 0;
            for (ToyFit f : fits) {
                double v = f.usable() ? f.nuisancePulls()[k] : Double.NaN;
                if (Double.isFinite(v)) values[nk++] = v;
            }
            double[] s = meanAndWidth(values, nk);
            boolean flagged = Math.abs(s[0]) > FLAG_STANDARD_ERRORS * s[1]
                    || Math.abs(s[2] - 1) > FLAG_STANDARD_ERRORS * s[3];
            nuisances.add(new NuisancePull(nuisanceNames[k], nk, s[0], s[1], s[2], s[3], flagged));
        }
        return new InjectionSummary(injected, fits.length, n, nonConverged, poiStats[0], poiStats[1],
                poiStats[0] - injected, pullStats[0], pullStats[1], pullStats[2], pullStats[3], p,
                Math.sqrt(p * (1 - p) / n), nuisances);
    }

    /** True when the POI pull's mean or width, or the coverage, is more than 3 standard errors off. */
    public boolean flagged() {
        return Math.abs(pullMean) > FLAG_STANDARD_ERRORS * pullMeanError
                || Math.abs(pullWidth - 1) > FLAG_STANDARD_ERRORS * pullWidthError
                || Math.abs(coverage68 - GAUSSIAN_68) > FLAG_STANDARD_ERRORS * coverage68Error;
    }

    /**
     * {mean, s/√N, s, s/√(2(N−1))} of the first n values, s with the N − 1 denominator; NaN where
     * N is too small. Two passes (mean first) keep the variance free of cancellation.
     */
    static double[] meanAndWidth(double[] x, int n) {
        double sum = 0;
        for (int i = 0; i < n; i++) sum += x[i];
        double mean = n > 0 ? sum / n : Double.NaN;
        double ss = 0;
        for (int i = 0; i < n; i++) {
            double d = x[i] - mean;
            ss += d * d;
        }
        double s = n > 1 ? Math.sqrt(ss / (n - 1)) : Double.NaN;
        return new double[] {mean, s / Math.sqrt(n), s, s / Math.sqrt(2.0 * (n - 1))};
    }
}
