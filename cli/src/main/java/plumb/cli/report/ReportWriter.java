package plumb.cli.report;

import plumb.cli.plot.TemplateFigure;
import plumb.engine.tooling.Templates;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collection;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import plumb.cli.io.AtomicFiles;
import plumb.cli.plot.CorrelationFigure;
import plumb.cli.plot.Figure;
import plumb.cli.plot.FigureFiles;
import plumb.cli.plot.FigureWriter;
import plumb.cli.plot.ImpactsFigure;
import plumb.cli.plot.ImpactBars;
import plumb.cli.plot.LimitBands;
import plumb.cli.plot.LimitsFigure;
import plumb.cli.plot.Linearity;
import plumb.cli.plot.LinearityFigure;
import plumb.cli.plot.PullMarks;
import plumb.cli.plot.PullsFigure;
import plumb.cli.plot.ScanCurve;
import plumb.cli.plot.ScanFigure;
import plumb.cli.plot.YieldsFigure;
import plumb.cli.table.Escape;
import plumb.cli.build.CutFlowRow;
import plumb.cli.table.Table;
import plumb.cli.table.TableFormat;

/**
 * Writes the self-contained analysis report: {@code index.html} (inline CSS and one small inline
 * script, nothing fetched from the network), {@code figures/} with every figure as PNG and SVG,
 * {@code tables/} with every table as CSV, Markdown and LaTeX, and the attachments.
 *
 * <p>Everything is first written into a staging folder and then put in place of DIR whole;
 * {@link ReportFolder} has the rules for a DIR that already exists. A failure before that removes
 * the staging folder and leaves DIR untouched.
 */
public final class ReportWriter {

    /** Largest correlation matrix drawn; bigger ones show their most correlated parameters. */
    static final int CORRELATION_MAX = 24;

    /** Section ids and their short names (navigation bar, list of failed sections). */
    private static final String[][] SECTIONS = {{"summary", "Run"}, {"cutflow", "Cut flow"}, {"fit", "Fit"}, {"pulls", "Pulls"},
        {"impacts", "Impacts"}, {"yields", "Yields"}, {"scan", "Scan"}, {"discovery", "Discovery"}, {"limits", "Limits"},
        {"planning", "Reach"}, {"gof", "Goodness of fit"}, {"injection", "Injection"}, {"templates", "Templates"}, {"files", "Files"}};

    private static String title(String id) {
        for (String[] sec : SECTIONS) if (sec[0].equals(id)) return sec[1];
        return id;
    }

    private final ReportInput in;
    private final Path stage;
    private StringBuilder html = new StringBuilder();
    private final List<String> problems = new ArrayList<>();
    private String section;
    private long drawStart;

    private ReportWriter(ReportInput in, Path stage) {
        this.in = in;
        this.stage = stage;
    }

    /**
     * Writes the report for {@code in} into {@code dir}, replacing a previous report there.
     *
     * @return the path of the written {@code index.html}
     * @throws IOException when a file cannot be written or DIR holds something other than a report
     *                     ({@link ReportFolder}); DIR is then left as it was
     */
    public static Path write(ReportInput in, Path dir) throws IOException {
        return write(in, dir, List.of());
    }

