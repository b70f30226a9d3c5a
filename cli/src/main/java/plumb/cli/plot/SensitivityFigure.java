package plumb.cli.plot;

import java.awt.Color;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.NumberAxis;
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
import plumb.engine.inference.Sensitivity;

/**
 * Which uncertainty limits the search: for the parameters (or groups) whose removal helps most,
 * the improvement of the expected limit in per cent when the uncertainty is removed (filled bar)
 * and when its width is scaled (hollow bar, the first factor asked for).
 */
public final class SensitivityFigure {

    private static final double HALF = 0.38;

    private SensitivityFigure() {
    }

    /** Gain of the expected limit in per cent: 100 (1 − changed/as-is). */
    public static double limitGain(double changed, double asIs) {
        return 100 * (1 - changed / asIs);
    }

    /** The figure of the first {@code top} targets of {@code ranked}. */
    public static Figure of(Sensitivity.Result r, List<Sensitivity.Target> ranked, int top, String what) {
        List<Sensitivity.Target> rows = ranked.subList(0, Math.min(top, ranked.size()));
        if (rows.isEmpty()) throw new IllegalArgumentException("nothing to rank");
        List<String> names = new ArrayList<>();
        XYIntervalSeries removed = new XYIntervalSeries("removed", false, true);
        XYIntervalSeries scaled = new XYIntervalSeries("scaled", false, true);
        double reach = 0;
        boolean anyScale = r.scales().length > 0;
        for (int i = 0; i < rows.size(); i++) {
            Sensitivity.Target t = rows.get(i);
            names.add(t.name());
            double g0 = limitGain(t.removed().fastLimit(), r.limit());
            bar(removed, i - HALF, anyScale ? i : i + HALF, g0);
            reach = Math.max(reach, Math.abs(g0));
            if (anyScale) {
                double g1 = limitGain(t.variants().get(1).fastLimit(), r.limit());
                bar(scaled, i, i + HALF, g1);
                reach = Math.max(reach, Math.abs(g1));
            }
        }
        XYIntervalSeriesCollection data = new XYIntervalSeriesCollection();
        data.addSeries(removed);
        data.addSeries(scaled);
        XYBarRenderer bars = new XYBarRenderer(0.0);
        bars.setUseYInterval(true);
        bars.setBarPainter(new StandardXYBarPainter());
        bars.setShadowVisible(false);
        bars.setDrawBarOutline(true);
        bars.setSeriesPaint(0, Theme.UP);
        bars.setSeriesOutlinePaint(0, Theme.UP);
        bars.setSeriesPaint(1, new Color(0, 0, 0, 0));
        bars.setSeriesOutlinePaint(1, Theme.DOWN);
        bars.setSeriesOutlineStroke(1, Theme.THIN);
        NumberAxis gain = Theme.numberAxis("Improvement of the expected " + percent(r.cl()) + " CL limit [%]");
        gain.setRange(0, Math.max(1, reach * 1.12));
        XYPlot plot = new XYPlot(data, ParameterAxis.of(names), gain, bars);
        plot.setOrientation(PlotOrientation.HORIZONTAL);
        plot.addRangeMarker(new ValueMarker(0, Theme.INK, Theme.THIN), Layer.FOREGROUND);
        Theme.style(plot);
        plot.setDomainGridlinesVisible(false);
        LegendItemCollection legend = new LegendItemCollection();
        legend.add(Theme.legendSwatch("removed", Theme.UP, null));
        if (anyScale) {
            legend.add(Theme.legendSwatch(String.format(Locale.ROOT, "width × %s", num(r.scales()[0])), Theme.BACKGROUND,
                    Theme.DOWN));
        }
        plot.setFixedLegendItems(legend);
        JFreeChart chart = new JFreeChart(String.format(Locale.ROOT, "What limits the search: %s", what), Theme.TITLE,
                plot, true);
        LegendTitle lt = chart.getLegend();
        lt.setPosition(RectangleEdge.BOTTOM);
        chart.addSubtitle(new TextTitle(String.format(Locale.ROOT,
                "expected limit on %s %s, expected significance %s σ (Asimov); fast path", r.poi(),
                num(r.limit()), String.format(Locale.ROOT, "%.2f", r.z()))));
        Theme.style(chart);
        return new Figure(chart, 980, Math.max(420, 190 + 34 * rows.size()));
    }

    private static void bar(XYIntervalSeries s, double from, double to, double value) {
        if (!Double.isFinite(value)) return;
        s.add(0.5 * (from + to), from, to, value, Math.min(0, value), Math.max(0, value));
    }

    static String percent(double cl) {
        return String.format(Locale.ROOT, "%s %%", num(100 * cl));
    }

    static String num(double v) {
        return String.format(Locale.ROOT, "%.4g", v).replaceAll("(\\.\\d*?)0+$", "$1").replaceAll("\\.$", "");
    }
}
