package org.stillfield.analysis;

import java.util.ArrayList;
import java.util.EnumMap;
import java.util.EnumSet;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Set;
import java.util.TreeSet;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The cavity mode sum C^F_ij(r_p, r_q) = Σ_l w_l f_l,i(r_p) f_l,j(r_q) over a fixed list of points,
 * with w_l = {@link ModeTable#variance(Field, int)} (window · thermal factor · vacuum variance) and
 * f = u for A and E, h for B (PHYSICS.md §4).
 *
 * <p>Mode functions are evaluated once per point per call and reused by every pair that touches
 * the point. When the bases of all points involved fit in the memory budget they are also kept
 * between calls; otherwise the modes are processed in blocks so that memory stays within the
 * budget (at the price of re-evaluating the points once per block).
 *
 * <p>Summation: in chunks of {@value #CHUNK} modes, each chunk summed in its own accumulators and
 * then added to the total, so the rounding error grows like (chunk + M/chunk)·ε rather than M·ε.
 * Instances are safe to share between threads (calls are serialised).
 */
public final class ModeSumCorrelation {
    /** Default memory budget for the cached mode-function bases, bytes. */
    public static final long DEFAULT_BUDGET_BYTES = 256L << 20;
    static final int CHUNK = 512;

    private final ModeTable table;
    private final List<Vec3> points;
    private final long budgetBytes;
    private final double[][] weights = new double[Field.values().length][];
    private final Map<Integer, double[]> cacheU = new HashMap<>();
    private final Map<Integer, double[]> cacheH = new HashMap<>();
    private long cachedBytes;
    private ModeFunctions allModes;

    private ModeSumCorrelation(ModeTable table, List<Vec3> points, long budgetBytes) {
        this.table = table;
        this.points = points;
        this.budgetBytes = budgetBytes;
    }

    /**
     * @param table modes and variances
     * @param points the points pairs refer to by index, metres
     * @return the mode sum with the default budget
     */
    public static ModeSumCorrelation of(ModeTable table, List<Vec3> points) {
        return of(table, points, DEFAULT_BUDGET_BYTES);
    }

    /**
     * @param table modes and variances
     * @param points the points pairs refer to by index, metres (finite)
     * @param budgetBytes memory for mode-function bases, bytes, ≥ 1 (a block always holds at
     *     least {@value #CHUNK} modes whatever the budget)
     * @return the mode sum
     */
    public static ModeSumCorrelation of(ModeTable table, List<Vec3> points, long budgetBytes) {
        Objects.requireNonNull(table, "table");
        List<Vec3> copy = List.copyOf(points);
        for (int p = 0; p < copy.size(); p++) {
            if (!copy.get(p).isFinite()) {
                throw new IllegalArgumentException("points[" + p + "] must be finite: " + copy.get(p));
            }
        }
        if (budgetBytes < 1) {
            throw new IllegalArgumentException("budgetBytes must be >= 1: " + budgetBytes);
        }
        return new ModeSumCorrelation(table, copy, budgetBytes);
    }

    /** @return the table */
    public ModeTable table() {
        return table;
    }

    /** @return the points */
    public List<Vec3> points() {
        return points;
    }

    /**
     * @param field the field
     * @param p index of r
     * @param q index of r′
     * @return C^F_ij(r_p, r_q), (field unit)²
     */
    public double[][] tensor(Field field, int p, int q) {
        return tensors(EnumSet.of(field), List.of(new RunSpec.PointPair(p, q))).get(field).get(0);
    }

    /**
     * @param field the field
     * @param pairs point pairs by index
     * @return C^F_ij for every pair, in order
     */
    public List<double[][]> tensors(Field field, List<RunSpec.PointPair> pairs) {
        return tensors(EnumSet.of(field), pairs).get(field);
    }

    /**
     * All requested tensors in one pass over the modes.
     *
     * @param fields the fields, non-empty
     * @param pairs point pairs by index
     * @return per field, C_ij for every pair in order
     */
    public synchronized Map<Field, List<double[][]>> tensors(Set<Field> fields, List<RunSpec.PointPair> pairs) {
        Objects.requireNonNull(fields, "fields");
        Objects.requireNonNull(pairs, "pairs");
        if (fields.isEmpty()) {
            throw new IllegalArgumentException("fields must name at least one of A, E, B");
        }
        TreeSet<Integer> used = new TreeSet<>();
        for (int k = 0; k < pairs.size(); k++) {
            RunSpec.PointPair pp = pairs.get(k);
            checkIndex(pp.first(), k);
            checkIndex(pp.second(), k);
            used.add(pp.first());
            used.add(pp.second());
        }
        Field[] order = EnumSet.copyOf(fields).toArray(new Field[0]);
        boolean needU = fields.contains(Field.A) || fields.contains(Field.E);
        boolean needH = fields.contains(Field.B);
        for (Field f : order) {
            weightsOf(f);
        }
        int m = table.size();
        int[] local = new int[points.size()];
        int[] global = new int[used.size()];
        int n = 0;
        for (int p : used) {
            local[p] = n;
            global[n++] = p;
        }
        double[][][] acc = new double[order.length][pairs.size()][9];
        long perMode = 24L * n * ((needU ? 1 : 0) + (needH ? 1 : 0));
        long block = Math.max(CHUNK, budgetBytes / Math.max(1, perMode));
        if (block >= m) {
            double[][] u = needU ? new double[n][] : null;
            double[][] h = needH ? new double[n][] : null;
            for (int k = 0; k < n; k++) {
                double[][] b = fullBasis(global[k], needU, needH);
                if (needU) {
                    u[k] = b[0];
                }
                if (needH) {
                    h[k] = b[1];
                }
            }
            accumulate(order, pairs, local, u, h, 0, m, acc);
        } else {
            int bs = (int) block;
            for (int from = 0; from < m; from += bs) {
                int to = Math.min(m, from + bs);
                ModeFunctions mf = table.cavity().modeFunctions(table.modes().subList(from, to));
                double[][] u = needU ? new double[n][3 * (to - from)] : null;
                double[][] h = needH ? new double[n][3 * (to - from)] : null;
                for (int k = 0; k < n; k++) {
                    Vec3 r = points.get(global[k]);
                    mf.evaluate(r.x(), r.y(), r.z(), needU ? u[k] : null, needH ? h[k] : null);
                }
                accumulate(order, pairs, local, u, h, from, to - from, acc);
            }
        }
        Map<Field, List<double[][]>> out = new EnumMap<>(Field.class);
        for (int fi = 0; fi < order.length; fi++) {
            List<double[][]> list = new ArrayList<>(pairs.size());
            for (int k = 0; k < pairs.size(); k++) {
                double[][] c = new double[3][3];
                for (int i = 0; i < 3; i++) {
                    for (int j = 0; j < 3; j++) {
                        c[i][j] = acc[fi][k][3 * i + j];
                    }
                }
                list.add(c);
            }
            out.put(order[fi], List.copyOf(list));
        }
        return out;
    }

    private void checkIndex(int p, int k) {
        if (p < 0 || p >= points.size()) {
            throw new IllegalArgumentException(
                "pairs[" + k + "] names point " + p + ", outside 0.." + (points.size() - 1));
        }
    }

    private double[] weightsOf(Field f) {
        double[] w = weights[f.ordinal()];
        if (w == null) {
            w = new double[table.size()];
            for (int l = 0; l < w.length; l++) {
                w[l] = table.variance(f, l);
            }
            weights[f.ordinal()] = w;
        }
        return w;
    }

    /** Whole-basis evaluation of one point, kept while the cache stays within budget. */
    private double[][] fullBasis(int p, boolean needU, boolean needH) {
        double[] u = needU ? cacheU.get(p) : null;
        double[] h = needH ? cacheH.get(p) : null;
        boolean missU = needU && u == null;
        boolean missH = needH && h == null;
        if (missU || missH) {
            if (allModes == null) {
                allModes = table.cavity().modeFunctions(table.modes());
            }
            int m = table.size();
            double[] nu = missU ? new double[3 * m] : null;
            double[] nh = missH ? new double[3 * m] : null;
            Vec3 r = points.get(p);
            allModes.evaluate(r.x(), r.y(), r.z(), nu, nh);
            long bytes = 24L * m;
            if (missU) {
                u = nu;
                if (cachedBytes + bytes <= budgetBytes) {
                    cacheU.put(p, nu);
                    cachedBytes += bytes;
                }
            }
            if (missH) {
                h = nh;
                if (cachedBytes + bytes <= budgetBytes) {
                    cacheH.put(p, nh);
                    cachedBytes += bytes;
                }
            }
        }
        return new double[][] {u, h};
    }

    /** Adds modes [from, from + count) of every field and pair to acc; bases hold 3·count values. */
    private void accumulate(Field[] order, List<RunSpec.PointPair> pairs, int[] local, double[][] u, double[][] h,
                            int from, int count, double[][][] acc) {
        for (int fi = 0; fi < order.length; fi++) {
            double[] w = weights[order[fi].ordinal()];
            double[][] basis = order[fi] == Field.B ? h : u;
            for (int k = 0; k < pairs.size(); k++) {
                RunSpec.PointPair pp = pairs.get(k);
                sum(w, from, basis[local[pp.first()]], basis[local[pp.second()]], count, acc[fi][k]);
            }
        }
    }

    /** out[3i + j] += Σ_l w[off + l] x[3l + i] y[3l + j], chunked. */
    static void sum(double[] w, int off, double[] x, double[] y, int count, double[] out) {
        for (int c0 = 0; c0 < count; c0 += CHUNK) {
            int c1 = Math.min(count, c0 + CHUNK);
            double s00 = 0;
            double s01 = 0;
            double s02 = 0;
            double s10 = 0;
            double s11 = 0;
            double s12 = 0;
            double s20 = 0;
            double s21 = 0;
            double s22 = 0;
            for (int l = c0; l < c1; l++) {
                double wl = w[off + l];
                int b = 3 * l;
                double x0 = wl * x[b];
                double x1 = wl * x[b + 1];
                double x2 = wl * x[b + 2];
                double y0 = y[b];
                double y1 = y[b + 1];
                double y2 = y[b + 2];
                s00 += x0 * y0;
                s01 += x0 * y1;
                s02 += x0 * y2;
                s10 += x1 * y0;
                s11 += x1 * y1;
                s12 += x1 * y2;
                s20 += x2 * y0;
                s21 += x2 * y1;
                s22 += x2 * y2;
            }
            out[0] += s00;
            out[1] += s01;
            out[2] += s02;
            out[3] += s10;
            out[4] += s11;
            out[5] += s12;
            out[6] += s20;
            out[7] += s21;
            out[8] += s22;
        }
    }
}
