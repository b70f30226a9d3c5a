package plumb.cli.plot;

import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.data.xy.XYIntervalSeries;
import org.jfree.data.xy.XYIntervalSeriesCollection;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import plumb.cli.table.Table;

/**
 * Injection linearity: mean fitted POI against the injected value with error bars, the fitted
 * straight line and the identity line that a closed analysis follows.
 */
public final class LinearityFigure {

    private LinearityFigure() {
    }

    /** Builds the figure at the default size. */
    public static Figure of(Linearity in) {
        XYIntervalSeries points = new XYIntervalSeries("fitted", false, true);
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (Linearity.Point p : in.points()) {
            double e = Double.isFinite(p.error()) ? p.error() : 0;
            points.add(p.injected(), p.injected(), p.injected(), p.fitted(), p.fitted() - e, p.fitted() + e);
            lo = Math.min(lo, Math.min(p.injected(), p.fitted() - e));
            hi = Math.max(hi, Math.max(p.injected(), p.fitted() + e));
        }
        double pad = Math.max(0.08 * (hi - lo), 0.1);
        lo -= pad;
        hi += pad;

        XYPlot plot = new XYPlot();
        plot.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        XYSeries identity = new XYSeries("identity");
        identity.add(lo, lo);
        identity.add(hi, hi);
        plot.setDataset(0, new XYSeriesCollection(identity));
        XYLineAndShapeRenderer idRenderer = new XYLineAndShapeRenderer(true, false);
        idRenderer.setSeriesPaint(0, Theme.MUTED_INK);
        idRenderer.setSeriesStroke(0, Theme.DASHED);
        plot.setRenderer(0, idRenderer);

        LegendItemCollection legend = new LegendItemCollection();
        legend.add(Theme.legendMarker("Mean fitted " + in.poi(), Theme.diamond(11), Theme.INK, null));
        plumb.engine.inference.InjectionLinearity line = in.line();
        if (line != null) {
            XYSeries fit = new XYSeries("fit");
            fit.add(lo, line.offset() + line.slope() * lo);
            fit.add(hi, line.offset() + line.slope() * hi);
            plot.setDataset(1, new XYSeriesCollection(fit));
            XYLineAndShapeRenderer fitRenderer = new XYLineAndShapeRenderer(true, false);
            fitRenderer.setSeriesPaint(0, Theme.FIT_LINE);
            fitRenderer.setSeriesStroke(0, Theme.LINE);
            plot.setRenderer(1, fitRenderer);
            legend.add(Theme.legendMarker("Line: slope " + Table.measurement(line.slope(), line.slopeError())
                    + ", offset " + Table.measurement(line.offset(), line.offsetError()), null, Theme.FIT_LINE, Theme.LINE));
        }
        legend.add(Theme.legendMarker("Fitted = injected", null, Theme.MUTED_INK, Theme.DASHED));

        XYIntervalSeriesCollection data = new XYIntervalSeriesCollection();
        data.addSeries(points);
        plot.setDataset(2, data);
        XYErrorRenderer errors = new XYErrorRenderer();
        errors.setDrawXError(false);
        errors.setCapLength(8);
        errors.setErrorStroke(Theme.ERROR_BAR);
        errors.setErrorPaint(Theme.INK);
        errors.setSeriesPaint(0, Theme.INK);
        errors.setSeriesShape(0, Theme.diamond(11));
        plot.setRenderer(2, errors);

        NumberAxis x = Theme.numberAxis("Injected " + in.poi());
        NumberAxis y = Theme.numberAxis("Fitted " + in.poi());
        x.setRange(lo, hi);
        y.setRange(lo, hi);
        plot.setDomainAxis(x);
        plot.setRangeAxis(y);
        Theme.style(plot);
        plot.setFixedLegendItems(legend);

        JFreeChart chart = new JFreeChart("Signal injection: fitted against injected " + in.poi(), Theme.TITLE, plot, true);
        LegendTitle legendTitle = chart.getLegend();
        legendTitle.setPosition(RectangleEdge.BOTTOM);
        Theme.style(chart);
        return new Figure(chart, 760, 700);
    }
}
