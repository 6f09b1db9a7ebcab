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
import org.stillfield.analysis.api.ConvergencePoint;
import org.stillfield.analysis.api.ConvergenceResult;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.spec.RunSpec;

/**
 * Convergence of the correlation estimates with the sample count: the sums Σ_s F_i(r) F_j(r′) of
 * fixed pairs are snapshot after the first N₁ &lt; N₂ &lt; ... samples (a batch is split at a
 * checkpoint), and each prefix's estimate is compared with the mode sum in units of the
 * single-sample standard deviation s₁ = √(C_ii(r,r) C_jj(r′,r′) + C_ij(r,r′)²) (Isserlis). For a
 * correct ensemble every normalised error has variance exactly 1/N, so the root mean square over
 * rows falls as 1/√N; a bias would flatten the curve at large N. Memory: 9 doubles per pair, field
 * and checkpoint.
 */
public final class ConvergenceTracker implements EnsembleSink {
    private final List<RunSpec.PointPair> pairs;
    private final Field[] fields;
    private final int pointCount;
    private final long[] checkpoints;
    private final double[][][] sum;
    private final List<double[][][]> snapshots = new ArrayList<>();
    private long samples;

    private ConvergenceTracker(List<RunSpec.PointPair> pairs, Field[] fields, int pointCount, long[] checkpoints) {
        this.pairs = pairs;
        this.fields = fields;
        this.pointCount = pointCount;
        this.checkpoints = checkpoints;
        sum = new double[fields.length][pairs.size()][9];
    }

    /**
     * @param pairs point pairs by global index
     * @param fields fields, non-empty
     * @param pointCount evaluation points per batch
     * @param checkpoints N₁ &lt; N₂ &lt; ..., each ≥ 1
     * @return the tracker
     */
    public static ConvergenceTracker of(List<RunSpec.PointPair> pairs, Set<Field> fields, int pointCount,
                                        long[] checkpoints) {
        Objects.requireNonNull(pairs, "pairs");
        Objects.requireNonNull(fields, "fields");
        Objects.requireNonNull(checkpoints, "checkpoints");
        if (fields.isEmpty() || pairs.isEmpty()) {
            throw new IllegalArgumentException("pairs and fields must be non-empty");
        }
        if (checkpoints.length < 2) {
            throw new IllegalArgumentException("checkpoints must hold at least 2 sample counts: " + checkpoints.length);
        }
        for (int k = 0; k < checkpoints.length; k++) {
            if (checkpoints[k] < 1 || (k > 0 && checkpoints[k] <= checkpoints[k - 1])) {
                throw new IllegalArgumentException("checkpoints must be increasing and >= 1: " + Arrays.toString(checkpoints));
            }
        }
        for (RunSpec.PointPair p : pairs) {
            if (p.first() < 0 || p.first() >= pointCount || p.second() < 0 || p.second() >= pointCount) {
                throw new IllegalArgumentException("pairs must name points in 0.." + (pointCount - 1) + ": " + p);
            }
        }
        return new ConvergenceTracker(List.copyOf(pairs), EnumSet.copyOf(fields).toArray(new Field[0]), pointCount,
            checkpoints.clone());
    }

    /**
     * Checkpoints 50, 100, 200, ... doubling up to the total (which is added as the last one).
     *
     * @param total the ensemble's sample count, ≥ 2
     * @return the checkpoints
     */
    public static long[] doubling(long total) {
        if (total < 2) {
            throw new IllegalArgumentException("total must be >= 2: " + total);
        }
        List<Long> out = new ArrayList<>();
        for (long n = Math.min(50, total / 2); n < total; n *= 2) {
            out.add(Math.max(1, n));
        }
        out.add(total);
        return out.stream().mapToLong(Long::longValue).toArray();
    }

    @Override
    public void accept(SampleBatch batch) {
        Objects.requireNonNull(batch, "batch");
        int n = batch.size();
        int s = 0;
        while (s < n) {
            int next = snapshots.size();
            long limit = next < checkpoints.length ? checkpoints[next] : Long.MAX_VALUE;
            int take = (int) Math.min(n - s, limit - samples);
            add(batch, s, take);
            s += take;
            samples += take;
            if (samples == limit) {
                double[][][] copy = new double[fields.length][pairs.size()][];
                for (int f = 0; f < fields.length; f++) {
                    for (int k = 0; k < pairs.size(); k++) {
                        copy[f][k] = sum[f][k].clone();
                    }
                }
                snapshots.add(copy);
            }
        }
    }

