package plumb.spark.build;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * Small invented event tables as CSV for the build tests, and a plain-Java reading of the same
 * files that fills the histograms independently of Spark (the reference of the checks).
 *
 * <p>Columns: {@code m} (the observable, 95–145 so that some events fall outside the edges),
 * {@code n_ph} (an integer), {@code iso}, {@code w} (positive weight), {@code w_alt} (a second
 * weight).
 */
final class SmallEvents {

    static final String HEADER = "m,n_ph,iso,w,w_alt";

    private SmallEvents() {
    }

    /** Writes {@code n} events to {@code file}; {@code slope} tilts the m spectrum; weights random around {@code scale}. */
    static Path write(Path file, long seed, int n, double slope, double scale) throws IOException {
        SplittableRandom rng = new SplittableRandom(seed);
        StringBuilder s = new StringBuilder(HEADER).append('\n');
        for (int i = 0; i < n; i++) {
            double m = 95 + 50 * Math.pow(rng.nextDouble(), slope);
            int nph = rng.nextInt(4);
            double iso = rng.nextDouble() * 0.5;
            double w = scale * (0.5 + rng.nextDouble());
            double alt = w * (0.9 + 0.2 * rng.nextDouble());
            s.append(String.format(Locale.ROOT, "%.9f,%d,%.6f,%.12g,%.12g%n", m, nph, iso, w, alt));
        }
        Files.writeString(file, s.toString());
        return file;
    }

    /** One event read back with Double.parseDouble. */
    record Event(double m, int nph, double iso, double w, double alt) { }

    static List<Event> read(Path file) throws IOException {
        List<Event> out = new ArrayList<>();
        List<String> lines = Files.readAllLines(file);
        for (String line : lines.subList(1, lines.size())) {
            String[] f = line.split(",");
            out.add(new Event(Double.parseDouble(f[0]), Integer.parseInt(f[1]), Double.parseDouble(f[2]),
                    Double.parseDouble(f[3]), Double.parseDouble(f[4])));
        }
        return out;
    }

    /**
     * The bin of x by the documented convention, computed plainly: low edge included, −1 when
     * dropped outside, the end bin when folded.
     */
    static int bin(double x, double[] edges, boolean fold) {
        int n = edges.length - 1;
        if (x < edges[0]) return fold ? 0 : -1;
        if (x >= edges[n]) return fold ? n - 1 : -1;
        for (int b = 0; b < n; b++) if (x < edges[b + 1]) return b;
        throw new AssertionError(x);
    }
}
