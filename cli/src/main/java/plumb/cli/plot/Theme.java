package plumb.cli.plot;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.GraphicsEnvironment;
import java.awt.Paint;
import java.awt.Shape;
import java.awt.Stroke;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Line2D;
import java.awt.geom.Path2D;
import java.awt.geom.Rectangle2D;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItem;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTickUnit;
import org.jfree.chart.axis.TickUnits;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.block.BlockBorder;
import org.jfree.chart.plot.Plot;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.title.Title;
import org.jfree.chart.ui.RectangleInsets;

/**
 * The one place that fixes how every Plumb figure looks: fonts, colours, strokes and markers.
 *
 * <p>Colours come from published colour-blind-safe sets (Paul Tol's "muted" and "bright"
 * schemes and his blue-red diverging scheme, personal.sron.nl/~pault, 2021), in an order and
 * assignment of our own: samples take the muted colours light-to-dark so neighbouring stack
 * layers differ in lightness as well as hue (readable in grey print), the signal always takes
 * the same strong rose, and everything measured (data, fitted points) is near-black ink.
 *
 * <p>Sizes are in points at the default figure size (900 × 640): no text is smaller than 11 pt.
 */
public final class Theme {

    static {
        // Figures are drawn off-screen; set before anything asks the graphics environment.
        System.setProperty("java.awt.headless", "true");
    }

    private Theme() {
    }

    /** A family that has Greek glyphs (γ, μ, σ, Δ) when installed; the logical sans-serif else. */
    public static final String FONT_FAMILY = pickFamily();

    public static final Font TITLE = new Font(FONT_FAMILY, Font.BOLD, 17);
    public static final Font AXIS_LABEL = new Font(FONT_FAMILY, Font.PLAIN, 16);
    public static final Font TICK_LABEL = new Font(FONT_FAMILY, Font.PLAIN, 14);
    public static final Font LEGEND = new Font(FONT_FAMILY, Font.PLAIN, 14);
    public static final Font NOTE = new Font(FONT_FAMILY, Font.PLAIN, 13);
    /** Smallest text we draw (matrix cells, crowded labels). */
    public static final Font SMALL = new Font(FONT_FAMILY, Font.PLAIN, 11);

    /** Text, axes, data points: a soft black that prints solid. */
    public static final Color INK = new Color(0x1E, 0x1E, 0x24);
    /** Secondary text and reference lines. */
    public static final Color MUTED_INK = new Color(0x5A, 0x5A, 0x66);
    public static final Color GRID = new Color(0xDD, 0xDD, 0xE3);
    public static final Color BACKGROUND = Color.WHITE;

    /** Stack colours, assigned in this order (Tol muted, reordered light to dark). */
    public static final List<Color> SAMPLE_COLOURS = List.of(
            new Color(0x88, 0xCC, 0xEE),  // cyan
            new Color(0xDD, 0xCC, 0x77),  // sand
            new Color(0x44, 0xAA, 0x99),  // teal
            new Color(0x99, 0x99, 0x33),  // olive
            new Color(0xAA, 0x44, 0x99),  // purple
            new Color(0x11, 0x77, 0x33),  // green
            new Color(0x33, 0x22, 0x88),  // indigo
            new Color(0xDD, 0xDD, 0xDD)); // pale grey, then the cycle repeats
    /** The signal sample (Tol muted rose), kept out of the sample cycle. */
    public static final Color SIGNAL = new Color(0xCC, 0x66, 0x77);

    /** Impact of moving a parameter up (Tol bright blue) and down (Tol vibrant orange). */
    public static final Color UP = new Color(0x44, 0x77, 0xAA);
    public static final Color DOWN = new Color(0xEE, 0x77, 0x33);

    /** Expected-limit bands: one blue in two lightnesses, so grey print keeps them apart. */
    public static final Color BAND_1SIGMA = new Color(0x77, 0xAA, 0xDD);
    public static final Color BAND_2SIGMA = new Color(0xCF, 0xE0, 0xF2);
    /** Reference bands behind pulls (±1 darker than ±2). */
    public static final Color PULL_BAND_1 = new Color(0xDE, 0xDE, 0xE6);
    public static final Color PULL_BAND_2 = new Color(0xF1, 0xF1, 0xF5);
    /** Fitted-line colour of the linearity figure (Tol bright purple). */
    public static final Color FIT_LINE = new Color(0xAA, 0x33, 0x77);

    /** Total-uncertainty band: translucent ink under a hatch of the same ink. */
    public static final Color UNCERTAINTY_FILL = new Color(0x1E, 0x1E, 0x24, 0x30);
    public static final Color UNCERTAINTY_HATCH = new Color(0x1E, 0x1E, 0x24, 0xA0);

