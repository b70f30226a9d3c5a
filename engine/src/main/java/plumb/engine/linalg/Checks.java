package plumb.engine.linalg;

import java.util.Locale;

/** Argument checks shared by the solvers: misuse throws with the shapes in the message. */
final class Checks {

    private Checks() {
    }

    static void matrixArgument(double[] matrix, int m, int capacity) {
        if (m < 0 || m > capacity) {
            throw new IllegalArgumentException(
                    String.format(Locale.ROOT, "matrix size %d is not in [0, %d]", m, capacity));
        }
        if (matrix.length < m * m) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "matrix array has %d entries, a %dx%d matrix needs %d", matrix.length, m, m, m * m));
        }
    }

    static void vectorArgument(double[] v, int needed, String name) {
        if (v.length < needed) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "%s has %d entries, needs %d", name, v.length, needed));
        }
    }
}