    private void add(SampleBatch batch, int from, int count) {
        for (int fi = 0; fi < fields.length; fi++) {
            for (int s = from; s < from + count; s++) {
                double[] v = batch.values(fields[fi], s);
                if (v.length != 3 * pointCount) {
                    throw new IllegalArgumentException("batch values must hold 3 x " + pointCount + " points: " + v.length);
                }
                for (int k = 0; k < pairs.size(); k++) {
                    int p = 3 * pairs.get(k).first();
                    int q = 3 * pairs.get(k).second();
                    double[] t = sum[fi][k];
                    for (int i = 0; i < 3; i++) {
                        double a = v[p + i];
                        t[3 * i] += a * v[q];
                        t[3 * i + 1] += a * v[q + 1];
                        t[3 * i + 2] += a * v[q + 2];
                    }
                }
            }
        }
    }

    /** @return samples seen */
    public long samples() {
        return samples;
    }

    /**
     * @param table the modes the ensemble was drawn with
     * @param points all evaluation points, metres (pairs with a point outside the cavity are skipped)
     * @return one point per checkpoint reached, and the slope on log–log axes
     */
    public ConvergenceResult result(ModeTable table, List<Vec3> points) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(points, "points");
        if (snapshots.size() < 2) {
            throw new IllegalStateException("needs at least 2 checkpoints reached: " + snapshots.size() + " of "
                + Arrays.toString(checkpoints) + " with " + samples + " samples");
        }
        List<Integer> kept = new ArrayList<>();
        Set<RunSpec.PointPair> all = new LinkedHashSet<>();
        for (int k = 0; k < pairs.size(); k++) {
            RunSpec.PointPair p = pairs.get(k);
            if (table.cavity().contains(points.get(p.first())) && table.cavity().contains(points.get(p.second()))) {
                kept.add(k);
                all.add(p);
                all.add(new RunSpec.PointPair(p.first(), p.first()));
                all.add(new RunSpec.PointPair(p.second(), p.second()));
            }
        }
        if (kept.isEmpty()) {
            throw new IllegalStateException("no pair lies inside the cavity");
        }
        List<RunSpec.PointPair> list = new ArrayList<>(all);
        Map<RunSpec.PointPair, Integer> at = new HashMap<>();
        for (int k = 0; k < list.size(); k++) {
            at.put(list.get(k), k);
        }
        Map<Field, List<double[][]>> c = ModeSumCorrelation.of(table, points).tensors(EnumSet.copyOf(List.of(fields)), list);
        List<ConvergencePoint> out = new ArrayList<>();
        double[] lx = new double[snapshots.size()];
        double[] ly = new double[snapshots.size()];
        for (int cp = 0; cp < snapshots.size(); cp++) {
            long n = checkpoints[cp];
            double sum2 = 0;
            int rows = 0;
            for (int fi = 0; fi < fields.length; fi++) {
                List<double[][]> cf = c.get(fields[fi]);
                for (int k : kept) {
                    RunSpec.PointPair p = pairs.get(k);
                    double[][] cpq = cf.get(at.get(p));
                    double[][] cpp = cf.get(at.get(new RunSpec.PointPair(p.first(), p.first())));
                    double[][] cqq = cf.get(at.get(new RunSpec.PointPair(p.second(), p.second())));
                    for (int i = 0; i < 3; i++) {
                        for (int j = 0; j < 3; j++) {
                            double vp = cpp[i][i] * cqq[j][j];
                            double s1 = Math.sqrt(vp + cpq[i][j] * cpq[i][j]);
                            if (vp > 0 && s1 > 0) {
                                double e = (snapshots.get(cp)[fi][k][3 * i + j] / n - cpq[i][j]) / s1;
                                sum2 += e * e;
                                rows++;
                            }
                        }
                    }
                }
            }
            if (rows == 0) {
                throw new IllegalStateException("no row with a positive variance to track");
            }
            double rms = Math.sqrt(sum2 / rows);
            out.add(new ConvergencePoint(n, rms, 1 / Math.sqrt(n), rows));
            lx[cp] = Math.log(n);
            ly[cp] = Math.log(rms);
        }
        double[] fit = Fits.line(lx, ly);
        return new ConvergenceResult(out, fit[0], fit[2], String.format(Locale.ROOT,
            "rms over %d rows of (estimate - mode sum)/s1, s1 = sqrt(C_ii C_jj + C_ij^2) (Isserlis); prefixes of the"
                + " ensemble; slope of ln rms on ln N by least squares", out.get(0).rows()));
    }
}
