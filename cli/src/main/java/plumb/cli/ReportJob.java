package plumb.cli;

import com.fasterxml.jackson.databind.node.ObjectNode;
import plumb.cli.plot.LimitBands;
import plumb.cli.report.ReportAssembler;
import plumb.cli.report.ReportFolder;
import plumb.cli.report.ReportInput;
import plumb.cli.report.ReportWriter;
import plumb.cli.report.Results;
import plumb.cli.report.RunSummary;
import plumb.engine.compile.CompiledModel;
import plumb.engine.inference.AsimovClosure;
import plumb.engine.inference.Contour;
import plumb.engine.inference.Discovery;
import plumb.engine.inference.DiscoveryAcrossModels;
import plumb.engine.inference.FitResult;
import plumb.engine.inference.GoodnessOfFit;
import plumb.engine.inference.Impacts;
import plumb.engine.inference.PostfitCovariance;
import plumb.engine.inference.Problem;
import plumb.engine.inference.Fitter;
import plumb.engine.inference.InjectionStudy;
import plumb.engine.inference.InjectionSummary;
import plumb.engine.inference.InjectionToyBatch;
import plumb.engine.inference.InjectionToys;
import plumb.engine.inference.ProfileScan;
import plumb.engine.inference.Projection;
import plumb.engine.inference.Sensitivity;
import plumb.engine.inference.WorkRunner;
import plumb.engine.inference.Yields;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.function.Supplier;

/**
 * The whole analysis of {@code plumb report}: every section computed through the same engine calls
 * and JSON builders as its own command, so each {@code json/NAME.json} of the report equals what
 * that command writes with the same options:
 * <pre>
 *   json/check.json      plumb check MODEL --json
 *   json/fit.json        plumb fit MODEL --json                      (timing differs)
 *   json/impacts.json    plumb impacts MODEL --exact-top N --json    (N = --impacts-top)
 *   json/yields.json     plumb yields MODEL --json
 *   json/scan.json       plumb scan MODEL --json                     (the POI, 21 points)
 *   json/discovery.json  plumb discovery MODEL --json
 *   json/limit.json      plumb limit MODEL… [--label KEY] --json     (every model; seconds differ)
 *   json/gof.json        plumb gof MODEL --json
 *   json/inject.json     plumb inject MODEL --mu 1,2,3 --toys T --asimov --json
 *   json/sensitivity.json plumb sensitivity MODEL --json                        (seconds differ)
 *   json/project.json    plumb project MODEL --lumi 1,2,5,10 --json          (seconds differ)
 *   json/contour.json    plumb contour MODEL --x POI --y P --rays 32 --json  (P: most correlated with the POI)
 *   json/discovery-scan.json plumb discovery MODEL… [--label KEY] --json     (with several models)
 * </pre>
 * each with the shared fit options given to the report (inject takes --fix, --threads, --seed,
 * --optimizer and --explicit-mcstat). A section that fails is recorded with why and the others
 * still run; bad options stop the job before anything is written.
 */
final class ReportJob {

    /**
     * POI values of the injection test (those inside the POI's range): the nominal signal, then
     * twice and three times it for the linearity. Not 0: a POI bounded at 0 keeps every fit at or
     * above it, which lifts the mean fitted value there and bends the line for no fault of the fit.
     */
    static final double[] INJECTED = {1, 2, 3};

    /** Confidence level of the report's limits: the limit command's default. */
    static final double LIMIT_CL = 0.95;

    /** Points of the POI scan: the scan command's default. */
    static final int SCAN_POINTS = 21;

    private final List<Path> files;
    private final FitOptions fit;
    private final int toys;
    private final int impactsTop;
    private final String label;
    /** Draw the template figures of every variation (plumb report --templates). */
    boolean templates;
    /**
     * The cut flow of the build that made the main model, shown in its own section: given by
     * {@code plumb demo --events}, otherwise read from the file the build wrote beside the model.
     */
    List<plumb.cli.build.CutFlowRow> cutFlow = List.of();

    private final List<String> warnings = new ArrayList<>();
    private final List<String> nonConverged = new ArrayList<>();
    private final List<RunSummary.Failure> failures = new ArrayList<>();
    private final List<Results.Attachment> attachments = new ArrayList<>();

