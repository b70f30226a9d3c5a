package plumb.engine.tooling;

/**
 * Which operations {@link Tidy} applies; each is off unless set. Thresholds follow the measures of
 * {@link VariationEdits#normEffect} and {@link VariationEdits#shapeEffect}.
 *
 * @param smooth             smooth every shape part ({@link ShapeSmoothing})
 * @param symmetrise         make one-sided parts two-sided, or null
 * @param splitNormTolerance replace shape parts that are pure normalisation (relative tolerance), or null
 * @param pruneNormBelow     drop norm parts whose largest effect is below this, or null
 * @param pruneShapeBelow    drop shape parts whose largest effect is below this, or null
 * @param dropUnused         remove variations without any effect and parameters left unused
 */
public record TidyOptions(boolean smooth, Symmetrisation symmetrise, Double splitNormTolerance,
                          Double pruneNormBelow, Double pruneShapeBelow, boolean dropUnused) {

    public static final TidyOptions NONE = new TidyOptions(false, null, null, null, null, false);

    public boolean any() {
        return smooth || symmetrise != null || splitNormTolerance != null || pruneNormBelow != null
                || pruneShapeBelow != null || dropUnused;
    }
}
