package org.stillfield.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.EnumSet;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.Set;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.spec.RunSpec;

/**
 * Streaming estimator of the two-point tensors Ĉ^F_ij(r, r′) = (1/N) Σ_s F_i(r) F_j(r′) over an
 * ensemble, for fixed point pairs, compared with the analytic mode sum.
 *
 * <p>The vacuum and thermal fields have known zero mean, so no mean is subtracted. For Gaussian
 * data this estimator is unbiased with variance (C_ii(r,r) C_jj(r′,r′) + C_ij(r,r′)²)/N (Isserlis,
 * Biometrika 12, 134 (1918), source from memory; REFERENCE-VALUES.md §8), and the standard error is
 * taken from the analytic C, not from the data, so it does not fluctuate with the sample.
 *
 * <p>Accumulation: each batch is summed in plain double (at most a few hundred terms), and the batch
 * sums are added to the totals with Neumaier's compensated summation, so the totals stay accurate to
 * a few ulps for any N.
 *
 * <p>Verdict: with K tested rows and false-alarm rate α, a row fails when |z| &gt; z* = Φ⁻¹(1 − α/(2K))
 * (two-sided normal, Bonferroni). By the union bound the chance that a correct ensemble fails is at
 * most α, however strongly the rows are correlated (the nine components of one pair and
 * neighbouring points are). Each z is only approximately normal: the estimator is a mean of N
 * products whose skewness falls like 1/√N, so the threshold is trusted for N ≥
 * {@value #MIN_TRUSTED_SAMPLES}; below that the result carries a warning. Rows whose analytic
 * C_ii(r,r)·C_jj(r′,r′) is exactly zero (a component that vanishes identically, e.g. tangential E
 * on a wall) are flagged and not tested; a correct ensemble gives exactly 0 there, so a nonzero
 * estimate on such a row fails the verdict.
 *
 * <p>Pairs with a point outside the cavity (masked grid points, whose values are NaN) are left out
 * of the table with a warning.
 */
public final class CorrelationEstimator implements EnsembleSink {
    /** Sample count below which the normal approximation of z is not trusted. */
    public static final long MIN_TRUSTED_SAMPLES = 100;

    private final List<RunSpec.PointPair> pairs;
    private final Field[] fields;
    private final int pointCount;
    /** [field][pair][3i + j]: running sum and its Neumaier compensation. */
    private final double[][][] sum;
    private final double[][][] comp;
    private long samples;

    /**
     * @param pairs point pairs by global index, each index in 0..pointCount−1
     * @param fields fields to estimate, non-empty
     * @param pointCount number of evaluation points in every batch
     */
    public CorrelationEstimator(List<RunSpec.PointPair> pairs, Set<Field> fields, int pointCount) {
        Objects.requireNonNull(pairs, "pairs");
        Objects.requireNonNull(fields, "fields");
        if (fields.isEmpty()) {
            throw new IllegalArgumentException("fields must name at least one of A, E, B");
        }
        if (pointCount < 1) {
            throw new IllegalArgumentException("pointCount must be >= 1: " + pointCount);
        }
        this.pairs = List.copyOf(pairs);
        for (int k = 0; k < this.pairs.size(); k++) {
            RunSpec.PointPair p = this.pairs.get(k);
            if (p.first() < 0 || p.first() >= pointCount || p.second() < 0 || p.second() >= pointCount) {
                throw new IllegalArgumentException(String.format(
                    "pairs[%d] = (%d, %d) must name points in 0..%d", k, p.first(), p.second(), pointCount - 1));
            }
        }
        this.fields = EnumSet.copyOf(fields).toArray(new Field[0]);
        this.pointCount = pointCount;
        sum = new double[this.fields.length][this.pairs.size()][9];
        comp = new double[this.fields.length][this.pairs.size()][9];
    }