    /**
     * @param files      model files, the first the main one; all of them feed the limits
     * @param toys       toys per injected value (0: the Asimov closure only)
     * @param impactsTop parameters refitted exactly and drawn in the impacts ranking
     * @param label      label of the models that orders the limits (null: the first numeric one)
     */
    ReportJob(List<Path> files, FitOptions fit, int toys, int impactsTop, String label) {
        this.files = List.copyOf(files);
        this.fit = fit;
        this.toys = toys;
        this.impactsTop = impactsTop;
        this.label = label;
    }

    /** What a run produced: the page written, and whether any section failed or any fit did not converge. */
    record Written(Path index, RunSummary summary) {
    }

    /**
     * Computes every section and writes the report into {@code dir}.
     *
     * @throws InputException for bad options (nothing is written then) or a report that cannot be written
     */
    Written run(Path dir) {
        requireReportFolder(dir, files);
        ReportInput in = assemble();
        try {
            return new Written(ReportWriter.write(in, dir, files), in.summary());
        } catch (ReportFolder.NotReusable e) {
            throw new InputException("--out " + dir + ": " + e.getMessage());
        } catch (IOException | RuntimeException e) {
            throw new InputException("--out " + dir + ": cannot write the report: " + Outputs.cause(e));
        }
    }

    /**
     * Computes every section: what the page shows and the JSON files it carries.
     *
     * @throws InputException for bad options
     */
    ReportInput assemble() {
        long t0 = System.nanoTime();
        ModelInput.Loaded main = ModelInput.load(files.get(0));
        // a model written by plumb build has its cut flow beside it
        if (cutFlow.isEmpty()) cutFlow = plumb.cli.build.CutFlowFile.readBeside(files.get(0), main.model(), warnings);
        for (Path f : files.subList(1, files.size())) ModelInput.load(f);   // every model valid before any work
        CompiledModel m = main.compiled();
        requireOptions(m, fit, toys);
        int threads = fit.threadCount();
        FitOptions.Prepared p = fit.prepare(m, 1.0);
        boolean hasPoi = m.poi() >= 0;

        List<String> checkWarnings = CheckJson.warnings(main);
        attach("check", CheckJson.of(m, checkWarnings));   // a summary of the model: no computation
        warnings.addAll(checkWarnings);

        Fitter fitter = new Fitter(p.problem());
        FitResult best = fitter.fit();
        attach("fit", ProfileIntervals.addTo(FitJson.of(m, p, best), m,
                ProfileIntervals.withKinks(m, p, best, new int[0], threads)));
        warnings.addAll(FitCommand.minimaWarnings(m, best));
        warnings.addAll(FitCommand.checkWarnings(m, best));
        if (!best.converged()) nonConverged.add("best fit (" + best.status() + ")");
        ReportInput in = ReportInput.of(new RunSummary(m.name(), null, null, null, null, null, null, 0, null, null, null))
                .withFit(ReportAssembler.fit(m, best)).withCutFlow(cutFlow);

        if (hasPoi) {
            // plumb impacts MODEL --exact-top N: the ranking with the top N refitted exactly, and the breakdown
            ImpactsCommand.ImpactRanking impacts = section("impacts", () -> {
                if (!best.converged() || best.covariance() == null) {
                    throw new ComputationException("the best fit did not converge (" + best.status() + "); no impacts");
                }
                Impacts engine = new Impacts(p.problem(), best, false);
                List<Impacts.Entry> entries = engine.rank(Math.min(impactsTop, engine.candidates().length), threads, null);
                return new ImpactsCommand.ImpactRanking(entries, engine.breakdown());
            });
            if (impacts != null) {
                attach("impacts", ImpactsJson.of(m, p, best, impacts.entries(), impacts.breakdown()));
                for (var e : impacts.entries()) {
                    if (e.refitted() && !(e.postfit().converged() && e.prefit().converged())) {
                        nonConverged.add("impacts: a refit with " + e.name() + " held");
                    }
                }
                in = in.withImpacts(ReportAssembler.impacts(m, best, impacts.entries()), impactsTop)
                        .withBreakdown(ReportAssembler.breakdown(impacts.breakdown()));
            }
        } else {
            failures.add(new RunSummary.Failure("impacts", "the model names no parameter of interest (poi)"));
        }

        List<Yields.ChannelYields> yields = section("yields", () -> {
            if (!best.converged()) throw new ComputationException("the best fit did not converge (" + best.status() + "); no post-fit yields");
            PostfitCovariance cov = PostfitCovariance.of(fitter.likelihood(), best);
            if (cov == null) throw new ComputationException("the post-fit covariance is not positive definite; no post-fit errors");
            return Yields.compute(p.problem(), best, cov);
        });
        if (yields != null) {
            attach("yields", YieldsJson.of(m, p, yields));
            in = in.withYields(ReportAssembler.yields(main.model(), m, yields));
        }

        ScanCommand.ScanProfile scan = section("scan", () -> {
            if (!hasPoi) throw new ComputationException("the model names no parameter of interest (poi)");
            if (best.held()[m.poi()]) throw new ComputationException("the POI is held, it cannot be scanned");
            if (!best.converged()) throw new ComputationException("the best fit did not converge (" + best.status() + "); no scan");
            // plumb scan MODEL: the POI over the default range, re-based to the lowest -ln L found
            ProfileScan engine = new ProfileScan(p.problem(), best);
            double[] range = ProfileScan.defaultRange(m, best, m.poi());
            return new ScanCommand.ScanProfile(ProfileScan.rebased(engine.points(m.poi(), range[0], range[1], SCAN_POINTS, threads, null)),
                    engine.intervals(m.poi(), new double[] {ProfileScan.LEVEL_68, ProfileScan.LEVEL_95}, threads));
        });
        if (scan != null) {
            attach("scan", ScanJson.of(m, p, m.poi(), best, scan.points(), scan.intervals()));
            for (ProfileScan.Point x : scan.points()) {
                if (Double.isNaN(x.nllAboveMin())) nonConverged.add(String.format(Locale.ROOT, "scan point %s = %s (%s)",
                        m.parameterNames(m.poi()), Numbers.plain(x.value()), x.status()));
            }
            for (ProfileScan.Interval iv : scan.intervals()) {
                if (iv.failure() != null) nonConverged.add(String.format(Locale.ROOT, "scan: an end of the interval at 2ΔNLL = %s (%s)",
                        Numbers.plain(iv.level()), iv.failure()));
            }
            in = in.withScan(ReportAssembler.scan(m.parameterNames(m.poi()), best.values()[m.poi()], scan.points(), scan.intervals()));
        }

        DiscoveryCommand.DiscoveryTests discovery = section("discovery", () -> {
            if (!hasPoi) throw new ComputationException("the model names no parameter of interest (poi)");
            // plumb discovery MODEL: observed (unless blinded) and expected on the Asimov set at --asimov-poi (default 1)
            double expectedPoi = fit.asimovPoi == null ? 1.0 : fit.asimovPoi;
            try {
                plumb.engine.inference.DataRequest.requireInRange(m, expectedPoi);
            } catch (plumb.engine.inference.DataRequest.Refused e) {
                throw fit.refused(e, main.file());
            }
            PoiData d = PoiData.resolve(main.file(), m, fit, expectedPoi, expectedPoi);
            Problem onExpected = d.sets().problem();
            return new DiscoveryCommand.DiscoveryTests(d, d.blinded() ? null : Discovery.compute(onExpected.withData(d.data())),
                    Discovery.compute(onExpected), null);
        });
        if (discovery != null) {
            attach("discovery", DiscoveryJson.of(m, discovery.data(), discovery.observed(), discovery.expected(), null, fit.seed));
            in = in.withDiscovery(ReportAssembler.discovery(discovery.observed(), discovery.expected()));
        }

        in = limits(in, hasPoi);
        in = planning(in, main, p, best, hasPoi);

        GoodnessOfFit.Result gof = section("gof", () -> GoodnessOfFit.compute(p.problem()));
        if (gof != null) {
            attach("gof", GofJson.of(m, p, gof, null, fit.seed));
            in = in.withGoodnessOfFit(ReportAssembler.gof(gof));
        }

        in = injection(in, main, p, hasPoi);

        RunSummary summary = new RunSummary(m.name(), main.model().description(), main.file().toString(), sha256(main.content()),
                p.asimovPoi() == null ? p.kind() + blindedNote(m) : p.kind() + " (" + m.parameterNames(m.poi()) + " = " + Numbers.plain(p.asimovPoi()) + ")",
                fit.seed, Main.VERSION, (System.nanoTime() - t0) * 1e-9, m.labels(), warnings, nonConverged, failures);
        in = in.withSummary(summary).withAttachments(attachments);
        if (templates) in = in.withTemplates(plumb.engine.tooling.Templates.of(main.model()));
        return in;
    }