    /** Tol's diverging blue-white-red scheme (BuRd), nine stops from −1 to +1. */
    public static final List<Color> DIVERGING = List.of(
            new Color(0x21, 0x66, 0xAC), new Color(0x43, 0x93, 0xC3), new Color(0x92, 0xC5, 0xDE),
            new Color(0xD1, 0xE5, 0xF0), new Color(0xF7, 0xF7, 0xF7), new Color(0xFD, 0xDB, 0xC7),
            new Color(0xF4, 0xA5, 0x82), new Color(0xD6, 0x60, 0x4D), new Color(0xB2, 0x18, 0x2B));

    public static final Stroke HAIRLINE = new BasicStroke(0.8f);
    public static final Stroke THIN = new BasicStroke(1.2f);
    public static final Stroke LINE = new BasicStroke(2.2f, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND);
    public static final Stroke DASHED = new BasicStroke(2.2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_ROUND,
            10f, new float[] {9f, 5f}, 0f);
    public static final Stroke DOTTED = new BasicStroke(1.4f, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND,
            10f, new float[] {1.5f, 4f}, 0f);
    public static final Stroke ERROR_BAR = new BasicStroke(1.6f);

    /** Default figure size in points (pixels at 1×). */
    public static final int WIDTH = 900;
    public static final int HEIGHT = 640;

    /** Colour of the i-th background sample of a stack. */
    public static Color sampleColour(int i) {
        return SAMPLE_COLOURS.get(Math.floorMod(i, SAMPLE_COLOURS.size()));
    }

    /** Marker of measured counts and fitted points: a diamond of the given width. */
    public static Shape diamond(double size) {
        double h = size / 2;
        Path2D.Double p = new Path2D.Double();
        p.moveTo(0, -h);
        p.lineTo(h, 0);
        p.lineTo(0, h);
        p.lineTo(-h, 0);
        p.closePath();
        return p;
    }

    /** Round marker, for curves sampled at points. */
    public static Shape dot(double size) {
        return new Ellipse2D.Double(-size / 2, -size / 2, size, size);
    }

    /** Legend swatch for filled areas. */
    public static Shape swatch() {
        return new Rectangle2D.Double(-8, -6, 16, 12);
    }

    /** Legend entry: a filled swatch, optionally outlined (outline null: none). */
    public static LegendItem legendSwatch(String label, Paint fill, Paint outline) {
        Line2D none = new Line2D.Double(0, 0, 1, 0);
        return new LegendItem(label, null, null, null, true, swatch(), true, fill, outline != null,
                outline == null ? fill : outline, THIN, false, none, THIN, fill);
    }

    /** Legend entry: a marker shape, optionally with a line through it (stroke null: none). */
    public static LegendItem legendMarker(String label, Shape marker, Paint paint, Stroke line) {
        return new LegendItem(label, null, null, null, marker != null, marker == null ? dot(1) : marker, true, paint,
                false, paint, THIN, line != null, new Line2D.Double(-14, 0, 14, 0), line == null ? THIN : line, paint);
    }

    /** Colour for a value in [−1, 1] from {@link #DIVERGING}, linear between stops. */
    public static Color diverging(double value) {
        double v = Math.max(-1, Math.min(1, Double.isNaN(value) ? 0 : value));
        double pos = (v + 1) / 2 * (DIVERGING.size() - 1);
        int i = Math.min((int) Math.floor(pos), DIVERGING.size() - 2);
        double f = pos - i;
        Color a = DIVERGING.get(i);
        Color b = DIVERGING.get(i + 1);
        return new Color(mix(a.getRed(), b.getRed(), f), mix(a.getGreen(), b.getGreen(), f),
                mix(a.getBlue(), b.getBlue(), f));
    }

    /** Ink or white, whichever reads better on {@code fill} (relative luminance, WCAG 2.1). */
    public static Color textOn(Color fill) {
        double l = 0.2126 * linear(fill.getRed()) + 0.7152 * linear(fill.getGreen()) + 0.0722 * linear(fill.getBlue());
        return l > 0.36 ? INK : Color.WHITE;
    }

    /** Applies the shared chart-level look: white, no border, legend and title fonts. */
    public static JFreeChart style(JFreeChart chart) {
        chart.setBackgroundPaint(BACKGROUND);
        chart.setBorderVisible(false);
        chart.setAntiAlias(true);
        chart.setTextAntiAlias(true);
        chart.setPadding(new RectangleInsets(8, 8, 8, 14));
        TextTitle title = chart.getTitle();
        if (title != null) {
            title.setFont(TITLE);
            title.setPaint(INK);
            title.setPadding(new RectangleInsets(2, 4, 8, 4));
        }
        for (int i = 0; i < chart.getSubtitleCount(); i++) styleSubtitle(chart.getSubtitle(i));
        return chart;
    }