    /**
     * As {@link #write(ReportInput, Path)}; {@code inputs} are the run's model files, which may lie
     * in DIR (they are kept in the new folder).
     */
    public static Path write(ReportInput in, Path dir, Collection<Path> inputs) throws IOException {
        Path target = ReportFolder.target(dir);
        Files.createDirectories(target.getParent());
        ReportFolder.requireReusable(dir, inputs);
        ReportFolder.sweepStale(target);
        // SIGINT and SIGTERM run the shutdown hooks: the staging folder goes with the process. The
        // hook is in place before the folder exists, so no signal finds a folder without it.
        java.util.concurrent.atomic.AtomicReference<Path> staged = new java.util.concurrent.atomic.AtomicReference<>();
        Thread cleanup = new Thread(() -> ReportFolder.removeWhileStopping(staged.get()), "plumb-report-cleanup");
        Runtime.getRuntime().addShutdownHook(cleanup);
        Path stage = null;
        try {
            stage = ReportFolder.createStage(target);
            staged.set(stage);
            new ReportWriter(in, stage).build();
            ReportFolder.mark(stage);
            ReportFolder.checkRunning();
            ReportFolder.publish(stage, target, inputs);
        } finally {
            if (stage != null) ReportFolder.deleteTree(stage);
            try {
                Runtime.getRuntime().removeShutdownHook(cleanup);
            } catch (IllegalStateException shuttingDown) {
                // the hook runs anyway
            }
        }
        return target.resolve("index.html");
    }

    private void build() throws IOException {
        drawStart = System.nanoTime();
        RunSummary s = in.summary();
        StringBuilder page = new StringBuilder(64 * 1024);
        page.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
            .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
            .append("<title>").append(esc("Plumb report: " + s.model())).append("</title>\n")
            .append("<style>\n").append(ReportStyle.CSS).append("</style>\n")
            .append("<script>\n").append(ReportStyle.CHECK_SCRIPT).append("</script>\n")
            .append("</head>\n<body>\n");
        page.append("<header><div class=\"brand\">Plumb report</div><h1>").append(esc(s.model())).append("</h1>");
        if (s.description() != null) page.append("<p class=\"lead\">").append(esc(s.description())).append("</p>");
        page.append("</header>\n<nav>");
        for (String[] sec : SECTIONS) {
            if (sec[0].equals("cutflow") && in.cutFlow().isEmpty()) continue;   // only a model built from events has one
            page.append("<a href=\"#").append(sec[0]).append("\">").append(sec[1]).append("</a>");
        }
        page.append("</nav>\n<p id=\"broken\" class=\"bad box\" hidden>Some figures did not load.</p>\n<main>\n");

        html = new StringBuilder();
        cutFlowSection();
        fitSection();
        pullsSection();
        impactsSection();
        yieldsSection();
        scanSection();
        discoverySection();
        limitsSection();
        planningSection();
        gofSection();
        injectionSection();
        templatesSection();
        filesSection();
        String body = html.toString();
        html = new StringBuilder();
        summarySection();          // after the rest, so it can list problems met while drawing them
        page.append(html).append(body);
        page.append("</main>\n<footer>Written by Plumb ").append(esc(orDash(s.toolVersion())))
            .append(". Each figure links to its SVG version for print.</footer>\n</body>\n</html>\n");
        AtomicFiles.writeString(stage.resolve("index.html"), page.toString());
    }

    // ---- sections ------------------------------------------------------------------------

