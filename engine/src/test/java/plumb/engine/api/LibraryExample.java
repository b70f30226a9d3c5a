package plumb.engine.api;

import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.InjectionSummary;
import plumb.engine.inference.Problem;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.Locale;

/** Fits a model, holds one parameter by name, and asks every question the engine answers. */
public final class LibraryExample {

    public static void main(String[] args) {
        run(Path.of(args[0]), System.out);
    }

    static void run(Path modelFile, PrintStream out) {
        CompiledModel model = Plumb.readModel(modelFile);
        // The observed data with the luminosity parameter held at +0.5 of its pre-fit width.
        Problem problem = Plumb.observed(model).holding("lumi", 0.5);

        FitOutcome fit = Plumb.fit(problem);
        out.printf(Locale.ROOT, "fit: %s, mu = %.4f +- %.4f, slope pull %.3f%n", fit.status(),
                fit.value("mu"), fit.error("mu"), fit.parameter("slope").pull());

        ImpactsOutcome impacts = Plumb.impacts(problem);
        for (ImpactsOutcome.Ranked r : impacts.ranking()) {
            out.printf(Locale.ROOT, "impact of %s: %+.4f / %+.4f%n", r.name(), r.postfitUp(), r.postfitDown());
        }

        YieldsOutcome yields = Plumb.yields(problem);
        YieldsOutcome.ChannelSums peak = yields.channel("peak");
        out.printf(Locale.ROOT, "peak: observed %.0f, post-fit %.2f +- %.2f%n", peak.observed(),
                peak.totalPostfit().value(), peak.totalPostfit().error());

        ScanOutcome scan = Plumb.scan(problem, "mu", 11);
        out.printf(Locale.ROOT, "scan: 68%% interval [%.4f, %.4f]%n", scan.low68(), scan.high68());

        LimitOutcome limit = Plumb.limit(problem, 0.95);
        out.printf(Locale.ROOT, "limit: mu < %.4f observed, %.4f expected%n", limit.observed(),
                limit.expected().median());

        DiscoveryOutcome discovery = Plumb.discovery(problem);
        out.printf(Locale.ROOT, "discovery: Z = %.3f observed, %.3f expected%n", discovery.observedZ(),
                discovery.expectedZ());

        GofOutcome gof = Plumb.gof(problem);
        out.printf(Locale.ROOT, "gof: %.3f for %d degrees of freedom, p = %.4f%n", gof.statistic(), gof.ndof(), gof.p());

        InjectionSummary injection = Plumb.inject(problem, 2.0, 40, 7);
        out.printf(Locale.ROOT, "injection of mu = 2: mean %.3f, pull width %.3f over %d toys%n", injection.mean(),
                injection.pullWidth(), injection.converged());
    }
}
