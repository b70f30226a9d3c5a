package plumb.cli.plot;

import java.awt.BasicStroke;
import java.awt.Color;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTickUnit;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.CombinedDomainXYPlot;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.data.xy.XYIntervalSeries;
import org.jfree.data.xy.XYIntervalSeriesCollection;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;

/**
 * Stacked expected yields of one channel as filled step histograms, observed counts as points
 * with Garwood (central 68%) error bars, the total uncertainty as a hatched band, and, when
 * there are data, an observed/expected panel underneath sharing the x axis.
 */
public final class YieldsFigure {

    /** Yields spanning more than this ratio (two decades) get a logarithmic axis. */
    static final double LOG_SPAN = 100;

    private YieldsFigure() {
    }

    /** Builds the figure at the default size. */
    public static Figure of(StackedYields in) {
        int n = in.bins();
        double[] total = in.total();
        List<StackedYields.Layer> order = stackOrder(in.layers());
        boolean log = useLog(total, in.observed());
        double floor = log ? logFloor(total) : 0;

        XYPlot main = new XYPlot();
        main.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);

        // 0: the stack, each layer a set of bars from the cumulative sum below it to above it.
        XYIntervalSeriesCollection stack = new XYIntervalSeriesCollection();
        double[] below = new double[n];
        XYBarRenderer stackRenderer = barRenderer();
        int background = 0;
        List<Color> colours = new ArrayList<>();
        for (int s = 0; s < order.size(); s++) {
            StackedYields.Layer layer = order.get(s);
            XYIntervalSeries series = new XYIntervalSeries(layer.name() + "#" + s, false, true);
            for (int b = 0; b < n; b++) {
                double lo = below[b];
                double hi = lo + layer.yields()[b];
                series.add(0.5 * (in.low(b) + in.high(b)), in.low(b), in.high(b), hi, Math.max(lo, floor), Math.max(hi, floor));
                below[b] = hi;
            }
            stack.addSeries(series);
            Color colour = layer.signal() ? Theme.SIGNAL : Theme.sampleColour(background++);
            colours.add(colour);
            stackRenderer.setSeriesPaint(s, colour);
            stackRenderer.setSeriesOutlinePaint(s, colour);
            stackRenderer.setSeriesOutlineStroke(s, new BasicStroke(0.6f));
        }
        stackRenderer.setDrawBarOutline(true);  // same colour as the fill: hides anti-aliasing seams between bins
        main.setDataset(0, stack);
        main.setRenderer(0, stackRenderer);

        // 1: total uncertainty band, 2: outline of the total.
        main.setDataset(1, band(in, total, null, floor));
        main.setRenderer(1, hatchRenderer());
        main.setDataset(2, totalOutline(in, total));
        XYLineAndShapeRenderer outline = new XYLineAndShapeRenderer(true, false);
        outline.setSeriesPaint(0, Theme.INK);
        outline.setSeriesStroke(0, Theme.THIN);
        main.setRenderer(2, outline);

        // 3: observed counts.
        if (in.observed() != null) {
            main.setDataset(3, points(in, null, log));
            main.setRenderer(3, dataRenderer());
        }

        double top = 0;
        for (int b = 0; b < n; b++) {
            top = Math.max(top, total[b] + in.totalError()[b]);
            if (in.observed() != null) top = Math.max(top, PoissonInterval.upper(in.observed()[b]));
        }
        ValueAxis yAxis;
        if (log) {
            LogAxis axis = new LogAxis("Events per bin");
            axis.setSmallestValue(floor);
            double decades = Math.log10(top / floor);
            axis.setRange(floor, top * Math.pow(10, 0.18 * decades));
            // One labelled tick per decade, as 10 with an integer superscript.
            axis.setAutoTickUnitSelection(false);
            axis.setTickUnit(new NumberTickUnit(decades > 8 ? 2 : 1, new DecimalFormat("0", DecimalFormatSymbols.getInstance(Locale.ROOT))));
            Theme.style(axis);
            yAxis = axis;
        } else {
            NumberAxis axis = Theme.numberAxis("Events per bin");
            axis.setRange(0, top > 0 ? top * 1.12 : 1);
            yAxis = axis;
        }
        main.setRangeAxis(yAxis);
        Theme.style(main);
        main.setDomainGridlinesVisible(false);
        LegendItemCollection legendItems = legend(order, colours, in.observed() != null);

