package plumb.engine.inference;

import plumb.engine.compile.CompiledModel;
import plumb.engine.likelihood.BinnedNll;
import plumb.engine.likelihood.DataSet;

import java.util.ArrayList;
import java.util.List;

/**
 * Pre-fit and post-fit yields with their uncertainties by linear propagation, σ² = J C Jᵀ
 * (docs/cli-contract.md, {@code plumb yields}): J the derivative of each yield by the parameters,
 * C diagonal with each constrained parameter's pre-fit width squared (pre-fit, at the nominal
 * values; free and held parameters left out), or the full post-fit covariance with the
 * MC-statistics γ and all correlations (post-fit, at the best fit).
 *
 * <p>J by the model parameters is taken by central finite differences of
 * {@link BinnedNll#expectedEntries}: the likelihood's analytic derivatives live in its private
 * work arrays, and differencing the public yields keeps one definition of ν; with a step of 1e-5
 * of the parameter's scale the error of a smooth interpolation is O(h²) ≈ 1e-10 relative, far
 * below the two digits quoted. At a kink (a {@code linear} term at θ = 0) the central difference is
 * the mean of the two one-sided slopes. J by γ_b is analytic: ν_sb/γ_b for the samples it scales.
 */
public final class Yields {

    private Yields() {
    }

    /**
     * Yields per bin with errors, and their sum over the channel's bins with its error (the
     * correlations between bins included).
     */
    public record Band(double[] values, double[] errors, double sum, double sumError) { }

    /** One sample of a channel, pre-fit and post-fit (postfit null when no fit was given). */
    public record SampleYields(String name, Band prefit, Band postfit) { }

    /**
     * One channel: its samples, their total, and the counts of the data set fitted (null for a
     * channel the data set leaves out, e.g. blinded).
     */
    public record ChannelYields(String name, double[] observed, List<SampleYields> samples, Band totalPrefit,
                                Band totalPostfit) { }

    /**
     * Pre-fit and post-fit yields of every channel of the problem around its best fit.
     *
     * @param best       the converged best fit of the problem
     * @param postfitCov full post-fit covariance ({@link Covariances#full}), or null for NaN post-fit errors
     */
    public static List<ChannelYields> compute(Problem p, FitResult best, double[] postfitCov) {
        return compute(p.model(), p.data(), p.startValues(), best.held(), best, postfitCov);
    }

    /**
     * Pre-fit and post-fit yields of every channel.
     *
     * @param data          the data set fitted (its counts are reported as observed)
     * @param prefitValues  nominal values, held ones applied (nAll)
     * @param held          parameters held in the fit (nAll): no pre-fit uncertainty either
     * @param best          the best fit, or null for pre-fit only
     * @param postfitCov    full post-fit covariance (nAll², {@link Covariances#full}); null gives NaN post-fit errors
     */
    public static List<ChannelYields> compute(CompiledModel m, DataSet data, double[] prefitValues, boolean[] held,
                                              FitResult best, double[] postfitCov) {
        int nAll = m.nAll;
        MemoryBudget.requireSquares(nAll, 2, "the yield errors of " + nAll + " parameters (MC statistics included)");
        double[] prefitCov = new double[nAll * nAll];
        for (int i = 0; i < nAll; i++) {
            if (m.constrained(i) && !held[i]) prefitCov[i * nAll + i] = m.prefitWidth[i] * m.prefitWidth[i];
        }
        Propagation pre = Propagation.at(m, data, prefitValues, prefitCov);
        Propagation post = best == null ? null : Propagation.at(m, data, best.values(), postfitCov);
        List<ChannelYields> out = new ArrayList<>(m.nChannels);
        for (int c = 0; c < m.nChannels; c++) {
            int b0 = m.channelBinStart[c], nb = m.bins(c);
            double[] observed = null;
            if (data.channelIncluded()[c]) {
                observed = new double[nb];
                System.arraycopy(data.counts(), b0, observed, 0, nb);
            }
            List<SampleYields> samples = new ArrayList<>();
            List<Integer> members = new ArrayList<>();
            for (int s = 0; s < m.nSamples; s++) {
                if (m.sampleChannel[s] != c) continue;
                members.add(s);
                samples.add(new SampleYields(m.sampleNames[s], pre.band(c, new int[] {s}),
                        post == null ? null : post.band(c, new int[] {s})));
            }
            int[] all = members.stream().mapToInt(Integer::intValue).toArray();
            out.add(new ChannelYields(m.channelNames[c], observed, List.copyOf(samples), pre.band(c, all),
                    post == null ? null : post.band(c, all)));
        }
        return out;
    }

