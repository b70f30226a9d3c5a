package plumb.cli.plot;

import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.regex.Pattern;
import javax.imageio.ImageIO;
import org.jfree.chart.JFreeChart;
import org.jfree.graphics2d.svg.SVGGraphics2D;
import plumb.cli.io.AtomicFiles;

/**
 * Writes a chart as PNG and SVG, each through a temporary file and a rename.
 *
 * <p>Why JFreeChart (1.5.6) and JFreeSVG (3.4.3): both are long-maintained pure-Java libraries
 * with no native parts, so figures render the same on any headless build machine; XYPlot with
 * interval datasets and CombinedDomainXYPlot give stacked step histograms with a ratio panel
 * sharing the x axis, and horizontal bar/point panels for pulls and impacts, without writing
 * a plotting layer ourselves; JFreeSVG is a Graphics2D that emits real SVG elements, so the
 * vector file is drawn by the very same code as the PNG rather than being an embedded bitmap.
 */
public final class FigureWriter {

    /** PNGs are rendered at this multiple of the nominal size so they stay sharp in print. */
    public static final int PNG_SCALE = 2;

    private static final Pattern SAFE_NAME = Pattern.compile("[A-Za-z0-9][A-Za-z0-9_.-]{0,127}");

    private FigureWriter() {
    }

    /**
     * Renders {@code chart} at {@code width} × {@code height} points into {@code dir/name.png}
     * (at {@link #PNG_SCALE}×) and {@code dir/name.svg}.
     *
     * @param name base file name; letters, digits, '_', '.', '-' (see {@link #safeName(String)})
     * @throws IllegalArgumentException for an unsafe name or a size below 100 points
     * @throws IOException              when a file cannot be written (no partial file is left)
     */
    public static FigureFiles write(JFreeChart chart, Path dir, String name, int width, int height) throws IOException {
        if (!SAFE_NAME.matcher(name).matches()) throw new IllegalArgumentException("unsafe figure name '" + name + "'");
        if (width < 100 || height < 100) throw new IllegalArgumentException("figure size " + width + "x" + height + " too small");
        Rectangle2D area = new Rectangle2D.Double(0, 0, width, height);

        BufferedImage image = new BufferedImage(width * PNG_SCALE, height * PNG_SCALE, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = image.createGraphics();
        try {
            g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
            g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
            g.setRenderingHint(RenderingHints.KEY_STROKE_CONTROL, RenderingHints.VALUE_STROKE_PURE);
            g.setRenderingHint(RenderingHints.KEY_FRACTIONALMETRICS, RenderingHints.VALUE_FRACTIONALMETRICS_ON);
            g.setPaint(Theme.BACKGROUND);
            g.fillRect(0, 0, image.getWidth(), image.getHeight());
            g.scale(PNG_SCALE, PNG_SCALE);
            chart.draw(g, area);
        } finally {
            g.dispose();
        }
        Path png = AtomicFiles.write(dir.resolve(name + ".png"), out -> {
            if (!ImageIO.write(image, "png", out)) throw new IOException("no PNG writer available");
        });

        SVGGraphics2D svg = new SVGGraphics2D(width, height);
        svg.setRenderingHint(RenderingHints.KEY_STROKE_CONTROL, RenderingHints.VALUE_STROKE_PURE);
        chart.draw(svg, area);
        // Our own header: no DOCTYPE, so no reader tries to fetch the SVG 1.0 DTD from the network.
        String document = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n" + svg.getSVGElement() + "\n";
        byte[] bytes = document.getBytes(StandardCharsets.UTF_8);
        Path svgFile = AtomicFiles.write(dir.resolve(name + ".svg"), out -> out.write(bytes));
        return new FigureFiles(name, png, svgFile, width, height);
    }

    /** {@link #write(JFreeChart, Path, String, int, int)} at the {@link Theme} default size. */
    public static FigureFiles write(JFreeChart chart, Path dir, String name) throws IOException {
        return write(chart, dir, name, Theme.WIDTH, Theme.HEIGHT);
    }

    /**
     * Turns any text (a channel name from a model file) into a safe file name: characters other
     * than letters, digits, '_', '.', '-' become '_', a leading non-alphanumeric gets a 'x'
     * prefix, and the result is cut to 100 characters.
     */
    public static String safeName(String text) {
        StringBuilder b = new StringBuilder();
        for (int i = 0; i < text.length() && b.length() < 100; i++) {
            char c = text.charAt(i);
            boolean ok = (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9')
                    || c == '_' || c == '.' || c == '-';
            b.append(ok ? c : '_');
        }
        if (b.length() == 0 || !Character.isLetterOrDigit(b.charAt(0))) b.insert(0, 'x');
        return b.toString();
    }
}
