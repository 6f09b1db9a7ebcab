package org.stillfield.analysis;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.stillfield.analysis.api.WallProfileRow;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.spec.RunSpec;

/**
 * Mean-square profiles ⟨F_x²⟩, ⟨F_y²⟩, ⟨F_z²⟩ and ⟨F²⟩ at chosen points of a box (typically a line
 * running away from a wall), against the distance from a chosen wall (e.g. the one the line starts
 * from) or from each point's nearest wall.
 *
 * <p>Estimates: per point the squares F_c² and F² of every sample go into a
 * {@link MomentAccumulator}, so parts merge exactly. Standard errors are the Isserlis ones from the
 * analytic mode sum: Var(F_c²) = 2C_cc², Var(F²) = 2 Σ_ij C_ij² per sample (Isserlis 1918, source from
 * memory). References: the exact mode sum, free space with the same window
 * ({@link FreeSpaceSpectrum#correlation}), and free space plus the image in the nearest wall
 * (PHYSICS.md §4; near one wall the excess of ⟨E²⟩ tends to 3ħc/(16π²ε0z⁴) for a → 0,
 * REFERENCE-VALUES.md §6). The image reference ignores the other five walls, so it agrees with the
 * mode sum only where that wall dominates.
 *
 * <p>A component whose mode-sum variance is below 1e-20 of the largest on the profile (tangential E
 * or normal B on a wall, where every mode function vanishes) is reported with standard error 0 and
 * not tested.
 */
public final class WallProfile implements EnsembleSink {
    private static final double ZERO_VARIANCE = 1e-20;

    private final Field field;
    private final int[] globalPoints;
    private final int pointCount;
    private final MomentAccumulator moments;

    private WallProfile(Field field, int[] globalPoints, int pointCount) {
        this.field = field;
        this.globalPoints = globalPoints;
        this.pointCount = pointCount;
        this.moments = MomentAccumulator.of(4 * globalPoints.length, MomentAccumulator.CEILING);
    }