    private static void styleSubtitle(Title t) {
        if (t instanceof LegendTitle legend) {
            legend.setItemFont(LEGEND);
            legend.setItemPaint(INK);
            legend.setBackgroundPaint(BACKGROUND);
            legend.setFrame(BlockBorder.NONE);
            legend.setItemLabelPadding(new RectangleInsets(2, 4, 2, 12));
        } else if (t instanceof TextTitle text) {
            text.setFont(NOTE);
            text.setPaint(MUTED_INK);
        }
    }

    /** Plot-level look shared by every XY plot: white field, light dashed grid, framed. */
    public static void style(XYPlot plot) {
        stylePlot(plot);
        plot.setDomainGridlinePaint(GRID);
        plot.setRangeGridlinePaint(GRID);
        plot.setDomainGridlineStroke(HAIRLINE);
        plot.setRangeGridlineStroke(HAIRLINE);
        plot.setAxisOffset(RectangleInsets.ZERO_INSETS);
        for (int i = 0; i < plot.getDomainAxisCount(); i++) if (plot.getDomainAxis(i) != null) style(plot.getDomainAxis(i));
        for (int i = 0; i < plot.getRangeAxisCount(); i++) if (plot.getRangeAxis(i) != null) style(plot.getRangeAxis(i));
    }

    static void stylePlot(Plot plot) {
        plot.setBackgroundPaint(BACKGROUND);
        plot.setOutlinePaint(INK);
        plot.setOutlineStroke(THIN);
        plot.setInsets(new RectangleInsets(4, 4, 4, 4));
    }

    /** Axis fonts and colours. */
    public static void style(ValueAxis axis) {
        axis.setLabelFont(AXIS_LABEL);
        axis.setLabelPaint(INK);
        axis.setTickLabelFont(TICK_LABEL);
        axis.setTickLabelPaint(INK);
        axis.setAxisLinePaint(INK);
        axis.setTickMarkPaint(INK);
        axis.setTickMarkOutsideLength(5f);
        axis.setTickMarkInsideLength(0f);
        axis.setMinorTickMarksVisible(false);
        // Generous label insets: JFreeChart picks the tick spacing from the label size plus
        // these, so this thins out crowded ticks (0.2-steps become 0.5-steps on a tall axis).
        axis.setTickLabelInsets(new RectangleInsets(9, 10, 9, 10));
    }

    /** A number axis with our look and tick labels formatted the same in every locale. */
    public static NumberAxis numberAxis(String label) {
        NumberAxis axis = new NumberAxis(label);
        axis.setStandardTickUnits(tickUnits(false));
        axis.setAutoRangeIncludesZero(false);
        style(axis);
        return axis;
    }

    /** Like {@link #numberAxis(String)} with whole-number ticks only (bin indices). */
    public static NumberAxis integerAxis(String label) {
        NumberAxis axis = numberAxis(label);
        axis.setStandardTickUnits(tickUnits(true));
        return axis;
    }

    /**
     * Tick sizes 1, 2, 2.5, 5 × 10^k with labels that show just the digits needed, no digit
     * grouping ("1500", not "1,500") and the same decimal point in every locale.
     */
    static TickUnits tickUnits(boolean integer) {
        TickUnits units = new TickUnits();
        for (int k = integer ? 0 : -8; k <= 12; k++) {
            for (double m : integer ? new double[] {1, 2, 5} : new double[] {1, 2, 2.5, 5}) {
                double size = m * Math.pow(10, k);
                int decimals = Math.max(0, -k + (m == 2.5 ? 1 : 0));
                DecimalFormat format = new DecimalFormat(decimals == 0 ? "0" : "0." + "0".repeat(decimals),
                        DecimalFormatSymbols.getInstance(Locale.ROOT));
                units.add(new NumberTickUnit(size, format));
            }
        }
        return units;
    }

    private static int mix(int a, int b, double f) {
        return (int) Math.round(a + (b - a) * f);
    }

    private static double linear(int channel) {
        double c = channel / 255.0;
        return c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4);
    }

    private static String pickFamily() {
        // Chosen by glyph coverage, not by name alone: the axis titles carry Greek (m(γγ)).
        String[] wanted = {"DejaVu Sans", "Liberation Sans", "Noto Sans"};
        try {
            List<String> installed = Arrays.asList(
                    GraphicsEnvironment.getLocalGraphicsEnvironment().getAvailableFontFamilyNames(Locale.ROOT));
            for (String family : wanted) {
                if (installed.contains(family) && new Font(family, Font.PLAIN, 12).canDisplayUpTo("γμσΔ±−") < 0) {
                    return family;
                }
            }
        } catch (RuntimeException | Error headlessWithoutFonts) {
            // fall through: the logical font is always there
        }
        return Font.SANS_SERIF;
    }
}