    private void summarySection() {
        RunSummary s = in.summary();
        open("summary", "Run summary");
        html.append("<dl class=\"facts\">");
        fact("Model", s.model());
        if (s.modelFile() != null) fact("Model file", s.modelFile());
        fact("Model SHA-256", s.modelSha256() == null ? "–" : s.modelSha256(), "mono");
        fact("Data set", orDash(s.dataSet()));
        fact("Seed", s.seed() == null ? "none used" : Long.toString(s.seed()));
        fact("Plumb version", orDash(s.toolVersion()));
        fact("Time taken", duration(s.seconds()));
        // The summary is built last, so this covers every figure and table of the page.
        fact("Figures and tables drawn in", duration((System.nanoTime() - drawStart) * 1e-9));
        if (!s.labels().isEmpty()) {
            StringBuilder labels = new StringBuilder();
            for (Map.Entry<String, Object> e : s.labels().entrySet()) {
                if (labels.length() > 0) labels.append(", ");
                labels.append(e.getKey()).append(" = ").append(e.getValue() instanceof Number n ? plumb.cli.Numbers.plain(n.doubleValue()) : e.getValue());
            }
            fact("Labels", labels.toString());
        }
        html.append("</dl>\n");
        if (!s.failures().isEmpty()) {
            html.append("<div class=\"bad box\"><strong>Sections that failed (").append(s.failures().size())
                .append(")</strong><ul>");
            for (RunSummary.Failure f : s.failures()) {
                html.append("<li><a href=\"#").append(esc(f.section())).append("\">").append(esc(title(f.section())))
                    .append("</a>: ").append(esc(f.message())).append("</li>");
            }
            html.append("</ul></div>\n");
        }
        if (s.nonConverged().isEmpty()) {
            html.append("<p class=\"good\">Every fit converged.</p>\n");
        } else {
            html.append("<div class=\"bad box\"><strong>Fits that did not converge (")
                .append(s.nonConverged().size()).append(")</strong><ul>");
            for (String f : s.nonConverged()) html.append("<li>").append(esc(f)).append("</li>");
            html.append("</ul></div>\n");
        }
        List<String> warnings = new ArrayList<>(s.warnings());
        warnings.addAll(problems);
        if (warnings.isEmpty()) {
            html.append("<p class=\"muted\">No warnings.</p>\n");
        } else {
            html.append("<div class=\"warn box\"><strong>Warnings (").append(warnings.size()).append(")</strong><ul>");
            for (String w : warnings) html.append("<li>").append(esc(w)).append("</li>");
            html.append("</ul></div>\n");
        }
        close();
    }

    private void fitSection() throws IOException {
        open("fit", "Fit results");
        FitSection fit = in.fit();
        if (fit == null) {
            notRun();
            return;
        }
        html.append(fit.converged() ? "<p class=\"good\">The fit converged." : "<p class=\"bad\">The fit did not converge: treat these numbers with care.");
        html.append(" −ln L at the minimum: ").append(esc(Table.number(fit.nll(), 8)));
        if (Double.isFinite(fit.seconds())) html.append("; ").append(esc(duration(fit.seconds())));
        if (fit.evaluations() >= 0) html.append(", ").append(fit.evaluations()).append(" likelihood evaluations");
        html.append(".</p>\n");
        Table.Builder t = Table.builder(null, "Parameter", "Fitted", "Pre-fit", "Pull", "Constraint");
        for (FitSection.Parameter p : fit.parameters()) {
            String prefit = Double.isNaN(p.prefitWidth()) ? (Double.isNaN(p.prefitValue()) ? "free" : Table.number(p.prefitValue(), 4) + " (free)")
                    : Table.measurement(p.prefitValue(), p.prefitWidth());
            t.row(p.name(), Table.measurement(p.value(), p.error()), prefit, fixed(p.pull(), 2), fixed(p.constraint(), 2));
        }
        table(t.build(), "fit_parameters");
        if (fit.correlation() != null && fit.correlation().names().size() > 1) {
            var matrix = fit.correlation();
            String caption = "Correlations of the fitted parameters.";
            if (matrix.names().size() > CORRELATION_MAX) {
                String which = fit.poi() == null
                        ? String.format(Locale.ROOT, "the %d parameters most correlated with another", CORRELATION_MAX)
                        : String.format(Locale.ROOT, "%s and the %d parameters most correlated with another", fit.poi(),
                        CORRELATION_MAX - 1);
                caption = String.format(Locale.ROOT, "Correlations of %s (of %d).", which, matrix.names().size());
                matrix = matrix.strongest(CORRELATION_MAX, fit.poi());
            }
            var shown = matrix;
            figure("correlation", caption, () -> CorrelationFigure.of(shown));
            List<String> header = new ArrayList<>();
            header.add("");
            header.addAll(fit.correlation().names());
            Table.Builder c = Table.builder(null, header.toArray(new String[0]));
            for (int i = 0; i < fit.correlation().names().size(); i++) {
                List<String> row = new ArrayList<>();
                row.add(fit.correlation().names().get(i));
                for (double v : fit.correlation().matrix()[i]) row.add(fixed(v, 3));
                c.row(row);
            }
            tableFilesOnly(c.build(), "correlation", "Full correlation matrix");
        }
        close();
    }