    /**
     * Refuses bad fit options before any work: the --fix checks of every command, and a held POI,
     * which would leave the impacts, the scan, the significance and the limits without meaning.
     */
    static void requireOptions(CompiledModel m, FitOptions fit, int toys) {
        if (m.poi() >= 0 && fit.fixes(m).containsKey(m.poi())) {
            throw new InputException("--fix: the POI " + m.parameterNames(m.poi())
                    + " cannot be held; the report's impacts, scan, significance and limits are about it");
        }
        fit.threadCount();
        plumb.engine.inference.MemoryBudget.require(plumb.engine.inference.MemoryBudget.times(
                (long) toys * INJECTED.length, plumb.engine.inference.MemoryBudget.taskResultBytes(m)), "--toys " + toys + " (per injected value, " + INJECTED.length + " values)");
    }

    /** Refuses, before any work, a --out folder that holds something other than a previous report or the models. */
    static void requireReportFolder(Path dir, List<Path> models) {
        try {
            ReportFolder.requireReusable(dir, models);
        } catch (IOException e) {
            throw new InputException("--out " + dir + ": " + (e instanceof ReportFolder.NotReusable ? e.getMessage()
                    : "cannot use the folder: " + Outputs.cause(e)));
        }
    }

    private ReportInput limits(ReportInput in, boolean hasPoi) {
        if (!hasPoi) {
            failures.add(new RunSummary.Failure("limits", "the model names no parameter of interest (poi)"));
            return in;
        }
        // Asymptotic limits at 95 % CL of every model, ordered by the label: plumb limit FILES [--label KEY].
        List<ModelInput.Loaded> loaded = new ArrayList<>();
        for (Path f : files) loaded.add(ModelInput.load(f));
        String key = ModelLabels.key(loaded, label);
        double[] xs = new double[loaded.size()];
        for (int i = 0; i < xs.length; i++) xs[i] = ModelLabels.x(loaded.get(i), key);
        List<ModelLimit> outcomes = section("limits", () -> {
            List<PoiData> data = new ArrayList<>();
            for (ModelInput.Loaded l : loaded) data.add(PoiData.resolve(l.file(), l.compiled(), fit, 0.0, 0.0));
            try (WorkRunner runner = WorkRunner.threads(fit.threadCount())) {
                return ModelLimit.asymptotic(loaded, xs, data, LIMIT_CL, runner);
            }
        });
        if (outcomes == null) return in;
        attach("limit", LimitJson.of(outcomes, key, LIMIT_CL, null, fit.seed));
        List<String> errors = ModelLimit.errors(outcomes);
        if (!errors.isEmpty()) failures.add(new RunSummary.Failure("limits", String.join("; ", errors)));
        List<LimitBands.Point> points = new ArrayList<>();
        for (ModelLimit o : outcomes) points.add(ReportAssembler.limitPoint(o.x(), o.result()));
        CompiledModel m = outcomes.get(0).model().compiled();
        return in.withLimits(new Results.Limits(m.parameterNames(m.poi()), "asymptotic, q̃μ", LIMIT_CL, key, points));
    }

