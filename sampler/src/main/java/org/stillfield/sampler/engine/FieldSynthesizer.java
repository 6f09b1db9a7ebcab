package org.stillfield.sampler.engine;

import java.util.ArrayList;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ForkJoinPool;
import java.util.stream.IntStream;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.TensorGridSum;
import org.stillfield.sampler.api.Vec3;

/**
 * Sums the modes at the evaluation points: A = Σ q_l u_l, E = Σ e_l u_l, B = Σ k_l q_l h_l
 * (PHYSICS.md §2). Geometry enters only through {@link ModeFunctions}.
 *
 * <p>When the basis of all points fits in the cache budget it is evaluated once; otherwise it is
 * re-evaluated per point for every batch. Each output value is a dot product in a fixed order, so
 * results are bit-identical for any thread count.
 */
public final class FieldSynthesizer {
    private final ModeFunctions functions;
    private final List<Vec3> points;
    private final Set<Field> fields;
    private final int modes;
    private final double[] k;
    private final boolean needU;
    private final boolean needH;
    private final double[][] cacheU;
    private final double[][] cacheH;
    private final boolean[] inside;
    private final boolean[] fast;
    private final List<GridSegment> segments = new ArrayList<>();

    /** A grid handled by the cavity's exact tensor-product sum. */
    private record GridSegment(int offset, int size, TensorGridSum sum) {
    }

    /**
     * @param table the modes
     * @param points evaluation points, metres
     * @param fields fields to synthesise (non-empty)
     * @param cacheBytes largest basis cache, bytes
     */
    public FieldSynthesizer(ModeTable table, List<Vec3> points, Set<Field> fields, long cacheBytes) {
        this(table, points, List.of(), fields, cacheBytes);
    }

    /**
     * Like the constructor, with the points given as sets: grid
     * sets of a cavity that offers a {@link TensorGridSum} (and lie wholly inside it) take that
     * exact fast path.
     *
     * @param table the modes
     * @param sets evaluation point sets, in global point order
     * @param fields fields to synthesise (non-empty)
     * @param cacheBytes largest basis cache for the other points, bytes
     * @return the synthesiser
     */
    public static FieldSynthesizer forSets(ModeTable table, List<PointSet> sets, Set<Field> fields, long cacheBytes) {
        return new FieldSynthesizer(table, flatten(sets), sets, fields, cacheBytes);
    }

    private static List<Vec3> flatten(List<PointSet> sets) {
        List<Vec3> out = new ArrayList<>();
        for (PointSet s : sets) {
            out.addAll(s.points());
        }
        return out;
    }

    private FieldSynthesizer(ModeTable table, List<Vec3> points, List<PointSet> sets, Set<Field> fields, long cacheBytes) {
        if (fields.isEmpty()) {
            throw new IllegalArgumentException("fields must name at least one of A, E, B");
        }
        this.functions = table.cavity().modeFunctions(table.modes());
        this.points = List.copyOf(points);
        this.fields = EnumSet.copyOf(fields);
        this.modes = table.size();
        this.k = new double[modes];
        for (int l = 0; l < modes; l++) {
            k[l] = table.modes().get(l).k();
        }
        this.inside = new boolean[this.points.size()];
        for (int p = 0; p < inside.length; p++) {
            inside[p] = table.cavity().contains(this.points.get(p));
        }
        this.fast = new boolean[this.points.size()];
        int offset = 0;
        for (PointSet set : sets) {
            if (set.kind() == PointSet.Kind.GRID && allInside(offset, set.size())) {
                int[] n = set.dims();
                double[] xs = new double[n[0]];
                double[] ys = new double[n[1]];
                double[] zs = new double[n[2]];
                List<Vec3> pts = set.points();
                for (int i = 0; i < n[0]; i++) {
                    xs[i] = pts.get(i).x();
                }
                for (int j = 0; j < n[1]; j++) {
                    ys[j] = pts.get(j * n[0]).y();
                }
                for (int k = 0; k < n[2]; k++) {
                    zs[k] = pts.get(k * n[0] * n[1]).z();
                }
                TensorGridSum sum = table.cavity().tensorGridSum(table.modes(), xs, ys, zs);
                if (sum != null) {
                    segments.add(new GridSegment(offset, set.size(), sum));
                    java.util.Arrays.fill(fast, offset, offset + set.size(), true);
                }
            }
            offset += set.size();
        }
        if (!sets.isEmpty() && offset != this.points.size()) {
            throw new IllegalArgumentException("point sets do not add up to the point list");
        }
        needU = fields.contains(Field.A) || fields.contains(Field.E);
        needH = fields.contains(Field.B);
        long perPoint = 3L * modes * 8 * ((needU ? 1 : 0) + (needH ? 1 : 0));
        if (perPoint * points.size() <= cacheBytes) {
            cacheU = needU ? new double[points.size()][] : null;
            cacheH = needH ? new double[points.size()][] : null;
            IntStream.range(0, points.size()).parallel().filter(p -> !fast[p]).forEach(p -> {
                double[][] basis = basis(p);
                if (needU) {
                    cacheU[p] = basis[0];
                }
                if (needH) {
                    cacheH[p] = basis[1];
                }
            });
        } else {
            cacheU = null;
            cacheH = null;
        }
    }

    private boolean allInside(int offset, int size) {
        for (int p = offset; p < offset + size; p++) {
            if (!inside[p]) {
                return false;
            }
        }
        return true;
    }

    /** @return number of points */
    public int pointCount() {
        return points.size();
    }

    /** @return fields synthesised */
    public Set<Field> fields() {
        return EnumSet.copyOf(fields);
    }

