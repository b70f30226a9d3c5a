package plumb.cli;

/** A computation that ran but did not succeed, with a message for the analyst: exit status 1. */
public final class ComputationException extends RuntimeException {
    public ComputationException(String message) {
        super(message);
    }
}