    /** Rays of the report's contour: enough for a smooth curve, half the command's default for speed. */
    static final int CONTOUR_RAYS = 32;

    /** Sensitivity ranking, luminosity projection, a contour of the POI and a scan across the models. */
    private ReportInput planning(ReportInput in, ModelInput.Loaded main, FitOptions.Prepared p, FitResult best,
                                boolean hasPoi) {
        if (!hasPoi) {
            failures.add(new RunSummary.Failure("planning", "the model names no parameter of interest (poi)"));
            return in;
        }
        CompiledModel m = main.compiled();
        List<Results.PlanningPart> parts = new ArrayList<>();
        int threads = fit.threadCount();
        // plumb sensitivity MODEL: removal and a width halved, fast path only, 95 % CL
        var sens = section("planning", () -> Sensitivity.compute(Sensitivity.request(WhatIf.problem(m, fit),
                WhatIf.postfit(fit), 0.95, new double[] {0.5}, 0, threads), null));
        if (sens != null) {
            attach("sensitivity", SensitivityJson.of(m, sens));
            List<plumb.cli.table.Table> tables = SensitivityJson.tables(sens, 15);
            parts.add(new Results.PlanningPart("Which uncertainty limits the search", String.format(Locale.ROOT,
                    "Expected %s limit on %s as it is: %s; expected significance %s σ. Each row: the nuisance parameter "
                            + "removed, or its pre-fit width halved (fast path from the Asimov Fisher information).",
                    "95 % CL", sens.poi(), plumb.cli.table.Table.number(sens.limit(), 4), Numbers.fixed(sens.z(), 2)),
                    tables.get(0), "sensitivity", sens.parameters().isEmpty() ? null
                    : () -> plumb.cli.plot.SensitivityFigure.of(sens, sens.parameters(), 15, "nuisance parameters"),
                    "Improvement of the expected limit with each uncertainty removed or halved."));
            parts.add(new Results.PlanningPart("Groups", null, tables.get(1), "sensitivity_groups", null, null));
        }
        // plumb project MODEL --lumi 1,2,5,10
        var proj = section("planning", () -> Projection.compute(WhatIf.problem(m, fit), WhatIf.postfit(fit), 0.95,
                new double[] {1, 2, 5, 10}, threads, null));
        if (proj != null) {
            attach("project", ProjectionJson.of(m, proj));
            parts.add(new Results.PlanningPart("Reach with more data", null, ProjectionJson.table(proj), "projection",
                    () -> plumb.cli.plot.ProjectionFigure.of(proj),
                    "Expected limit and significance against the luminosity factor, three scenarios."));
        }
        int partner = mostCorrelated(m, best);
        if (partner >= 0 && best.converged()) {
            // plumb contour MODEL --x POI --y PARTNER --rays 32
            var c = section("planning", () -> Contour.compute(p.problem(), m.parameterNames(m.poi()),
                    m.parameterNames(partner), Contour.DEFAULT_CLS, CONTOUR_RAYS, threads, null));
            if (c != null) {
                attach("contour", ContourJson.of(m, p.kind(), c));
                parts.add(new Results.PlanningPart("Two-parameter regions", String.format(Locale.ROOT,
                        "%s against %s, the parameter most correlated with it (ρ = %s).", m.parameterNames(m.poi()),
                        m.parameterNames(partner), Numbers.fixed(c.correlation(), 2)), null, "contour",
                        () -> plumb.cli.plot.ContourFigure.of(c), "68 % and 95 % profile-likelihood regions."));
            }
        }
        if (files.size() > 1) {
            // plumb discovery A B … --reference 0.5, without toys
            var scan = section("planning", () -> {
                DiscoveryScan.Hypotheses h = DiscoveryScan.load(files, fit, label, null);
                try {
                    return DiscoveryScan.of(h, DiscoveryAcrossModels.compute(h.problems(), h.x(), 0.5, null, fit.seed,
                            threads, null));
                } catch (IllegalArgumentException e) {
                    throw new InputException(e.getMessage());   // models that cannot form one scan: bad input
                }
            });
            if (scan != null) {
                attach("discovery-scan", DiscoveryScanJson.of(scan));
                parts.add(new Results.PlanningPart("Local p-value across " + scan.key(), DiscoveryScanJson.summary(scan),
                        DiscoveryScanJson.table(scan), "local_p",
                        () -> plumb.cli.plot.LookElsewhereFigure.of(scan.scan(), scan.key(), Double.NaN),
                        "Local discovery p-value; the global significance of the largest excess by up-crossings."));
            }
        }
        return in.withPlanning(parts);
    }

