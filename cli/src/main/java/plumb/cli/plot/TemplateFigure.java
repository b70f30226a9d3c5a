package plumb.cli.plot;

import java.awt.Color;
import java.awt.Stroke;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.CombinedDomainXYPlot;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import plumb.engine.tooling.Templates;

/**
 * One variation of one sample: nominal, up and down yields as step lines, and a panel underneath
 * with up/nominal and down/nominal, sharing the x axis.
 */
public final class TemplateFigure {

    private TemplateFigure() {
    }

    public static Figure of(Templates.Template t) {
        int n = t.nominal().length;
        XYPlot main = new XYPlot();
        main.setDataset(steps(t, t.nominal(), t.up(), t.down(), null));
        main.setRenderer(lines());
        double top = 0;
        for (int b = 0; b < n; b++) top = Math.max(top, Math.max(t.nominal()[b], Math.max(t.up()[b], t.down()[b])));
        NumberAxis y = Theme.numberAxis("Events per bin");
        y.setRange(0, top > 0 ? top * 1.12 : 1);
        main.setRangeAxis(y);
        Theme.style(main);
        main.setDomainGridlinesVisible(false);

        XYPlot ratio = new XYPlot();
        ratio.setDataset(steps(t, ones(n), t.up(), t.down(), t.nominal()));
        ratio.setRenderer(lines());
        ratio.addRangeMarker(new ValueMarker(1.0, Theme.MUTED_INK, Theme.DOTTED));
        double reach = 0;
        for (int b = 0; b < n; b++) {
            if (!(t.nominal()[b] > 0)) continue;
            reach = Math.max(reach, Math.abs(t.up()[b] / t.nominal()[b] - 1));
            reach = Math.max(reach, Math.abs(t.down()[b] / t.nominal()[b] - 1));
        }
        double half = 1;
        for (double nice : new double[] {0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1.0}) {
            if (reach * 1.15 <= nice) {
                half = nice;
                break;
            }
        }
        NumberAxis r = Theme.numberAxis("Ratio to nominal");
        r.setAutoRange(false);
        r.setRange(Math.max(0, 1 - half), 1 + half);
        ratio.setRangeAxis(r);
        Theme.style(ratio);
        ratio.setDomainGridlinesVisible(false);

        NumberAxis x = t.edges() == null ? Theme.integerAxis(t.observable() == null ? "Bin" : t.observable())
                : Theme.numberAxis(t.observable() == null ? "Bin edge" : t.observable());
        x.setAutoRange(false);
        x.setRange(low(t, 0), low(t, n));
        CombinedDomainXYPlot combined = new CombinedDomainXYPlot(x);
        combined.setGap(16);
        combined.add(main, 3);
        combined.add(ratio, 1);
        Theme.stylePlot(combined);
        combined.setOutlineVisible(false);
        LegendItemCollection legend = new LegendItemCollection();
        legend.add(Theme.legendMarker("Nominal", null, Theme.INK, Theme.LINE));
        legend.add(Theme.legendMarker("Up (+1)", null, Theme.UP, Theme.LINE));
        legend.add(Theme.legendMarker("Down (−1)", null, Theme.DOWN, Theme.DASHED));
        combined.setFixedLegendItems(legend);
        JFreeChart chart = new JFreeChart(t.channel() + " · " + t.sample() + " · " + t.parameter(), Theme.TITLE, combined, true);
        LegendTitle l = chart.getLegend();
        l.setPosition(RectangleEdge.BOTTOM);
        Theme.style(chart);
        return new Figure(chart, Theme.WIDTH, Theme.HEIGHT);
    }

    private static double low(Templates.Template t, int b) {
        return t.edges() == null ? b - 0.5 : t.edges()[b];
    }

    private static double[] ones(int n) {
        double[] x = new double[n];
        java.util.Arrays.fill(x, 1);
        return x;
    }

    /** Nominal, up, down as step series, each divided by {@code scale} per bin when given (bins with scale 0 left out). */
    private static XYSeriesCollection steps(Templates.Template t, double[] nominal, double[] up, double[] down, double[] scale) {
        XYSeriesCollection d = new XYSeriesCollection();
        d.addSeries(step("Nominal", t, nominal, null));
        d.addSeries(step("Up", t, up, scale));
        d.addSeries(step("Down", t, down, scale));
        return d;
    }

    private static XYSeries step(String key, Templates.Template t, double[] values, double[] scale) {
        XYSeries s = new XYSeries(key, false, true);
        for (int b = 0; b < values.length; b++) {
            double c = scale == null ? 1 : scale[b];
            if (!(c > 0)) {
                s.add(low(t, b), null);   // a gap in the line
                continue;
            }
            s.add(low(t, b), values[b] / c);
            s.add(low(t, b + 1), values[b] / c);
        }
        return s;
    }

    private static XYLineAndShapeRenderer lines() {
        XYLineAndShapeRenderer r = new XYLineAndShapeRenderer(true, false);
        Color[] paints = {Theme.INK, Theme.UP, Theme.DOWN};
        Stroke[] strokes = {Theme.LINE, Theme.LINE, Theme.DASHED};
        for (int i = 0; i < 3; i++) {
            r.setSeriesPaint(i, paints[i]);
            r.setSeriesStroke(i, strokes[i]);
        }
        r.setDefaultSeriesVisibleInLegend(false);
        return r;
    }
}
