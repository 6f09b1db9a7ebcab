package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.WallProfileRow;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.spec.RunSpec;

/**
 * Mean-square profiles across the small box from the wall x = 0: ensemble against the mode sum,
 * and the one-wall image reference against the mode sum close to a wall of a box with many modes.
 *
 * <p>False-failure budget: 2e-6 (Bonferroni over all tested rows of the three fields).
 */
class WallProfileTest {
    private static final long SEED = 20261205L;

    @Test
    void ensembleProfilesMatchTheModeSum() throws Exception {
        RunSpec spec = EstimatorFixtures.spec(Path.of("."));
        ModeTable table = EstimatorFixtures.table(spec);
        List<Integer> line = EstimatorFixtures.range(1, 12);
        WallProfile[] profiles = {WallProfile.of(Field.A, line, 48), WallProfile.of(Field.E, line, 48),
            WallProfile.of(Field.B, line, 48)};
        int n = 3000;
        EstimatorFixtures.run(spec, table, SEED, 0, n, EstimatorFixtures.tee(profiles));
        int tested = 0;
        List<List<WallProfileRow>> all = new java.util.ArrayList<>();
        for (WallProfile p : profiles) {
            List<WallProfileRow> rows = p.result(table, spec.allPoints());
            assertEquals(44, rows.size());
            all.add(rows);
            tested += (int) rows.stream().filter(WallProfileRow::tested).count();
        }
        // Each row is a mean of N squares (skewness 2√2/√N = 0.05 at N = 3000): normal tail is fine.
        double zStar = CorrelationEstimator.criticalZ(2e-6, tested);
        for (List<WallProfileRow> rows : all) {
            for (int k = 0; k < rows.size(); k += 4) {
                WallProfileRow sum = rows.get(k + 3);
                double parts = rows.get(k).estimate() + rows.get(k + 1).estimate() + rows.get(k + 2).estimate();
                assertEquals(parts, sum.estimate(), 1e-12 * sum.estimate(), "sum row is the sum of the components");
            }
            for (WallProfileRow r : rows) {
                if (r.tested()) {
                    assertTrue(Math.abs(r.z()) < zStar, String.format("seed %d, N = %d: %s point %d %s: z = %.3f > %.3f",
                        SEED, n, r.field(), r.point(), r.componentName(), r.z(), zStar));
                } else {
                    assertEquals(0.0, r.estimate(), 1e-30, "vanishing component on the wall: " + r);
                }
            }
            // Point 1 sits on the wall x = 0; point 6 at x = 0.5, nearest wall still x = 0 (0.5 < 0.55).
            assertEquals(0.0, rows.get(0).distanceM());
            assertEquals(0.5, rows.get(20).distanceM(), 1e-12);
            assertEquals(0, rows.get(20).wallAxis());
        }
        // On the wall, tangential E and normal B vanish (PHYSICS.md §1 boundary conditions).
        assertTrue(!all.get(1).get(1).tested() && !all.get(1).get(2).tested() && all.get(1).get(0).tested());
        assertTrue(!all.get(2).get(0).tested() && all.get(2).get(1).tested());
    }

    @Test
    void imageReferenceApproachesTheModeSumNearAWall() {
        // A 0.3 m cube with an exponential window of a = 2 cm, truncated at W = 1e-4 (about 89 000
        // modes): 2 cm from the wall x = 0, at the centre of that face, the five far walls are
        // ≥ 0.15 m away and the one-wall image formula (PHYSICS.md §4) must give the excess of <E²>
        // over free space; the far walls' images are ~ (a/0.3 m)⁴ ≈ 2e-5 of the free value. Both
        // sides use the same enumerated band, so the truncation cancels.
        double side = 0.3;
        double a = 0.02;
        Window w = new Window(Window.Kind.EXP, Medium.VACUUM.waveSpeed() / a, 1e-4);
        ModeTable table = ModeTable.of(RectangularCavity.of(side, side, side, Medium.VACUUM), w, ThermalState.VACUUM,
            200_000);
        Vec3 r = new Vec3(0.02, 0.15, 0.15);
        FreeSpaceSpectrum free = FreeSpaceSpectrum.correlation(Field.E, w, ThermalState.VACUUM, Medium.VACUUM);
        double[][] ms = ModeSumCorrelation.of(table, List.of(r)).tensor(Field.E, 0, 0);
        double[][] img = free.nearPlane(Field.E, 0, 0.0, r, r);
        double[][] fr = free.tensor(Vec3.ZERO);
        double msSum = ms[0][0] + ms[1][1] + ms[2][2];
        double imgSum = img[0][0] + img[1][1] + img[2][2];
        double frSum = fr[0][0] + fr[1][1] + fr[2][2];
        double excess = imgSum - frSum;
        assertTrue(Math.abs(excess) > 0.01 * frSum, "the wall must matter at 2 cm: excess/free = " + excess / frSum);
        assertEquals(imgSum, msSum, 0.02 * Math.abs(excess), "mode sum vs free + one image");
        assertThrows(IllegalArgumentException.class, () -> WallProfile.of(Field.E, List.of(99), 48));
    }
}
