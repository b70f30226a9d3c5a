package plumb.cli.plot;

import java.util.Locale;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.CombinedDomainXYPlot;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import plumb.engine.inference.Projection;

/**
 * Reach against luminosity: the expected limit (upper panel) and the expected significance (lower
 * panel) against the luminosity factor on a logarithmic axis, one line per scenario.
 */
public final class ProjectionFigure {

    private ProjectionFigure() {
    }

    public static Figure of(Projection.Result r) {
        Projection.Scenario[] sc = Projection.Scenario.values();
        XYSeriesCollection limits = new XYSeriesCollection(), zs = new XYSeriesCollection();
        for (Projection.Scenario s : sc) {
            XYSeries l = new XYSeries(s.label(), true, false), z = new XYSeries(s.label(), true, false);
            for (Projection.Point p : r.points()) {
                if (p.scenario() != s) continue;
                if (Double.isFinite(p.limit())) l.add(p.lumi(), p.limit());
                if (Double.isFinite(p.z())) z.add(p.lumi(), p.z());
            }
            limits.addSeries(l);
            zs.addSeries(z);
        }
        LogAxis lumi = new LogAxis("Luminosity factor L");
        lumi.setBase(10);
        lumi.setSmallestValue(1e-3);
        lumi.setStandardTickUnits(NumberAxis.createStandardTickUnits(Locale.ROOT));
        Theme.style(lumi);
        CombinedDomainXYPlot combined = new CombinedDomainXYPlot(lumi);
        combined.setGap(14);
        combined.add(panel(limits, "Expected " + SensitivityFigure.percent(r.cl()) + " CL limit on " + r.poi(), false), 1);
        combined.add(panel(zs, "Expected significance Z_A [σ]", true), 1);
        Theme.stylePlot(combined);
        JFreeChart chart = new JFreeChart("Reach with more data", Theme.TITLE, combined, true);
        LegendTitle lt = chart.getLegend();
        lt.setPosition(RectangleEdge.BOTTOM);
        Theme.style(chart);
        return new Figure(chart, Theme.WIDTH, 760);
    }

    private static XYPlot panel(XYSeriesCollection data, String label, boolean legend) {
        XYLineAndShapeRenderer r = new XYLineAndShapeRenderer(true, true);
        java.awt.Color[] colours = {Theme.UP, Theme.DOWN, Theme.FIT_LINE};
        for (int s = 0; s < data.getSeriesCount(); s++) {
            r.setSeriesPaint(s, colours[s % colours.length]);
            r.setSeriesStroke(s, s == 2 ? Theme.DASHED : Theme.LINE);
            r.setSeriesShape(s, s == 1 ? Theme.diamond(9) : Theme.dot(7));
            r.setSeriesVisibleInLegend(s, legend);
        }
        NumberAxis y = Theme.numberAxis(label);
        y.setAutoRangeIncludesZero(true);
        XYPlot plot = new XYPlot(data, null, y, r);
        Theme.style(plot);
        return plot;
    }
}