    /** The selection of the build that made the model, region by region (only for a model built from events). */
    private void cutFlowSection() throws IOException {
        if (in.cutFlow().isEmpty()) return;
        open("cutflow", "Cut flow");
        html.append("<p>The event selection of the build that made this model: after each step of a region, the weighted ")
            .append("sum Σw and the number of events of each sample left (cumulative). The last row, “")
            .append(esc(CutFlowRow.IN_THE_BINS)).append("”, is what the region's histogram holds: the last step less ")
            .append("the events outside the bin edges, or equal to it when they are folded into the end bins.</p>\n");
        for (Map.Entry<String, Table> e : CutFlowTables.byRegion(in.cutFlow()).entrySet()) {
            table(e.getValue(), "cutflow_" + e.getKey());
        }
        close();
    }

    private void pullsSection() {
        open("pulls", "Nuisance-parameter pulls");
        PullMarks pulls = in.fit() == null ? null : in.fit().pulls();
        if (pulls == null) {
            notRun();
            return;
        }
        html.append("<p>Each point is (fitted − pre-fit value) / pre-fit width; the bar is the post-fit error in the same unit. "
                + "Grey bands mark ±1 and ±2.</p>\n");
        figure("pulls", "Pulls of the constrained parameters.", () -> PullsFigure.of(pulls));
        close();
    }

    private void impactsSection() throws IOException {
        open("impacts", "Impacts on the parameter of interest");
        ImpactBars impacts = in.impacts();
        if (impacts == null || impacts.entries().isEmpty()) {
            notRun();
            return;
        }
        html.append("<p>Shift of ").append(esc(impacts.poi()))
            .append(" when a parameter is held one standard deviation up (upper bar of a row) or down (lower bar) and the rest is refitted: "
                + "filled with the post-fit error, framed with the pre-fit width.</p>\n");
        figure("impacts", "Largest impacts, with each parameter's pull.", () -> ImpactsFigure.of(impacts, in.impactsTop()));
        Table.Builder t = Table.builder(null, "Parameter", "Pull", "Constraint", "Pre-fit +1σ", "Pre-fit −1σ",
                "Post-fit +1σ", "Post-fit −1σ");
        for (ImpactBars.Bar e : impacts.top(impacts.entries().size())) {
            t.row(e.parameter(), fixed(e.pull(), 2), fixed(e.constraint(), 2), Table.number(e.prefitUp(), 3),
                    Table.number(e.prefitDown(), 3), Table.number(e.postfitUp(), 3), Table.number(e.postfitDown(), 3));
        }
        table(t.build(), "impacts");
        Results.ErrorBreakdown b = in.breakdown();
        if (b != null) {
            Table.Builder g = Table.builder("Breakdown of the uncertainty on " + impacts.poi(), "Group", "Parameters",
                    "Share of the error", "Error with the group held");
            g.row("total", "", Table.number(b.total(), 3), "");
            g.row("statistical only", "", Table.number(b.statOnly(), 3), "");
            for (Results.ErrorBreakdown.Group gr : b.groups()) {
                g.row(gr.name(), Integer.toString(gr.parameters()), Table.number(gr.error(), 3), Table.number(gr.fixedError(), 3));
            }
            table(g.build(), "impacts_breakdown");
            html.append("<p class=\"muted\">A group's share is √(total² − error with the group held at its best-fit values).</p>\n");
        }
        close();
    }

