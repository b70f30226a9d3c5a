package plumb.engine.compile;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.Problem;
import plumb.engine.inference.Yields;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelException;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.ModelReader;
import plumb.engine.model.ModelWriter;
import plumb.engine.model.ParameterKind;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;

import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Per-bin free factors ({@code binFactors}): generated parameters, likelihood, the control-region closed form. */
class BinFactorsTest {

    private static final double[] C = {50, 30, 20, 10};       // background in the control region, per bin
    private static final double[] TAU = {0.2, 0.3, 0.5, 0.8}; // transfer factor to the signal region
    private static final double[] N_CR = {61, 27, 24, 7};      // observed in the control region

    /** A control region fixing a background bin by bin, a signal region seeing it times τ_b. */
    private static Model twoRegions(double[] srObserved, boolean extras) {
        double[] sr = new double[C.length], sig = {1, 4, 2, 0.5};
        for (int b = 0; b < C.length; b++) sr[b] = TAU[b] * C[b];
        List<Variation> srVars = extras
                ? List.of(new Variation("tf_syst", new Variation.NormEffect(0.93, 1.08), null, null, null)) : List.of();
        Sample crBkg = new Sample("bkg", C, null, List.of(), List.of(), "dd");
        Sample srBkg = new Sample("bkg", sr, extras ? new double[] {0.5, 0.4, 0.6, 0.3} : null, List.of(), srVars, "dd");
        List<Sample> srSamples = extras ? List.of(srBkg, new Sample("signal", sig, null, List.of("mu"), List.of(
                new Variation("eff", new Variation.NormEffect(0.95, 1.05), new Variation.ShapeEffect(
                        new double[] {0.9, 3.9, 2.1, 0.5}, new double[] {1.1, 4.2, 1.9, 0.5}), null, null))))
                : List.of(srBkg);
        List<Channel> channels = List.of(new Channel("cr", null, null, N_CR, List.of(crBkg)),
                new Channel("sr", null, null, srObserved, srSamples));
        return new Model(Model.FORMAT, "tf", null, extras ? "mu" : null, channels, List.of(), Map.of(), Map.of(),
                ModelOptions.DEFAULTS);
    }

    @Test
    void generatesOneFreeParameterPerBinSharedByName() {
        CompiledModel m = ModelCompiler.compile(twoRegions(null, false));
        assertEquals(4, m.nParams);
        for (int b = 0; b < 4; b++) {
            int i = m.indexOf("dd:" + b);
            assertEquals(ParameterKind.BIN_FACTOR, m.kind[i]);
            assertEquals(1, m.nominal[i], 0);
            assertEquals(ConstraintType.NONE, m.constraintType[i]);
        }
        // at the nominal values the expectation is the written yields
        double[] nu = new double[m.nominalYield.length];
        new BinnedNll(m, DataSet.observed(m)).expectedEntries(m.nominal.clone(), nu);
        for (int b = 0; b < 4; b++) {
            assertEquals(C[b], nu[b], 1e-12);
            assertEquals(TAU[b] * C[b], nu[4 + b], 1e-12);
        }
    }

    /**
     * Fitting the control region alone (signal region blinded) gives φ_b = n_CR,b / c_b, so the
     * signal-region background is n_CR,b·τ_b with the Poisson error √n_CR,b scaled by τ_b
     * (common practice for a transfer-factor estimate; the Hessian error of a Poisson mean at its
     * maximum-likelihood value is √n).
     */
    @Test
    void aControlRegionGivesTheClosedFormEstimateInTheSignalRegion() {
        CompiledModel m = ModelCompiler.compile(twoRegions(null, false));
        Problem p = Problem.observed(m);
        Fitter fitter = new Fitter(p);
        FitResult best = fitter.fit();
        assertTrue(best.converged(), best.status().toString());
        PostfitCovariance cov = PostfitCovariance.of(fitter.likelihood(), best);
        Yields.SampleYields sr = Yields.compute(p, best, cov).get(1).samples().get(0);
        // 1e-5 relative: the minimiser stops when the expected decrease is below its tolerance,
        // which leaves a relative offset of order 1e-6 in the fitted factors
        for (int b = 0; b < 4; b++) {
            assertEquals(N_CR[b] * TAU[b], sr.postfit().values()[b], 1e-5 * N_CR[b] * TAU[b], "bin " + b);
            assertEquals(Math.sqrt(N_CR[b]) * TAU[b], sr.postfit().errors()[b], 1e-4 * Math.sqrt(N_CR[b]) * TAU[b], "error, bin " + b);
        }
    }

    /** The analytic gradient and Hessian against central finite differences (common practice). */
    @ParameterizedTest
    @CsvSource({"false", "true"})
    void derivativesMatchFiniteDifferences(boolean explicit) {
        CompiledModel m = ModelCompiler.compile(twoRegions(new double[] {14, 13, 12, 9}, true));
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m), explicit);
        int n = nll.dimension();
        Random r = new Random(7);
        double[] x = new double[n];
        for (int i = 0; i < n; i++) x[i] = m.nominal[i] + 0.3 * (r.nextDouble() - 0.5);
        double[] g = new double[n], h = new double[n * n], gp = new double[n], gm = new double[n];
        nll.valueGradientHessian(x, g, h);
        double step = 1e-5;
        for (int i = 0; i < n; i++) {
            double[] xp = x.clone(), xm = x.clone();
            xp[i] += step;
            xm[i] -= step;
            double fd = (nll.value(xp) - nll.value(xm)) / (2 * step);
            assertEquals(fd, g[i], 1e-6 * (1 + Math.abs(fd)), "gradient " + m.parameterNames[i]);
            nll.valueAndGradient(xp, gp);
            nll.valueAndGradient(xm, gm);
            for (int j = 0; j < n; j++) {
                double hd = (gp[j] - gm[j]) / (2 * step);
                assertEquals(hd, h[i * n + j], 1e-5 * (1 + Math.abs(hd)), "hessian " + m.parameterNames[i] + "," + m.parameterNames[j]);
            }
        }
    }

    @Test
    void theKeyIsWrittenAndReadBackAndItsRulesHold() {
        Model model = twoRegions(null, true);
        String json = ModelWriter.toJson(model);
        assertTrue(json.contains("\"binFactors\": \"dd\""), json);
        assertEquals(json, ModelWriter.toJson(ModelReader.parse(json, "tf.json")));
        ModelException e = assertThrows(ModelException.class, () -> ModelReader.parse(
                json.replace("\"parameter\": \"tf_syst\",", "\"parameter\": \"tf_syst\", \"shape\": {\"down\": [1,1,1,1], \"up\": [1,1,1,1]},"), "tf.json"));
        assertTrue(e.getMessage().contains("channels[1].samples[0].variations[0].shape: a sample with binFactors takes norm variations only"),
                e.getMessage());
        e = assertThrows(ModelException.class, () -> ModelReader.parse(json.replace("\"parameter\": \"eff\"", "\"parameter\": \"dd:2\""), "tf.json"));
        assertTrue(e.getMessage().contains("channels[1].samples[1].variations[0].parameter: \"dd:2\" is the name of a generated per-bin factor"),
                e.getMessage());
    }
}
