package org.stillfield.sampler.engine;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.EnumMap;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ForkJoinPool;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * The box's tensor-product grid sum must equal the direct per-point mode sum (an independent code
 * path: per-point mode functions and dot products) to rounding, for A, E and B.
 */
class TensorGridSumTest {
    @Test
    void gridSumEqualsDirectModeSum() {
        RectangularCavity box = RectangularCavity.of(1.0, 1.3, 1.7, Medium.VACUUM);
        // Hard cutoff at k = 25 rad/m: about 1150 modes, every index pattern including one-zero modes.
        Window w = new Window(Window.Kind.HARD, 25 * Medium.VACUUM.waveSpeed(), Window.DEFAULT_TOLERANCE);
        ModeTable table = ModeTable.of(box, w, ThermalState.VACUUM, 100_000);
        PointSet grid = PointSet.grid("g", new Vec3(0.1, 0.0, 0.2), new Vec3(0.9, 1.3, 1.5), 7, 5, 9);
        PointSet line = PointSet.line("l", new Vec3(0.5, 0.65, 0.0), new Vec3(0.5, 0.65, 1.7), 4);
        List<PointSet> sets = List.of(line, grid);
        List<Vec3> points = new java.util.ArrayList<>(line.points());
        points.addAll(grid.points());
        EnumSet<Field> fields = EnumSet.allOf(Field.class);

        int samples = 3;
        int m = table.size();
        double[][] q = new double[samples][m];
        double[][] e = new double[samples][m];
        UniformRandomProvider rng = RandomSource.L64_X128_MIX.create(42L);
        for (int s = 0; s < samples; s++) {
            for (int l = 0; l < m; l++) {
                q[s][l] = rng.nextDouble() - 0.5;
                e[s][l] = rng.nextDouble() - 0.5;
            }
        }
        Map<Field, double[][]> direct = alloc(fields, samples, points.size());
        Map<Field, double[][]> fast = alloc(fields, samples, points.size());
        ForkJoinPool pool = new ForkJoinPool(2);
        try {
            new FieldSynthesizer(table, points, fields, 1L << 30).synthesize(q, e, direct, pool, 0);
            FieldSynthesizer.forSets(table, sets, fields, 1L << 30).synthesize(q, e, fast, pool, 0);
        } finally {
            pool.shutdown();
        }
        for (Field f : fields) {
            for (int s = 0; s < samples; s++) {
                double scale = 0;
                double diff = 0;
                for (int j = 0; j < 3 * points.size(); j++) {
                    scale = Math.max(scale, Math.abs(direct.get(f)[s][j]));
                    diff = Math.max(diff, Math.abs(direct.get(f)[s][j] - fast.get(f)[s][j]));
                }
                // ~1150 terms of O(1): rounding of either sum is ~1e-14 of the scale.
                assertTrue(scale > 0 && diff <= 1e-12 * scale, f + " sample " + s + ": max diff " + diff + " of scale " + scale);
            }
        }
    }

    private static Map<Field, double[][]> alloc(EnumSet<Field> fields, int samples, int points) {
        Map<Field, double[][]> out = new EnumMap<>(Field.class);
        for (Field f : fields) {
            out.put(f, new double[samples][3 * points]);
        }
        return out;
    }
}
