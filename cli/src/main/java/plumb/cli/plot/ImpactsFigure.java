package plumb.cli.plot;

import java.awt.Color;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.CombinedDomainXYPlot;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.Layer;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.data.xy.XYIntervalSeries;
import org.jfree.data.xy.XYIntervalSeriesCollection;
import plumb.cli.table.Table;

/**
 * Ranking of nuisance parameters by their impact on the parameter of interest. Each row is split
 * in two: the upper half shows the shift for the parameter moved up, the lower half for it moved
 * down, so same-sign shifts never hide each other. Post-fit shifts are filled bars, pre-fit
 * shifts hollow frames around them. A side panel shows each parameter's pull with its constraint.
 */
public final class ImpactsFigure {

    private static final double HALF = 0.42;     // half-height of a row's bars, in row units
    private static final double INSET = 0.09;    // post-fit bars are this much thinner than pre-fit

    private ImpactsFigure() {
    }

    /** Builds the figure for the {@code topN} largest impacts; height grows with the rows. */
    public static Figure of(ImpactBars in, int topN) {
        if (topN < 1) throw new IllegalArgumentException("topN must be >= 1, got " + topN);
        List<ImpactBars.Bar> rows = in.top(topN);
        if (rows.isEmpty()) throw new IllegalArgumentException("no impacts to show");
        int n = rows.size();
        List<String> names = new ArrayList<>(n);
        double[] pulls = new double[n];
        double[] constraints = new double[n];
        XYIntervalSeries postUp = new XYIntervalSeries("post-up", false, true);
        XYIntervalSeries postDown = new XYIntervalSeries("post-down", false, true);
        XYIntervalSeries preUp = new XYIntervalSeries("pre-up", false, true);
        XYIntervalSeries preDown = new XYIntervalSeries("pre-down", false, true);
        double reach = 0;
        for (int i = 0; i < n; i++) {
            ImpactBars.Bar e = rows.get(i);
            names.add(e.parameter());
            pulls[i] = e.pull();
            constraints[i] = e.constraint();
            // With the axis inverted, smaller positions are higher on the page: "up" on top.
            addBar(preUp, i - HALF, i, e.prefitUp());
            addBar(preDown, i, i + HALF, e.prefitDown());
            addBar(postUp, i - HALF + INSET, i - INSET / 2, e.postfitUp());
            addBar(postDown, i + INSET / 2, i + HALF - INSET, e.postfitDown());
            for (double v : new double[] {e.prefitUp(), e.prefitDown(), e.postfitUp(), e.postfitDown()}) {
                if (!Double.isNaN(v)) reach = Math.max(reach, Math.abs(v));
            }
        }

        XYPlot impacts = new XYPlot();
        impacts.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        XYIntervalSeriesCollection filled = new XYIntervalSeriesCollection();
        filled.addSeries(postUp);
        filled.addSeries(postDown);
        impacts.setDataset(0, filled);
        impacts.setRenderer(0, bars(true));
        XYIntervalSeriesCollection hollow = new XYIntervalSeriesCollection();
        hollow.addSeries(preUp);
        hollow.addSeries(preDown);
        impacts.setDataset(1, hollow);
        impacts.setRenderer(1, bars(false));
        impacts.addRangeMarker(new ValueMarker(0, Theme.INK, Theme.THIN), Layer.FOREGROUND);
        NumberAxis shift = Theme.numberAxis("Shift of " + in.poi());
        double half = reach > 0 ? reach * 1.12 : 1;
        shift.setRange(-half, half);
        impacts.setRangeAxis(shift);
        Theme.style(impacts);
        impacts.setDomainGridlinesVisible(false);

        XYPlot pullPanel = new XYPlot();
        pullPanel.setDataset(PullsFigure.pullPoints(pulls, constraints));
        pullPanel.setRenderer(PullsFigure.pullRenderer());
        double pullReach = ParameterAxis.pullReach(pulls, constraints);
        pullPanel.setRangeAxis(ParameterAxis.pullAxis("Pull", pullReach));
        ParameterAxis.addPullBands(pullPanel);
        Theme.style(pullPanel);
        pullPanel.setDomainGridlinesVisible(false);

        CombinedDomainXYPlot combined = new CombinedDomainXYPlot(ParameterAxis.of(names));
        combined.setGap(14);
        combined.add(impacts, 3);
        combined.add(pullPanel, 2);
        combined.setOrientation(PlotOrientation.HORIZONTAL);   // after add(): it is passed on to the subplots
        Theme.stylePlot(combined);
        combined.setOutlineVisible(false);
        LegendItemCollection legend = new LegendItemCollection();
        legend.add(Theme.legendSwatch("post-fit, +1σ", Theme.UP, null));
        legend.add(Theme.legendSwatch("post-fit, −1σ", Theme.DOWN, null));
        legend.add(Theme.legendSwatch("pre-fit, +1σ", Theme.BACKGROUND, Theme.UP));
        legend.add(Theme.legendSwatch("pre-fit, −1σ", Theme.BACKGROUND, Theme.DOWN));
        legend.add(Theme.legendMarker("pull ± constraint", Theme.dot(9), Theme.INK, Theme.ERROR_BAR));
        combined.setFixedLegendItems(legend);

        String title = String.format(Locale.ROOT, "Impact on %s: largest %d of %d", in.poi(), n, in.entries().size());
        JFreeChart chart = new JFreeChart(title, Theme.TITLE, combined, true);
        LegendTitle legendTitle = chart.getLegend();
        legendTitle.setPosition(RectangleEdge.BOTTOM);
        if (Double.isFinite(in.poiValue())) {
            String fit = Double.isFinite(in.poiError()) && in.poiError() > 0
                    ? Table.measurement(in.poiValue(), in.poiError()) : Table.number(in.poiValue(), 4);
            chart.addSubtitle(new TextTitle("best fit " + in.poi() + " = " + fit));
        }
        Theme.style(chart);
        return new Figure(chart, 980, Math.max(420, 190 + 38 * n));
    }

    private static void addBar(XYIntervalSeries s, double from, double to, double shift) {
        if (Double.isNaN(shift)) return;
        double mid = 0.5 * (from + to);
        s.add(mid, from, to, shift, Math.min(0, shift), Math.max(0, shift));
    }

    private static XYBarRenderer bars(boolean filled) {
        XYBarRenderer r = new XYBarRenderer(0.0);
        r.setUseYInterval(true);
        r.setBarPainter(new StandardXYBarPainter());
        r.setShadowVisible(false);
        r.setDrawBarOutline(true);
        r.setDefaultSeriesVisibleInLegend(false);
        Color[] colours = {Theme.UP, Theme.DOWN};
        for (int s = 0; s < 2; s++) {
            r.setSeriesPaint(s, filled ? colours[s] : new Color(0, 0, 0, 0));
            r.setSeriesOutlinePaint(s, colours[s]);
            r.setSeriesOutlineStroke(s, filled ? Theme.HAIRLINE : Theme.LINE);
        }
        return r;
    }
}
