package plumb.validation;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.Covariances;
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.Yields;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterSpec;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Post-fit yield errors (linear propagation J C Jᵀ with the full covariance, γ included) against
 * brute force: 10⁵ draws of every parameter from the post-fit multivariate normal (commons-math
 * Cholesky factor, commons-rng Gaussian sampler), the yields recomputed at each draw, and their
 * standard deviation taken. Agreement within 1 % (the accuracy asked of the yield errors): the sampling error of a
 * standard deviation from 10⁵ draws is 1/√(2·10⁵) ≈ 0.2 %, and the yields are close to linear
 * over one post-fit standard deviation (common practice).
 */
class YieldErrorsSamplingTest {

    private static final int DRAWS = 100_000;

    /**
     * Two channels of four bins with yields in the thousands: a signal (POI), a background with a
     * free factor shared by both channels, norm and shape variations (one of them in both
     * channels), MC-statistics errors of 1–3 %. Correlations everywhere; variations mirrored
     * (κd = 1/κu, d − n = n − u) so the yields are near-linear over 1σ: an asymmetric variation
     * adds a quadratic term that moves the sampled spread by a few per cent.
     */
    private static Model model() {
        double[][] sig = {{40, 160, 90, 20}, {15, 60, 35, 8}};
        double[][] b1 = {{3000, 2200, 1500, 900}, {1200, 900, 700, 500}};
        double[][] b2 = {{800, 700, 500, 300}, {2500, 2000, 1600, 1100}};
        List<Channel> channels = new java.util.ArrayList<>();
        for (int c = 0; c < 2; c++) {
            double[] up = new double[4], down = new double[4], mc1 = new double[4], mc2 = new double[4], obs = new double[4];
            for (int i = 0; i < 4; i++) {
                up[i] = b1[c][i] * (1 + 0.03 * (i - 1.5));
                down[i] = b1[c][i] * (1 - 0.03 * (i - 1.5));   // mirrored: no quadratic term (a strong one breaks linearity)
                mc1[i] = 0.01 * (1 + i % 2) * b1[c][i];
                mc2[i] = 0.03 * b2[c][i];
                obs[i] = Math.round(sig[c][i] * 1.2 + b1[c][i] * 1.05 + b2[c][i] * 0.97 + 20 * Math.sin(3.0 * i + c));
            }
            Sample s = new Sample("signal", sig[c], null, List.of("mu"),
                    List.of(new Variation("lumi", new Variation.NormEffect(1 / 1.02, 1.02), null, null, null)));
            Sample bk1 = new Sample("bkgA", b1[c], mc1, List.of("kA"),
                    List.of(new Variation("shapeA", null, new Variation.ShapeEffect(down, up), null, null)));
            Sample bk2 = new Sample("bkgB", b2[c], mc2, List.of(),
                    List.of(new Variation("lumi", new Variation.NormEffect(1 / 1.02, 1.02), null, null, null),
                            new Variation("xsB" + c, new Variation.NormEffect(1 / 1.05, 1.05), null, null, null)));
            channels.add(new Channel("ch" + c, null, null, obs, List.of(s, bk1, bk2)));
        }
        return new Model(Model.FORMAT, "yields-check", null, "mu", channels,
                List.of(new ParameterSpec("mu", 1.0, new double[] {-5, 10}, null, null, false)), Map.of(), Map.of(), null);
    }

    @Test
    void postfitErrorsMatchSampling() {
        CompiledModel m = ModelCompiler.compile(model());
        DataSet data = DataSet.observed(m);
        Fitter fitter = new Fitter(m, data, FitSettings.defaults());
        FitResult best = fitter.fit();
        assertTrue(best.converged(), best.status().toString());
        PostfitCovariance cov = PostfitCovariance.of(fitter.likelihood(), best);
        assertNotNull(cov);
        double[] dense = Covariances.full(fitter.likelihood(), best);   // drawn from below
        List<Yields.ChannelYields> yields = Yields.compute(m, data, m.nominal(), best.held(), best, cov);

        int n = m.nAll();
        RealMatrix c = new Array2DRowRealMatrix(n, n);
        for (int i = 0; i < n; i++) for (int j = 0; j < n; j++) c.setEntry(i, j, dense[i * n + j]);
        RealMatrix l = new CholeskyDecomposition(c, 1e-12, 1e-14).getL();
        UniformRandomProvider rng = RandomSource.SPLIT_MIX_64.create(20240601L);
        ZigguratSampler.NormalizedGaussian gauss = ZigguratSampler.NormalizedGaussian.of(rng);
        BinnedNll nll = new BinnedNll(m, data, true);
        int entries = m.nominalYield().length;
        double[] sum = new double[m.nBins()], sumSq = new double[m.nBins()];
        double[] channelSum = new double[m.nChannels()], channelSumSq = new double[m.nChannels()];
        double[] z = new double[n], x = new double[n], nu = new double[entries];
        for (int d = 0; d < DRAWS; d++) {
            for (int i = 0; i < n; i++) z[i] = gauss.sample();
            for (int i = 0; i < n; i++) {
                double v = best.values()[i];
                for (int j = 0; j <= i; j++) v += l.getEntry(i, j) * z[j];
                x[i] = v;
            }
            nll.expectedEntries(x, nu);
            for (int ch = 0; ch < m.nChannels(); ch++) {
                double total = 0;
                for (int b = m.channelBinStart(ch); b < m.channelBinStart(ch + 1); b++) {
                    double y = 0;
                    for (int s = 0; s < m.nSamples(); s++) {
                        if (m.sampleChannel(s) == ch) y += nu[m.sampleEntryStart(s) + b - m.channelBinStart(ch)];
                    }
                    sum[b] += y;
                    sumSq[b] += y * y;
                    total += y;
                }
                channelSum[ch] += total;
                channelSumSq[ch] += total * total;
            }
        }
        for (int ch = 0; ch < m.nChannels(); ch++) {
            Yields.Band post = yields.get(ch).totalPostfit();
            for (int b = 0; b < m.bins(ch); b++) {
                int g = m.channelBinStart(ch) + b;
                double mean = sum[g] / DRAWS;
                double sd = Math.sqrt(sumSq[g] / DRAWS - mean * mean);
                assertEquals(sd, post.errors()[b], 0.01 * sd, "channel " + ch + " bin " + b);
            }
            double mean = channelSum[ch] / DRAWS;
            double sd = Math.sqrt(channelSumSq[ch] / DRAWS - mean * mean);
            assertEquals(sd, post.sumError(), 0.01 * sd, "channel " + ch + " sum");
        }
    }
}
