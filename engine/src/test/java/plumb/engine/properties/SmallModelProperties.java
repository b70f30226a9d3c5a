package plumb.engine.properties;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.LongRange;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.DataSets;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.Fitter;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.ModelReader;
import plumb.engine.model.ModelWriter;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Properties of the likelihood on random small models (two channels, three samples, every kind
 * of variation and interpolation, MC statistics; yields, shapes and counts drawn from the seed),
 * at random points. jqwik draws the seeds and shrinks a failing case to a small one.
 */
class SmallModelProperties {

    private static final ObjectMapper JSON = new ObjectMapper();

    private static Model model(long seed, boolean poisson) {
        return TestModels.mixed(seed, poisson ? ModelOptions.McStatConstraint.POISSON : ModelOptions.McStatConstraint.GAUSSIAN);
    }

    /** A point near the nominal values (γ near 1), the POI in [0.5, 1.5]. */
    private static double[] point(CompiledModel m, int n, Random r) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = i < m.nParams() ? m.nominal(i) + 0.4 * (r.nextDouble() - 0.5) : 1 + 0.1 * (r.nextDouble() - 0.5);
        }
        x[m.poi()] = 0.5 + r.nextDouble();
        return x;
    }

    /** Analytic gradient and Hessian equal central finite differences of the value (common practice). */
    @Property(tries = 25)
    void derivativesMatchFiniteDifferences(@ForAll @LongRange(min = 1, max = 1_000_000) long seed,
                                           @ForAll boolean explicit, @ForAll boolean poisson) {
        CompiledModel m = ModelCompiler.compile(model(seed, poisson));
        BinnedNll nll = new BinnedNll(m, DataSet.observed(m), explicit);
        int n = nll.dimension();
        double[] x = point(m, n, new Random(seed));
        double[] g = new double[n], h = new double[n * n], gp = new double[n], gm = new double[n];
        nll.valueGradientHessian(x, g, h);
        double step = 1e-5;
        for (int i = 0; i < n; i++) {
            double[] xp = x.clone(), xm = x.clone();
            xp[i] += step;
            xm[i] -= step;
            double fd = (nll.value(xp) - nll.value(xm)) / (2 * step);
            assertEquals(fd, g[i], 1e-5 * (1 + Math.abs(fd)), "gradient " + i);
            nll.valueAndGradient(xp, gp);
            nll.valueAndGradient(xm, gm);
            for (int j = 0; j < n; j++) {
                double hd = (gp[j] - gm[j]) / (2 * step);
                assertEquals(hd, h[i * n + j], 1e-4 * (1 + Math.abs(hd)), "hessian " + i + "," + j);
            }
        }
    }

    /** The model as a JSON tree with its channels, each channel's samples and the parameter list shuffled. */
    private static Model shuffled(Model model, Random r) throws Exception {
        ObjectNode root = (ObjectNode) JSON.readTree(ModelWriter.toJson(model));
        shuffle((ArrayNode) root.get("channels"), r);
        for (JsonNode ch : root.get("channels")) shuffle((ArrayNode) ch.get("samples"), r);
        if (root.has("parameters")) shuffle((ArrayNode) root.get("parameters"), r);
        return ModelReader.parse(JSON.writeValueAsString(root), "shuffled");
    }

    private static void shuffle(ArrayNode a, Random r) {
        List<JsonNode> items = new ArrayList<>();
        a.forEach(items::add);
        Collections.shuffle(items, r);
        a.removeAll();
        items.forEach(a::add);
    }

    /** −ln L is the same function whatever the order of channels, samples and parameters (profiled γ). */
    @Property(tries = 25)
    void nllIsInvariantUnderReordering(@ForAll @LongRange(min = 1, max = 1_000_000) long seed) throws Exception {
        Model original = model(seed, false);
        Model other = shuffled(original, new Random(seed ^ 0x5DEECE66DL));
        CompiledModel a = ModelCompiler.compile(original), b = ModelCompiler.compile(other);
        assertEquals(a.nParams(), b.nParams());
        BinnedNll fa = new BinnedNll(a, DataSet.observed(a), false), fb = new BinnedNll(b, DataSet.observed(b), false);
        double[] xa = point(a, a.nParams(), new Random(seed));
        double[] xb = new double[b.nParams()];
        for (int i = 0; i < a.nParams(); i++) xb[b.indexOf(a.parameterNames(i))] = xa[i];
        double va = fa.value(xa), vb = fb.value(xb);
        assertEquals(va, vb, 1e-10 * Math.max(1, Math.abs(va)));
    }

    /** A fit to the Asimov data set of a point returns that point (Cowan et al., EPJ C 71 (2011) 1554). */
    @Property(tries = 15)
    void asimovFitReturnsTheGeneratingValues(@ForAll @LongRange(min = 1, max = 1_000_000) long seed,
                                             @ForAll @DoubleRange(min = 0.5, max = 2) double mu) {
        CompiledModel m = ModelCompiler.compile(model(seed, false));
        double[] values = m.nominal();
        values[m.poi()] = mu;
        DataSet asimov = DataSets.asimov(m, values);
        FitResult r = new Fitter(m, asimov, FitSettings.defaults()).fit();
        assertTrue(r.converged(), r.status().toString());
        for (int i = 0; i < m.nParams(); i++) {
            double tol = 1e-3 * (r.errors()[i] > 0 && Double.isFinite(r.errors()[i]) ? r.errors()[i] : 1);
            assertEquals(values[i], r.values()[i], tol, m.parameterNames(i));
        }
    }

    /** Writing a model and reading it back gives the same model: the same text and the same −ln L. */
    @Property(tries = 25)
    void writeThenReadIsTheSameModel(@ForAll @LongRange(min = 1, max = 1_000_000) long seed, @ForAll boolean poisson) {
        Model original = model(seed, poisson);
        String text = ModelWriter.toJson(original);
        Model back = ModelReader.parse(text, "round-trip");
        assertEquals(text, ModelWriter.toJson(back));
        CompiledModel a = ModelCompiler.compile(original), b = ModelCompiler.compile(back);
        double[] x = point(a, a.nParams(), new Random(seed));
        assertEquals(new BinnedNll(a, DataSet.observed(a)).value(x), new BinnedNll(b, DataSet.observed(b)).value(x), 0.0);
    }
}
