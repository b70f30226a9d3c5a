package plumb.cli;

/** A computation that ran but did not succeed, with a message for the analyst: exit status 1. */
public final class ComputationException extends RuntimeException {

    private static final long serialVersionUID = 1L;

    public ComputationException(String message) {
        super(message);
    }
}
