package plumb.cli.plot;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Input of the correlation heat map.
 *
 * @param title  figure title, or null for a default
 * @param names  parameter names, in matrix order
 * @param matrix square, symmetric correlation matrix, entries in [−1, 1] (NaN: unknown)
 */
public record CorrelationMatrix(String title, List<String> names, double[][] matrix) {

    public CorrelationMatrix {
        names = List.copyOf(names);
        if (names.isEmpty()) throw new IllegalArgumentException("empty correlation matrix");
        if (matrix.length != names.size()) {
            throw new IllegalArgumentException(String.format(Locale.ROOT, "%d names for a %d-row matrix", names.size(), matrix.length));
        }
        double[][] copy = new double[matrix.length][];
        for (int i = 0; i < matrix.length; i++) {
            if (matrix[i].length != names.size()) throw new IllegalArgumentException("correlation row " + i + " has " + matrix[i].length + " values");
            copy[i] = matrix[i].clone();
        }
        matrix = copy;
    }

    /**
     * The {@code n} parameters with the strongest correlation to any other parameter (largest
     * off-diagonal |ρ|), kept in their original order, so a large matrix stays legible.
     */
    public CorrelationMatrix strongest(int n) {
        return strongest(n, null);
    }

    /**
     * As {@link #strongest(int)}, but parameter {@code always} (e.g. the parameter of interest) is
     * always among the {@code n}; null or an unknown name keeps none in particular.
     */
    public CorrelationMatrix strongest(int n, String always) {
        int size = names.size();
        if (n >= size) return this;
        if (n < 1) throw new IllegalArgumentException("need at least one parameter, got " + n);
        double[] strength = new double[size];
        for (int i = 0; i < size; i++) {
            for (int j = 0; j < size; j++) {
                if (i != j && !Double.isNaN(matrix[i][j])) strength[i] = Math.max(strength[i], Math.abs(matrix[i][j]));
            }
        }
        boolean[] keep = new boolean[size];
        int kept = always == null ? -1 : names.indexOf(always);
        if (kept >= 0) keep[kept] = true;
        for (int k = kept >= 0 ? 1 : 0; k < n; k++) {
            int best = -1;
            for (int i = 0; i < size; i++) if (!keep[i] && (best < 0 || strength[i] > strength[best])) best = i;
            keep[best] = true;
        }
        List<Integer> index = new ArrayList<>();
        for (int i = 0; i < size; i++) if (keep[i]) index.add(i);
        List<String> subNames = new ArrayList<>();
        double[][] sub = new double[index.size()][index.size()];
        for (int a = 0; a < index.size(); a++) {
            subNames.add(names.get(index.get(a)));
            for (int b = 0; b < index.size(); b++) sub[a][b] = matrix[index.get(a)][index.get(b)];
        }
        return new CorrelationMatrix(title, subNames, sub);
    }
}
