package plumb.engine.minimise;

import java.util.Arrays;

/**
 * A list of hinges a_e·max(0, u_e + ∇u_eᵀd) of an objective at a point ({@link HingedObjective}):
 * for each its identifier, offset u_e, slope a_e and the sparse gradient ∇u_e. Grows as needed and
 * is reused between steps.
 */
public final class Hinges {

    private int count;
    private int[] id = new int[16];
    private double[] offset = new double[16];
    private double[] slope = new double[16];
    /** Hinge e's gradient: positions normalIndex[normalStart[e] .. normalStart[e + 1]) with their values. */
    private int[] normalStart = new int[17];
    private int[] normalIndex = new int[64];
    private double[] normalValue = new double[64];

    /** Empties the list. */
    public void clear() {
        count = 0;
    }

    /** Number of hinges held. */
    public int size() {
        return count;
    }

    /** Whether a hinge with this identifier is held. */
    public boolean contains(int hingeId) {
        for (int e = 0; e < count; e++) {
            if (id[e] == hingeId) {
                return true;
            }
        }
        return false;
    }

    /**
     * Adds a hinge.
     *
     * @param hingeId the objective's identifier of the term (to avoid adding it twice)
     * @param u       u_e at the point
     * @param a       the slope a_e, positive
     * @param index   positions of the non-zero components of ∇u_e (the first {@code length})
     * @param value   those components
     */
    public void add(int hingeId, double u, double a, int[] index, double[] value, int length) {
        if (count == id.length) {
            int c = 2 * count;
            id = Arrays.copyOf(id, c);
            offset = Arrays.copyOf(offset, c);
            slope = Arrays.copyOf(slope, c);
            normalStart = Arrays.copyOf(normalStart, c + 1);
        }
        int from = normalStart[count];
        if (from + length > normalIndex.length) {
            int c = Math.max(2 * normalIndex.length, from + length);
            normalIndex = Arrays.copyOf(normalIndex, c);
            normalValue = Arrays.copyOf(normalValue, c);
        }
        System.arraycopy(index, 0, normalIndex, from, length);
        System.arraycopy(value, 0, normalValue, from, length);
        id[count] = hingeId;
        offset[count] = u;
        slope[count] = a;
        normalStart[count + 1] = from + length;
        count++;
    }

    /** u_e of hinge e. */
    public double offset(int e) {
        return offset[e];
    }

    /** a_e of hinge e. */
    public double slope(int e) {
        return slope[e];
    }

    int normalFrom(int e) {
        return normalStart[e];
    }

    int normalTo(int e) {
        return normalStart[e + 1];
    }

    int normalIndex(int k) {
        return normalIndex[k];
    }

    double normalValue(int k) {
        return normalValue[k];
    }

    /** ∇u_eᵀd. */
    double along(int e, double[] d) {
        double s = 0;
        for (int k = normalStart[e]; k < normalStart[e + 1]; k++) {
            s += normalValue[k] * d[normalIndex[k]];
        }
        return s;
    }
}