    /** The free constrained-or-free model parameter most correlated with the POI in the best fit, or −1. */
    private static int mostCorrelated(CompiledModel m, FitResult best) {
        int pick = -1;
        double most = -1;
        for (int i = 0; i < m.nParams(); i++) {
            if (i == m.poi() || best.held()[i]) continue;
            double r = Math.abs(best.correlation(m.poi(), i, m.nParams()));
            if (r > most) {
                most = r;
                pick = i;
            }
        }
        return pick;
    }

    /** What the injection section ran: the toys and the closure checks. */
    private record Injection(InjectionToyBatch toys, List<AsimovClosure> closures) {
    }

    /**
     * The injection section: {@code plumb inject MODEL --mu 1,2,3 --toys T --asimov} with the shared
     * options (toys at the nominal nuisance values, auxiliary values fluctuated, the closure check
     * at every value), through the engine's {@link InjectionStudy}.
     */
    private ReportInput injection(ReportInput in, ModelInput.Loaded main, FitOptions.Prepared p, boolean hasPoi) {
        CompiledModel m = main.compiled();
        Injection inj = section("injection", () -> {
            if (!hasPoi) throw new ComputationException("the model names no parameter of interest (poi)");
            if (p.problem().holds(m.parameterNames(m.poi()))) {
                throw new InputException("--fix: the POI " + m.parameterNames(m.poi()) + " cannot be held in an injection");
            }
            if (m.fixed(m.poi())) throw new InputException(main.file() + ": the POI " + m.parameterNames(m.poi()) + " is fixed in the model");
            List<Double> mu = new ArrayList<>();
            for (double x : INJECTED) if (x >= m.lower(m.poi()) && x <= m.upper(m.poi())) mu.add(x);
            if (mu.isEmpty()) throw new ComputationException("none of the injected values 1, 2, 3 is inside the POI's range");
            // --toys was checked against the heap before any work (requireOptions)
            InjectionStudy study = new InjectionStudy(new InjectionToys(p.problem()), mu, false);
            List<AsimovClosure> closures = new ArrayList<>();
            for (int k = 0; k < mu.size(); k++) closures.add(study.closure(k));
            List<InjectionToyBatch.ValueFits> fits = new ArrayList<>();
            try (WorkRunner runner = WorkRunner.threads(fit.threadCount())) {
                for (int k = 0; k < mu.size(); k++) fits.add(study.toys(k, fit.seed, true, 0, toys, runner, null));
            }
            List<String> fixed = new ArrayList<>();
            p.problem().held().forEach((name, v) -> fixed.add(name + "=" + v));
            ObjectNode run = InjectionToyBatch.runIdentity(m.name(), main.sha256(), m.parameterNames(m.poi()), mu, "nominal",
                    true, fit.seed, fixed, p.settings());
            return new Injection(new InjectionToyBatch(run, m.labels(), study.nuisanceNames(), 0, toys, fits), closures);
        });
        if (inj == null) return in;
        List<InjectionSummary> summaries = inj.toys().summaries();
        attach("inject", InjectionJson.of(inj.toys(), m, inj.closures(), summaries));
        String poi = m.parameterNames(m.poi());
        for (AsimovClosure c : inj.closures()) {
            if (!c.fit().converged()) {
                nonConverged.add(String.format(Locale.ROOT, "Asimov closure fit at %s = %s (%s)", poi, Numbers.plain(c.injected()),
                        c.fit().status()));
            } else if (!c.passed()) {
                failures.add(new RunSummary.Failure("injection", String.format(Locale.ROOT,
                        "the Asimov closure check at %s = %s failed: %s is %.2e from its generating value", poi,
                        Numbers.plain(c.injected()), m.parameterNames(c.worstParameter()), c.maxDeviation())));
            }
        }
        for (InjectionSummary s : summaries) {
            if (s.toys() > 0 && s.converged() == 0) {
                failures.add(new RunSummary.Failure("injection", String.format(Locale.ROOT, "no toy fit at %s = %s converged",
                        poi, Numbers.plain(s.injected()))));
            } else if (s.converged() < s.toys()) {
                // A few failed toy fits are usual in a toy study: counted, and left out of its numbers.
                warnings.add(String.format(Locale.ROOT, "injection at %s = %s: %d of %d toy fits did not converge %s",
                        poi, Numbers.plain(s.injected()), s.toys() - s.converged(), s.toys(), s.nonConverged()));
            }
        }
        return in.withClosures(ReportAssembler.closures(m, inj.closures()))
                .withInjection(inj.toys().count() > 0 ? ReportAssembler.injection(summaries) : List.of());
    }

