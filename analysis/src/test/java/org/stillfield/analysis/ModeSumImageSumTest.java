package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The box mode sum against an independent algorithm: the free-space closed form summed over the
 * box's reflection group (method of images; Poisson summation turns the image sum into the mode
 * sum, PHYSICS.md §4). Common practice for rectangular PEC cavities; the closed form is derived, see
 * REFERENCE-VALUES.md §5.
 *
 * <p>Box 1 × 1.3 × 1.7 m, a = 0.3 m, window truncated at W = 1e-12: 58 245 modes. Errors: the mode
 * sum drops ν = Q(4, 27.6) = 3.9e-9 of ⟨E²⟩ (≤ 8ν ≈ 3e-8 of C(0) pointwise); the image sum,
 * truncated at |n_i| ≤ 16, is off by 2.1e-7 of C(0) at worst (measured: 1.5e-6 at 8 cells,
 * 2.1e-7 at 16, 3.0e-8 at 32, falling like cells⁻³). Tolerance 1e-6 of C(0) = ħc/(π²ε a⁴) for
 * every element, points near walls, edges and corners included.
 */
class ModeSumImageSumTest {
    private static final double A = 0.3;
    private static final List<Vec3> POINTS = List.of(
        new Vec3(0.3, 0.5, 0.7),      // interior
        new Vec3(0.05, 0.6, 0.9),     // near the wall x = 0
        new Vec3(0.02, 0.03, 1.65),   // near a corner
        new Vec3(0.0, 0.4, 0.4),      // on the wall x = 0
        new Vec3(0.97, 1.28, 0.85));  // near the edge x = a, y = b
    private static final List<RunSpec.PointPair> PAIRS = List.of(
        new RunSpec.PointPair(0, 0), new RunSpec.PointPair(0, 1), new RunSpec.PointPair(1, 1),
        new RunSpec.PointPair(2, 2), new RunSpec.PointPair(2, 0), new RunSpec.PointPair(3, 3),
        new RunSpec.PointPair(3, 1), new RunSpec.PointPair(4, 4), new RunSpec.PointPair(4, 2));

    @Test
    void modeSumEqualsImageSumInVacuum() {
        compare(Medium.VACUUM, List.of(Field.E, Field.B), PAIRS);
    }

    @Test
    void modeSumEqualsImageSumInAFilledBox() {
        // ε0 → ε0ε_r and c → c_m in the variances (ModeTable) and in the closed form, independently.
        compare(new Medium(2.25, 1.2), List.of(Field.E, Field.B), PAIRS.subList(0, 4));
    }

    private static void compare(Medium medium, List<Field> fields, List<RunSpec.PointPair> pairs) {
        Cavity box = RectangularCavity.of(1.0, 1.3, 1.7, medium);
        Window w = new Window(Window.Kind.EXP, medium.waveSpeed() / A, 1e-12);
        ModeTable table = ModeTable.of(box, w, ThermalState.VACUUM, 1_000_000);
        ModeSumCorrelation sums = ModeSumCorrelation.of(table, POINTS);
        BoxImageSum images = BoxImageSum.of(box, w, 16);
        for (Field f : fields) {
            double scale = AnalyticCorrelation.freeSpace(f, Vec3.ZERO, A, medium)[0][0];
            List<double[][]> m = sums.tensors(f, pairs);
            for (int k = 0; k < pairs.size(); k++) {
                RunSpec.PointPair p = pairs.get(k);
                double[][] img = images.tensor(f, POINTS.get(p.first()), POINTS.get(p.second()));
                for (int i = 0; i < 3; i++) {
                    for (int j = 0; j < 3; j++) {
                        assertEquals(img[i][j], m.get(k)[i][j], 1e-6 * scale, String.format(
                            "%s %s pair (%d,%d) [%d][%d]: mode sum %.9e, images %.9e (units C(0))", medium, f, p.first(),
                            p.second(), i, j, m.get(k)[i][j] / scale, img[i][j] / scale));
                    }
                }
            }
        }
    }

    @Test
    void imageSumRejectsTheVectorPotentialAndOutsidePoints() {
        BoxImageSum s = BoxImageSum.of(1, 1, 1, 0.1, Medium.VACUUM, 2);
        assertThrows(IllegalArgumentException.class, () -> s.tensor(Field.A, new Vec3(0.5, 0.5, 0.5), new Vec3(0.5, 0.5, 0.5)));
        assertThrows(IllegalArgumentException.class, () -> s.tensor(Field.E, new Vec3(1.5, 0.5, 0.5), new Vec3(0.5, 0.5, 0.5)));
        assertThrows(IllegalArgumentException.class, () -> BoxImageSum.of(1, 1, 1, 0.1, Medium.VACUUM, -1));
    }
}