        NumberAxis xAxis = in.edges() == null ? Theme.integerAxis(in.observable() == null ? "Bin" : in.observable())
                : Theme.numberAxis(in.observable() == null ? "Bin edge" : in.observable());
        xAxis.setAutoRange(false);
        xAxis.setRange(in.low(0), in.high(n - 1));
        CombinedDomainXYPlot combined = new CombinedDomainXYPlot(xAxis);
        combined.setGap(16);   // room for the tick labels that meet at the panels' common edge
        combined.add(main, 3);
        if (in.observed() != null) combined.add(ratioPanel(in, total), 1);
        Theme.stylePlot(combined);
        combined.setOutlineVisible(false);
        combined.setFixedLegendItems(legendItems);

        JFreeChart chart = new JFreeChart(in.channel() + " · " + in.stage(), Theme.TITLE, combined, true);
        LegendTitle legendTitle = chart.getLegend();
        legendTitle.setPosition(RectangleEdge.RIGHT);
        legendTitle.setMargin(new RectangleInsets(0, 12, 0, 0));
        Theme.style(chart);
        return new Figure(chart, Theme.WIDTH, in.observed() != null ? Theme.HEIGHT + 60 : Theme.HEIGHT);
    }

    /** Backgrounds in the given order, then signals, so the signal sits on top of the stack. */
    static List<StackedYields.Layer> stackOrder(List<StackedYields.Layer> layers) {
        List<StackedYields.Layer> out = new ArrayList<>(layers.size());
        for (StackedYields.Layer l : layers) if (!l.signal()) out.add(l);
        for (StackedYields.Layer l : layers) if (l.signal()) out.add(l);
        return out;
    }

    /** True when the positive totals and counts span more than {@link #LOG_SPAN}. */
    static boolean useLog(double[] total, double[] observed) {
        double min = Double.POSITIVE_INFINITY;
        double max = 0;
        for (int b = 0; b < total.length; b++) {
            if (total[b] > 0) min = Math.min(min, total[b]);
            max = Math.max(max, total[b]);
            if (observed != null) max = Math.max(max, observed[b]);
        }
        return max > 0 && min < Double.POSITIVE_INFINITY && max / min > LOG_SPAN;
    }

    /** A power of ten a little below the smallest positive total. */
    private static double logFloor(double[] total) {
        double min = Double.POSITIVE_INFINITY;
        for (double t : total) if (t > 0) min = Math.min(min, t);
        return Math.pow(10, Math.floor(Math.log10(min * 0.5)));
    }

    private static XYBarRenderer barRenderer() {
        XYBarRenderer r = new XYBarRenderer(0.0);
        r.setUseYInterval(true);
        r.setBarPainter(new StandardXYBarPainter());
        r.setShadowVisible(false);
        r.setDefaultSeriesVisibleInLegend(false);
        return r;
    }

    private static XYBarRenderer hatchRenderer() {
        XYBarRenderer r = barRenderer();
        r.setBarPainter(new HatchBarPainter(Theme.UNCERTAINTY_FILL, Theme.UNCERTAINTY_HATCH, Theme.HAIRLINE));
        r.setDrawBarOutline(false);
        return r;
    }

    /** Band total ± error, divided by {@code scale} per bin when given (ratio panel). */
    private static XYIntervalSeriesCollection band(StackedYields in, double[] total, double[] scale, double floor) {
        XYIntervalSeries s = new XYIntervalSeries("band", false, true);
        for (int b = 0; b < in.bins(); b++) {
            double c = scale == null ? 1 : scale[b];
            if (!(c > 0)) continue;
            double lo = (total[b] - in.totalError()[b]) / c;
            double hi = (total[b] + in.totalError()[b]) / c;
            s.add(0.5 * (in.low(b) + in.high(b)), in.low(b), in.high(b), total[b] / c, Math.max(lo, floor), Math.max(hi, floor));
        }
        XYIntervalSeriesCollection d = new XYIntervalSeriesCollection();
        d.addSeries(s);
        return d;
    }

    private static XYSeriesCollection totalOutline(StackedYields in, double[] total) {
        XYSeries s = new XYSeries("total", false, true);
        for (int b = 0; b < in.bins(); b++) {
            s.add(in.low(b), total[b]);
            s.add(in.high(b), total[b]);
        }
        return new XYSeriesCollection(s);
    }

    /** Observed counts (divided by {@code scale} when given) with Garwood intervals. */
    private static XYIntervalSeriesCollection points(StackedYields in, double[] scale, boolean log) {
        XYIntervalSeries s = new XYIntervalSeries("Observed", false, true);
        for (int b = 0; b < in.bins(); b++) {
            double n = in.observed()[b];
            double c = scale == null ? 1 : scale[b];
            if (!(c > 0)) continue;
            if (log && n <= 0) continue;   // no place for zero on a log axis
            double x = 0.5 * (in.low(b) + in.high(b));
            s.add(x, x, x, n / c, PoissonInterval.lower(n) / c, PoissonInterval.upper(n) / c);
        }
        XYIntervalSeriesCollection d = new XYIntervalSeriesCollection();
        d.addSeries(s);
        return d;
    }

    private static XYErrorRenderer dataRenderer() {
        XYErrorRenderer r = new XYErrorRenderer();
        r.setDrawXError(false);
        r.setCapLength(0);
        r.setErrorStroke(Theme.ERROR_BAR);
        r.setErrorPaint(Theme.INK);
        r.setSeriesPaint(0, Theme.INK);
        r.setSeriesShape(0, Theme.diamond(11));
        r.setDefaultSeriesVisibleInLegend(false);
        return r;
    }

    private static XYPlot ratioPanel(StackedYields in, double[] total) {
        XYPlot ratio = new XYPlot();
        ratio.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ratio.setDataset(0, band(in, total, total, Double.NEGATIVE_INFINITY));
        ratio.setRenderer(0, hatchRenderer());
        ratio.setDataset(1, points(in, total, false));
        ratio.setRenderer(1, dataRenderer());
        ValueMarker one = new ValueMarker(1.0, Theme.MUTED_INK, Theme.DASHED);
        ratio.addRangeMarker(one);

        double reach = 0;
        for (int b = 0; b < in.bins(); b++) {
            if (!(total[b] > 0)) continue;
            reach = Math.max(reach, in.totalError()[b] / total[b]);
            double n = in.observed()[b];
            reach = Math.max(reach, Math.abs(n / total[b] - 1));
            // Let error bars show too, unless they are huge (few counts): the axis stops at ±1.
            reach = Math.max(reach, Math.min(1, Math.max(PoissonInterval.upper(n) / total[b] - 1, 1 - PoissonInterval.lower(n) / total[b])));
        }
        double half = 1.0;
        for (double nice : new double[] {0.1, 0.15, 0.2, 0.3, 0.5, 0.75, 1.0}) {
            if (reach * 1.15 <= nice) {
                half = nice;
                break;
            }
        }
        NumberAxis axis = Theme.numberAxis("Obs. / exp.");
        axis.setAutoRange(false);
        axis.setRange(Math.max(0, 1 - half), 1 + half);
        ratio.setRangeAxis(axis);
        Theme.style(ratio);
        ratio.setDomainGridlinesVisible(false);
        return ratio;
    }

    private static LegendItemCollection legend(List<StackedYields.Layer> order, List<Color> colours, boolean data) {
        LegendItemCollection items = new LegendItemCollection();
        if (data) items.add(Theme.legendMarker("Observed", Theme.diamond(11), Theme.INK, null));
        for (int s = order.size() - 1; s >= 0; s--) {   // legend reads top of the stack first
            items.add(Theme.legendSwatch(order.get(s).name(), colours.get(s), null));
        }
        items.add(Theme.legendSwatch("Total uncertainty", Theme.UNCERTAINTY_FILL, Theme.INK));
        return items;
    }
}
