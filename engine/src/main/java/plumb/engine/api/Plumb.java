package plumb.engine.api;

import plumb.engine.compile.CompiledModel;
import plumb.engine.compile.ModelCompiler;
import plumb.engine.inference.AsymptoticUpperLimit;
import plumb.engine.inference.DataRequest;
import plumb.engine.inference.Discovery;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.GoodnessOfFit;
import plumb.engine.inference.Impacts;
import plumb.engine.inference.InferenceException;
import plumb.engine.inference.InjectionSummary;
import plumb.engine.inference.InjectionToys;
import plumb.engine.inference.LimitResult;
import plumb.engine.inference.FitSettings;
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.inference.Problem;
import plumb.engine.inference.ProfileScan;
import plumb.engine.inference.Pulls;
import plumb.engine.inference.ToyFit;
import plumb.engine.inference.Yields;
import plumb.engine.likelihood.DataSet;
import plumb.engine.model.ModelReader;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * The engine for other Java programs, parameters by name. Read a model, build a {@link Problem},
 * then ask for a fit, impacts, yields, a scan, a limit, a discovery test, goodness of fit or
 * injection toys; each answer is a record. Every method is independent (it makes its own best
 * fit) and uses all cores; results do not depend on the number of threads.
 *
 * <p>Errors: a bad model file throws {@link plumb.engine.model.ModelException}; a bad name or
 * value, {@link IllegalArgumentException}; a computation that ran but failed (a fit that does
 * not converge where one is needed), {@link InferenceException}.
 */
public final class Plumb {

    private Plumb() {
    }

    /** Reads, validates and compiles a model file (.json or .json.gz). */
    public static CompiledModel readModel(Path file) {
        return ModelCompiler.compile(ModelReader.read(file));
    }

    /** The model fitted to its observed data, default settings, nothing held. */
    public static Problem observed(CompiledModel model) {
        return Problem.observed(model);
    }

    /**
     * The model fitted to its Asimov data set at POI value {@code poiValue}: nuisance values from
     * a fit to the observed data with the POI held there, or the nominal values when every
     * channel is blinded.
     */
    public static Problem asimov(CompiledModel model, double poiValue) {
        FitSettings settings = FitSettings.defaults();
        return Problem.of(model, asimovAt(model, new int[0], new double[0], settings, poiValue), settings, Map.of());
    }

    /** A fit of the problem: every parameter's value, error, pull and constraint. */
    public static FitOutcome fit(Problem p) {
        return fitOutcome(p, new Fitter(p).fit());
    }

    /**
     * The constrained parameters ranked by their impact on the POI (exact refits for every one).
     *
     * @throws InferenceException when the best fit does not converge
     */
    public static ImpactsOutcome impacts(Problem p) {
        CompiledModel m = p.model();
        requirePoi(m);
        FitResult best = convergedFit(p, "impacts");
        Impacts impacts = new Impacts(p, best, false);
        List<ImpactsOutcome.Ranked> ranked = new ArrayList<>();
        for (Impacts.Entry e : impacts.rank(impacts.candidates().length, threads(), null)) {
            ranked.add(new ImpactsOutcome.Ranked(e.name(), e.pull(), e.constraint(), e.postfit().up(),
                    e.postfit().down(), e.prefit().up(), e.prefit().down(),
                    e.postfit().converged() && e.prefit().converged()));
        }
        return new ImpactsOutcome(m.parameterNames(m.poi()), best.values()[m.poi()], best.errors()[m.poi()], ranked);
    }

    /**
     * Pre-fit and post-fit yields of every channel and sample, summed over bins.
     *
     * @throws InferenceException when the best fit does not converge or its covariance is not positive definite
     */
    public static YieldsOutcome yields(Problem p) {
        CompiledModel m = p.model();
        Fitter fitter = new Fitter(p);
        FitResult best = fitter.fit();
        if (!best.converged()) throw new InferenceException("the best fit did not converge (" + best.status() + "); no yields");
        PostfitCovariance cov = PostfitCovariance.of(fitter.likelihood(), best);
        if (cov == null) throw new InferenceException("the post-fit covariance is not positive definite; no yields");
        List<YieldsOutcome.ChannelSums> channels = new ArrayList<>();
        for (Yields.ChannelYields c : Yields.compute(p, best, cov)) {
            List<YieldsOutcome.SampleSums> samples = new ArrayList<>();
            for (Yields.SampleYields s : c.samples()) samples.add(new YieldsOutcome.SampleSums(s.name(), sum(s.prefit()), sum(s.postfit())));
            double observed = Double.NaN;
            if (c.observed() != null) {
                observed = 0;
                for (double n : c.observed()) observed += n;
            }
            channels.add(new YieldsOutcome.ChannelSums(c.name(), observed, samples, sum(c.totalPrefit()), sum(c.totalPostfit())));
        }
        return new YieldsOutcome(channels);
    }

