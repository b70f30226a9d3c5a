package plumb.engine.compile;

/** Integer codes of constraint terms, stored in {@link CompiledModel#constraintType}. */
public final class ConstraintType {
    public static final int NONE = 0;
    public static final int GAUSSIAN = 1;
    public static final int POISSON = 2;

    private ConstraintType() {
    }
}
