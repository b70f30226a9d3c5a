package plumb.engine.tooling;

/**
 * Smoothing of one side of a shape variation that keeps its total. The method, common practice for
 * noisy simulated templates (running medians and hanning: J. W. Tukey, Exploratory Data Analysis,
 * Addison-Wesley 1977, from memory):
 * <ol>
 *   <li>take the relative difference r_b = v_b / n_b − 1 over the bins with n_b &gt; 0, in bin
 *       order (bins with n_b = 0 keep their value and are skipped);</li>
 *   <li>replace each inner r_b by the median of r_{b−1}, r_b, r_{b+1} (the two end values stay);</li>
 *   <li>replace each inner value by (r_{b−1} + 2 r_b + r_{b+1}) / 4 (hanning; ends stay);</li>
 *   <li>v'_b = max(0, n_b (1 + r'_b)), then scale all v'_b by one factor so that their sum equals
 *       the sum of the original v_b over the same bins: the varied total is unchanged.</li>
 * </ol>
 * Smoothing the ratio rather than the yields keeps a peaked nominal shape intact.
 */
public final class ShapeSmoothing {

    private ShapeSmoothing() {
    }

    /** The smoothed copy of {@code varied}, or null when fewer than 3 bins have n &gt; 0 or the result sums to 0. */
    public static double[] smooth(double[] nominal, double[] varied) {
        int[] bins = new int[nominal.length];
        int k = 0;
        for (int b = 0; b < nominal.length; b++) if (nominal[b] > 0) bins[k++] = b;
        if (k < 3) return null;
        double[] r = new double[k];
        double total = 0;
        for (int i = 0; i < k; i++) {
            r[i] = varied[bins[i]] / nominal[bins[i]] - 1;
            total += varied[bins[i]];
        }
        double[] median = r.clone();
        for (int i = 1; i < k - 1; i++) median[i] = medianOf3(r[i - 1], r[i], r[i + 1]);
        double[] hann = median.clone();
        for (int i = 1; i < k - 1; i++) hann[i] = (median[i - 1] + 2 * median[i] + median[i + 1]) / 4;
        double[] out = varied.clone();
        double sum = 0;
        for (int i = 0; i < k; i++) {
            out[bins[i]] = Math.max(0, nominal[bins[i]] * (1 + hann[i]));
            sum += out[bins[i]];
        }
        if (!(sum > 0)) return null;
        double scale = total / sum;
        for (int i = 0; i < k; i++) out[bins[i]] *= scale;
        return out;
    }

    static double medianOf3(double a, double b, double c) {
        return Math.max(Math.min(a, b), Math.min(Math.max(a, b), c));
    }
}
