package plumb.cli.report;

import java.util.ArrayList;
import java.util.List;
import plumb.cli.plot.CorrelationMatrix;
import plumb.cli.plot.ImpactBars;
import plumb.cli.plot.LimitBands;
import plumb.cli.plot.ScanCurve;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.AsimovClosure;
import plumb.engine.inference.Discovery;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.GoodnessOfFit;
import plumb.engine.inference.InjectionSummary;
import plumb.engine.inference.InjectionToys;
import plumb.engine.inference.LimitResult;
import plumb.engine.inference.ProfileScan;
import plumb.engine.inference.Pulls;
import plumb.engine.inference.Yields;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.ParameterKind;
import plumb.engine.model.Sample;

/**
 * Maps the engine's results to the report's input records: the one place that knows both sides,
 * so the page and figures stay independent of the engine and the engine of the page.
 */
public final class ReportAssembler {

    private ReportAssembler() {
    }

    /**
     * The fit section: every model parameter (the MC-statistics γ and per-bin free factors are left
     * out: there is one per bin, and the fit result file lists them), and the correlations of the parameters fitted.
     */
    public static FitSection fit(CompiledModel m, FitResult r) {
        List<FitSection.Parameter> params = new ArrayList<>();
        for (int i = 0; i < m.nAll(); i++) {
            if (m.kind(i) == ParameterKind.MC_STATISTICS || m.kind(i) == ParameterKind.BIN_FACTOR) continue;
            params.add(new FitSection.Parameter(m.parameterNames(i), r.values()[i], r.errors()[i],
                    m.nominal(i), m.prefitWidth(i), Pulls.pull(m, r, i), Pulls.constraint(m, r, i)));
        }
        CorrelationMatrix correlation = null;
        if (r.covariance() != null) {
            List<Integer> free = new ArrayList<>();
            for (int i = 0; i < m.nParams(); i++) if (!r.held()[i]) free.add(i);
            List<String> names = new ArrayList<>();
            double[][] c = new double[free.size()][free.size()];
            for (int a = 0; a < free.size(); a++) {
                names.add(m.parameterNames(free.get(a)));
                for (int b = 0; b < free.size(); b++) c[a][b] = r.correlation(free.get(a), free.get(b), m.nParams());
            }
            if (!names.isEmpty()) correlation = new CorrelationMatrix(null, names, c);
        }
        return new FitSection(r.converged(), r.nll(), params, correlation, r.seconds(), r.evaluations(),
                m.poi() < 0 ? null : m.parameterNames(m.poi()));
    }

    /** The impacts ranking: exact shifts where refitted, linearised ones for the rest. */
    public static ImpactBars impacts(CompiledModel m, FitResult best, List<plumb.engine.inference.Impacts.Entry> entries) {
        List<ImpactBars.Bar> out = new ArrayList<>();
        for (plumb.engine.inference.Impacts.Entry e : entries) {
            plumb.engine.inference.Impacts.Shift pre = e.refitted() ? e.prefit() : e.linearPrefit();
            plumb.engine.inference.Impacts.Shift post = e.refitted() ? e.postfit() : e.linearPostfit();
            out.add(new ImpactBars.Bar(e.name(), e.pull(), e.constraint(), pre.up(), pre.down(), post.up(), post.down()));
        }
        return new ImpactBars(m.parameterNames(m.poi()), best.values()[m.poi()], best.errors()[m.poi()], out);
    }

    /** The grouped breakdown of the POI's uncertainty. */
    public static Results.ErrorBreakdown breakdown(plumb.engine.inference.Impacts.Breakdown b) {
        List<Results.ErrorBreakdown.Group> groups = new ArrayList<>();
        for (plumb.engine.inference.Impacts.Contribution c : b.groups()) {
            groups.add(new Results.ErrorBreakdown.Group(c.group(), c.members(), c.contribution(), c.fixedError()));
        }
        return new Results.ErrorBreakdown(b.total(), b.statOnly(), groups);
    }

