package plumb.validation;

import org.junit.jupiter.api.Test;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.Covariances;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.inference.Yields;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.models.SyntheticModels;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Yield errors from the span basis and the block covariance ({@link Yields}) against the dense
 * propagation σ² = vᵀ Σ v (linear error propagation, common practice) with Σ the dense inverse of
 * the full Hessian over all parameters and v each yield's full derivative row over all nAll
 * parameters, on the medium generated model; and the analytic derivatives against central
 * differences of the expected yields.
 */
class YieldsBlockFormTest {

    @Test
    void errorsEqualTheDensePropagation() {
        CompiledModel m = ModelCompiler.compile(SyntheticModels.medium(1));
        DataSet data = DataSet.observed(m);
        Fitter fitter = new Fitter(m, data, FitSettings.defaults());
        FitResult best = fitter.fit();
        assertTrue(best.converged(), best.status().toString());
        double[] dense = Covariances.full(fitter.likelihood(), best);
        PostfitCovariance block = PostfitCovariance.of(fitter.likelihood(), best);
        assertNotNull(dense);
        List<Yields.ChannelYields> yields = Yields.compute(m, data, m.nominal(), best.held(), best, block);
        int n = m.nAll();
        double[] prefit = new double[n * n];
        for (int i = 0; i < n; i++) if (m.constrained(i)) prefit[i * n + i] = m.prefitWidth(i) * m.prefitWidth(i);
        double[][] postRows = rows(m, data, best.values());
        double[][] preRows = rows(m, data, m.nominal());
        int checked = 0;
        for (int c = 0; c < m.nChannels(); c++) {
            Yields.ChannelYields cy = yields.get(c);
            int k = 0;
            int[] all = samplesOf(m, c);
            for (int s : all) {
                Yields.SampleYields sy = cy.samples().get(k++);
                checked += compare(sy.postfit(), postRows, dense, m, c, new int[] {s});
                checked += compare(sy.prefit(), preRows, prefit, m, c, new int[] {s});
            }
            checked += compare(cy.totalPostfit(), postRows, dense, m, c, all);
            checked += compare(cy.totalPrefit(), preRows, prefit, m, c, all);
        }
        assertTrue(checked > 2000, "compared " + checked + " errors");
    }

    @Test
    void analyticDerivativesMatchCentralDifferences() {
        CompiledModel m = ModelCompiler.compile(SyntheticModels.medium(2));
        DataSet data = DataSet.observed(m);
        double[] x = m.nominal().clone();
        for (int i = 0; i < m.nParams(); i++) if (!m.fixed(i)) x[i] = Math.min(m.upper(i), x[i] + 0.1 + 0.01 * (i % 7));
        double[][] rows = rows(m, data, x);
        BinnedNll nll = new BinnedNll(m, data, true);
        int entries = m.nominalYield().length;
        double[] up = new double[entries], down = new double[entries];
        double h = 1e-5;
        for (int i = 0; i < m.nParams(); i++) {
            double v = x[i];
            x[i] = v + h;
            nll.expectedEntries(x, up);
            x[i] = v - h;
            nll.expectedEntries(x, down);
            x[i] = v;
            for (int e = 0; e < entries; e++) {
                double fd = (up[e] - down[e]) / (2 * h);
                assertEquals(fd, rows[e][i], 1e-6 * (1 + Math.abs(fd)), m.parameterNames(i) + " entry " + e);
            }
        }
    }

    /** Σ_b over the band's bins and the sum: errors from the dense propagation. */
    private static int compare(Yields.Band band, double[][] rows, double[] cov, CompiledModel m, int c, int[] samples) {
        int n = m.nAll(), nb = m.bins(c);
        double[] sumRow = new double[n];
        for (int b = 0; b < nb; b++) {
            double[] v = new double[n];
            for (int s : samples) {
                double[] r = rows[m.sampleEntryStart(s) + b];
                for (int i = 0; i < n; i++) v[i] += r[i];
            }
            for (int i = 0; i < n; i++) sumRow[i] += v[i];
            double var = quadratic(cov, v, n);
            assertEquals(Math.sqrt(var), band.errors()[b], 1e-10 * Math.sqrt(var) + 1e-14, "bin " + b);
        }
        double var = quadratic(cov, sumRow, n);
        assertEquals(Math.sqrt(var), band.sumError(), 1e-10 * Math.sqrt(var), "sum");
        return nb + 1;
    }

    /** The full derivative row over all nAll parameters of every (sample, bin) entry at x. */
    private static double[][] rows(CompiledModel m, DataSet data, double[] x) {
        BinnedNll nll = new BinnedNll(m, data, true);
        nll.value(x.clone());
        int maxL = 0;
        for (int[] p : m.channelParams()) maxL = Math.max(maxL, p.length);
        double[][] out = new double[m.nominalYield().length][];
        for (int s = 0; s < m.nSamples(); s++) {
            int c = m.sampleChannel(s), b0 = m.channelBinStart(c), nb = m.bins(c);
            int[] local = m.channelParams(c);
            int nShape = m.sampleShapeStart(s + 1) - m.sampleShapeStart(s);
            double[] dir = new double[maxL], along = new double[nb], shape = new double[nShape * nb];
            double[] gf = new double[nb], byGamma = new double[nb];
            nll.sampleDerivatives(s, dir, along, shape, gf, byGamma);
            for (int b = 0; b < nb; b++) {
                double[] r = new double[m.nAll()];
                for (int i = 0; i < local.length; i++) r[local[i]] += gf[b] * along[b] * dir[i];
                for (int j = 0; j < nShape; j++) {
                    int p = m.shapeParam(m.sampleShapeStart(s) + j);
                    r[p] += gf[b] * shape[j * nb + b];
                }
                int g = m.binGamma(b0 + b);
                if (g >= 0) r[m.nParams() + g] += byGamma[b];
                out[m.sampleEntryStart(s) + b] = r;
            }
        }
        return out;
    }

    private static int[] samplesOf(CompiledModel m, int c) {
        return java.util.stream.IntStream.range(0, m.nSamples()).filter(s -> m.sampleChannel(s) == c).toArray();
    }

    private static double quadratic(double[] a, double[] v, int n) {
        double q = 0;
        for (int i = 0; i < n; i++) {
            if (v[i] == 0) continue;
            double acc = 0;
            for (int j = 0; j < n; j++) acc += a[i * n + j] * v[j];
            q += v[i] * acc;
        }
        return q;
    }
}
