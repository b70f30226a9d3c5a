package plumb.cli.plot;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

/**
 * Input of the injection-linearity figure: the mean fitted POI of toy data sets generated at
 * each injected value.
 *
 * @param poi    name of the parameter of interest
 * @param points at least one, any order (sorted by injected value here)
 */
public record Linearity(String poi, List<Point> points) {

    /**
     * @param injected value used to generate the toys
     * @param fitted   mean fitted value
     * @param error    error bar on the mean fitted value (≥ 0; NaN: none)
     */
    public record Point(double injected, double fitted, double error) {
    }

    public Linearity {
        List<Point> sorted = new ArrayList<>(points);
        if (sorted.isEmpty()) throw new IllegalArgumentException("no injection points");
        sorted.sort(Comparator.comparingDouble(Point::injected));
        points = List.copyOf(sorted);
    }

    /**
     * Straight line fitted = offset + slope · injected by least squares, weighted by 1/error² when
     * every point has a positive error, unweighted otherwise. Returns {slope, slopeError, offset,
     * offsetError} (standard weighted least squares, e.g. Bevington & Robinson, Data Reduction
     * and Error Analysis, 3rd ed., ch. 6; from memory), or null with fewer than two distinct
     * injected values. Unweighted errors are scaled by the residual variance.
     */
    public double[] line() {
        int n = points.size();
        boolean weighted = true;
        for (Point p : points) weighted &= p.error() > 0 && Double.isFinite(p.error());
        double s = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
        for (Point p : points) {
            double w = weighted ? 1 / (p.error() * p.error()) : 1;
            s += w;
            sx += w * p.injected();
            sy += w * p.fitted();
            sxx += w * p.injected() * p.injected();
            sxy += w * p.injected() * p.fitted();
        }
        double delta = s * sxx - sx * sx;
        if (n < 2 || !(delta > 1e-12 * s * sxx)) return null;
        double slope = (s * sxy - sx * sy) / delta;
        double offset = (sxx * sy - sx * sxy) / delta;
        double varSlope = s / delta;
        double varOffset = sxx / delta;
        if (!weighted) {
            double rss = 0;
            for (Point p : points) {
                double r = p.fitted() - offset - slope * p.injected();
                rss += r * r;
            }
            double variance = n > 2 ? rss / (n - 2) : Double.NaN;
            varSlope *= variance;
            varOffset *= variance;
        }
        return new double[] {slope, Math.sqrt(varSlope), offset, Math.sqrt(varOffset)};
    }
}