    /**
     * Yields per channel with the channel's observable and edges. A sample is the signal when its
     * factors include the parameter of interest (per channel: a sample may be signal in one only).
     */
    public static List<ChannelYieldBands> yields(Model model, CompiledModel m, List<Yields.ChannelYields> yields) {
        List<ChannelYieldBands> out = new ArrayList<>();
        for (int c = 0; c < yields.size(); c++) {
            Yields.ChannelYields y = yields.get(c);
            Channel ch = model.channels().get(c);
            List<ChannelYieldBands.SampleBands> samples = new ArrayList<>();
            for (Yields.SampleYields s : y.samples()) {
                samples.add(new ChannelYieldBands.SampleBands(s.name(), isSignal(model, ch, s.name()), band(s.prefit()),
                        s.postfit() == null ? null : band(s.postfit())));
            }
            out.add(new ChannelYieldBands(y.name(), m.observables(c), m.edges(c), y.observed(), samples,
                    band(y.totalPrefit()), y.totalPostfit() == null ? null : band(y.totalPostfit())));
        }
        return out;
    }

    private static boolean isSignal(Model model, Channel ch, String sample) {
        if (model.poi() == null) return false;
        for (Sample s : ch.samples()) if (s.name().equals(sample)) return s.factors().contains(model.poi());
        return false;
    }

    private static ChannelYieldBands.BinBand band(Yields.Band b) {
        return new ChannelYieldBands.BinBand(b.values(), b.errors());
    }

    /**
     * The scan curve: ΔNLL relative to the lowest value found ({@link ProfileScan#rebased}, as in the
     * scan result file); points whose refit failed are left out.
     */
    public static ScanCurve scan(String parameter, double best, List<ProfileScan.Point> points,
                                 List<ProfileScan.Interval> intervals) {
        List<ProfileScan.Point> good = new ArrayList<>();
        for (ProfileScan.Point p : ProfileScan.rebased(points)) if (Double.isFinite(p.nllAboveMin())) good.add(p);
        double[] x = new double[good.size()], y = new double[good.size()];
        for (int i = 0; i < x.length; i++) {
            x[i] = good.get(i).value();
            y[i] = good.get(i).nllAboveMin();
        }
        return new ScanCurve(parameter, x, y, best, ends(intervals.get(0)), ends(intervals.get(1)));
    }

    private static double[] ends(ProfileScan.Interval iv) {
        return new double[] {iv.low(), iv.high()};
    }

    /** Observed (null when blinded) and expected discovery tests. */
    public static Results.DiscoveryValues discovery(Discovery.Significance observed, Discovery.Significance expected) {
        return new Results.DiscoveryValues(observed == null ? null : significance(observed), significance(expected));
    }

    private static Results.Q0Values significance(Discovery.Significance s) {
        return new Results.Q0Values(s.q0(), s.z(), s.p());
    }

    /** One point of the limits table or figure; a model without a limit gives NaN everywhere. */
    public static LimitBands.Point limitPoint(double x, LimitResult r) {
        if (r == null) return new LimitBands.Point(x, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN);
        double[] b = r.expected().toArray();
        return new LimitBands.Point(x, r.observed(), b[0], b[1], b[2], b[3], b[4]);
    }

    /** The saturated-model goodness of fit. */
    public static Results.GofValues gof(GoodnessOfFit.Result r) {
        return new Results.GofValues(r.statistic(), r.ndof(), r.p());
    }

    /** One row per injected value. */
    public static List<Results.InjectionValues> injection(List<InjectionSummary> summaries) {
        List<Results.InjectionValues> out = new ArrayList<>();
        for (InjectionSummary s : summaries) {
            out.add(new Results.InjectionValues(s.injected(), s.toys(), s.converged(), s.mean(), s.meanError(), s.pullMean(),
                    s.pullWidth(), s.coverage68()));
        }
        return out;
    }

    /** One row per Asimov closure check. */
    public static List<Results.Closure> closures(CompiledModel m, List<AsimovClosure> closures) {
        List<Results.Closure> out = new ArrayList<>();
        for (AsimovClosure c : closures) {
            out.add(new Results.Closure(c.injected(), c.fit().converged(), c.passed(), c.maxDeviation(),
                    c.worstParameter() < 0 ? null : m.parameterNames(c.worstParameter()), InjectionToys.CLOSURE_TOLERANCE));
        }
        return out;
    }
}
