package org.stillfield.analysis;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;

/**
 * The correlation tensor of every pair of a chosen set of points (a line, a grid or any list),
 * accumulated as one full covariance matrix of the chosen coordinates (point × component) with a
 * {@link MomentAccumulator}: memory 8(P·c)² bytes whatever the sample count, refused above the
 * accumulator's size limit with a message naming the size.
 *
 * <p>Estimator: the raw second moment Ĉ_ij(r_p, r_q) = (1/N) Σ_s F_i(r_p) F_j(r_q), unbiased for the
 * known zero mean, with the Isserlis standard error √((C_ii(p,p) C_jj(q,q) + C_ij(p,q)²)/N) from the
 * analytic mode sum (Isserlis, Biometrika 12, 134 (1918), source from memory; REFERENCE-VALUES.md
 * §8), as in {@link CorrelationEstimator}. Parts of an ensemble analysed separately merge exactly
 * ({@link #merge(FullCovarianceEstimator)}).
 *
 * <p>Points must lie inside the cavity (values outside are NaN and are refused when they arrive).
 */
public final class FullCovarianceEstimator implements EnsembleSink {
    private final Field field;
    private final int[] globalPoints;
    private final int[] components;
    private final int pointCount;
    private final MomentAccumulator moments;

    private FullCovarianceEstimator(Field field, int[] globalPoints, int[] components, int pointCount,
                                    MomentAccumulator moments) {
        this.field = field;
        this.globalPoints = globalPoints;
        this.components = components;
        this.pointCount = pointCount;
        this.moments = moments;
    }

    /**
     * All three components, default size limit.
     *
     * @param field the field
     * @param globalPoints global indices of the chosen points, distinct, in 0..pointCount−1
     * @param pointCount number of evaluation points in every batch
     * @return the estimator
     */
    public static FullCovarianceEstimator of(Field field, List<Integer> globalPoints, int pointCount) {
        return of(field, globalPoints, new int[] {0, 1, 2}, pointCount, MomentAccumulator.DEFAULT_MAX_DIMENSION);
    }

