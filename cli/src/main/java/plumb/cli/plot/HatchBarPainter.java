package plumb.cli.plot;

import java.awt.Graphics2D;
import java.awt.Paint;
import java.awt.Shape;
import java.awt.Stroke;
import java.awt.geom.Line2D;
import java.awt.geom.RectangularShape;
import org.jfree.chart.renderer.xy.XYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.chart.ui.RectangleEdge;

/**
 * Paints bars as a translucent fill under diagonal hatching, for uncertainty bands: the hatch
 * stays visible in grey print and over any stack colour. Drawn as plain lines, so the SVG keeps
 * it as vector strokes (no texture paint).
 */
final class HatchBarPainter implements XYBarPainter {

    private static final double SPACING = 6.0;

    private final Paint fill;
    private final Paint hatch;
    private final Stroke stroke;

    HatchBarPainter(Paint fill, Paint hatch, Stroke stroke) {
        this.fill = fill;
        this.hatch = hatch;
        this.stroke = stroke;
    }

    @Override
    public void paintBar(Graphics2D g2, XYBarRenderer renderer, int row, int column, RectangularShape bar,
                         RectangleEdge base) {
        if (bar.getWidth() <= 0 || bar.getHeight() <= 0) return;
        g2.setPaint(fill);
        g2.fill(bar);
        Shape oldClip = g2.getClip();
        g2.clip(bar);
        g2.setPaint(hatch);
        g2.setStroke(stroke);
        double x0 = bar.getMinX();
        double y0 = bar.getMinY();
        double h = bar.getHeight();
        // Lines rising to the right at 45°, anchored to a page-wide lattice so that hatching
        // continues seamlessly across neighbouring bins.
        double start = Math.floor((x0 + y0) / SPACING) * SPACING;
        double end = bar.getMaxX() + bar.getMaxY();
        for (double s = start; s <= end; s += SPACING) {
            g2.draw(new Line2D.Double(s - y0, y0, s - (y0 + h), y0 + h));
        }
        g2.setClip(oldClip);
    }

    @Override
    public void paintBarShadow(Graphics2D g2, XYBarRenderer renderer, int row, int column, RectangularShape bar,
                               RectangleEdge base, boolean pegShadow) {
        // no shadows in our figures
    }
}
