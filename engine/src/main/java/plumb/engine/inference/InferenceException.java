package plumb.engine.inference;

/**
 * A statistical computation that ran but could not produce its result: a fit that did not
 * converge where one was needed, or a limit that could not be bracketed in the POI's range. The
 * message says what failed, for the analyst; the command line turns it into exit status 1.
 */
public final class InferenceException extends RuntimeException {

    private static final long serialVersionUID = 1L;

    public InferenceException(String message) {
        super(message);
    }
}
