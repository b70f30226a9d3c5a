package plumb.cli.plot;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

/**
 * Input of the limits figure: upper limits on the parameter of interest at several values of
 * a label (e.g. the resonance mass of each model).
 *
 * @param poi    name of the parameter of interest (y-axis title)
 * @param xLabel x-axis title with units, e.g. "mass [GeV]"
 * @param cl     confidence level, e.g. 0.95
 * @param points at least two, any order (sorted by x here)
 */
public record LimitBands(String poi, String xLabel, double cl, List<Point> points) {

    /**
     * Limits at one x. {@code observed} is NaN for a blinded model.
     */
    public record Point(double x, double observed, double minus2, double minus1, double median,
                        double plus1, double plus2) {
    }

    public LimitBands {
        if (!(cl > 0 && cl < 1)) throw new IllegalArgumentException("confidence level " + cl + " is not in (0, 1)");
        List<Point> sorted = new ArrayList<>(points);
        if (sorted.size() < 2) throw new IllegalArgumentException("a limit curve needs at least two points, got " + sorted.size());
        sorted.sort(Comparator.comparingDouble(Point::x));
        points = List.copyOf(sorted);
    }
}