    /**
     * @param field the field
     * @param globalPoints global indices of the chosen points, distinct, in 0..pointCount−1
     * @param components components per point, distinct values in 0..2
     * @param pointCount number of evaluation points in every batch, ≥ 1
     * @param maxCoordinates limit on points × components (see {@link MomentAccumulator#of(int, int)})
     * @return the estimator
     * @throws IllegalArgumentException when the choice exceeds the limit
     */
    public static FullCovarianceEstimator of(Field field, List<Integer> globalPoints, int[] components, int pointCount,
                                             int maxCoordinates) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(globalPoints, "globalPoints");
        Objects.requireNonNull(components, "components");
        if (pointCount < 1) {
            throw new IllegalArgumentException("pointCount must be >= 1: " + pointCount);
        }
        if (globalPoints.isEmpty()) {
            throw new IllegalArgumentException("globalPoints must name at least one point");
        }
        ModeSumMatrix.checkComponents(components);
        int[] g = new int[globalPoints.size()];
        java.util.Set<Integer> seen = new java.util.HashSet<>();
        for (int k = 0; k < g.length; k++) {
            int p = Objects.requireNonNull(globalPoints.get(k), "globalPoints element");
            if (p < 0 || p >= pointCount) {
                throw new IllegalArgumentException("globalPoints[" + k + "] must lie in 0.." + (pointCount - 1) + ": " + p);
            }
            if (!seen.add(p)) {
                throw new IllegalArgumentException("globalPoints must be distinct: " + p + " appears twice");
            }
            g[k] = p;
        }
        long coords = (long) g.length * components.length;
        if (coords > maxCoordinates) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                "points x components must be at most %d for the full covariance of %s: %d points x %d components = %d"
                    + " (a %.0f MiB matrix); choose fewer points or components", maxCoordinates, field, g.length,
                components.length, coords, 8.0 * coords * coords / (1 << 20)));
        }
        return new FullCovarianceEstimator(field, g, components.clone(), pointCount,
            MomentAccumulator.of((int) coords, maxCoordinates));
    }

    /** @return the field */
    public Field field() {
        return field;
    }

    /** @return the number of chosen points */
    public int points() {
        return globalPoints.length;
    }

    /** @return global index of chosen point k */
    public int globalPoint(int k) {
        return globalPoints[k];
    }

    /** @return a copy of the components per point */
    public int[] components() {
        return components.clone();
    }

    /** @return samples accumulated */
    public long samples() {
        return moments.count();
    }

    /** @return the underlying accumulator (live; do not modify) */
    public MomentAccumulator moments() {
        return moments;
    }

    @Override
    public void accept(SampleBatch batch) {
        Objects.requireNonNull(batch, "batch");
        int n = batch.size();
        int nc = components.length;
        double[][] rows = new double[n][globalPoints.length * nc];
        for (int s = 0; s < n; s++) {
            double[] v = batch.values(field, s);
            if (v.length != 3 * pointCount) {
                throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "batch values of %s must hold 3 x %d points: %d in sample %d", field, pointCount, v.length,
                    batch.firstSample() + s));
            }
            double[] row = rows[s];
            for (int k = 0; k < globalPoints.length; k++) {
                int base = 3 * globalPoints[k];
                for (int c = 0; c < nc; c++) {
                    double x = v[base + components[c]];
                    if (!Double.isFinite(x)) {
                        throw new IllegalArgumentException(String.format(Locale.ROOT,
                            "point %d has a non-finite %s value in sample %d (outside the cavity?): %s",
                            globalPoints[k], field.column(components[c]), batch.firstSample() + s, x));
                    }
                    row[k * nc + c] = x;
                }
            }
        }
        moments.addAll(rows, n);
    }

    /**
     * Adds another part of the same ensemble (other samples, same choice of points).
     *
     * @param other an estimator with the same field, points and components
     */
    public void merge(FullCovarianceEstimator other) {
        Objects.requireNonNull(other, "other");
        if (other.field != field || !java.util.Arrays.equals(other.globalPoints, globalPoints)
            || !java.util.Arrays.equals(other.components, components)) {
            throw new IllegalArgumentException("other must estimate the same field, points and components");
        }
        moments.merge(other.moments);
    }

    /**
     * The estimated tensor between chosen points a and b (components not chosen are NaN).
     *
     * @param a index into the chosen points
     * @param b index into the chosen points
     * @return Ĉ_ij(r_a, r_b), [i][j], (field unit)²
     */
    public double[][] tensor(int a, int b) {
        checkLocal(a, "a");
        checkLocal(b, "b");
        double[] s = moments.secondMoment();
        int p = moments.dimension();
        int nc = components.length;
        double[][] out = new double[3][3];
        for (double[] row : out) {
            java.util.Arrays.fill(row, Double.NaN);
        }
        for (int i = 0; i < nc; i++) {
            for (int j = 0; j < nc; j++) {
                out[components[i]][components[j]] = s[(a * nc + i) * p + b * nc + j];
            }
        }
        return out;
    }

    /**
     * The table of every unordered pair of chosen points (a ≤ b; for a = b only i ≤ j, the rest
     * being transposes), compared with the analytic mode sum.
     *
     * @param table the modes the ensemble was drawn with
     * @param points all evaluation points in global order, metres
     * @param falseAlarm nominal false-alarm rate α of the verdict (Bonferroni over tested rows), in (0, 1)
     * @return rows in the order (a, b, i, j), global point indices
     */
    public CorrelationResult result(ModeTable table, List<Vec3> points, double falseAlarm) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(points, "points");
        if (!(falseAlarm > 0 && falseAlarm < 1)) {
            throw new IllegalArgumentException("falseAlarm must lie in (0, 1): " + falseAlarm);
        }
        if (points.size() != pointCount) {
            throw new IllegalArgumentException("points must hold the " + pointCount + " evaluation points: " + points.size());
        }
        long n = moments.count();
        if (n == 0) {
            throw new IllegalStateException("no samples accumulated");
        }
        List<Vec3> chosen = new ArrayList<>();
        for (int g : globalPoints) {
            chosen.add(points.get(g));
        }
        DMatrixRMaj c = ModeSumMatrix.covariance(table, field, chosen, components);
        double[] est = moments.secondMoment();
        int p = moments.dimension();
        int nc = components.length;
        List<CorrelationRow> rows = new ArrayList<>();
        int tested = 0;
        int inconsistent = 0;
        double worst = 0;
        for (int a = 0; a < globalPoints.length; a++) {
            for (int b = a; b < globalPoints.length; b++) {
                for (int i = 0; i < nc; i++) {
                    for (int j = a == b ? i : 0; j < nc; j++) {
                        int x = a * nc + i;
                        int y = b * nc + j;
                        double cxy = c.get(x, y);
                        double varProduct = c.get(x, x) * c.get(y, y);
                        double e = est[x * p + y];
                        double se = Math.sqrt((varProduct + cxy * cxy) / n);
                        if (varProduct > 0 && se > 0) {
                            double z = (e - cxy) / se;
                            worst = Math.max(worst, Math.abs(z));
                            tested++;
                            rows.add(new CorrelationRow(field, globalPoints[a], globalPoints[b], components[i],
                                components[j], e, se, cxy, z, CorrelationRow.Status.TESTED));
                        } else {
                            if (e != 0.0) {
                                inconsistent++;
                            }
                            rows.add(new CorrelationRow(field, globalPoints[a], globalPoints[b], components[i],
                                components[j], e, 0.0, cxy, 0.0, CorrelationRow.Status.ZERO_VARIANCE));
                        }
                    }
                }
            }
        }
        List<String> warnings = new ArrayList<>();
        if (n < CorrelationEstimator.MIN_TRUSTED_SAMPLES) {
            warnings.add(String.format(Locale.ROOT, "only %d samples: the normal approximation behind the threshold"
                + " needs N >= %d, treat the verdict as indicative", n, CorrelationEstimator.MIN_TRUSTED_SAMPLES));
        }
        if (inconsistent > 0) {
            warnings.add(inconsistent + " rows with zero analytic variance have a nonzero estimate");
        }
        double threshold = tested == 0 ? 0.0 : CorrelationEstimator.criticalZ(falseAlarm, tested);
        String method = String.format(Locale.ROOT,
            "full covariance of %d points x %d components; Bonferroni over %d rows: |z| <= %.4f, alpha = %.3g",
            globalPoints.length, nc, tested, threshold, falseAlarm);
        Verdict v = new Verdict(worst <= threshold && inconsistent == 0, falseAlarm, tested, threshold, worst, method);
        return new CorrelationResult(n, rows, v, warnings);
    }

    private void checkLocal(int k, String name) {
        if (k < 0 || k >= globalPoints.length) {
            throw new IllegalArgumentException(name + " must lie in 0.." + (globalPoints.length - 1) + ": " + k);
        }
    }
}
