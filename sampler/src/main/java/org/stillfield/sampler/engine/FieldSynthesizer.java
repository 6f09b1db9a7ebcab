package org.stillfield.sampler.engine;

import java.util.ArrayList;
import java.util.Arrays;
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
 * (PHYSICS.md §2). Geometry enters only through {@link ModeFunctions} and, for grids of cavities
 * that offer one, the exact {@link TensorGridSum}.
 *
 * <p>Other points are handled in blocks of up to {@value #BLOCK} consecutive points. A block's
 * basis is stored mode-major, basis[l·w + 3j + i] (w = 3·block size), so the sum over modes for a
 * batch of samples is a matrix product Out(S × w) = Amp(S × M)·Basis(M × w), done as contiguous
 * axpy updates over mode tiles that stay in cache across the samples. When all blocks' bases fit
 * the cache budget they are evaluated once; otherwise per batch. Every output value sums the
 * modes in increasing order, so results are bit-identical for any thread count.
 */
public final class FieldSynthesizer {
    /** Points per block of the generic path. */
    static final int BLOCK = 32;
    /** Modes per tile: a tile of a block's basis (TILE × 3·BLOCK doubles, 192 KiB) stays in L2. */
    static final int TILE = 256;

    private final ModeFunctions functions;
    private final List<Vec3> points;
    private final Set<Field> fields;
    private final int modes;
    private final double[] k;
    private final boolean needU;
    private final boolean needH;
    private final boolean[] inside;
    private final List<Block> blocks = new ArrayList<>();
    private final List<GridSegment> segments = new ArrayList<>();
    private final boolean cached;

    /** Consecutive points [start, start + size) of the generic path, with their basis if cached. */
    private static final class Block {
        final int start;
        final int size;
        double[] u;
        double[] hk;

        Block(int start, int size) {
            this.start = start;
            this.size = size;
        }
    }

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
     * Like the constructor, with the points given as sets: grid sets of a cavity that offers a
     * {@link TensorGridSum} (and lie wholly inside it) take that exact fast path.
     *
     * @param table the modes
     * @param sets evaluation point sets, in global point order
     * @param fields fields to synthesise (non-empty)
     * @param cacheBytes largest basis cache for the other points, bytes
     * @return the synthesiser
     */
    public static FieldSynthesizer forSets(ModeTable table, List<PointSet> sets, Set<Field> fields, long cacheBytes) {
        List<Vec3> all = new ArrayList<>();
        for (PointSet s : sets) {
            all.addAll(s.points());
        }
        return new FieldSynthesizer(table, all, sets, fields, cacheBytes);
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
        int n = this.points.size();
        this.inside = new boolean[n];
        for (int p = 0; p < n; p++) {
            inside[p] = table.cavity().contains(this.points.get(p));
        }
        boolean[] fast = new boolean[n];
        int offset = 0;
        for (PointSet set : sets) {
            if (set.kind() == PointSet.Kind.GRID && allInside(offset, set.size())) {
                TensorGridSum sum = gridSum(table, set);
                if (sum != null) {
                    segments.add(new GridSegment(offset, set.size(), sum));
                    Arrays.fill(fast, offset, offset + set.size(), true);
                }
            }
            offset += set.size();
        }
        if (!sets.isEmpty() && offset != n) {
            throw new IllegalArgumentException("point sets do not add up to the point list");
        }
        for (int p = 0; p < n;) {
            if (fast[p]) {
                p++;
                continue;
            }
            int start = p;
            while (p < n && !fast[p] && p - start < BLOCK) {
                p++;
            }
            blocks.add(new Block(start, p - start));
        }
        needU = fields.contains(Field.A) || fields.contains(Field.E);
        needH = fields.contains(Field.B);
        long genericPoints = blocks.stream().mapToLong(b -> b.size).sum();
        long bytes = 3L * modes * 8 * ((needU ? 1 : 0) + (needH ? 1 : 0)) * genericPoints;
        cached = bytes <= cacheBytes;
        if (cached) {
            blocks.parallelStream().forEach(this::fillBasis);
        }
    }

    private static TensorGridSum gridSum(ModeTable table, PointSet set) {
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
        for (int kk = 0; kk < n[2]; kk++) {
            zs[kk] = pts.get(kk * n[0] * n[1]).z();
        }
        return table.cavity().tensorGridSum(table.modes(), xs, ys, zs);
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

    /** @return true if point p lies inside the cavity */
    public boolean inside(int p) {
        return inside[p];
    }

    /** Evaluates a block's basis, mode-major; points outside the cavity get zero columns. */
    private void fillBasis(Block b) {
        int w = 3 * b.size;
        double[] u = needU ? new double[modes * w] : null;
        double[] hk = needH ? new double[modes * w] : null;
        double[] pu = needU ? new double[3 * modes] : null;
        double[] ph = needH ? new double[3 * modes] : null;
        for (int j = 0; j < b.size; j++) {
            int p = b.start + j;
            if (!inside[p]) {
                continue;
            }
            Vec3 r = points.get(p);
            functions.evaluate(r.x(), r.y(), r.z(), pu, ph);
            for (int l = 0; l < modes; l++) {
                for (int i = 0; i < 3; i++) {
                    if (u != null) {
                        u[l * w + 3 * j + i] = pu[3 * l + i];
                    }
                    if (hk != null) {
                        hk[l * w + 3 * j + i] = k[l] * ph[3 * l + i];
                    }
                }
            }
        }
        b.u = u;
        b.hk = hk;
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
        double[][] outA = out.get(Field.A);
        double[][] outE = out.get(Field.E);
        double[][] outB = out.get(Field.B);
        pool.submit(() -> blocks.parallelStream().forEach(b -> {
            Block blk = b;
            if (!cached) {
                blk = new Block(b.start, b.size);
                fillBasis(blk);
            }
            if (outA != null) {
                product(blk, blk.u, q, outA, Field.A, firstSample);
            }
            if (outE != null) {
                product(blk, blk.u, e, outE, Field.E, firstSample);
            }
            if (outB != null) {
                product(blk, blk.hk, q, outB, Field.B, firstSample);
            }
        })).join();
        if (!segments.isEmpty()) {
            pool.submit(() -> IntStream.range(0, q.length).parallel().forEach(s -> {
                for (GridSegment g : segments) {
                    if (outA != null) {
                        if (!g.sum().sum(q[s], false, outA[s], 3 * g.offset())) {
                            checkRange(outA[s], g.offset(), g.size(), Field.A, firstSample + s);
                        }
                    }
                    if (outE != null) {
                        if (!g.sum().sum(e[s], false, outE[s], 3 * g.offset())) {
                            checkRange(outE[s], g.offset(), g.size(), Field.E, firstSample + s);
                        }
                    }
                    if (outB != null) {
                        if (!g.sum().sum(q[s], true, outB[s], 3 * g.offset())) {
                            checkRange(outB[s], g.offset(), g.size(), Field.B, firstSample + s);
                        }
                    }
                }
            })).join();
        }
    }

    /** Out[s][3·start .. 3·start + w) = Σ_l amp[s][l]·basis[l·w ..], modes in increasing order. */
    private void product(Block b, double[] basis, double[][] amp, double[][] out, Field f, long firstSample) {
        int w = 3 * b.size;
        int o = 3 * b.start;
        for (double[] row : out) {
            Arrays.fill(row, o, o + w, 0.0);
        }
        for (int l0 = 0; l0 < modes; l0 += TILE) {
            int l1 = Math.min(modes, l0 + TILE);
            for (int s = 0; s < amp.length; s++) {
                double[] a = amp[s];
                double[] row = out[s];
                for (int l = l0; l < l1; l++) {
                    double c = a[l];
                    int base = l * w;
                    for (int j = 0; j < w; j++) {
                        row[o + j] += c * basis[base + j];
                    }
                }
            }
        }
        for (int s = 0; s < amp.length; s++) {
            for (int j = 0; j < b.size; j++) {
                int p = b.start + j;
                if (!inside[p]) {
                    out[s][3 * p] = Double.NaN;
                    out[s][3 * p + 1] = Double.NaN;
                    out[s][3 * p + 2] = Double.NaN;
                }
            }
            checkRange(out[s], b.start, b.size, f, firstSample + s);
        }
    }

    // Points outside the cavity carry NaN on purpose; everything else must be finite.
    private void checkRange(double[] values, int start, int size, Field f, long sample) {
        // Fast pass: x·0 is 0 for finite x and NaN otherwise, so a sum of them settles the common
        // case (four independent sums, to run at throughput rather than add latency); only a range
        // holding a NaN (outside points, or a real fault) is walked point by point.
        double a0 = 0.0;
        double a1 = 0.0;
        double a2 = 0.0;
        double a3 = 0.0;
        int v = 3 * start;
        int end = 3 * (start + size);
        for (; v + 3 < end; v += 4) {
            a0 += values[v] * 0.0;
            a1 += values[v + 1] * 0.0;
            a2 += values[v + 2] * 0.0;
            a3 += values[v + 3] * 0.0;
        }
        for (; v < end; v++) {
            a0 += values[v] * 0.0;
        }
        if (a0 + a1 + a2 + a3 == 0.0) {
            return;
        }
        for (int p = start; p < start + size; p++) {
            if (!inside[p]) {
                continue;
            }
            for (int i = 0; i < 3; i++) {
                if (!Double.isFinite(values[3 * p + i])) {
                    Vec3 r = points.get(p);
                    throw new IllegalStateException(String.format(
                        "non-finite %s at point %d (%g, %g, %g) m in sample %d", f.column(i), p, r.x(), r.y(), r.z(), sample));
                }
            }
        }
    }
}
