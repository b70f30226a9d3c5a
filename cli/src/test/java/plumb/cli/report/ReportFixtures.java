package plumb.cli.report;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import plumb.cli.plot.CorrelationMatrix;
import plumb.cli.plot.Fixtures;
import plumb.cli.plot.LimitBands;
import plumb.cli.plot.PullMarks;
import plumb.cli.plot.StackedYields;

/** A complete report input in the demo scenario (fictional collider, two-photon resonance). */
final class ReportFixtures {

    private ReportFixtures() {
    }

    /** Model name with markup in it: the page must show it as text. */
    static final String HOSTILE_NAME = "gg_res <script>alert('x')</script> & \"friends\"";

    static ReportInput full() {
        Map<String, Object> labels = new LinkedHashMap<>();
        labels.put("mass", 638.0);
        labels.put("detector", "Tamarind");
        RunSummary summary = new RunSummary(HOSTILE_NAME, "Narrow resonance search in m(γγ), invented yields.",
                "models/demo.json", "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", "observed",
                20240611L, "0.1.0", 83.4, labels, List.of("variation 'fake_rate' is one-sided in channel ctrl_highpt"),
                List.of("scan point mu_res=2.9"));

        List<FitSection.Parameter> params = new ArrayList<>();
        params.add(new FitSection.Parameter("mu_res", 1.08, 0.27, 1, Double.NaN, Double.NaN, Double.NaN));
        for (PullMarks.Mark e : Fixtures.pulls().entries()) {
            double c = Double.isNaN(e.constraint()) ? 1 : e.constraint();
            params.add(new FitSection.Parameter(e.name(), e.pull(), c, 0, 1, e.pull(), c));
        }
        CorrelationMatrix corr = Fixtures.correlation(params.size());
        List<String> names = new ArrayList<>();
        for (FitSection.Parameter p : params) names.add(p.name());
        FitSection fit = new FitSection(true, 1234.56789, params, new CorrelationMatrix(null, names, corr.matrix()), 1.73, 4210);

        List<ChannelYieldBands> yields = List.of(channel(Fixtures.diphoton("post-fit"), true), channel(Fixtures.falling(true), false));

        List<Results.InjectionValues> injections = new ArrayList<>();
        for (var p : Fixtures.linearity().points()) {
            injections.add(new Results.InjectionValues(p.injected(), 200, 198, p.fitted(), p.error(), 0.03, 1.02, 0.675));
        }
        List<LimitBands.Point> limitPoints = Fixtures.limits(true).points();

        return ReportInput.of(summary)
                .withFit(fit)
                .withImpacts(Fixtures.impacts(), 8)
                .withYields(yields)
                .withScan(Fixtures.scan())
                .withDiscovery(new Results.DiscoveryValues(new Results.Q0Values(9.61, 3.1, 9.68e-4),
                        new Results.Q0Values(12.25, 3.5, 2.33e-4)))
                .withLimits(new Results.Limits("mu_res", "asymptotic", 0.95, "mass [GeV]", limitPoints))
                .withGoodnessOfFit(new Results.GofValues(14.2, 15, 0.51))
                .withInjection(injections)
                .withAttachments(List.of(new Results.Attachment("json/fit.json", "fit result (JSON)",
                        "{\"converged\": true}".getBytes(StandardCharsets.UTF_8))));
    }

    /** Report-side yields from a figure fixture: pre-fit = 0.9 × post-fit, errors 5% / 3%. */
    static ChannelYieldBands channel(StackedYields s, boolean withPostfit) {
        int n = s.bins();
        List<ChannelYieldBands.SampleBands> samples = new ArrayList<>();
        double[] pre = new double[n];
        double[] post = new double[n];
        for (StackedYields.Layer l : s.layers()) {
            double[] y = l.yields();
            double[] yPre = new double[n];
            double[] ePre = new double[n];
            double[] ePost = new double[n];
            for (int b = 0; b < n; b++) {
                yPre[b] = 0.9 * y[b];
                ePre[b] = 0.05 * yPre[b];
                ePost[b] = 0.03 * y[b];
                pre[b] += yPre[b];
                post[b] += y[b];
            }
            samples.add(new ChannelYieldBands.SampleBands(l.name(), l.signal(), new ChannelYieldBands.BinBand(yPre, ePre),
                    withPostfit ? new ChannelYieldBands.BinBand(y, ePost) : null));
        }
        double[] preErr = new double[n];
        double[] postErr = new double[n];
        for (int b = 0; b < n; b++) {
            preErr[b] = 0.05 * pre[b];
            postErr[b] = 0.03 * post[b];
        }
        return new ChannelYieldBands(s.channel(), s.observable(), s.edges(), s.observed(), samples,
                new ChannelYieldBands.BinBand(pre, preErr), withPostfit ? new ChannelYieldBands.BinBand(post, postErr) : null);
    }
}