    /**
     * Runs one section; a failure is recorded (shown in red, exit status 1) and gives null. Bad
     * options are not a section's failure: they propagate (exit status 2).
     */
    private <T> T section(String id, Supplier<T> work) {
        try {
            return work.get();
        } catch (InputException e) {
            throw e;
        } catch (RuntimeException e) {
            String why = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
            failures.add(new RunSummary.Failure(id, why));
            return null;
        }
    }

    private void attach(String name, ObjectNode json) {
        attachments.add(new Results.Attachment("json/" + name + ".json", name + ".json (plumb " + name + ")",
                Json.write(json).getBytes(StandardCharsets.UTF_8)));
    }

    private static String sha256(Path file) {
        try {
            return RunSummary.sha256(file);
        } catch (IOException e) {
            throw new InputException(file + ": cannot read: " + Outputs.cause(e));
        }
    }

    /** For a fit to observed data: which channels are blinded and so left out of it. */
    private static String blindedNote(plumb.engine.compile.CompiledModel m) {
        List<String> blinded = new java.util.ArrayList<>();
        for (int c = 0; c < m.nChannels(); c++) if (m.observed(c) == null) blinded.add(m.channelNames(c));
        return blinded.isEmpty() ? "" : " (blinded, left out of the fit: " + String.join(", ", blinded) + ")";
    }
}
