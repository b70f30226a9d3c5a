package plumb.engine.inference;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * CLs+b and CLb of the asymptotic limit against the closed forms of Cowan, Cranmer, Gross,
 * Vitells, EPJ C 71 (2011) 1554, eqs. 65–66: the distribution of q̃μ under a hypothesis μ′ is
 * F(q̃|μ′) = Φ(√q̃ − (μ − μ′)/σ) for q̃ ≤ μ²/σ², and Φ((q̃ − (μ² − 2μμ′)/σ²)/(2μ/σ)) beyond.
 * CLs+b = 1 − F(q̃|μ), CLb = 1 − F(q̃|0). Written here from μ and σ with commons-math's normal
 * distribution, independently of the engine's q_μ,A form and its erfc.
 */
class AsymptoticUpperLimitTest {

    private static final NormalDistribution PHI = new NormalDistribution();

    private static double cdf(double q, double mu, double sigma, double muPrime) {
        if (q <= mu * mu / (sigma * sigma)) return PHI.cumulativeProbability(Math.sqrt(q) - (mu - muPrime) / sigma);
        return PHI.cumulativeProbability((q - (mu * mu - 2 * mu * muPrime) / (sigma * sigma)) / (2 * mu / sigma));
    }

    @Test
    void clsPlusBAndClbFollowTheClosedForms() {
        double[] mus = {0.3, 1, 2.5};
        double[] sigmas = {0.5, 1, 2};
        double[] qs = {0, 0.01, 0.5, 1, 2.7, 4, 9, 25};
        for (double mu : mus) {
            for (double sigma : sigmas) {
                double qA = mu * mu / (sigma * sigma);
                for (double q : qs) {
                    double clsb = 1 - cdf(q, mu, sigma, mu);
                    double clb = 1 - cdf(q, mu, sigma, 0);
                    String at = "mu=" + mu + " sigma=" + sigma + " q=" + q;
                    assertEquals(clsb, AsymptoticUpperLimit.clsPlusB(q, qA), 1e-12 + 1e-9 * clsb, at);
                    assertEquals(clb, AsymptoticUpperLimit.clb(q, qA), 1e-12 + 1e-9 * clb, at);
                }
            }
        }
    }

    @Test
    void knownValuesAtMuOverSigmaTwo() {
        // μ/σ = 2, q̃ = 1 (below μ²/σ² = 4): CLs+b = 1 − Φ(1), CLb = 1 − Φ(1 − 2) = Φ(1).
        // Φ(1) = 0.8413447460685429 (from memory; standard normal tables).
        assertEquals(0.15865525393145707, AsymptoticUpperLimit.clsPlusB(1, 4), 1e-12);
        assertEquals(0.8413447460685429, AsymptoticUpperLimit.clb(1, 4), 1e-12);
        assertEquals(0.15865525393145707 / 0.8413447460685429, AsymptoticUpperLimit.cls(1, 4), 1e-12);
        // Beyond the kink, q̃ = 9 > 4: CLs+b = 1 − Φ((9 + 4)/4) = 1 − Φ(3.25), CLb = 1 − Φ((9 − 4)/4) = 1 − Φ(1.25).
        assertEquals(1 - PHI.cumulativeProbability(3.25), AsymptoticUpperLimit.clsPlusB(9, 4), 1e-12);
        assertEquals(1 - PHI.cumulativeProbability(1.25), AsymptoticUpperLimit.clb(9, 4), 1e-12);
    }

    @Test
    void theExpectedMedianLimitIsAtMuOverSigmaOfTheClsCondition() {
        // For N = 0 and cl = 0.95, Cowan et al. eq. 89 (σ constant): μ/σ = Φ⁻¹(1 − 0.05/2) = 1.959964 (from memory).
        assertEquals(1.959963984540054, AsymptoticUpperLimit.bandTarget(0, 0.95), 1e-9);
        // Band N: Φ(N − μ/σ)/Φ(N) = 1 − cl must hold at the returned μ/σ.
        for (int n : ExpectedBands.N) {
            double t = AsymptoticUpperLimit.bandTarget(n, 0.95);
            assertEquals(0.05, PHI.cumulativeProbability(n - t) / PHI.cumulativeProbability(n), 1e-12, "band " + n);
        }
    }
}