    @Override
    public void accept(SampleBatch batch) {
        Objects.requireNonNull(batch, "batch");
        int n = batch.size();
        double[] part = new double[9];
        for (int fi = 0; fi < fields.length; fi++) {
            Field f = fields[fi];
            double[][] rows = new double[n][];
            for (int s = 0; s < n; s++) {
                rows[s] = batch.values(f, s);
                int len = rows[s].length;
                if (len != 3 * pointCount) {
                    throw new IllegalArgumentException(String.format(
                        "batch values of %s must hold 3 x %d points: %d in sample %d", f, pointCount, len,
                        batch.firstSample() + s));
                }
            }
            for (int k = 0; k < pairs.size(); k++) {
                int p = 3 * pairs.get(k).first();
                int q = 3 * pairs.get(k).second();
                Arrays.fill(part, 0.0);
                for (int s = 0; s < n; s++) {
                    double[] v = rows[s];
                    for (int i = 0; i < 3; i++) {
                        double a = v[p + i];
                        part[3 * i] += a * v[q];
                        part[3 * i + 1] += a * v[q + 1];
                        part[3 * i + 2] += a * v[q + 2];
                    }
                }
                double[] t = sum[fi][k];
                double[] c = comp[fi][k];
                for (int x = 0; x < 9; x++) {
                    // Neumaier: keep the low-order part lost in t + part.
                    double y = t[x] + part[x];
                    c[x] += Math.abs(t[x]) >= Math.abs(part[x]) ? (t[x] - y) + part[x] : (part[x] - y) + t[x];
                    t[x] = y;
                }
            }
        }
        samples += n;
    }

    /** @return samples accumulated so far */
    public long samples() {
        return samples;
    }

    /** @return the pairs, in table order */
    public List<RunSpec.PointPair> pairs() {
        return pairs;
    }

    /**
     * Current estimate for one pair.
     *
     * @param field an estimated field
     * @param pair index into {@link #pairs()}
     * @return (1/N) Σ F_i(r) F_j(r′), [i][j], (field unit)²
     */
    public double[][] estimate(Field field, int pair) {
        int fi = fieldIndex(field);
        if (pair < 0 || pair >= pairs.size()) {
            throw new IllegalArgumentException("pair must lie in 0.." + (pairs.size() - 1) + ": " + pair);
        }
        if (samples == 0) {
            throw new IllegalStateException("no samples accumulated");
        }
        double[][] out = new double[3][3];
        for (int x = 0; x < 9; x++) {
            out[x / 3][x % 3] = (sum[fi][pair][x] + comp[fi][pair][x]) / samples;
        }
        return out;
    }

    /**
     * The correlation table with the analytic mode sum and the verdict.
     *
     * @param table the modes and variances the ensemble was drawn with
     * @param points all evaluation points, in global order, metres
     * @param falseAlarm nominal false-alarm rate α of the verdict, in (0, 1)
     * @return the table, verdict and warnings
     */
    public CorrelationResult result(ModeTable table, List<Vec3> points, double falseAlarm) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(points, "points");
        if (!(falseAlarm > 0 && falseAlarm < 1)) {
            throw new IllegalArgumentException("falseAlarm must lie in (0, 1): " + falseAlarm);
        }
        if (points.size() != pointCount) {
            throw new IllegalArgumentException(
                "points must hold the " + pointCount + " evaluation points of the ensemble: " + points.size());
        }
        if (samples == 0) {
            throw new IllegalStateException("no samples accumulated");
        }
        List<String> warnings = new ArrayList<>();
        if (samples < MIN_TRUSTED_SAMPLES) {
            warnings.add(String.format("only %d samples: the normal approximation behind the threshold needs N >= %d,"
                + " treat the verdict as indicative", samples, MIN_TRUSTED_SAMPLES));
        }
        List<Integer> kept = new ArrayList<>();
        List<RunSpec.PointPair> keptPairs = new ArrayList<>();
        Set<Integer> diag = new LinkedHashSet<>();
        int outside = 0;
        for (int k = 0; k < pairs.size(); k++) {
            RunSpec.PointPair p = pairs.get(k);
            if (!table.cavity().contains(points.get(p.first())) || !table.cavity().contains(points.get(p.second()))) {
                outside++;
                continue;
            }
            kept.add(k);
            keptPairs.add(p);
            diag.add(p.first());
            diag.add(p.second());
        }
        if (outside > 0) {
            warnings.add(outside + " pairs with a point outside the cavity were left out of the table");
        }
        Map<Integer, Integer> diagIndex = new HashMap<>();
        List<RunSpec.PointPair> all = new ArrayList<>(keptPairs);
        for (int p : diag) {
            diagIndex.put(p, all.size());
            all.add(new RunSpec.PointPair(p, p));
        }
        Map<Field, List<double[][]>> analytic = all.isEmpty() ? Map.of()
            : ModeSumCorrelation.of(table, points).tensors(EnumSet.copyOf(List.of(fields)), all);

