package plumb.cli.plot;

import java.awt.Color;
import java.awt.Font;
import java.util.Locale;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.Layer;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import plumb.engine.inference.LookElsewhere;

/**
 * The local discovery p-value against the label of the models (a mass) on a logarithmic axis,
 * with the p-values of 1 to 5 σ marked and the global result of the largest excess below the title.
 */
public final class LookElsewhereFigure {

    private LookElsewhereFigure() {
    }

    /** @param toyZ global significance from toys, or NaN */
    public static Figure of(LookElsewhere.Scan s, String label, double toyZ) {
        XYSeries local = new XYSeries("local p-value", true, false);
        double smallest = 1;
        for (int i = 0; i < s.x().length; i++) {
            double p = Math.max(s.pLocal()[i], 1e-300);
            local.add(s.x()[i], p);
            smallest = Math.min(smallest, p);
        }
        XYLineAndShapeRenderer r = new XYLineAndShapeRenderer(true, true);
        r.setSeriesPaint(0, Theme.UP);
        r.setSeriesStroke(0, Theme.LINE);
        r.setSeriesShape(0, Theme.dot(7));
        NumberAxis x = Theme.numberAxis(label);
        LogAxis y = new LogAxis("Local p-value");
        y.setBase(10);
        y.setSmallestValue(1e-300);
        double lowest = Math.min(smallest, LookElsewhere.pLocal(9)) / 3;   // room for the 3 σ line at least
        y.setRange(lowest, 1);
        Theme.style(y);
        XYPlot plot = new XYPlot(new XYSeriesCollection(local), x, y, r);
        Theme.style(plot);
        for (int k = 1; k <= 6; k++) {
            double p = LookElsewhere.pLocal(k * k);
            if (p < lowest) break;
            ValueMarker m = new ValueMarker(p, Theme.MUTED_INK, Theme.DOTTED);
            m.setLabel(k + "σ");
            m.setLabelFont(Theme.NOTE.deriveFont(Font.BOLD));
            m.setLabelPaint(Theme.MUTED_INK);
            m.setLabelBackgroundColor(new Color(255, 255, 255, 0));
            m.setLabelOffset(new RectangleInsets(2, 2, 2, 6));
            m.setLabelAnchor(RectangleAnchor.TOP_RIGHT);
            m.setLabelTextAnchor(TextAnchor.BOTTOM_RIGHT);
            plot.addRangeMarker(m, Layer.BACKGROUND);
        }
        plot.addDomainMarker(new ValueMarker(s.x()[s.best()], Theme.FIT_LINE, Theme.DASHED), Layer.BACKGROUND);
        JFreeChart chart = new JFreeChart("Local p-value across the search", Theme.TITLE, plot, false);
        String global = String.format(Locale.ROOT,
                "largest excess at %s = %s: local %.2f σ; global %.2f σ (up-crossings of q0 = %s: %d, trials factor %.1f)%s",
                label, SensitivityFigure.num(s.x()[s.best()]), s.zLocal(), s.zGlobal(), SensitivityFigure.num(s.reference()),
                s.upcrossings(), s.trials(), Double.isNaN(toyZ) ? "" : String.format(Locale.ROOT, "; toys %.2f σ", toyZ));
        chart.addSubtitle(new TextTitle(global));
        Theme.style(chart);
        return new Figure(chart, Theme.WIDTH, Theme.HEIGHT);
    }
}
