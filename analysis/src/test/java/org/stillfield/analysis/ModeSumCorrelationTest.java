package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.spec.RunSpec;

/** The cached and blocked mode sums against a direct loop over the modes (PHYSICS.md §4). */
class ModeSumCorrelationTest {
    private static final List<Vec3> POINTS = List.of(new Vec3(0.011, 0.007, 0.013), new Vec3(0.02, 0.015, 0.03),
        new Vec3(0.0, 0.01, 0.02), new Vec3(0.005, 0.019, 0.001));
    private static final List<RunSpec.PointPair> PAIRS = List.of(new RunSpec.PointPair(0, 0), new RunSpec.PointPair(0, 1),
        new RunSpec.PointPair(1, 0), new RunSpec.PointPair(2, 3), new RunSpec.PointPair(3, 3));

    private static ModeTable table() {
        // A thermal state so that the thermal factor enters; 30 x 20 x 40 mm box, ~3000 modes.
        return ModeTable.of(RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM),
            new Window(Window.Kind.GAUSS, 2 * Math.PI * 20e9, 1e-6), new ThermalState(0.3), 100_000);
    }

    /** Σ_l variance(f, l) f_i(r) f_j(r′), the definition, one mode at a time in table order. */
    private static double[][] direct(ModeTable t, Field f, Vec3 r, Vec3 r2) {
        ModeFunctions mf = t.cavity().modeFunctions(t.modes());
        int m = t.size();
        double[] u1 = new double[3 * m];
        double[] h1 = new double[3 * m];
        double[] u2 = new double[3 * m];
        double[] h2 = new double[3 * m];
        mf.evaluate(r.x(), r.y(), r.z(), u1, h1);
        mf.evaluate(r2.x(), r2.y(), r2.z(), u2, h2);
        double[] b1 = f == Field.B ? h1 : u1;
        double[] b2 = f == Field.B ? h2 : u2;
        double[][] c = new double[3][3];
        for (int l = 0; l < m; l++) {
            double w = t.variance(f, l);
            for (int i = 0; i < 3; i++) {
                for (int j = 0; j < 3; j++) {
                    c[i][j] += w * b1[3 * l + i] * b2[3 * l + j];
                }
            }
        }
        return c;
    }

    @Test
    void cachedAndBlockedSumsEqualTheDirectSum() {
        // Same terms, different grouping: agreement to rounding, 1e-12 of the diagonal scale.
        ModeTable t = table();
        ModeSumCorrelation cached = ModeSumCorrelation.of(t, POINTS);
        ModeSumCorrelation blocked = ModeSumCorrelation.of(t, POINTS, 1);
        Map<Field, List<double[][]>> c1 = cached.tensors(EnumSet.allOf(Field.class), PAIRS);
        Map<Field, List<double[][]>> c2 = blocked.tensors(EnumSet.allOf(Field.class), PAIRS);
        for (Field f : Field.values()) {
            double scale = direct(t, f, POINTS.get(0), POINTS.get(0))[0][0];
            for (int k = 0; k < PAIRS.size(); k++) {
                RunSpec.PointPair p = PAIRS.get(k);
                double[][] d = direct(t, f, POINTS.get(p.first()), POINTS.get(p.second()));
                for (int i = 0; i < 3; i++) {
                    for (int j = 0; j < 3; j++) {
                        String at = f + " pair " + k + " [" + i + "][" + j + "]";
                        assertEquals(d[i][j], c1.get(f).get(k)[i][j], 1e-12 * scale, at + " cached");
                        assertEquals(d[i][j], c2.get(f).get(k)[i][j], 1e-12 * scale, at + " blocked");
                    }
                }
            }
        }
        double[][] single = AnalyticCorrelation.modeSum(t, Field.E, POINTS.get(1), POINTS.get(0));
        double[][] viaList = cached.tensor(Field.E, 1, 0);
        for (int i = 0; i < 3; i++) {
            assertEquals(viaList[i][i], single[i][i], 1e-12 * Math.abs(viaList[i][i]));
        }
    }

    @Test
    void swappingThePointsTransposes() {
        // C_ij(r, r′) = C_ji(r′, r) by definition; the products are grouped differently, so to rounding.
        ModeSumCorrelation s = ModeSumCorrelation.of(table(), POINTS);
        for (Field f : Field.values()) {
            double[][] a = s.tensor(f, 0, 1);
            double[][] b = s.tensor(f, 1, 0);
            double scale = s.tensor(f, 0, 0)[0][0];
            for (int i = 0; i < 3; i++) {
                for (int j = 0; j < 3; j++) {
                    assertEquals(a[i][j], b[j][i], 1e-14 * scale);
                }
            }
        }
    }

    @Test
    void wallPointHasExactlyZeroTangentialElectricVariance() {
        // n×u = 0 on the wall x = 0 (PHYSICS.md §1): sin(0) = 0 exactly, so E_y, E_z, A_y, A_z and
        // the normal B_x vanish identically there; the estimator relies on the zeros being exact.
        ModeSumCorrelation s = ModeSumCorrelation.of(table(), POINTS);
        double[][] e = s.tensor(Field.E, 2, 2);
        double[][] b = s.tensor(Field.B, 2, 2);
        assertEquals(0.0, e[1][1]);
        assertEquals(0.0, e[2][2]);
        assertEquals(0.0, b[0][0]);
        assertTrue(e[0][0] > 0 && b[1][1] > 0 && b[2][2] > 0);
    }

    @Test
    void rejectsBadIndicesAndBudgets() {
        ModeSumCorrelation s = ModeSumCorrelation.of(table(), POINTS);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> s.tensor(Field.E, 0, 4));
        assertTrue(ex.getMessage().contains("point 4"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> ModeSumCorrelation.of(table(), POINTS, 0));
        assertThrows(IllegalArgumentException.class,
            () -> ModeSumCorrelation.of(table(), List.of(new Vec3(Double.NaN, 0, 0))));
    }
}
