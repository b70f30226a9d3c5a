package plumb.engine.likelihood;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import plumb.engine.TestModels;
import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ModelOptions;
import plumb.engine.model.Sample;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * The Hessian's channel blocks made two at a time on two threads give bit for bit the Hessian of
 * one thread (the blocks are added in channel order either way), in both layouts, for the
 * Gauss–Newton form and for the γ blocks of the post-fit covariance; and that Hessian against
 * central differences of the gradient (common practice).
 */
class BinnedNllTwoThreadsTest {

    /**
     * Three channels (an odd number: the last has no partner) from two mixed test models; with
     * {@code allMc} every sample carries MC-statistics errors (the one-rank-per-bin path).
     */
    private static CompiledModel model(ModelOptions.McStatConstraint mc, boolean allMc) {
        Model a = TestModels.mixed(1, mc), b = TestModels.mixed(2, mc);
        List<Channel> channels = new ArrayList<>(a.channels());
        Channel extra = b.channels().get(1);
        channels.add(new Channel("ch2", extra.observable(), extra.edges(), extra.observed(), extra.samples()));
        if (allMc) {
            List<Channel> withErrors = new ArrayList<>();
            for (Channel c : channels) {
                List<Sample> samples = new ArrayList<>();
                for (Sample s : c.samples()) {
                    double[] err = s.mcError();
                    if (err == null) {
                        err = new double[s.yields().length];
                        for (int i = 0; i < err.length; i++) err[i] = 0.06 * s.yields()[i] + 0.1;
                    }
                    samples.add(new Sample(s.name(), s.yields(), err, s.factors(), s.variations()));
                }
                withErrors.add(new Channel(c.name(), c.observable(), c.edges(), c.observed(), samples));
            }
            channels = withErrors;
        }
        return ModelCompiler.compile(new Model(a.format(), a.name(), a.description(), a.poi(), channels,
                a.parameters(), a.groups(), a.labels(), a.options()));
    }

    @ParameterizedTest
    @CsvSource({"false,GAUSSIAN,false", "true,GAUSSIAN,false", "false,POISSON,false", "true,POISSON,false",
            "false,GAUSSIAN,true", "true,POISSON,true"})
    void twoThreadsGiveTheSameHessian(boolean explicit, ModelOptions.McStatConstraint mc, boolean allMc) {
        CompiledModel m = model(mc, allMc);
        DataSet data = DataSet.observed(m);
        BinnedNll one = new BinnedNll(m, data, explicit), two = new BinnedNll(m, data, explicit);
        two.blocksOnTwoThreads(true);
        int n = one.dimension(), nP = m.nParams(), stride = one.localStride();
        Random r = new Random(explicit ? 11 : 12);
        for (int trial = 0; trial < 3; trial++) {
            double[] x = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = m.nominal(i) + 0.4 * (r.nextDouble() - 0.5);
                if (i >= nP) x[i] = 1 + 0.1 * (r.nextDouble() - 0.5);
            }
            x[m.indexOf("mu")] = 0.5 + r.nextDouble();
            double[] g1 = new double[n], h1 = new double[n * n], g2 = new double[n], h2 = new double[n * n];
            assertEquals(one.valueGradientHessian(x, g1, h1), two.valueGradientHessian(x, g2, h2), 0.0);
            assertArrayEquals(g1, g2, 0.0);
            assertArrayEquals(h1, h2, 0.0);
            one.valueGradientCurvature(x, g1, h1);
            two.valueGradientCurvature(x, g2, h2);
            assertArrayEquals(h1, h2, 0.0);
            double[] a1 = new double[nP * nP], d1 = new double[m.nGamma()], mixed1 = new double[m.nGamma() * stride];
            double[] a2 = new double[nP * nP], d2 = new double[m.nGamma()], mixed2 = new double[m.nGamma() * stride];
            one.gammaBlocks(x, a1, d1, mixed1);
            two.gammaBlocks(x, a2, d2, mixed2);
            assertArrayEquals(a1, a2, 0.0);
            assertArrayEquals(d1, d2, 0.0);
            assertArrayEquals(mixed1, mixed2, 0.0);
            // the Hessian of two threads against central differences of its gradient
            two.valueGradientHessian(x, g2, h2);
            double step = 1e-5;
            double[] gp = new double[n], gm = new double[n];
            for (int i = 0; i < n; i++) {
                double[] xp = x.clone(), xm = x.clone();
                xp[i] += step;
                xm[i] -= step;
                two.valueAndGradient(xp, gp);
                two.valueAndGradient(xm, gm);
                for (int j = 0; j < n; j++) {
                    double hd = (gp[j] - gm[j]) / (2 * step);
                    assertEquals(hd, h2[i * n + j], 1e-4 * (1 + Math.abs(hd)), "hessian " + i + "," + j);
                }
            }
        }
    }
}