        List<CorrelationRow> rows = new ArrayList<>();
        int tested = 0;
        int inconsistent = 0;
        double worst = 0;
        for (Field f : fields) {
            if (all.isEmpty()) {
                break;
            }
            List<double[][]> c = analytic.get(f);
            for (int kk = 0; kk < kept.size(); kk++) {
                int k = kept.get(kk);
                RunSpec.PointPair p = pairs.get(k);
                double[][] cpq = c.get(kk);
                double[][] cpp = c.get(diagIndex.get(p.first()));
                double[][] cqq = c.get(diagIndex.get(p.second()));
                double[][] est = estimate(f, k);
                for (int i = 0; i < 3; i++) {
                    for (int j = 0; j < 3; j++) {
                        double e = est[i][j];
                        if (!Double.isFinite(e)) {
                            throw new IllegalStateException(String.format(
                                "non-finite estimate of %s (%d, %d)[%d,%d] for points inside the cavity", f, p.first(),
                                p.second(), i, j));
                        }
                        double varProduct = cpp[i][i] * cqq[j][j];
                        double se = Math.sqrt((varProduct + cpq[i][j] * cpq[i][j]) / samples);
                        if (varProduct > 0 && se > 0) {
                            double z = (e - cpq[i][j]) / se;
                            worst = Math.max(worst, Math.abs(z));
                            tested++;
                            rows.add(new CorrelationRow(f, p.first(), p.second(), i, j, e, se, cpq[i][j], z,
                                CorrelationRow.Status.TESTED));
                        } else {
                            if (e != 0.0) {
                                inconsistent++;
                            }
                            rows.add(new CorrelationRow(f, p.first(), p.second(), i, j, e, 0.0, cpq[i][j], 0.0,
                                CorrelationRow.Status.ZERO_VARIANCE));
                        }
                    }
                }
            }
        }
        int zeroRows = rows.size() - tested;
        if (inconsistent > 0) {
            warnings.add(inconsistent + " rows with zero analytic variance have a nonzero estimate");
        }
        if (tested == 0) {
            warnings.add("no row has a positive standard error: nothing was tested");
        }
        double threshold = tested == 0 ? 0.0 : criticalZ(falseAlarm, tested);
        boolean passed = worst <= threshold && inconsistent == 0;
        String method = String.format(Locale.ROOT,
            "Bonferroni over %d rows: |z| <= %.4f = Phi^-1(1 - alpha/(2K)), alpha = %.3g, two-sided normal;"
                + " %d zero-variance rows not tested%s", tested, threshold, falseAlarm, zeroRows,
            inconsistent > 0 ? ", " + inconsistent + " of them with a nonzero estimate (fail)" : "");
        Verdict verdict = new Verdict(passed, falseAlarm, tested, threshold, worst, method);
        return new CorrelationResult(samples, rows, verdict, warnings);
    }

    /**
     * Two-sided Bonferroni critical value z* = Φ⁻¹(1 − α/(2K)), computed as −Φ⁻¹(α/(2K)) so the tail
     * probability keeps its relative precision.
     *
     * @param falseAlarm α in (0, 1)
     * @param tests K ≥ 1
     * @return z*
     */
    public static double criticalZ(double falseAlarm, int tests) {
        if (!(falseAlarm > 0 && falseAlarm < 1)) {
            throw new IllegalArgumentException("falseAlarm must lie in (0, 1): " + falseAlarm);
        }
        if (tests < 1) {
            throw new IllegalArgumentException("tests must be >= 1: " + tests);
        }
        // No generator: the distribution is only inverted, never sampled.
        NormalDistribution normal = new NormalDistribution(null, 0.0, 1.0);
        return -normal.inverseCumulativeProbability(falseAlarm / (2.0 * tests));
    }

    private int fieldIndex(Field field) {
        for (int i = 0; i < fields.length; i++) {
            if (fields[i] == field) {
                return i;
            }
        }
        throw new IllegalArgumentException("field was not estimated: " + field);
    }
}