    /**
     * @param field the field
     * @param globalPoints global indices of the profile's points (inside the box), at most 2048
     * @param pointCount number of evaluation points in every batch
     * @return the profile estimator
     */
    public static WallProfile of(Field field, List<Integer> globalPoints, int pointCount) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(globalPoints, "globalPoints");
        if (globalPoints.isEmpty() || globalPoints.size() > 2048) {
            throw new IllegalArgumentException("globalPoints must name 1 to 2048 points: " + globalPoints.size());
        }
        int[] g = new int[globalPoints.size()];
        for (int k = 0; k < g.length; k++) {
            g[k] = Objects.requireNonNull(globalPoints.get(k), "globalPoints element");
            if (g[k] < 0 || g[k] >= pointCount) {
                throw new IllegalArgumentException("globalPoints[" + k + "] must lie in 0.." + (pointCount - 1) + ": " + g[k]);
            }
        }
        return new WallProfile(field, g, pointCount);
    }

    /** @return the field */
    public Field field() {
        return field;
    }

    /** @return samples accumulated */
    public long samples() {
        return moments.count();
    }

    @Override
    public void accept(SampleBatch batch) {
        Objects.requireNonNull(batch, "batch");
        int n = batch.size();
        double[][] rows = new double[n][4 * globalPoints.length];
        for (int s = 0; s < n; s++) {
            double[] v = batch.values(field, s);
            if (v.length != 3 * pointCount) {
                throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "batch values of %s must hold 3 x %d points: %d in sample %d", field, pointCount, v.length,
                    batch.firstSample() + s));
            }
            for (int k = 0; k < globalPoints.length; k++) {
                int b = 3 * globalPoints[k];
                double sum = 0;
                for (int c = 0; c < 3; c++) {
                    double x = v[b + c];
                    rows[s][4 * k + c] = x * x;
                    sum += x * x;
                }
                rows[s][4 * k + 3] = sum;
            }
        }
        moments.addAll(rows, n);
    }

    /**
     * Adds another part of the same ensemble.
     *
     * @param other a profile of the same field and points
     */
    public void merge(WallProfile other) {
        Objects.requireNonNull(other, "other");
        if (other.field != field || !java.util.Arrays.equals(other.globalPoints, globalPoints)) {
            throw new IllegalArgumentException("other must profile the same field and points");
        }
        moments.merge(other.moments);
    }

    /**
     * Rows against the nearest wall of each point.
     *
     * @param table the modes the ensemble was drawn with; the cavity must be a box
     * @param points all evaluation points, metres
     * @return four rows per point (x, y, z, sum), points in the order given
     */
    public List<WallProfileRow> result(ModeTable table, List<Vec3> points) {
        return result(table, points, null);
    }

    /**
     * Rows against one chosen wall (e.g. the wall a line starts from), whose image gives the
     * plane-image reference for every point.
     *
     * @param table the modes the ensemble was drawn with; the cavity must be a box
     * @param points all evaluation points, metres
     * @param wall the wall (axis and position; its distance field is ignored), or null for each
     *     point's nearest wall
     * @return four rows per point (x, y, z, sum), points in the order given
     */
    public List<WallProfileRow> result(ModeTable table, List<Vec3> points, BoxWalls.Wall wall) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(points, "points");
        BoxWalls walls = BoxWalls.of(table.cavity());
        if (walls == null) {
            throw new IllegalArgumentException("cavity.shape must be box for a wall profile: " + table.cavity().shape());
        }
        long n = moments.count();
        if (n == 0) {
            throw new IllegalStateException("no samples accumulated");
        }
        List<RunSpec.PointPair> self = new ArrayList<>();
        List<Vec3> own = new ArrayList<>();
        for (int k = 0; k < globalPoints.length; k++) {
            own.add(points.get(globalPoints[k]));
            self.add(new RunSpec.PointPair(k, k));
        }
        List<double[][]> ms = ModeSumCorrelation.of(table, own).tensors(field, self);
        FreeSpaceSpectrum free = FreeSpaceSpectrum.correlation(field, table.window(), table.state(),
            table.cavity().medium());
        double[] mean = moments.mean();
        double largest = 0;
        for (double[][] c : ms) {
            for (int i = 0; i < 3; i++) {
                largest = Math.max(largest, c[i][i]);
            }
        }
        double[][] at0 = free.tensor(Vec3.ZERO);
        List<WallProfileRow> out = new ArrayList<>();
        for (int k = 0; k < globalPoints.length; k++) {
            Vec3 r = own.get(k);
            BoxWalls.Wall w = wall == null ? walls.nearest(r)
                : new BoxWalls.Wall(wall.axis(), wall.position(), Math.abs(r.get(wall.axis()) - wall.position()));
            double[][] c = ms.get(k);
            double[][] img = free.nearPlane(field, w.axis(), w.position(), r, r);
            double sumC = 0;
            double sumC2 = 0;
            double sumImg = 0;
            double sumFree = 0;
            for (int i = 0; i < 3; i++) {
                sumC += c[i][i];
                sumImg += img[i][i];
                sumFree += at0[i][i];
                for (int j = 0; j < 3; j++) {
                    sumC2 += c[i][j] * c[i][j];
                }
            }
            for (int comp = 0; comp < 4; comp++) {
                double e = mean[4 * k + comp];
                double ref = comp < 3 ? c[comp][comp] : sumC;
                boolean zero = ref <= ZERO_VARIANCE * largest;
                double se = zero ? 0.0 : Math.sqrt(2 * (comp < 3 ? ref * ref : sumC2) / n);
                double z = zero ? 0.0 : (e - ref) / se;
                out.add(new WallProfileRow(field, globalPoints[k], w.distanceM(), w.axis(), w.position(), comp, e, se,
                    ref, comp < 3 ? img[comp][comp] : sumImg, comp < 3 ? at0[comp][comp] : sumFree, z));
            }
        }
        return out;
    }
}
