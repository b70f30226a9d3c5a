package plumb.engine.inference;

/**
 * Straight line mean fitted POI = offset + slope · injected through the injection points,
 * by weighted least squares with weights 1/σ² from the errors of the means. A model and fit
 * free of bias give slope 1 and offset 0 within the errors.
 *
 * <p>With S = Σw, Sx = Σwx, Sy = Σwy, Sxx = Σwx², Sxy = Σwxy and Δ = S·Sxx − Sx²:
 * slope = (S·Sxy − Sx·Sy)/Δ, offset = (Sxx·Sy − Sx·Sxy)/Δ, σ²(slope) = S/Δ, σ²(offset) = Sxx/Δ
 * (weighted least squares with known errors, common practice). The sums run over the points
 * after centring x at its weighted mean, which keeps Δ free of cancellation.
 */
public record InjectionLinearity(double slope, double slopeError, double offset, double offsetError) {

    /**
     * The line through the injection summaries, the one the result file, the terminal and the
     * report's figure all show: the points with a positive, finite error of the mean, or null when
     * fewer than two distinct injected values have one.
     */
    public static InjectionLinearity through(java.util.List<InjectionSummary> summaries) {
        double[] x = new double[summaries.size()], y = new double[x.length], e = new double[x.length];
        for (int k = 0; k < x.length; k++) {
            x[k] = summaries.get(k).injected();
            y[k] = summaries.get(k).mean();
            e[k] = summaries.get(k).meanError();
        }
        return throughUsable(x, y, e);
    }

    /**
     * As {@link #through(java.util.List)} for points given as arrays: points without a positive,
     * finite error are left out; null with fewer than two distinct injected values left.
     */
    public static InjectionLinearity throughUsable(double[] injected, double[] mean, double[] error) {
        int n = 0;
        double[] x = new double[injected.length], y = new double[x.length], e = new double[x.length];
        for (int k = 0; k < injected.length; k++) {
            if (!(error[k] > 0 && error[k] < Double.POSITIVE_INFINITY) || !Double.isFinite(mean[k])) continue;
            x[n] = injected[k];
            y[n] = mean[k];
            e[n++] = error[k];
        }
        if (java.util.Arrays.stream(x, 0, n).distinct().count() < 2) return null;
        return fit(java.util.Arrays.copyOf(x, n), java.util.Arrays.copyOf(y, n), java.util.Arrays.copyOf(e, n));
    }

    /**
     * @param injected points' injected values (at least two distinct)
     * @param mean     mean fitted values
     * @param error    errors of the means, positive and finite
     * @throws IllegalArgumentException for fewer than two distinct injected values or a bad error
     */
    public static InjectionLinearity fit(double[] injected, double[] mean, double[] error) {
        int n = injected.length;
        if (mean.length != n || error.length != n) throw new IllegalArgumentException("arrays of different lengths");
        double s = 0, sx = 0;
        for (int i = 0; i < n; i++) {
            if (!(error[i] > 0 && error[i] < Double.POSITIVE_INFINITY)) {
                throw new IllegalArgumentException("error " + error[i] + " of point " + i + " is not positive and finite");
            }
            double w = 1 / (error[i] * error[i]);
            s += w;
            sx += w * injected[i];
        }
        double xBar = sx / s;
        double sy = 0, sxx = 0, sxy = 0;
        for (int i = 0; i < n; i++) {
            double w = 1 / (error[i] * error[i]);
            double dx = injected[i] - xBar;
            sy += w * mean[i];
            sxx += w * dx * dx;
            sxy += w * dx * mean[i];
        }
        if (!(sxx > 0)) throw new IllegalArgumentException("fewer than two distinct injected values");
        // centred: y = a + slope (x − x̄), a = Sy/S with σ²(a) = 1/S and cov(a, slope) = 0
        double slope = sxy / sxx;
        double a = sy / s;
        double offset = a - slope * xBar;
        double offsetVariance = 1 / s + xBar * xBar / sxx;
        return new InjectionLinearity(slope, Math.sqrt(1 / sxx), offset, Math.sqrt(offsetVariance));
    }
}