    private static YieldsOutcome.Sum sum(Yields.Band b) {
        return new YieldsOutcome.Sum(b.sum(), b.sumError());
    }

    /**
     * A profile likelihood scan of the named parameter over the default range (best fit ± 3
     * errors, clipped to its range) with the 68 % and 95 % intervals.
     *
     * @throws IllegalArgumentException when the parameter is unknown, held, or points &lt; 2
     * @throws InferenceException when the best fit does not converge
     */
    public static ScanOutcome scan(Problem p, String parameter, int points) {
        CompiledModel m = p.model();
        int k = m.indexOf(parameter);
        if (k < 0) throw new IllegalArgumentException("model '" + m.name() + "' has no parameter '" + parameter + "'");
        if (p.holds(parameter) || m.fixed(k)) throw new IllegalArgumentException(parameter + " is held; it cannot be scanned");
        FitResult best = convergedFit(p, "scan");
        ProfileScan scan = new ProfileScan(p, best);
        double[] range = ProfileScan.defaultRange(m, best, k);
        List<ScanOutcome.ProfilePoint> pts = new ArrayList<>();
        for (ProfileScan.Point x : ProfileScan.rebased(scan.points(k, range[0], range[1], points, threads(), null))) {
            pts.add(new ScanOutcome.ProfilePoint(x.value(), 2 * x.nllAboveMin(), x.status().name()));
        }
        List<ProfileScan.Interval> iv = scan.intervals(k, new double[] {ProfileScan.LEVEL_68, ProfileScan.LEVEL_95}, threads());
        return new ScanOutcome(parameter, best.values()[k], best.errors()[k], pts, iv.get(0).low(), iv.get(0).high(),
                iv.get(1).low(), iv.get(1).high());
    }

    /**
     * The asymptotic CLs upper limit on the POI at confidence level {@code cl}. Expected limits come
     * from the Asimov data set at POI = 0 (nuisances from a fit to the observed data when there are
     * any); a blinded model fitted to observed data has expected limits only.
     *
     * @throws InferenceException when a needed fit fails or no limit lies in the POI range
     */
    public static LimitOutcome limit(Problem p, double cl) {
        CompiledModel m = requirePoi(p.model());
        DataSet asimovZero = asimovAt(p, 0);
        boolean observedLimit = !blindedObserved(p);
        LimitResult r = AsymptoticUpperLimit.compute(p, asimovZero, observedLimit, cl);
        return new LimitOutcome(m.parameterNames(m.poi()), cl, r.observed(), r.expected(), r.muHat());
    }

    /**
     * The discovery test of POI = 0 (q0): observed on the problem's data, expected on the Asimov
     * data set at POI = 1.
     *
     * @throws InferenceException when a needed fit fails
     */
    public static DiscoveryOutcome discovery(Problem p) {
        CompiledModel m = requirePoi(p.model());
        double expectedPoi = 1;
        Discovery.Significance expected = Discovery.compute(p.withData(asimovAt(p, expectedPoi)));
        Discovery.Significance observed = blindedObserved(p) ? null : Discovery.compute(p);
        return new DiscoveryOutcome(m.parameterNames(m.poi()), observed == null ? Double.NaN : observed.z(),
                observed == null ? Double.NaN : observed.p(), observed == null ? Double.NaN : observed.muHat(),
                expected.z(), expectedPoi);
    }

    /**
     * Goodness of fit of the problem's data with the saturated-model statistic.
     *
     * @throws InferenceException when the fit does not converge
     */
    public static GofOutcome gof(Problem p) {
        GoodnessOfFit.Result r = GoodnessOfFit.compute(p);
        return new GofOutcome(r.statistic(), r.ndof(), r.p(), r.fit().converged());
    }