    private void yieldsSection() throws IOException {
        open("yields", "Yields");
        if (in.yields().isEmpty()) {
            notRun();
            return;
        }
        for (ChannelYieldBands ch : in.yields()) {
            html.append("<h3>").append(esc(ch.name())).append("</h3>\n");
            if (ch.observed() == null) html.append("<p class=\"muted\">Blinded channel: no observed counts.</p>\n");
            String base = "yields_" + FigureWriter.safeName(ch.name());
            html.append("<div class=\"pair\">");
            figure(base + "_prefit", "Pre-fit yields of " + ch.name() + ".", () -> YieldsFigure.of(ch.stacked(false)));
            if (ch.hasPostfit()) figure(base + "_postfit", "Post-fit yields of " + ch.name() + ".", () -> YieldsFigure.of(ch.stacked(true)));
            html.append("</div>\n");
            table(yieldsTable(ch, false), base + "_prefit");
            if (ch.hasPostfit()) table(yieldsTable(ch, true), base + "_postfit");
        }
        close();
    }

    private static Table yieldsTable(ChannelYieldBands ch, boolean postfit) {
        List<String> header = new ArrayList<>();
        header.add("Bin");
        for (ChannelYieldBands.SampleBands s : ch.samples()) header.add(s.name());
        header.add("Total");
        if (ch.observed() != null) header.add("Observed");
        Table.Builder t = Table.builder((postfit ? "Post-fit" : "Pre-fit") + " yields, " + ch.name(), header.toArray(new String[0]));
        ChannelYieldBands.BinBand total = postfit ? ch.totalPostfit() : ch.totalPrefit();
        for (int b = 0; b < ch.bins(); b++) {
            List<String> row = new ArrayList<>();
            row.add(ch.edges() == null ? Integer.toString(b)
                    : Table.number(ch.edges()[b], 4) + "–" + Table.number(ch.edges()[b + 1], 4));
            for (ChannelYieldBands.SampleBands s : ch.samples()) {
                ChannelYieldBands.BinBand band = postfit ? s.postfit() : s.prefit();
                row.add(Table.measurement(band.yields()[b], band.errors()[b]));
            }
            row.add(Table.measurement(total.yields()[b], total.errors()[b]));
            if (ch.observed() != null) row.add(Table.number(ch.observed()[b], 6).replaceAll("\\.0+$", ""));
            t.row(row);
        }
        return t.build();
    }

    private void scanSection() throws IOException {
        open("scan", "Profile likelihood scan");
        ScanCurve scan = in.scan();
        if (scan == null) {
            notRun();
            return;
        }
        figure("scan", "2ΔNLL of " + scan.parameter() + "; dashed lines at the 68% and 95% levels (1 and 3.84).",
                () -> ScanFigure.of(scan));
        Table.Builder t = Table.builder(null, "Parameter", "Best fit", "68% low", "68% high", "95% low", "95% high");
        t.row(scan.parameter(), Table.number(scan.best(), 4), Table.number(scan.interval68()[0], 4),
                Table.number(scan.interval68()[1], 4), Table.number(scan.interval95()[0], 4), Table.number(scan.interval95()[1], 4));
        table(t.build(), "scan_intervals");
        close();
    }

    private void discoverySection() throws IOException {
        open("discovery", "Discovery significance");
        Results.DiscoveryValues d = in.discovery();
        if (d == null) {
            notRun();
            return;
        }
        Table.Builder t = Table.builder(null, "Data", "q0", "Z", "p-value");
        significanceRow(t, "Observed", d.observed());
        significanceRow(t, "Expected (Asimov, POI = 1)", d.expected());
        table(t.build(), "discovery");
        if (d.observed() == null) html.append("<p class=\"muted\">Blinded: no observed significance.</p>\n");
        close();
    }

    private void planningSection() throws IOException {
        open("planning", "What limits the search, and the reach with more data");
        if (in.planning().isEmpty()) {
            notRun();
            return;
        }
        for (Results.PlanningPart p : in.planning()) {
            html.append("<h3>").append(esc(p.heading())).append("</h3>\n");
            if (p.text() != null) html.append("<p>").append(esc(p.text())).append("</p>\n");
            if (p.figure() != null) figure(p.name(), p.caption(), p.figure()::get);
            if (p.table() != null) table(p.table(), p.name());
        }
        close();
    }

