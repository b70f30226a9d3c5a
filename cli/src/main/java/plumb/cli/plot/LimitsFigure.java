package plumb.cli.plot;

import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.Locale;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTickUnit;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.DeviationRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;

/**
 * Upper limits against a label: observed limit as a solid line with markers, expected median
 * dashed, ±1σ and ±2σ expected bands in two lightnesses of one blue.
 */
public final class LimitsFigure {

    private LimitsFigure() {
    }

    /** Builds the figure at the default size. */
    public static Figure of(LimitBands in) {
        YIntervalSeries outer = new YIntervalSeries("±2σ");
        YIntervalSeries inner = new YIntervalSeries("±1σ");
        XYSeries median = new XYSeries("median", true, true);
        XYSeries observed = new XYSeries("observed", true, true);
        double min = Double.POSITIVE_INFINITY;
        double max = 0;
        for (LimitBands.Point p : in.points()) {
            if (finite(p.minus2(), p.plus2())) outer.add(p.x(), p.median(), p.minus2(), p.plus2());
            if (finite(p.minus1(), p.plus1())) inner.add(p.x(), p.median(), p.minus1(), p.plus1());
            if (Double.isFinite(p.median())) median.add(p.x(), p.median());
            if (Double.isFinite(p.observed())) observed.add(p.x(), p.observed());
            for (double v : new double[] {p.observed(), p.minus2(), p.minus1(), p.median(), p.plus1(), p.plus2()}) {
                if (Double.isFinite(v) && v > 0) {
                    min = Math.min(min, v);
                    max = Math.max(max, v);
                }
            }
        }
        XYPlot plot = new XYPlot();
        plot.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        plot.setDataset(0, bandData(outer));
        plot.setRenderer(0, band(Theme.BAND_2SIGMA));
        plot.setDataset(1, bandData(inner));
        plot.setRenderer(1, band(Theme.BAND_1SIGMA));
        plot.setDataset(2, new XYSeriesCollection(median));
        XYLineAndShapeRenderer dashed = new XYLineAndShapeRenderer(true, false);
        dashed.setSeriesPaint(0, Theme.INK);
        dashed.setSeriesStroke(0, Theme.DASHED);
        plot.setRenderer(2, dashed);
        boolean hasObserved = observed.getItemCount() > 0;
        if (hasObserved) {
            plot.setDataset(3, new XYSeriesCollection(observed));
            XYLineAndShapeRenderer solid = new XYLineAndShapeRenderer(true, true);
            solid.setSeriesPaint(0, Theme.INK);
            solid.setSeriesStroke(0, Theme.LINE);
            solid.setSeriesShape(0, Theme.diamond(10));
            plot.setRenderer(3, solid);
        }

        NumberAxis x = Theme.numberAxis(in.xLabel());
        x.setAutoRangeIncludesZero(false);
        x.setAutoRange(false);
        double first = in.points().get(0).x();
        double last = in.points().get(in.points().size() - 1).x();
        double margin = 0.02 * (last - first);   // keeps the end markers whole
        x.setRange(first - margin, last + margin);
        plot.setDomainAxis(x);
        String yLabel = String.format(Locale.ROOT, "%s%% CL upper limit on %s", percent(in.cl()), in.poi());
        ValueAxis y;
        if (max > 0 && max / min > YieldsFigure.LOG_SPAN) {
            LogAxis log = new LogAxis(yLabel);
            double lo = Math.pow(10, Math.floor(Math.log10(min)));
            log.setRange(lo, max * Math.pow(max / lo, 0.25));
            log.setAutoTickUnitSelection(false);
            log.setTickUnit(new NumberTickUnit(1, new DecimalFormat("0", DecimalFormatSymbols.getInstance(Locale.ROOT))));
            Theme.style(log);
            y = log;
        } else {
            NumberAxis linear = Theme.numberAxis(yLabel);
            linear.setRange(0, max > 0 ? max * 1.3 : 1);
            y = linear;
        }
        plot.setRangeAxis(y);
        Theme.style(plot);

        LegendItemCollection legend = new LegendItemCollection();
        if (hasObserved) legend.add(Theme.legendMarker("Observed", Theme.diamond(10), Theme.INK, Theme.LINE));
        legend.add(Theme.legendMarker("Expected (median)", null, Theme.INK, Theme.DASHED));
        legend.add(Theme.legendSwatch("Expected ±1σ", Theme.BAND_1SIGMA, null));
        legend.add(Theme.legendSwatch("Expected ±2σ", Theme.BAND_2SIGMA, null));
        plot.setFixedLegendItems(legend);

        JFreeChart chart = new JFreeChart("Upper limits on " + in.poi(), Theme.TITLE, plot, true);
        LegendTitle legendTitle = chart.getLegend();
        legendTitle.setPosition(RectangleEdge.BOTTOM);
        Theme.style(chart);
        return new Figure(chart, Theme.WIDTH, Theme.HEIGHT);
    }

    /** A confidence level as a percentage without trailing zeros: 0.95 gives "95", 0.683 "68.3". */
    public static String percent(double cl) {
        return new DecimalFormat("0.###", DecimalFormatSymbols.getInstance(Locale.ROOT)).format(100 * cl);
    }

    private static boolean finite(double a, double b) {
        return Double.isFinite(a) && Double.isFinite(b);
    }

    private static YIntervalSeriesCollection bandData(YIntervalSeries s) {
        YIntervalSeriesCollection d = new YIntervalSeriesCollection();
        d.addSeries(s);
        return d;
    }

    private static DeviationRenderer band(java.awt.Color colour) {
        DeviationRenderer r = new DeviationRenderer(false, false);
        r.setAlpha(1f);
        r.setSeriesFillPaint(0, colour);
        r.setSeriesPaint(0, colour);
        return r;
    }
}
