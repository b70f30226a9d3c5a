package plumb.engine.tooling;

import org.junit.jupiter.api.Test;
import plumb.engine.model.Variation;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The per-variation edits. Symmetrising one-sided variations (mirror the larger side, or the mean
 * of the two moves) and folding flat shape variations into a normalisation are common practice;
 * the expected numbers below follow from those definitions by hand.
 */
class VariationEditsTest {

    private static final double[] N = {100, 50, 20, 10};

    private static Variation norm(double down, double up) {
        return new Variation("p", new Variation.NormEffect(down, up), null, null, null);
    }

    private static Variation shape(double[] down, double[] up) {
        return new Variation("p", null, new Variation.ShapeEffect(down, up), null, null);
    }

    @Test
    void mirrorsTheLargerSideOfAOneSidedNorm() {
        VariationEdits.Edit e = VariationEdits.symmetrise(norm(1.05, 1.10), N, Symmetrisation.LARGER);
        assertEquals(1.10, e.variation().norm().up(), 1e-15);
        assertEquals(0.90, e.variation().norm().down(), 1e-15);
        assertTrue(e.change().contains("two-sided (larger)"), e.change());
        // the larger side is down: it keeps its place and sign
        e = VariationEdits.symmetrise(norm(0.80, 0.95), N, Symmetrisation.LARGER);
        assertEquals(0.80, e.variation().norm().down(), 1e-15);
        assertEquals(1.20, e.variation().norm().up(), 1e-15);
    }

    @Test
    void meanOfBothMovesForAOneSidedNorm() {
        VariationEdits.Edit e = VariationEdits.symmetrise(norm(1.05, 1.10), N, Symmetrisation.MEAN);
        assertEquals(1.075, e.variation().norm().up(), 1e-15);
        assertEquals(0.925, e.variation().norm().down(), 1e-15);
        // one side not moving at all is one-sided too: mean of 0.2 and 0 is 0.1
        e = VariationEdits.symmetrise(norm(1.0, 1.2), N, Symmetrisation.MEAN);
        assertEquals(1.1, e.variation().norm().up(), 1e-15);
        assertEquals(0.9, e.variation().norm().down(), 1e-15);
    }

    @Test
    void aMirrorBelowZeroMirrorsTheLogarithmInstead() {
        // 2 − 2.5 < 0: ln κ is mirrored, so down = 1/2.5
        VariationEdits.Edit e = VariationEdits.symmetrise(norm(1.2, 2.5), N, Symmetrisation.LARGER);
        assertEquals(2.5, e.variation().norm().up(), 1e-15);
        assertEquals(0.4, e.variation().norm().down(), 1e-15);
    }

    @Test
    void twoSidedVariationsAreLeftAlone() {
        Variation v = norm(0.95, 1.08);
        assertSame(v, VariationEdits.symmetrise(v, N, Symmetrisation.LARGER).variation());
        assertFalse(VariationEdits.symmetrise(v, N, Symmetrisation.MEAN).changed());
    }

    @Test
    void symmetrisesAShapeBinByBin() {
        // bin 0 one-sided (+10, +4), bin 1 two-sided, bin 2 one-sided (−2, 0), bin 3 one-sided (0, −15: floored)
        Variation v = shape(new double[] {104, 45, 18, 10}, new double[] {110, 55, 20, -0.0 + 0});
        v = shape(new double[] {104, 45, 20, 10}, new double[] {110, 55, 18, 25});
        VariationEdits.Edit e = VariationEdits.symmetrise(v, N, Symmetrisation.LARGER);
        assertArrayEquals(new double[] {110, 55, 18, 25}, e.variation().shape().up(), 1e-12);
        assertArrayEquals(new double[] {90, 45, 22, 0}, e.variation().shape().down(), 1e-12);
        assertTrue(e.change().contains("3 of 4 bins"), e.change());
        e = VariationEdits.symmetrise(v, N, Symmetrisation.MEAN);
        assertArrayEquals(new double[] {107, 55, 19, 17.5}, e.variation().shape().up(), 1e-12);
        assertArrayEquals(new double[] {93, 45, 21, 2.5}, e.variation().shape().down(), 1e-12);
    }

    @Test
    void aFlatShapeBecomesANorm() {
        double[] up = new double[N.length], down = new double[N.length];
        for (int b = 0; b < N.length; b++) {
            up[b] = 1.04 * N[b];
            down[b] = 0.97 * N[b];
        }
        VariationEdits.Edit e = VariationEdits.splitNorm(shape(down, up), N, 1e-6);
        assertNull(e.variation().shape());
        assertEquals(1.04, e.variation().norm().up(), 1e-14);
        assertEquals(0.97, e.variation().norm().down(), 1e-14);
        // with a norm part already there the two multiply (exact at θ = ±1)
        Variation both = new Variation("p", new Variation.NormEffect(0.9, 1.1), new Variation.ShapeEffect(down, up), null, null);
        e = VariationEdits.splitNorm(both, N, 1e-6);
        assertEquals(1.1 * 1.04, e.variation().norm().up(), 1e-14);
        assertEquals(0.9 * 0.97, e.variation().norm().down(), 1e-14);
        // one bin 1 % off the common ratio: a real shape, kept
        up[2] *= 1.01;
        assertFalse(VariationEdits.splitNorm(shape(down, up), N, 1e-3).changed());
    }

    @Test
    void prunesPartsBelowTheirThresholds() {
        Variation v = new Variation("p", new Variation.NormEffect(0.995, 1.004),
                new Variation.ShapeEffect(new double[] {98, 50, 20, 10}, new double[] {103, 50, 20, 10}), null, null);
        VariationEdits.Edit e = VariationEdits.prune(v, N, 0.01, 0.01);
        assertNull(e.variation().norm());                      // 0.5 % < 1 %
        assertEquals(0.03, VariationEdits.shapeEffect(v, N), 1e-15);
        assertTrue(e.variation().shape() != null);             // 3 % kept
        e = VariationEdits.prune(v, N, 0.01, 0.05);
        assertNull(e.variation());
        assertTrue(e.change().endsWith("variation removed"), e.change());
        assertFalse(VariationEdits.prune(v, N, 0.001, 0.01).changed());
    }

    @Test
    void aVariationWithoutEffectIsRecognised() {
        assertFalse(VariationEdits.hasEffect(norm(1, 1), N));
        assertFalse(VariationEdits.hasEffect(shape(N.clone(), N.clone()), N));
        assertTrue(VariationEdits.hasEffect(norm(1, 1.001), N));
    }
}