    private static void significanceRow(Table.Builder t, String label, Results.Q0Values s) {
        if (s == null) {
            t.row(label, Table.MISSING, Table.MISSING, Table.MISSING);
        } else {
            t.row(label, Table.number(s.q0(), 4), fixed(s.z(), 2), Table.number(s.p(), 3));
        }
    }

    private void limitsSection() throws IOException {
        open("limits", "Upper limits");
        Results.Limits l = in.limits();
        if (l == null) {
            notRun();
            return;
        }
        String cl = LimitsFigure.percent(l.cl());
        html.append("<p>CLs upper limits on ").append(esc(l.poi())).append(" at ").append(cl).append("% CL (")
            .append(esc(orDash(l.method()))).append(").</p>\n");
        // Points without any limit (their computation failed) stay in the table but not on the curve.
        List<LimitBands.Point> drawn = new ArrayList<>();
        for (LimitBands.Point p : l.points()) if (Double.isFinite(p.median()) || Double.isFinite(p.observed())) drawn.add(p);
        if (drawn.size() >= 2) {
            String xLabel = l.xLabel() == null ? "point" : l.xLabel();
            figure("limits", "Observed and expected upper limits against " + xLabel + ".",
                    () -> LimitsFigure.of(new LimitBands(l.poi(), xLabel, l.cl(), drawn)));
        }
        Table.Builder t = Table.builder(null, l.xLabel() == null ? "Point" : l.xLabel(), "Observed", "Expected −2σ",
                "Expected −1σ", "Expected median", "Expected +1σ", "Expected +2σ");
        for (LimitBands.Point p : l.points()) {
            t.row(l.xLabel() == null && l.points().size() == 1 ? "–" : Table.number(p.x(), 4).replaceAll("\\.0+$", ""),
                    Table.number(p.observed(), 3), Table.number(p.minus2(), 3), Table.number(p.minus1(), 3),
                    Table.number(p.median(), 3), Table.number(p.plus1(), 3), Table.number(p.plus2(), 3));
        }
        table(t.build(), "limits");
        close();
    }

    private void gofSection() throws IOException {
        open("gof", "Goodness of fit");
        Results.GofValues g = in.gof();
        if (g == null) {
            notRun();
            return;
        }
        Table.Builder t = Table.builder(null, "Statistic", "Degrees of freedom", "p-value");
        t.row(Table.number(g.statistic(), 4), Integer.toString(g.ndof()), Table.number(g.p(), 3));
        table(t.build(), "goodness_of_fit");
        html.append("<p class=\"muted\">Saturated-model test; the p-value is left out when there are no degrees of freedom.</p>\n");
        close();
    }

