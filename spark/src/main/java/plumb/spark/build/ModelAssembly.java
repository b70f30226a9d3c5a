package plumb.spark.build;

import plumb.cli.build.CutFlowRow;
import plumb.engine.model.Channel;
import plumb.engine.model.Model;
import plumb.engine.model.Sample;
import plumb.engine.model.Variation;
import plumb.engine.tooling.Symmetrisation;
import plumb.engine.tooling.VariationEdits;
import plumb.spark.build.BuildSpec.Region;
import plumb.spark.build.BuildSpec.SampleSpec;
import plumb.spark.build.BuildSpec.Source;
import plumb.spark.build.BuildSpec.TidyChoice;
import plumb.spark.build.BuildSpec.VariationSpec;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Collects the histograms of a build and turns them into a model: one channel per region, the
 * samples that appear in it, their variations after the per-variation options (the edits of
 * {@code plumb tidy}, {@link VariationEdits}), the observed counts of unblinded regions. Also
 * keeps the cut-flow rows, the warnings and one line per change made to a variation.
 */
final class ModelAssembly {

    /** A shape part whose ratio to nominal is flat within this after splitting becomes a pure norm part. */
    static final double FLAT = 1e-6;

    private final BuildSpec spec;
    private final Map<String, double[]> yields = new HashMap<>();      // key sample/region
    private final Map<String, double[]> squares = new HashMap<>();
    private final Map<String, double[][]> sides = new HashMap<>();     // key sample/region/parameter → {down, up}
    private final Map<String, double[]> observed = new HashMap<>();    // key region
    private final List<CutFlowRow> cutFlow = new ArrayList<>();
    private final List<String> warnings = new ArrayList<>();
    private final List<String> changes = new ArrayList<>();

    ModelAssembly(BuildSpec spec) {
        this.spec = spec;
    }

    /** The regions a sample appears in, in the description's order. */
    List<Region> regions(SampleSpec s) {
        return spec.regions().stream().filter(r -> s.regions() == null || s.regions().contains(r.name())).toList();
    }

    /** The regions a variation of the sample applies to. */
    List<Region> regions(SampleSpec s, VariationSpec v) {
        return regions(s).stream().filter(r -> v.regions() == null || v.regions().contains(r.name())).toList();
    }

    /**
     * The nominal pass of a sample: yields, Σw², the weight variations (in the job's weight order)
     * and its cut flow; {@code regions} are the pass's first entries.
     */
    void nominal(SampleSpec s, List<Region> regions, HistogramJob job, HistogramJob.Sums sums, CutFlow.Counts flow) {
        int[] off = job.offsets();
        for (int r = 0; r < regions.size(); r++) {
            Region region = regions.get(r);
            int n = region.bins();
            double[] y = sums.region(sums.sums()[0], off, r, n);
            yields.put(key(s, region), y);
            squares.put(key(s, region), sums.region(sums.squares()[0], off, r, n));
            int k = 1;
            for (VariationSpec v : s.variations()) {
                if (v.source() != Source.WEIGHTS) continue;
                double[] up = v.up() == null ? y : sums.region(sums.sums()[k++], off, r, n);
                double[] down = v.down() == null ? y : sums.region(sums.sums()[k++], off, r, n);
                if (v.regions() == null || v.regions().contains(region.name())) {
                    sides.put(key(s, region) + "/" + v.parameter(), new double[][] {down, up});
                }
            }
            long entries = 0;
            for (int b = 0; b < n; b++) entries += sums.entries()[off[r] + b];
            flowRows(region, s.name(), flow.weighted()[r], flow.raw()[r], sum(y), entries);
        }
    }

    /** The histograms of an observable- or table-based variation ({@code null} side: nominal). */
    void variation(SampleSpec s, VariationSpec v, List<Region> regions, double[][] up, double[][] down) {
        for (int r = 0; r < regions.size(); r++) {
            double[] nominal = yields.get(key(s, regions.get(r)));
            sides.put(key(s, regions.get(r)) + "/" + v.parameter(),
                    new double[][] {down == null ? nominal : down[r], up == null ? nominal : up[r]});
        }
    }

    /** The observed counts and the data's cut flow. */
    void data(List<Region> regions, HistogramJob job, HistogramJob.Sums sums, CutFlow.Counts flow) {
        int[] off = job.offsets();
        for (int r = 0; r < regions.size(); r++) {
            double[] n = sums.region(sums.sums()[0], off, r, regions.get(r).bins());
            observed.put(regions.get(r).name(), n);
            flowRows(regions.get(r), "data", flow.weighted()[r], flow.raw()[r], sum(n), (long) sum(n));
        }
    }

    private void flowRows(Region region, String sample, double[] weighted, long[] raw, double binned, long binnedRaw) {
        for (int k = 0; k < weighted.length; k++) {
            cutFlow.add(new CutFlowRow(region.name(), sample, region.steps().get(k).name(), weighted[k], raw[k]));
        }
        cutFlow.add(new CutFlowRow(region.name(), sample, CutFlowRow.IN_THE_BINS, binned, binnedRaw));
        if (raw[raw.length - 1] == 0) {
            warnings.add("region " + region.name() + " keeps no event of " + (sample.equals("data") ? "the data" : "sample " + sample));
        }
    }

    List<CutFlowRow> cutFlow() {
        return cutFlow;
    }

    List<String> warnings() {
        return warnings;
    }

    List<String> changes() {
        return changes;
    }

