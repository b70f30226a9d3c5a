package plumb.engine.api;

import java.util.List;
import java.util.NoSuchElementException;

/**
 * The nuisance parameters ranked by their impact on the parameter of interest, largest first.
 *
 * @param poi      name of the parameter of interest
 * @param poiValue its best-fit value
 * @param poiError its symmetric error
 * @param ranking  one entry per constrained parameter, largest exact post-fit shift first
 */
public record ImpactsOutcome(String poi, double poiValue, double poiError, List<Ranked> ranking) {

    public ImpactsOutcome {
        ranking = List.copyOf(ranking);
    }

    /**
     * One parameter's impact: the POI shift when it is held at its best fit ± its post-fit error
     * (and ± its pre-fit width) and everything else is refitted. NaN where a refit did not converge.
     */
    public record Ranked(String name, double pull, double constraint, double postfitUp, double postfitDown,
                         double prefitUp, double prefitDown, boolean converged) {
        /** The larger post-fit shift in size. */
        public double size() {
            return Math.max(abs(postfitUp), abs(postfitDown));
        }

        private static double abs(double v) {
            return Double.isNaN(v) ? 0 : Math.abs(v);
        }
    }

    /** The named parameter's entry. */
    public Ranked of(String name) {
        for (Ranked r : ranking) if (r.name().equals(name)) return r;
        throw new NoSuchElementException("no impact for parameter '" + name + "'");
    }
}
