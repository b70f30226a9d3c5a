package plumb.cli.plot;

import java.awt.Color;
import java.awt.Font;
import java.util.Locale;
import org.jfree.chart.JFreeChart;
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
import plumb.cli.table.Table;

/**
 * Profile likelihood scan: 2ΔNLL against the parameter, with horizontal lines at the 68% and
 * 95% levels of a χ² with one degree of freedom (1 and 3.841) and the interval ends marked.
 */
public final class ScanFigure {

    /** χ²₁ quantiles at 68.27% and 95% (common practice; 3.841 = 1.95996²). */
    static final double LEVEL_68 = 1.0;
    static final double LEVEL_95 = 3.841458820694124;

    private ScanFigure() {
    }

    /** Builds the figure at the default size. */
    public static Figure of(ScanCurve in) {
        XYSeries curve = new XYSeries("2ΔNLL", true, true);
        double top = 0;
        for (int i = 0; i < in.values().length; i++) {
            double y = 2 * in.nllAboveMin()[i];
            if (Double.isFinite(y)) {
                curve.add(in.values()[i], y);
                top = Math.max(top, y);
            }
        }
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(true, true);
        renderer.setSeriesPaint(0, Theme.UP);
        renderer.setSeriesStroke(0, Theme.LINE);
        renderer.setSeriesShape(0, Theme.dot(6));
        renderer.setSeriesShapesFilled(0, true);

        NumberAxis x = Theme.numberAxis(in.parameter());
        x.setAutoRangeIncludesZero(false);
        NumberAxis y = Theme.numberAxis("2ΔNLL");
        y.setRange(0, Math.max(5, Math.min(top, 9)) * 1.08);   // the region that matters: up to past the 95% line
        XYPlot plot = new XYPlot(new XYSeriesCollection(curve), x, y, renderer);
        Theme.style(plot);
        plot.setDomainGridlinesVisible(false);

        level(plot, LEVEL_68, "68%");
        level(plot, LEVEL_95, "95%");
        for (double[] interval : new double[][] {in.interval68(), in.interval95()}) {
            for (double end : interval) {
                if (Double.isFinite(end)) plot.addDomainMarker(new ValueMarker(end, Theme.MUTED_INK, Theme.DOTTED), Layer.BACKGROUND);
            }
        }
        if (Double.isFinite(in.best())) {
            plot.addDomainMarker(new ValueMarker(in.best(), Theme.INK, Theme.HAIRLINE), Layer.BACKGROUND);
        }

        JFreeChart chart = new JFreeChart("Profile likelihood scan of " + in.parameter(), Theme.TITLE, plot, false);
        String summary = summary(in);
        if (summary != null) chart.addSubtitle(new TextTitle(summary));
        Theme.style(chart);
        return new Figure(chart, Theme.WIDTH, Theme.HEIGHT);
    }

    private static void level(XYPlot plot, double value, String label) {
        ValueMarker m = new ValueMarker(value, Theme.MUTED_INK, Theme.DASHED);
        m.setLabel(label);
        m.setLabelFont(Theme.NOTE.deriveFont(Font.BOLD));
        m.setLabelPaint(Theme.MUTED_INK);
        m.setLabelBackgroundColor(new Color(255, 255, 255, 0));
        m.setLabelOffset(new RectangleInsets(2, 2, 2, 6));
        m.setLabelAnchor(RectangleAnchor.TOP_RIGHT);
        m.setLabelTextAnchor(TextAnchor.BOTTOM_RIGHT);
        plot.addRangeMarker(m, Layer.BACKGROUND);
    }

    /**
     * "best fit μ = 1.10   68%: [0.75, 1.55]   95%: [0.41, 1.98]"; all numbers to the decimal
     * place of two significant digits of the narrower 68% half-width (as in
     * {@link Table#measurement(double, double)}); missing ends print as "–".
     */
    static String summary(ScanCurve in) {
        if (!Double.isFinite(in.best())) return null;
        double half = Double.POSITIVE_INFINITY;
        for (double end : in.interval68()) if (Double.isFinite(end)) half = Math.min(half, Math.abs(end - in.best()));
        int decimals = half > 0 && half < Double.POSITIVE_INFINITY
                ? Math.max(0, Math.min(6, 1 - (int) Math.floor(Math.log10(half)))) : 3;
        return String.format(Locale.ROOT, "best fit %s = %s   68%%: [%s, %s]   95%%: [%s, %s]", in.parameter(),
                fixed(in.best(), decimals), fixed(in.interval68()[0], decimals), fixed(in.interval68()[1], decimals),
                fixed(in.interval95()[0], decimals), fixed(in.interval95()[1], decimals));
    }

    private static String fixed(double v, int decimals) {
        return Double.isFinite(v) ? String.format(Locale.ROOT, "%." + decimals + "f", v) : Table.MISSING;
    }
}