    /** The model: regions as channels, samples in description order, tidied variations. */
    Model model() {
        List<Channel> channels = new ArrayList<>();
        for (Region region : spec.regions()) {
            List<Sample> samples = new ArrayList<>();
            for (SampleSpec s : spec.samples()) {
                if (!regions(s).contains(region)) continue;
                double[] y = nonNegative(yields.get(key(s, region)), s.name(), region.name(), "nominal");
                double[] mcError = null;
                if (s.mcStatistics()) {
                    mcError = new double[y.length];
                    double[] q = squares.get(key(s, region));
                    for (int b = 0; b < y.length; b++) mcError[b] = Math.sqrt(q[b]);
                }
                List<Variation> variations = new ArrayList<>();
                for (VariationSpec v : s.variations()) {
                    if (!regions(s, v).contains(region)) continue;
                    Variation built = variation(s, v, region, y);
                    if (built != null) variations.add(built);
                }
                samples.add(new Sample(s.name(), y, mcError, s.factors(), variations));
            }
            double[] obs = region.blinded() ? null : observed.get(region.name());
            channels.add(new Channel(region.name(), region.title(), region.edges(), obs, samples));
        }
        return new Model(Model.FORMAT, spec.name(), spec.description(), spec.poi(), channels, null, null, spec.labels(), null);
    }

    /** One variation in one region after its options; null when nothing of it is left. */
    private Variation variation(SampleSpec s, VariationSpec v, Region region, double[] nominal) {
        String where = region.name() + "/" + s.name() + "/" + v.parameter() + ": ";
        Variation out;
        if (v.source() == Source.NORM) {
            out = new Variation(v.parameter(), new Variation.NormEffect(v.kappaDown(), v.kappaUp()), null, null, null);
        } else {
            double[][] ds = sides.get(key(s, region) + "/" + v.parameter());
            double[] down = nonNegative(ds[0], s.name(), region.name(), v.parameter() + " down");
            double[] up = nonNegative(ds[1], s.name(), region.name(), v.parameter() + " up");
            out = new Variation(v.parameter(), null, new Variation.ShapeEffect(down, up), null, null);
        }
        TidyChoice t = v.tidy();
        if (t.smooth()) out = logged(VariationEdits.smooth(out, nominal), where);
        if (out != null && t.symmetrise() != null) {
            out = logged(VariationEdits.symmetrise(out, nominal, Symmetrisation.fromName(t.symmetrise())), where);
        }
        if (out != null && t.splitNorm()) out = splitNormAndShape(out, nominal, where);
        if (out != null && (t.pruneNorm() > 0 || t.pruneShape() > 0)) {
            out = logged(VariationEdits.prune(out, nominal, t.pruneNorm(), t.pruneShape()), where);
        }
        if (out != null && !VariationEdits.hasEffect(out, nominal)) {
            changes.add(where + "no effect on any yield; left out");
            return null;
        }
        return out;
    }

    /**
     * Splits a shape part into a norm part κ = Σ alternative / Σ nominal (per side) and a shape part
     * scaled to the nominal total; a shape part left flat is turned into the norm part alone by the
     * shared edit ({@link VariationEdits#splitNorm}).
     */
    private Variation splitNormAndShape(Variation v, double[] nominal, String where) {
        if (v.shape() == null) return v;
        double n = sum(nominal), u = sum(v.shape().up()), d = sum(v.shape().down());
        if (!(n > 0 && u > 0 && d > 0)) return v;
        double ku = u / n, kd = d / n;
        double[] up = scaled(v.shape().up(), 1 / ku), down = scaled(v.shape().down(), 1 / kd);
        Variation.NormEffect norm = v.norm() == null ? new Variation.NormEffect(kd, ku)
                : new Variation.NormEffect(v.norm().down() * kd, v.norm().up() * ku);
        Variation split = new Variation(v.parameter(), norm, new Variation.ShapeEffect(down, up), null, null);
        changes.add(where + String.format(Locale.ROOT, "split into norm (up %.4g, down %.4g) and a shape of the nominal total", ku, kd));
        VariationEdits.Edit flat = VariationEdits.splitNorm(new Variation(v.parameter(), null, split.shape(), null, null),
                nominal, FLAT);
        if (!flat.changed()) return split;
        changes.add(where + "shape left flat after the split; norm part only");
        return new Variation(v.parameter(), norm, null, null, null);
    }

    private Variation logged(VariationEdits.Edit e, String where) {
        if (e.changed()) changes.add(where + e.change());
        return e.variation();
    }

    /** Negative sums (events of negative weight) are set to 0, with a warning: the model needs yields ≥ 0. */
    private double[] nonNegative(double[] y, String sample, String region, String what) {
        double[] out = y.clone();
        int clipped = 0;
        for (int b = 0; b < out.length; b++) {
            if (out[b] < 0) {
                out[b] = 0;
                clipped++;
            }
        }
        if (clipped > 0) {
            warnings.add(String.format(Locale.ROOT, "region %s, sample %s, %s: %d bin%s with a negative sum of weights set to 0",
                    region, sample, what, clipped, clipped == 1 ? "" : "s"));
        }
        return out;
    }

    private static String key(SampleSpec s, Region r) {
        return s.name() + "/" + r.name();
    }

    static double sum(double[] a) {
        double t = 0;
        for (double v : a) t += v;
        return t;
    }

    private static double[] scaled(double[] a, double f) {
        double[] out = new double[a.length];
        for (int i = 0; i < a.length; i++) out[i] = a[i] * f;
        return out;
    }
}
