package plumb.cli.plot;

import java.util.ArrayList;
import java.util.List;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.data.xy.XYIntervalSeries;
import org.jfree.data.xy.XYIntervalSeriesCollection;

/**
 * Nuisance-parameter pulls, (value − pre-fit value)/pre-fit width, one row per parameter, each
 * with its post-fit constraint as a horizontal error bar, over grey ±1 and ±2 bands.
 */
public final class PullsFigure {

    private PullsFigure() {
    }

    /** Builds the figure; its height grows with the number of parameters. */
    public static Figure of(PullMarks in) {
        List<String> names = new ArrayList<>();
        int n = in.entries().size();
        double[] pulls = new double[n];
        double[] constraints = new double[n];
        for (int i = 0; i < n; i++) {
            PullMarks.Mark e = in.entries().get(i);
            names.add(e.name());
            pulls[i] = e.pull();
            constraints[i] = e.constraint();
        }
        XYPlot plot = new XYPlot();
        plot.setOrientation(PlotOrientation.HORIZONTAL);
        plot.setDomainAxis(ParameterAxis.of(names));
        double reach = ParameterAxis.pullReach(pulls, constraints);
        plot.setRangeAxis(ParameterAxis.pullAxis("Pull: (fitted − pre-fit) / pre-fit width", reach));
        plot.setDataset(pullPoints(pulls, constraints));
        plot.setRenderer(pullRenderer());
        ParameterAxis.addPullBands(plot);
        Theme.style(plot);
        plot.setDomainGridlinesVisible(false);

        JFreeChart chart = new JFreeChart(in.title() == null ? "Nuisance-parameter pulls" : in.title(),
                Theme.TITLE, plot, false);
        Theme.style(chart);
        return new Figure(chart, 820, Math.max(360, 130 + 24 * n));
    }

    static XYIntervalSeriesCollection pullPoints(double[] pulls, double[] constraints) {
        XYIntervalSeries s = new XYIntervalSeries("Pull", false, true);
        for (int i = 0; i < pulls.length; i++) {
            if (Double.isNaN(pulls[i])) continue;
            double c = Double.isNaN(constraints[i]) ? 0 : constraints[i];
            s.add(i, i, i, pulls[i], pulls[i] - c, pulls[i] + c);
        }
        XYIntervalSeriesCollection d = new XYIntervalSeriesCollection();
        d.addSeries(s);
        return d;
    }

    static XYErrorRenderer pullRenderer() {
        XYErrorRenderer r = new XYErrorRenderer();
        r.setDrawXError(false);
        r.setCapLength(7);
        r.setErrorStroke(Theme.ERROR_BAR);
        r.setErrorPaint(Theme.INK);
        r.setSeriesPaint(0, Theme.INK);
        r.setSeriesShape(0, Theme.dot(9));
        r.setDefaultSeriesVisibleInLegend(false);
        return r;
    }
}
