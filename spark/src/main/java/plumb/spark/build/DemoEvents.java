package plumb.spark.build;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.DiscreteSampler;
import org.apache.commons.rng.sampling.distribution.PoissonSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;

import java.util.ArrayList;
import java.util.List;

/**
 * Invented events of the demonstration scenario: a collision ring of our own making (the Lumen
 * Ring), its detector (Tamarind), and a narrow resonance decaying to two photons at 640 GeV. Pure
 * Java, no Spark: the same seed gives the same events, row for row.
 *
 * <p>Four simulated processes, each with its own random stream drawn from (seed, process):
 * <ul>
 *   <li>{@code signal}: the resonance, m_γγ a Gaussian core (σ = 7.5 GeV) with a wider tail;</li>
 *   <li>{@code continuum}: two real photons, a falling m_γγ spectrum (power law);</li>
 *   <li>{@code photon_jet}: one real photon and a jet taken for one, steeper;</li>
 *   <li>{@code dijet}: two jets taken for photons, steeper still.</li>
 * </ul>
 * A jet taken for a photon is less isolated and less photon-like in its identification score than
 * a real photon, which is what separates the isolated signal region from the control region. The
 * pseudo-data are drawn from the sum: for each process a Poisson number of events around its
 * expected total (the signal at its nominal strength), each with weight one.
 */
final class DemoEvents {

    /** Mass of the invented resonance, GeV. */
    static final double MASS = 640;
    /** Relative photon energy-scale shift of the up and down observables. */
    static final double ENERGY_SCALE = 0.005;
    /** Mean number of collision vertices per crossing (pile-up). */
    static final double MEAN_VERTICES = 30;

    /** One simulated process: name, events generated, expected events before any selection. */
    record Process(String name, int generated, double expected, int stream) { }

    /** The processes of the demo: sizes chosen so that the whole demo runs in seconds. */
    static final List<Process> PROCESSES = List.of(
            new Process("signal", 3000, 110, 1),
            new Process("continuum", 16000, 7200, 2),
            new Process("photon_jet", 9000, 5400, 3),
            new Process("dijet", 9000, 7000, 4));

    /** Columns of a simulated table, in order; {@link #DATA_COLUMNS} are those of the pseudo-data. */
    static final List<String> MC_COLUMNS = List.of("m_gg", "m_gg_scale_up", "m_gg_scale_down", "pt1", "pt2", "iso1", "iso2",
            "id1", "id2", "n_photons", "n_vertices", "w", "w_photon_id_up", "w_photon_id_down", "w_pileup_up", "w_pileup_down");
    static final List<String> DATA_COLUMNS = List.of("m_gg", "pt1", "pt2", "iso1", "iso2", "id1", "id2", "n_photons", "n_vertices");
    /** Columns holding integers ({@code Integer} in the rows); the others are {@code Double}. */
    static final List<String> INTEGER_COLUMNS = List.of("n_photons", "n_vertices");

    private DemoEvents() {
    }