    private void injectionSection() throws IOException {
        open("injection", "Signal injection and closure");
        List<Results.InjectionValues> inj = in.injection();
        List<Results.Closure> closures = in.closures();
        if (inj.isEmpty() && closures.isEmpty()) {
            notRun();
            return;
        }
        String poi = in.impacts() != null ? in.impacts().poi() : in.fit() != null && in.fit().poi() != null ? in.fit().poi() : "POI";
        if (!closures.isEmpty()) {
            html.append("<h3>Asimov closure</h3>\n<p>A fit to the Asimov data set made at each injected value must return every "
                    + "parameter to the value the data set was made at.</p>\n");
            Table.Builder c = Table.builder(null, "Injected", "Fit", "Largest deviation", "Parameter", "Result");
            boolean failed = false;
            for (Results.Closure r : closures) {
                failed |= !r.passed();
                c.row(Table.number(r.injected(), 4), r.converged() ? "converged" : "did not converge",
                        Double.isFinite(r.maxDeviation()) ? String.format(Locale.ROOT, "%.1e", r.maxDeviation()) : Table.MISSING,
                        r.worstParameter() == null ? Table.MISSING : r.worstParameter(),
                        r.passed() ? "passed" : String.format(Locale.ROOT, "FAILED (tolerance %.0e)", r.tolerance()));
            }
            table(c.build(), "asimov_closure");
            html.append(failed ? "<p class=\"bad\">The closure check failed: the fit does not find the point its data were made at.</p>\n"
                    : "<p class=\"good\">Every closure check passed.</p>\n");
        }
        if (!inj.isEmpty()) {
            html.append("<h3>Toys</h3>\n<p>Toy data sets generated at each injected value of ").append(esc(poi))
                .append(" and fitted; pull = (fitted − injected)/error.</p>\n");
            Table.Builder t = Table.builder(null, "Injected", "Toys", "Converged", "Mean fitted", "Pull mean", "Pull width",
                    "68% coverage");
            for (Results.InjectionValues r : inj) {
                t.row(Table.number(r.injected(), 4), Integer.toString(r.toys()), Integer.toString(r.converged()),
                        Table.measurement(r.mean(), r.meanError()), fixed(r.pullMean(), 3), fixed(r.pullWidth(), 3),
                        fixed(r.coverage68(), 3));
            }
            figure("injection", "Mean fitted " + poi + " against the injected value; error bars are errors of the mean.",
                    () -> LinearityFigure.of(linearity(poi, inj)));
            table(t.build(), "injection");
        }
        close();
    }

    /** What the injection figure draws: the mean fitted POI at every injected value, with its error. */
    public static Linearity linearity(String poi, List<Results.InjectionValues> rows) {
        List<Linearity.Point> points = new ArrayList<>();
        for (Results.InjectionValues r : rows) points.add(new Linearity.Point(r.injected(), r.mean(), r.meanError()));
        return new Linearity(poi, points);
    }

    /** Every variation's nominal, up and down templates, folded away: there are many. */
    private void templatesSection() {
        open("templates", "Templates");
        if (in.templates().isEmpty()) {
            if (in.summary().failure(section) == null) {
                html.append("<p class=\"muted\">Not drawn for this report (plumb report --templates draws them).</p>\n");
            }
            close();
            return;
        }
        html.append("<details><summary>").append(in.templates().size())
            .append(" figures: nominal, up and down of every variation of every sample, with the ratio to nominal</summary>\n");
        for (int k = 0; k < in.templates().size(); k++) {
            Templates.Template t = in.templates().get(k);
            String name = String.format(Locale.ROOT, "template-%03d-%s", k,
                    FigureWriter.safeName(t.channel() + "_" + t.sample() + "_" + t.parameter()));
            figure(name, "Variation " + t.parameter() + " of " + t.sample() + " in " + t.channel() + ".", () -> TemplateFigure.of(t));
        }
        html.append("</details>\n");
        close();
    }

    private void filesSection() throws IOException {
        open("files", "Files");
        if (in.attachments().isEmpty()) {
            html.append("<p class=\"muted\">No result files attached.</p>\n");
        } else {
            html.append("<ul class=\"files\">");
            for (Results.Attachment a : in.attachments()) {
                byte[] content = a.content();
                AtomicFiles.write(stage.resolve(a.path()), out -> out.write(content));
                html.append("<li><a href=\"").append(esc(a.path())).append("\">").append(esc(a.label())).append("</a></li>");
            }
            html.append("</ul>\n");
        }
        close();
    }

    // ---- building blocks -------------------------------------------------------------------

    private void open(String id, String title) {
        section = id;
        html.append("<section id=\"").append(id).append("\">\n<h2>").append(esc(title)).append("</h2>\n");
        String failure = in.summary().failure(id);
        if (failure != null) html.append("<p class=\"bad\">This section failed: ").append(esc(failure)).append("</p>\n");
    }

    private void close() {
        html.append("</section>\n");
    }

