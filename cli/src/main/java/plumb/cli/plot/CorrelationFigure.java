package plumb.cli.plot;

import java.awt.Font;
import java.awt.Paint;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.Locale;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.annotations.XYTextAnnotation;
import org.jfree.chart.axis.AxisLocation;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTickUnit;
import org.jfree.chart.axis.SymbolAxis;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.PaintScale;
import org.jfree.chart.renderer.xy.XYBlockRenderer;
import org.jfree.chart.title.PaintScaleLegend;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.data.xy.DefaultXYZDataset;

/**
 * Correlation matrix as a heat map on a diverging blue-white-red scale with the value written
 * in every cell (up to {@link #MAX_LABELLED} parameters; beyond that the text would fall below
 * 11 pt, so only colours are drawn: use {@link CorrelationMatrix#strongest(int)}).
 */
public final class CorrelationFigure {

    /** Largest matrix whose cells carry their values. */
    public static final int MAX_LABELLED = 30;

    private CorrelationFigure() {
    }

    /** Builds the figure; its size grows with the number of parameters. */
    public static Figure of(CorrelationMatrix in) {
        int n = in.names().size();
        double[] x = new double[n * n];
        double[] y = new double[n * n];
        double[] z = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                int k = i * n + j;
                x[k] = j;
                y[k] = i;
                z[k] = in.matrix()[i][j];
            }
        }
        DefaultXYZDataset data = new DefaultXYZDataset();
        data.addSeries("correlation", new double[][] {x, y, z});

        XYBlockRenderer renderer = new XYBlockRenderer();
        renderer.setBlockAnchor(RectangleAnchor.CENTER);
        PaintScale scale = new DivergingScale();
        renderer.setPaintScale(scale);

        String[] labels = in.names().toArray(new String[0]);
        SymbolAxis columns = new SymbolAxis(null, labels);
        columns.setVerticalTickLabels(true);
        SymbolAxis rows = new SymbolAxis(null, labels);
        rows.setInverted(true);
        for (SymbolAxis a : new SymbolAxis[] {columns, rows}) {
            a.setGridBandsVisible(false);
            a.setAutoRange(false);
            a.setRange(-0.5, n - 0.5);
            Theme.style(a);
            a.setTickLabelFont(n > 20 ? Theme.SMALL : Theme.TICK_LABEL.deriveFont(13f));
        }
        XYPlot plot = new XYPlot(data, columns, rows, renderer);
        Theme.style(plot);
        plot.setDomainGridlinesVisible(false);
        plot.setRangeGridlinesVisible(false);
        plot.setDomainAxisLocation(AxisLocation.BOTTOM_OR_LEFT);

        if (n <= MAX_LABELLED) {
            float size = n <= 10 ? 14f : n <= 16 ? 12f : 11f;
            Font font = Theme.SMALL.deriveFont(size);
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    double v = in.matrix()[i][j];
                    XYTextAnnotation text = new XYTextAnnotation(format(v, n), j, i);
                    text.setFont(font);
                    text.setPaint(Theme.textOn(Theme.diverging(v)));
                    plot.addAnnotation(text);
                }
            }
        }

        NumberAxis scaleAxis = Theme.numberAxis(null);
        scaleAxis.setRange(-1, 1);
        scaleAxis.setTickUnit(new NumberTickUnit(0.5, new DecimalFormat("0.0", DecimalFormatSymbols.getInstance(Locale.ROOT))));
        PaintScaleLegend legend = new PaintScaleLegend(scale, scaleAxis);
        legend.setPosition(RectangleEdge.RIGHT);
        legend.setStripWidth(16);
        legend.setAxisOffset(4);
        legend.setSubdivisionCount(200);
        legend.setMargin(new RectangleInsets(30, 16, 30, 0));
        legend.setBackgroundPaint(Theme.BACKGROUND);

        JFreeChart chart = new JFreeChart(in.title() == null ? "Correlations of the fitted parameters" : in.title(),
                Theme.TITLE, plot, false);
        chart.addSubtitle(legend);
        Theme.style(chart);
        int cell = Math.max(22, Math.min(64, 640 / n));
        int longest = 0;
        for (String s : labels) longest = Math.max(longest, s.length());
        int labelSpace = Math.min(260, 40 + 8 * longest);
        int side = cell * n;
        return new Figure(chart, Math.max(640, side + labelSpace + 150), Math.max(560, side + labelSpace + 70));
    }

    /** Two decimals with a true minus sign; fewer characters in big matrices ("−.42"). */
    static String format(double v, int n) {
        if (Double.isNaN(v)) return "?";
        String s = String.format(Locale.ROOT, "%.2f", Math.abs(v));
        if (n > 16 && s.startsWith("0.")) s = s.substring(1);
        if (s.equals("1.00") || s.equals("1.0")) s = "1";
        boolean negative = v < 0 && !s.matches("\\.?0*\\.?0*");
        return negative ? "−" + s : s;
    }

    /** Maps [−1, 1] onto {@link Theme#diverging(double)}. */
    private static final class DivergingScale implements PaintScale {
        @Override
        public double getLowerBound() {
            return -1;
        }

        @Override
        public double getUpperBound() {
            return 1;
        }

        @Override
        public Paint getPaint(double value) {
            return Theme.diverging(value);
        }
    }
}