    /** Yields and their Jacobian at one point, with the covariance to propagate. */
    private static final class Propagation {
        final CompiledModel m;
        final double[] nu;
        /** ∂ν_e/∂θ_i for model parameters, row i: jac[i * entries + e]. */
        final double[] jac;
        final double[] gammaValue;
        final double[] cov;
        final int entries;

        private Propagation(CompiledModel m, double[] nu, double[] jac, double[] gammaValue, double[] cov) {
            this.m = m;
            this.nu = nu;
            this.jac = jac;
            this.gammaValue = gammaValue;
            this.cov = cov;
            this.entries = nu.length;
        }

        static Propagation at(CompiledModel m, DataSet data, double[] values, double[] cov) {
            BinnedNll nll = new BinnedNll(m, data, true);   // explicit layout: γ taken from the point
            int entries = m.nominalYield.length;
            double[] x = values.clone();
            double[] nu = new double[entries];
            nll.expectedEntries(x, nu);
            double[] jac = new double[m.nParams * entries];
            double[] up = new double[entries], down = new double[entries];
            for (int i = 0; i < m.nParams; i++) {
                boolean varies = false;
                for (int c = 0; c < m.nChannels && !varies; c++) varies = contains(m.channelParams[c], i);
                if (!varies) continue;
                double scale = Double.isFinite(m.prefitWidth[i]) ? m.prefitWidth[i] : Math.max(1, Math.abs(values[i]));
                double h = 1e-5 * scale;
                double v = values[i];
                x[i] = v + h;
                nll.expectedEntries(x, up);
                x[i] = v - h;
                nll.expectedEntries(x, down);
                x[i] = v;
                int row = i * entries;
                for (int e = 0; e < entries; e++) jac[row + e] = (up[e] - down[e]) / (2 * h);
            }
            double[] gammaValue = new double[m.nGamma];
            System.arraycopy(values, m.nParams, gammaValue, 0, m.nGamma);
            return new Propagation(m, nu, jac, gammaValue, cov);
        }

        /** The summed yield of the given samples of channel c per bin and over the bins, with errors. */
        Band band(int c, int[] samples) {
            int b0 = m.channelBinStart[c], nb = m.bins(c);
            int[] local = m.channelParams[c];
            int L = local.length;
            // Index set of the row vectors: the channel's parameters, then its γ.
            int nG = 0;
            for (int b = 0; b < nb; b++) if (m.binGamma[b0 + b] >= 0) nG++;
            int[] index = new int[L + nG];
            System.arraycopy(local, 0, index, 0, L);
            int[] gammaSlot = new int[nb];
            for (int b = 0, g = L; b < nb; b++) {
                gammaSlot[b] = -1;
                if (m.binGamma[b0 + b] >= 0) {
                    gammaSlot[b] = g;
                    index[g++] = m.nParams + m.binGamma[b0 + b];
                }
            }
            int n = index.length;
            double[] sub = new double[n * n];
            boolean haveCov = cov != null;
            if (haveCov) {
                for (int a = 0; a < n; a++) {
                    int row = index[a] * m.nAll;
                    for (int bb = 0; bb < n; bb++) sub[a * n + bb] = cov[row + index[bb]];
                }
            }
            double[] values = new double[nb], errors = new double[nb];
            double[] row = new double[n], sumRow = new double[n];
            double sum = 0;
            for (int b = 0; b < nb; b++) {
                java.util.Arrays.fill(row, 0);
                double y = 0;
                for (int s : samples) {
                    int e = m.sampleEntryStart[s] + b;
                    y += nu[e];
                    for (int a = 0; a < L; a++) row[a] += jac[local[a] * entries + e];
                    if (m.sampleMcStat[s] && gammaSlot[b] >= 0) {
                        double gamma = gammaValue[m.binGamma[b0 + b]];
                        if (gamma > 0) row[gammaSlot[b]] += nu[e] / gamma;
                    }
                }
                values[b] = y;
                sum += y;
                errors[b] = haveCov ? Math.sqrt(Math.max(quadratic(sub, row, n), 0)) : Double.NaN;
                for (int a = 0; a < n; a++) sumRow[a] += row[a];
            }
            double sumError = haveCov ? Math.sqrt(Math.max(quadratic(sub, sumRow, n), 0)) : Double.NaN;
            return new Band(values, errors, sum, sumError);
        }

        private static double quadratic(double[] a, double[] v, int n) {
            double q = 0;
            for (int i = 0; i < n; i++) {
                double vi = v[i];
                if (vi == 0) continue;
                int row = i * n;
                double acc = 0;
                for (int j = 0; j < n; j++) acc += a[row + j] * v[j];
                q += vi * acc;
            }
            return q;
        }

        private static boolean contains(int[] sorted, int v) {
            return java.util.Arrays.binarySearch(sorted, v) >= 0;
        }
    }
}
