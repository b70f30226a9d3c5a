package plumb.cli;

/** Bad input found after option parsing (an unknown parameter in --fix, say): exit status 2. */
public final class InputException extends RuntimeException {

    private static final long serialVersionUID = 1L;

    public InputException(String message) {
        super(message);
    }
}
