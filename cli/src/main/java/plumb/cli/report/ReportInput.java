package plumb.cli.report;

import java.util.List;
import plumb.cli.build.CutFlowRow;
import plumb.cli.plot.ImpactBars;
import plumb.cli.plot.ScanCurve;
import plumb.engine.tooling.Templates;

/**
 * Everything one report shows. Only the summary is required; a null section was not run and
 * the page says so (or, when the summary lists it as failed, why). Build with
 * {@link #of(RunSummary)} and the {@code withX} copies.
 *
 * @param impactsTop how many parameters the impacts figure ranks
 * @param closures   Asimov closure checks shown with the injection tests
 * @param breakdown  grouped breakdown of the POI's uncertainty shown with the impacts, or null
 */
public record ReportInput(RunSummary summary, FitSection fit, ImpactBars impacts, int impactsTop,
                          List<ChannelYieldBands> yields, ScanCurve scan, Results.DiscoveryValues discovery,
                          Results.Limits limits, Results.GofValues gof, List<Results.InjectionValues> injection,
                          List<Results.Attachment> attachments, List<Results.Closure> closures,
                          Results.ErrorBreakdown breakdown, List<Results.PlanningPart> planning,
                          List<Templates.Template> templates, List<CutFlowRow> cutFlow) {

    /** Default number of parameters in the impacts ranking. */
    public static final int DEFAULT_IMPACTS_TOP = 20;

    public ReportInput {
        if (summary == null) throw new IllegalArgumentException("a report needs a run summary");
        if (impactsTop < 1) throw new IllegalArgumentException("impactsTop must be >= 1, got " + impactsTop);
        yields = yields == null ? List.of() : List.copyOf(yields);
        injection = injection == null ? List.of() : List.copyOf(injection);
        attachments = attachments == null ? List.of() : List.copyOf(attachments);
        closures = closures == null ? List.of() : List.copyOf(closures);
        planning = planning == null ? List.of() : List.copyOf(planning);
        templates = templates == null ? List.of() : List.copyOf(templates);
        cutFlow = cutFlow == null ? List.of() : List.copyOf(cutFlow);
    }

    /** A report with only the run summary. */
    public static ReportInput of(RunSummary summary) {
        return new ReportInput(summary, null, null, DEFAULT_IMPACTS_TOP, null, null, null, null, null, null, null, null, null, null, null, null);
    }

    public ReportInput withSummary(RunSummary summary) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withFit(FitSection fit) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withImpacts(ImpactBars impacts, int top) {
        return new ReportInput(summary, fit, impacts, top, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withYields(List<ChannelYieldBands> yields) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withScan(ScanCurve scan) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withDiscovery(Results.DiscoveryValues discovery) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withLimits(Results.Limits limits) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withGoodnessOfFit(Results.GofValues gof) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withInjection(List<Results.InjectionValues> injection) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withAttachments(List<Results.Attachment> attachments) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withClosures(List<Results.Closure> closures) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withBreakdown(Results.ErrorBreakdown breakdown) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    /** The planning section (sensitivity, projections, contours, look-elsewhere): its parts in order. */
    public ReportInput withPlanning(List<Results.PlanningPart> planning) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    public ReportInput withTemplates(List<Templates.Template> templates) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }

    /** The cut flow of the build that made the model: a section of its own when not empty. */
    public ReportInput withCutFlow(List<CutFlowRow> cutFlow) {
        return new ReportInput(summary, fit, impacts, impactsTop, yields, scan, discovery, limits, gof, injection, attachments, closures, breakdown, planning, templates, cutFlow);
    }
}
