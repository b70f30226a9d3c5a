package plumb.cli;

/** Exit status of docs/cli-contract.md. */
public final class ExitCodes {
    public static final int OK = 0;
    /** The computation ran but did not succeed (a fit that did not converge, a limit not bracketed). */
    public static final int FAILED = 1;
    /** Bad input: an unreadable or invalid model, a bad option. */
    public static final int BAD_INPUT = 2;

    private ExitCodes() {
    }
}