    /**
     * Which uncertainty limits the search: the expected limit and significance with each nuisance
     * parameter and group removed or its pre-fit width scaled by each of {@code scales}, ranked
     * (fast path), with the exact recomputation for the top {@code exactTop}. Asimov nuisance values
     * post-fit when the model has observed data.
     */
    public static plumb.engine.inference.Sensitivity.Result sensitivity(Problem p, double[] scales, int exactTop) {
        requirePoi(p.model());
        return plumb.engine.inference.Sensitivity.compute(
                plumb.engine.inference.Sensitivity.request(p, true, 0.95, scales, exactTop, threads()), null);
    }

    /** The expected limit and significance with the yields scaled by each luminosity factor, three scenarios. */
    public static plumb.engine.inference.Projection.Result project(Problem p, double[] lumis) {
        requirePoi(p.model());
        return plumb.engine.inference.Projection.compute(p, true, 0.95, lumis, threads(), null);
    }

    /** The 68 % and 95 % profile-likelihood regions of two parameters, {@code rays} points each. */
    public static plumb.engine.inference.Contour.Result contour(Problem p, String x, String y, int rays) {
        return plumb.engine.inference.Contour.compute(p, x, y, plumb.engine.inference.Contour.DEFAULT_CLS, rays,
                threads(), null);
    }

    /**
     * Injection toys: {@code toys} pseudo-data sets generated at POI = {@code injected} (nuisances
     * at their nominal values, auxiliary values fluctuated), each fitted; the summary of the fitted
     * POI, its pull and coverage. Toy i depends only on ({@code seed}, i).
     */
    public static InjectionSummary inject(Problem p, double injected, int toys, long seed) {
        CompiledModel m = requirePoi(p.model());
        if (toys < 1) throw new IllegalArgumentException("toys must be at least 1, got " + toys);
        InjectionToys engine = new InjectionToys(p);
        double[] point = engine.generatingPoint(injected, false).values();
        ToyFit[] fits = engine.run(point, InjectionToys.injectionSeed(seed, 0), true, 0, toys, threads(), null);
        int[] pulled = engine.pulledParameters();
        String[] names = new String[pulled.length];
        for (int k = 0; k < pulled.length; k++) names[k] = m.parameterNames(pulled[k]);
        return InjectionSummary.of(injected, fits, names);
    }

    static FitOutcome fitOutcome(Problem p, FitResult r) {
        CompiledModel m = p.model();
        List<FitOutcome.Estimate> list = new ArrayList<>(m.nAll());
        for (int i = 0; i < m.nAll(); i++) {
            list.add(new FitOutcome.Estimate(m.parameterNames(i), r.values()[i], r.errors()[i], Pulls.pull(m, r, i),
                    Pulls.constraint(m, r, i), r.held()[i]));
        }
        return new FitOutcome(r.status().name(), r.converged(), r.nll(), list, r);
    }

    private static FitResult convergedFit(Problem p, String what) {
        FitResult best = new Fitter(p).fit();
        if (!best.converged()) {
            throw new InferenceException("the best fit did not converge (" + best.status() + "); no " + what);
        }
        return best;
    }

    private static CompiledModel requirePoi(CompiledModel m) {
        if (m.poi() < 0) throw new IllegalArgumentException("model '" + m.name() + "' names no parameter of interest");
        return m;
    }

    /** Observed data of a model with a blinded channel: no observed POI test. */
    private static boolean blindedObserved(Problem p) {
        return p.data().kind().equals("observed") && p.model().anyBlinded();
    }

    /** The Asimov set at POI = mu with post-fit nuisances (from the observed data, held parameters held). */
    private static DataSet asimovAt(Problem p, double mu) {
        return asimovAt(p.model(), p.heldIndices(), p.heldValues(), p.settings(), mu);
    }

    private static DataSet asimovAt(CompiledModel m, int[] held, double[] heldValues, FitSettings settings, double mu) {
        requirePoi(m);
        DataRequest.requireInRange(m, mu);
        return DataRequest.asimovAt(m, mu, held, heldValues, true, settings);
    }

    private static int threads() {
        return Runtime.getRuntime().availableProcessors();
    }
}
