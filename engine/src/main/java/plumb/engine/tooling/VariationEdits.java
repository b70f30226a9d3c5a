package plumb.engine.tooling;

import plumb.engine.model.Variation;

import java.util.Locale;

/**
 * Edits of one variation of one sample, given the sample's nominal yields: the building blocks of
 * {@link Tidy}, also usable by anything that builds models (per-variation options). Each returns an
 * {@link Edit}: the new variation (null when it was removed) and one line saying what changed (null
 * when nothing did). The input is never modified.
 */
public final class VariationEdits {

    private VariationEdits() {
    }

    /**
     * The outcome of one edit.
     *
     * @param variation the variation after the edit, null when removed
     * @param change    what changed, without the variation's location; null when nothing did
     */
    public record Edit(Variation variation, String change) {
        static Edit unchanged(Variation v) {
            return new Edit(v, null);
        }

        public boolean changed() {
            return change != null;
        }
    }

    /** Largest |κ − 1| of the norm part (0 without one). */
    public static double normEffect(Variation v) {
        if (v.norm() == null) return 0;
        return Math.max(Math.abs(v.norm().up() - 1), Math.abs(v.norm().down() - 1));
    }

    /**
     * Largest |u − n|/n or |d − n|/n over the bins with n &gt; 0 (0 without a shape part); the
     * measure of the model's {@code pruneBelow}.
     */
    public static double shapeEffect(Variation v, double[] nominal) {
        if (v.shape() == null) return 0;
        double largest = 0;
        for (int b = 0; b < nominal.length; b++) {
            if (nominal[b] > 0) {
                largest = Math.max(largest, Math.abs(v.shape().up()[b] - nominal[b]) / nominal[b]);
                largest = Math.max(largest, Math.abs(v.shape().down()[b] - nominal[b]) / nominal[b]);
            }
        }
        return largest;
    }

    /** Whether the variation moves any expected yield at all. */
    public static boolean hasEffect(Variation v, double[] nominal) {
        if (v.norm() != null && (v.norm().up() != 1 || v.norm().down() != 1)) return true;
        if (v.shape() == null) return false;
        for (int b = 0; b < nominal.length; b++) {
            if (v.shape().up()[b] != nominal[b] || v.shape().down()[b] != nominal[b]) return true;
        }
        return false;
    }

    /**
     * Drops the norm part when {@link #normEffect} is below {@code normBelow} and the shape part
     * when {@link #shapeEffect} is below {@code shapeBelow}; with both gone the variation is removed.
     */
    public static Edit prune(Variation v, double[] nominal, double normBelow, double shapeBelow) {
        boolean dropNorm = v.norm() != null && normEffect(v) < normBelow;
        boolean dropShape = v.shape() != null && shapeEffect(v, nominal) < shapeBelow;
        if (!dropNorm && !dropShape) return Edit.unchanged(v);
        Variation.NormEffect norm = dropNorm ? null : v.norm();
        Variation.ShapeEffect shape = dropShape ? null : v.shape();
        StringBuilder what = new StringBuilder("pruned");
        if (dropNorm) what.append(String.format(Locale.ROOT, " norm part (largest effect %.3g < %.3g)", normEffect(v), normBelow));
        if (dropNorm && dropShape) what.append(" and");
        if (dropShape) {
            what.append(String.format(Locale.ROOT, " shape part (largest effect %.3g < %.3g)", shapeEffect(v, nominal), shapeBelow));
        }
        if (norm == null && shape == null) return new Edit(null, what + "; variation removed");
        return new Edit(rebuild(v, norm, shape), what.toString());
    }

    /**
     * Makes one-sided parts two-sided ({@link Symmetrisation}): the norm part when κu − 1 and κd − 1
     * have the same sign or one is 0, the shape part bin by bin under the same rule. Mirrored κ
     * values are 2 − κ; where that would not be positive, 1/κ (mirror in ln κ) is used instead.
     * Mirrored shape yields are floored at 0.
     */
    public static Edit symmetrise(Variation v, double[] nominal, Symmetrisation mode) {
        Variation.NormEffect norm = v.norm();
        Variation.ShapeEffect shape = v.shape();
        StringBuilder what = new StringBuilder();
        if (norm != null && oneSided(norm.up() - 1, norm.down() - 1)) {
            double[] ud = twoSided(norm.up() - 1, norm.down() - 1, mode);
            double up = 1 + ud[0], down = 1 + ud[1];
            if (!(up > 0) || !(down > 0)) {
                // mirroring 2 − κ would leave κ ≤ 0: mirror ln κ instead, which keeps κ positive
                double[] logs = twoSided(Math.log(norm.up()), Math.log(norm.down()), mode);
                up = Math.exp(logs[0]);
                down = Math.exp(logs[1]);
            }
            what.append(String.format(Locale.ROOT, "norm made two-sided (%s): up %.4g -> %.4g, down %.4g -> %.4g",
                    mode.optionName(), norm.up(), up, norm.down(), down));
            norm = new Variation.NormEffect(down, up);
        }
        if (shape != null) {
            double[] u = shape.up().clone(), d = shape.down().clone();
            int changed = 0;
            for (int b = 0; b < nominal.length; b++) {
                double du = u[b] - nominal[b], dd = d[b] - nominal[b];
                if (!oneSided(du, dd)) continue;
                double[] ud = twoSided(du, dd, mode);
                u[b] = Math.max(0, nominal[b] + ud[0]);
                d[b] = Math.max(0, nominal[b] + ud[1]);
                changed++;
            }
            if (changed > 0) {
                if (what.length() > 0) what.append("; ");
                what.append(String.format(Locale.ROOT, "shape made two-sided (%s) in %d of %d bins",
                        mode.optionName(), changed, nominal.length));
                shape = new Variation.ShapeEffect(d, u);
            }
        }
        if (what.length() == 0) return Edit.unchanged(v);
        return new Edit(rebuild(v, norm, shape), what.toString());
    }