    /** A section without content: not run, unless it failed (then {@link #open} said why). */
    private void notRun() {
        if (in.summary().failure(section) == null) html.append("<p class=\"muted\">Not run for this report.</p>\n");
        close();
    }

    private void fact(String key, String value) {
        fact(key, value, null);
    }

    private void fact(String key, String value, String cssClass) {
        html.append("<dt>").append(esc(key)).append("</dt><dd").append(cssClass == null ? "" : " class=\"" + cssClass + "\"")
            .append('>').append(esc(value)).append("</dd>");
    }

    /** Builds a figure lazily: a figure that cannot be drawn becomes a warning, not a lost report. */
    private interface FigureSource {
        Figure get();
    }

    private void figure(String name, String caption, FigureSource source) {
        FigureFiles files;
        try {
            ReportFolder.checkRunning();
            files = source.get().write(stage.resolve("figures"), name);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (IllegalArgumentException e) {
            problems.add("figure " + name + " not drawn: " + e.getMessage());
            html.append("<p class=\"bad\">Figure ").append(esc(name)).append(" could not be drawn: ")
                .append(esc(e.getMessage())).append("</p>\n");
            return;
        }
        String png = "figures/" + files.png().getFileName();
        String svg = "figures/" + files.svg().getFileName();
        html.append("<figure><a href=\"").append(svg).append("\"><img src=\"").append(png).append("\" width=\"")
            .append(files.width()).append("\" height=\"").append(files.height()).append("\" alt=\"").append(esc(caption))
            .append("\"></a><figcaption>").append(esc(caption)).append(" <a href=\"").append(svg).append("\">SVG</a> · <a href=\"")
            .append(png).append("\">PNG</a></figcaption></figure>\n");
    }

    private void table(Table table, String name) throws IOException {
        html.append("<div class=\"table\">").append(TableFormat.HTML.render(table));
        writeTableFiles(table, name, "Download");
        html.append("</div>\n");
    }

    private void tableFilesOnly(Table table, String name, String label) throws IOException {
        html.append("<p class=\"downloads\">");
        writeTableFiles(table, name, label);
        html.append("</p>\n");
    }

    private void writeTableFiles(Table table, String name, String label) throws IOException {
        ReportFolder.checkRunning();
        String safe = FigureWriter.safeName(name);
        html.append("<span class=\"downloads\">").append(esc(label)).append(':');
        for (TableFormat f : new TableFormat[] {TableFormat.CSV, TableFormat.MARKDOWN, TableFormat.LATEX}) {
            String file = "tables/" + safe + "." + f.extension();
            AtomicFiles.writeString(stage.resolve(file), f.render(table));
            html.append(" <a href=\"").append(file).append("\">").append(f == TableFormat.CSV ? "CSV"
                    : f == TableFormat.MARKDOWN ? "Markdown" : "LaTeX").append("</a>");
        }
        html.append("</span>");
    }

    private static String esc(String s) {
        return Escape.html(s);
    }

    private static String orDash(String s) {
        return s == null ? "–" : s;
    }

    /** Fixed decimals with '.' in every locale; NaN gives {@link Table#MISSING}. */
    static String fixed(double v, int decimals) {
        return Double.isFinite(v) ? String.format(Locale.ROOT, "%." + decimals + "f", v) : Table.MISSING;
    }

    /** "0.84 s", "12.3 s", "2 min 05 s", "1 h 02 min". */
    static String duration(double seconds) {
        if (!Double.isFinite(seconds) || seconds < 0) return "–";
        if (seconds < 10) return String.format(Locale.ROOT, "%.2f s", seconds);
        if (seconds < 60) return String.format(Locale.ROOT, "%.1f s", seconds);
        long s = Math.round(seconds);
        if (s < 3600) return String.format(Locale.ROOT, "%d min %02d s", s / 60, s % 60);
        return String.format(Locale.ROOT, "%d h %02d min", s / 3600, (s % 3600) / 60);
    }
}
