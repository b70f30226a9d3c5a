package plumb.cli.plot;

import plumb.engine.inference.InjectionLinearity;

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
     * The straight line through the points: the engine's {@link InjectionLinearity}, the same line
     * the injection result file and the terminal give for these points; null when it has none
     * (fewer than two distinct injected values with an error bar).
     */
    public InjectionLinearity line() {
        double[] x = new double[points.size()], y = new double[x.length], e = new double[x.length];
        for (int k = 0; k < x.length; k++) {
            x[k] = points.get(k).injected();
            y[k] = points.get(k).fitted();
            e[k] = points.get(k).error();
        }
        return InjectionLinearity.throughUsable(x, y, e);
    }
}