    /** The simulated events of {@code p}: one {@code Object[]} per event, in {@link #MC_COLUMNS} order. */
    static List<Object[]> simulated(Process p, long seed) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {seed, p.stream()});
        Generator g = new Generator(p.name(), rng);
        double perEvent = p.expected() / p.generated();
        List<Object[]> rows = new ArrayList<>(p.generated());
        for (int i = 0; i < p.generated(); i++) {
            Event e = g.next();
            // generator weights scatter around 1 (mean 1), so the sums of squares differ from the counts
            double w = perEvent * (0.85 + 0.3 * rng.nextDouble());
            rows.add(new Object[] {e.m, e.m * (1 + ENERGY_SCALE), e.m * (1 - ENERGY_SCALE), e.pt1, e.pt2, e.iso1, e.iso2,
                e.id1, e.id2, e.photons, e.vertices, w, e.idUp, e.idDown, e.pileupUp, e.pileupDown});
        }
        return rows;
    }

    /**
     * Pseudo-data: for every process a Poisson number of events around its expected total, drawn
     * with the process's generator on a stream of its own; rows in {@link #DATA_COLUMNS} order.
     */
    static List<Object[]> pseudoData(long seed) {
        List<Object[]> rows = new ArrayList<>();
        for (Process p : PROCESSES) {
            UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {seed, 100 + p.stream()});
            int n = PoissonSampler.of(rng, p.expected()).sample();
            Generator g = new Generator(p.name(), rng);
            for (int i = 0; i < n; i++) {
                Event e = g.next();
                rows.add(new Object[] {e.m, e.pt1, e.pt2, e.iso1, e.iso2, e.id1, e.id2, e.photons, e.vertices});
            }
        }
        return rows;
    }

    /** One event's quantities before they become a row. */
    private static final class Event {
        double m, pt1, pt2, iso1, iso2, id1, id2, idUp, idDown, pileupUp, pileupDown;
        int photons, vertices;
    }

    /** Draws events of one process. */
    private static final class Generator {
        private final String process;
        private final UniformRandomProvider rng;
        private final ZigguratSampler.NormalizedGaussian gauss;
        private final DiscreteSampler vertices;

        Generator(String process, UniformRandomProvider rng) {
            this.process = process;
            this.rng = rng;
            this.gauss = ZigguratSampler.NormalizedGaussian.of(rng);
            this.vertices = PoissonSampler.of(rng, MEAN_VERTICES);
        }

        Event next() {
            Event e = new Event();
            boolean fake1, fake2;
            switch (process) {
                case "signal" -> {
                    // Gaussian core and a wider tail (photons that lost some energy)
                    e.m = MASS + (rng.nextDouble() < 0.85 ? 7.5 : 20) * gauss.sample();
                    fake1 = false;
                    fake2 = false;
                }
                case "continuum" -> {
                    e.m = fallingMass(5);
                    fake1 = false;
                    fake2 = false;
                }
                case "photon_jet" -> {
                    e.m = fallingMass(6);
                    boolean firstIsJet = rng.nextBoolean();
                    fake1 = firstIsJet;
                    fake2 = !firstIsJet;
                }
                case "dijet" -> {
                    e.m = fallingMass(7);
                    fake1 = true;
                    fake2 = true;
                }
                default -> throw new IllegalArgumentException("no process " + process);
            }
            // transverse momenta as fractions of the mass; the leading photon first
            double a = e.m * (0.33 + 0.27 * rng.nextDouble());
            double b = e.m * (0.18 + 0.27 * rng.nextDouble());
            e.pt1 = Math.max(a, b);
            e.pt2 = Math.min(a, b);
            e.vertices = vertices.sample();
            // pile-up adds energy around the photons: more vertices, less isolated
            double pileupIso = 0.05 * (e.vertices - MEAN_VERTICES);
            e.iso1 = isolation(fake1) + pileupIso;
            e.iso2 = isolation(fake2) + pileupIso;
            e.id1 = identification(fake1);
            e.id2 = identification(fake2);
            int extra = rng.nextDouble() < 0.04 ? 1 : 0;
            int jets = (fake1 ? 1 : 0) + (fake2 ? 1 : 0);
            // a jet is not always reconstructed as a photon candidate at all
            e.photons = 2 + extra - (jets > 0 && rng.nextDouble() < 0.15 * jets ? 1 : 0);
            // photon identification efficiency: a per-photon uncertainty larger at low momentum
            double d1 = fake1 ? 0 : idUncertainty(e.pt1);
            double d2 = fake2 ? 0 : idUncertainty(e.pt2);
            e.idUp = (1 + d1) * (1 + d2);
            e.idDown = (1 - d1) * (1 - d2);
            // pile-up reweighting: the profile's slope varied
            double slope = 0.012 * (e.vertices - MEAN_VERTICES);
            e.pileupUp = 1 + slope;
            e.pileupDown = 1 - slope;
            return e;
        }

        /** A falling spectrum above 480 GeV: density ∝ m^−(k+1), drawn by inverting its distribution. */
        private double fallingMass(double k) {
            return 480 * Math.pow(1 - rng.nextDouble(), -1 / k);
        }

        /** Isolation energy in GeV: small for a photon, larger for a jet. */
        private double isolation(boolean jet) {
            return -(jet ? 6.0 : 1.2) * Math.log(1 - rng.nextDouble());
        }

        /** An identification score in [0, 1]: near 1 for a photon, spread low for a jet. */
        private double identification(boolean jet) {
            double u = rng.nextDouble();
            return jet ? Math.pow(u, 0.8) : 1 - 0.35 * u * u * u;
        }

        private static double idUncertainty(double pt) {
            return 0.01 + 2.0 / pt;
        }
    }
}