    /** One-sided: both moves have the same sign, or exactly one of them is 0. */
    static boolean oneSided(double up, double down) {
        return up * down > 0 || (up == 0) != (down == 0);
    }

    /** The two-sided {up, down} moves replacing one-sided ones. */
    private static double[] twoSided(double up, double down, Symmetrisation mode) {
        boolean upLarger = Math.abs(up) >= Math.abs(down);
        double larger = upLarger ? up : down;
        double size = mode == Symmetrisation.LARGER ? Math.abs(larger) : (Math.abs(up) + Math.abs(down)) / 2;
        double signed = Math.copySign(size, larger);
        return upLarger ? new double[] {signed, -signed} : new double[] {-signed, signed};
    }

    /**
     * Replaces a shape part that only scales the sample by a norm part: when in every bin u/n and d/n
     * equal Σu/Σn and Σd/Σn within {@code tolerance} (relative), and bins with n = 0 stay 0, the
     * shape becomes κu = Σu/Σn, κd = Σd/Σn, multiplied into an existing norm part. The result equals
     * the input at θ = ±1; between them the norm interpolation applies.
     */
    public static Edit splitNorm(Variation v, double[] nominal, double tolerance) {
        if (v.shape() == null) return Edit.unchanged(v);
        double sumN = 0, sumU = 0, sumD = 0;
        for (int b = 0; b < nominal.length; b++) {
            sumN += nominal[b];
            sumU += v.shape().up()[b];
            sumD += v.shape().down()[b];
        }
        if (!(sumN > 0) || !(sumU > 0) || !(sumD > 0)) return Edit.unchanged(v);
        double ku = sumU / sumN, kd = sumD / sumN;
        for (int b = 0; b < nominal.length; b++) {
            double n = nominal[b], u = v.shape().up()[b], d = v.shape().down()[b];
            if (n == 0) {
                if (u != 0 || d != 0) return Edit.unchanged(v);
                continue;
            }
            if (Math.abs(u / n - ku) > tolerance * ku || Math.abs(d / n - kd) > tolerance * kd) return Edit.unchanged(v);
        }
        double up = ku, down = kd;
        if (v.norm() != null) {
            up *= v.norm().up();
            down *= v.norm().down();
        }
        String what = String.format(Locale.ROOT, "shape is a pure normalisation: replaced by norm up %.4g, down %.4g%s",
                up, down, v.norm() != null ? " (combined with the existing norm part)" : "");
        Variation out = new Variation(v.parameter(), new Variation.NormEffect(down, up), null,
                v.normInterpolation(), null);
        return new Edit(out, what);
    }

    /**
     * Smooths both sides of a shape part, keeping each side's total ({@link ShapeSmoothing}).
     * Unchanged when the sample has fewer than 3 bins with a positive nominal yield.
     */
    public static Edit smooth(Variation v, double[] nominal) {
        if (v.shape() == null) return Edit.unchanged(v);
        double[] u = ShapeSmoothing.smooth(nominal, v.shape().up());
        double[] d = ShapeSmoothing.smooth(nominal, v.shape().down());
        if (u == null || d == null) return Edit.unchanged(v);
        double moved = 0;
        for (int b = 0; b < nominal.length; b++) {
            if (nominal[b] > 0) {
                moved = Math.max(moved, Math.abs(u[b] - v.shape().up()[b]) / nominal[b]);
                moved = Math.max(moved, Math.abs(d[b] - v.shape().down()[b]) / nominal[b]);
            }
        }
        if (moved < 1e-12) return Edit.unchanged(v); // rounding of an already smooth ratio
        String what = String.format(Locale.ROOT, "shape smoothed (largest change %.3g of nominal in a bin)", moved);
        return new Edit(rebuild(v, v.norm(), new Variation.ShapeEffect(d, u)), what);
    }

    private static Variation rebuild(Variation v, Variation.NormEffect norm, Variation.ShapeEffect shape) {
        return new Variation(v.parameter(), norm, shape,
                norm == null ? null : v.normInterpolation(), shape == null ? null : v.shapeInterpolation());
    }
}
