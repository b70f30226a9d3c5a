package plumb.cli.plot;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

/**
 * Input of the impacts figure: how much the parameter of interest moves when each nuisance
 * parameter is held shifted by one standard deviation and everything else is refitted.
 *
 * @param poi      name of the parameter of interest (axis title)
 * @param poiValue its best-fit value (NaN: not shown)
 * @param poiError its uncertainty (NaN: not shown)
 * @param entries  one per nuisance parameter, any order
 */
public record ImpactBars(String poi, double poiValue, double poiError, List<Bar> entries) {

    /**
     * POI shifts (refit value minus best fit) for one parameter. NaN marks a shift not computed.
     *
     * @param parameter   parameter name
     * @param pull        its pull; NaN for a free parameter
     * @param constraint  its post-fit error over pre-fit width; NaN for a free parameter
     * @param prefitUp    shift with the parameter at value + pre-fit width
     * @param prefitDown  shift at value − pre-fit width
     * @param postfitUp   shift at value + post-fit error
     * @param postfitDown shift at value − post-fit error
     */
    public record Bar(String parameter, double pull, double constraint, double prefitUp, double prefitDown,
                        double postfitUp, double postfitDown) {
        public Bar {
            if (parameter == null) throw new IllegalArgumentException("impact entry without a parameter name");
        }

        /** The ranking key: the larger of |postfitUp| and |postfitDown| (NaN counts as 0). */
        public double size() {
            return Math.max(abs(postfitUp), abs(postfitDown));
        }

        private static double abs(double v) {
            return Double.isNaN(v) ? 0 : Math.abs(v);
        }
    }

    public ImpactBars {
        if (poi == null) throw new IllegalArgumentException("impacts need the name of the parameter of interest");
        entries = List.copyOf(entries);
    }

    /** The {@code n} largest entries by {@link Bar#size()}, largest first (ties keep input order). */
    public List<Bar> top(int n) {
        List<Bar> sorted = new ArrayList<>(entries);
        sorted.sort(Comparator.comparingDouble(Bar::size).reversed());
        return sorted.subList(0, Math.min(n, sorted.size()));
    }
}
