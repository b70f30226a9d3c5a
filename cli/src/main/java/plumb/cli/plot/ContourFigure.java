package plumb.cli.plot;

import java.util.Locale;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import plumb.engine.inference.Contour;

/** Two-parameter profile-likelihood regions: closed curves around the best fit (a marker). */
public final class ContourFigure {

    private ContourFigure() {
    }

    public static Figure of(Contour.Result r) {
        XYSeriesCollection data = new XYSeriesCollection();
        for (Contour.Region g : r.regions()) {
            XYSeries s = new XYSeries(SensitivityFigure.percent(g.cl()) + " CL (2ΔNLL = "
                    + String.format(Locale.ROOT, "%.2f", g.level()) + ")", false, true);
            int n = g.x().length;
            for (int k = 0; k <= n; k++) {
                int i = k % n;
                if (Double.isFinite(g.x()[i]) && Double.isFinite(g.y()[i])) s.add(g.x()[i], g.y()[i]);
            }
            data.addSeries(s);
        }
        XYSeries best = new XYSeries("best fit", false, true);
        best.add(r.xBest(), r.yBest());
        data.addSeries(best);
        XYLineAndShapeRenderer lines = new XYLineAndShapeRenderer(true, false);
        java.awt.Color[] colours = {Theme.UP, Theme.DOWN, Theme.FIT_LINE};
        int nr = r.regions().size();
        for (int s = 0; s < nr; s++) {
            lines.setSeriesPaint(s, colours[s % colours.length]);
            lines.setSeriesStroke(s, s == 0 ? Theme.LINE : Theme.DASHED);
        }
        lines.setSeriesLinesVisible(nr, false);
        lines.setSeriesShapesVisible(nr, true);
        lines.setSeriesShape(nr, Theme.diamond(12));
        lines.setSeriesPaint(nr, Theme.INK);
        NumberAxis x = Theme.numberAxis(r.xName());
        NumberAxis y = Theme.numberAxis(r.yName());
        XYPlot plot = new XYPlot(data, x, y, lines);
        Theme.style(plot);
        JFreeChart chart = new JFreeChart("Profile-likelihood regions of " + r.xName() + " and " + r.yName(),
                Theme.TITLE, plot, true);
        chart.addSubtitle(new TextTitle(String.format(Locale.ROOT,
                "%d rays from the best fit %s = %s, %s = %s; correlation %.2f", r.rays(), r.xName(),
                SensitivityFigure.num(r.xBest()), r.yName(), SensitivityFigure.num(r.yBest()), r.correlation())));
        LegendTitle lt = chart.getLegend();
        lt.setPosition(RectangleEdge.BOTTOM);
        Theme.style(chart);
        return new Figure(chart, Theme.WIDTH, Theme.HEIGHT);
    }
}