    /** Component-major basis of one point: [x block | y block | z block], h already times k. */
    private double[][] basis(int p) {
        Vec3 r = points.get(p);
        double[] u = needU ? new double[3 * modes] : null;
        double[] h = needH ? new double[3 * modes] : null;
        functions.evaluate(r.x(), r.y(), r.z(), u, h);
        double[] uc = needU ? transpose(u, null) : null;
        double[] hc = needH ? transpose(h, k) : null;
        return new double[][] {uc, hc};
    }

    private double[] transpose(double[] interleaved, double[] scale) {
        double[] out = new double[3 * modes];
        for (int l = 0; l < modes; l++) {
            double s = scale == null ? 1.0 : scale[l];
            out[l] = s * interleaved[3 * l];
            out[modes + l] = s * interleaved[3 * l + 1];
            out[2 * modes + l] = s * interleaved[3 * l + 2];
        }
        return out;
    }

    /**
     * Fills out.get(field)[s][3p + i] for every sample of the batch.
     *
     * @param q q[s][l]
     * @param e e[s][l]
     * @param out per field, arrays [S][3P] to fill
     * @param pool threads to use
     * @param firstSample global index of sample 0, for error messages
     */
    public void synthesize(double[][] q, double[][] e, Map<Field, double[][]> out, ForkJoinPool pool, long firstSample) {
        int nPoints = points.size();
        int chunk = Math.max(1, Math.min(64, nPoints / (4 * pool.getParallelism()) + 1));
        int chunks = (nPoints + chunk - 1) / chunk;
        double[][] outA = out.get(Field.A);
        double[][] outE = out.get(Field.E);
        double[][] outB = out.get(Field.B);
        pool.submit(() -> IntStream.range(0, chunks).parallel().forEach(c -> {
            int end = Math.min(nPoints, (c + 1) * chunk);
            for (int p = c * chunk; p < end; p++) {
                if (fast[p]) {
                    continue;
                }
                if (!inside[p]) {
                    fillOutside(p, q.length, outA, outE, outB);
                    continue;
                }
                double[] u;
                double[] hk;
                if (cacheU != null || cacheH != null) {
                    u = cacheU == null ? null : cacheU[p];
                    hk = cacheH == null ? null : cacheH[p];
                } else {
                    double[][] b = basis(p);
                    u = b[0];
                    hk = b[1];
                }
                for (int s = 0; s < q.length; s++) {
                    for (int i = 0; i < 3; i++) {
                        int off = i * modes;
                        if (outA != null) {
                            outA[s][3 * p + i] = check(dot(u, off, q[s]), Field.A, i, p, firstSample + s);
                        }
                        if (outE != null) {
                            outE[s][3 * p + i] = check(dot(u, off, e[s]), Field.E, i, p, firstSample + s);
                        }
                        if (outB != null) {
                            outB[s][3 * p + i] = check(dot(hk, off, q[s]), Field.B, i, p, firstSample + s);
                        }
                    }
                }
            }
        })).join();
        if (!segments.isEmpty()) {
            pool.submit(() -> IntStream.range(0, q.length).parallel().forEach(s -> {
                for (GridSegment g : segments) {
                    if (outA != null) {
                        g.sum().sum(q[s], false, outA[s], 3 * g.offset());
                        checkSegment(outA[s], g, Field.A, firstSample + s);
                    }
                    if (outE != null) {
                        g.sum().sum(e[s], false, outE[s], 3 * g.offset());
                        checkSegment(outE[s], g, Field.E, firstSample + s);
                    }
                    if (outB != null) {
                        g.sum().sum(q[s], true, outB[s], 3 * g.offset());
                        checkSegment(outB[s], g, Field.B, firstSample + s);
                    }
                }
            })).join();
        }
    }

    private void checkSegment(double[] values, GridSegment g, Field f, long sample) {
        for (int j = 3 * g.offset(); j < 3 * (g.offset() + g.size()); j++) {
            check(values[j], f, j % 3, j / 3, sample);
        }
    }

    /** Points outside the cavity (grids over a bounding box) carry NaN: no field is defined there. */
    private static void fillOutside(int p, int samples, double[][]... outs) {
        for (double[][] out : outs) {
            if (out != null) {
                for (int s = 0; s < samples; s++) {
                    out[s][3 * p] = Double.NaN;
                    out[s][3 * p + 1] = Double.NaN;
                    out[s][3 * p + 2] = Double.NaN;
                }
            }
        }
    }

    /** @return true if point p lies inside the cavity */
    public boolean inside(int p) {
        return inside[p];
    }

    private double check(double v, Field f, int i, int p, long sample) {
        if (!Double.isFinite(v)) {
            Vec3 r = points.get(p);
            throw new IllegalStateException(String.format(
                "non-finite %s at point %d (%g, %g, %g) m in sample %d", f.column(i), p, r.x(), r.y(), r.z(), sample));
        }
        return v;
    }

    /** Four independent accumulators: shorter dependency chains, and a fixed summation order. */
    private double dot(double[] basis, int off, double[] amp) {
        double s0 = 0;
        double s1 = 0;
        double s2 = 0;
        double s3 = 0;
        int l = 0;
        for (; l + 3 < modes; l += 4) {
            s0 += basis[off + l] * amp[l];
            s1 += basis[off + l + 1] * amp[l + 1];
            s2 += basis[off + l + 2] * amp[l + 2];
            s3 += basis[off + l + 3] * amp[l + 3];
        }
        for (; l < modes; l++) {
            s0 += basis[off + l] * amp[l];
        }
        return (s0 + s1) + (s2 + s3);
    }
}
