package plumb.cli.plot;

import java.io.IOException;
import java.nio.file.Path;
import org.jfree.chart.JFreeChart;

/**
 * A built chart with the size it is meant to be drawn at (tall figures such as long pull lists
 * grow with their content).
 */
public record Figure(JFreeChart chart, int width, int height) {

    /** Writes {@code dir/name.png} and {@code dir/name.svg}; see {@link FigureWriter}. */
    public FigureFiles write(Path dir, String name) throws IOException {
        return FigureWriter.write(chart, dir, name, width, height);
    }
}
