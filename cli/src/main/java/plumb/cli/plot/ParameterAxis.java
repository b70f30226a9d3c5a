package plumb.cli.plot;

import java.awt.Font;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.Locale;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTickUnit;
import java.util.List;
import org.jfree.chart.axis.SymbolAxis;
import org.jfree.chart.plot.IntervalMarker;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.ui.Layer;

/** Shared pieces of the figures that list parameters down the vertical axis. */
final class ParameterAxis {

    private ParameterAxis() {
    }

    /** Names down the axis, first at the top, one per integer position. */
    static SymbolAxis of(List<String> names) {
        SymbolAxis axis = new SymbolAxis(null, names.toArray(new String[0]));
        axis.setGridBandsVisible(false);
        axis.setInverted(true);
        axis.setAutoRange(false);
        axis.setRange(-0.6, names.size() - 0.4);
        Theme.style(axis);
        axis.setTickLabelFont(names.size() > 40 ? Theme.SMALL : Theme.TICK_LABEL.deriveFont(Font.PLAIN, 13f));
        return axis;
    }

    /** Grey ±2 and ±1 bands and a line at 0 behind pull points. */
    static void addPullBands(XYPlot plot) {
        plot.addRangeMarker(new IntervalMarker(-2, 2, Theme.PULL_BAND_2), Layer.BACKGROUND);
        plot.addRangeMarker(new IntervalMarker(-1, 1, Theme.PULL_BAND_1), Layer.BACKGROUND);
        plot.addRangeMarker(new ValueMarker(0, Theme.MUTED_INK, Theme.HAIRLINE), Layer.BACKGROUND);
    }

    /** Symmetric pull-axis half-range: at least 2.5, wide enough for every point and bar. */
    static double pullReach(double[] pulls, double[] constraints) {
        double reach = 2.5;
        for (int i = 0; i < pulls.length; i++) {
            double c = Double.isNaN(constraints[i]) ? 0 : constraints[i];
            if (!Double.isNaN(pulls[i])) reach = Math.max(reach, Math.abs(pulls[i]) + c + 0.3);
        }
        return Math.ceil(reach * 2) / 2;
    }

    /** A pull axis over ±reach with a tick at every whole number. */
    static NumberAxis pullAxis(String label, double reach) {
        NumberAxis axis = Theme.numberAxis(label);
        axis.setRange(-reach, reach);
        axis.setTickUnit(new NumberTickUnit(reach > 6 ? 2 : 1, new DecimalFormat("0", DecimalFormatSymbols.getInstance(Locale.ROOT))));
        return axis;
    }
}
