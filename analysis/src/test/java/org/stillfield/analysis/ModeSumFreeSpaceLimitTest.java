package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * The cavity mode sum far from the walls (free-space limit) and near one wall (image formula), in a
 * cube of side L = 14a with the exponential window a = c/ω_c = 1 cm.
 *
 * <p>Size: truncating the window at W = 1e-9 keeps k ≤ ln(1e9)/a = 20.7/a, so Weyl's law gives
 * V k³/(3π²) ≈ 300 (L/a)³ = 8.2e5 modes (824 623 enumerated); building the table and one basis
 * takes about a second. The truncation drops a fraction ν = Q(4, 20.7) = 1.7e-6 of ⟨E²⟩
 * ({@link Window#neglectedFraction(int)}).
 *
 * <p>Error budget. The box mode sum equals the free-space form summed over the box's images
 * ({@link BoxImageSum}, checked separately), so the walls enter as the images other than the
 * direct term. Every image contributes at most (ħc/π²ε0)/|D|⁴ to any tensor element (its
 * eigenvalues are 1/s² and (a² − D²)/s³, both ≤ 1/D⁴ in magnitude), so the sum of 1/|D|⁴ over
 * the images bounds the wall error. At the centre of a cube the images sit at L·m, m ∈ Z³∖{0}, and
 * the bound is (a/L)⁴ Σ|m|⁻⁴ = 16.53 (a/L)⁴ = 4.3e-4 of C(0). The signed sum is smaller: each
 * face adds (a/L)⁴ to every diagonal element (one wall's per-component excess ħc/(16π²ε0z⁴) at
 * z = L/2, over ħc/(π²ε0a⁴)), so the three wall pairs give 6(a/L)⁴; the twelve edges add −(a/L)⁴
 * and the eight corners −(8/27)(a/L)⁴, so the first shell gives 4.7(a/L)⁴ = 1.22e-4, which is
 * what the mode sum shows (1.217e-4 after the truncation correction). The dropped
 * modes add a non-negative amount ≤ 8 × (their box average), since |u_l|² ≤ N² = 8 pointwise while
 * its box average is 1: at most 24ν C(0) = 4e-5 of C(0) to a trace, or 8ν C(0) to one element.
 */
class ModeSumFreeSpaceLimitTest {
    private static final double A = 0.01;
    private static final double L = 14 * A;
    private static final Medium VAC = Medium.VACUUM;
    private static final double C_M = VAC.waveSpeed();
    private static ModeTable table;
    private static double nu;
    /** ħc/(π²ε0) / a⁴ = C^E_ii(0), V²/m². */
    private static double c0;
    private static double pE;

    @BeforeAll
    static void buildTable() {
        Window w = new Window(Window.Kind.EXP, C_M / A, 1e-9);
        table = ModeTable.of(RectangularCavity.of(L, L, L, VAC), w, ThermalState.VACUUM, 2_000_000);
        nu = w.neglectedFraction(Field.E);
        c0 = AnalyticCorrelation.freeSpace(Field.E, Vec3.ZERO, A, VAC)[0][0];
        pE = c0 * Math.pow(A, 4);
    }

    @Test
    void tableHasTheExpectedSize() {
        // Weyl's law with the edge term (PHYSICS.md §1) for the cube up to k = ln(1e9)/a: the exact
        // count must lie within 1 % (the rms residual grows ~ k, far below 1 % of 8e5).
        double kMax = Math.log(1e9) / A;
        double weyl = table.cavity().weylCount(kMax);
        assertEquals(weyl, table.size(), 0.01 * weyl, "mode count");
    }

    @Test
    void centreVarianceApproachesFreeSpace() {
        // C^E_ij(centre) → ħc δ_ij/(π²ε0a⁴) (PHYSICS.md §4; REFERENCE-VALUES.md §5, derived; the
        // a → 0 form from Milonni 1994, source from memory). Expected value reduced by the
        // truncated fraction ν; tolerance = image bound (class comment) + 8ν for the truncation.
        Vec3 c = new Vec3(L / 2, L / 2, L / 2);
        double[][] m = AnalyticCorrelation.modeSum(table, Field.E, c, c);
        double bound = imageBound(c, c) * pE + 8 * nu * c0;
        assertTrue(bound < 6e-4 * c0, "bound " + bound / c0);
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                double expected = i == j ? c0 * (1 - nu) : 0;
                assertEquals(expected, m[i][j], bound,
                    String.format("C[%d][%d]/C(0) = %.8f, bound %.2e", i, j, m[i][j] / c0, bound / c0));
            }
        }
    }

    @Test
    void separatedPairMatchesFreeSpaceClosedForm() {
        // C^E_ij(r, r + s), |s| = 2a along (1,2,2)/3 so that all nine elements are nonzero, against
        // the regulated closed form (REFERENCE-VALUES.md §5, derived). Tolerance: image bound for
        // this pair + 8ν C(0); about 1.1 % of the parallel component 1/(25a⁴).
        Vec3 c = new Vec3(L / 2, L / 2, L / 2);
        Vec3 s = new Vec3(2 * A / 3, 4 * A / 3, 4 * A / 3);
        Vec3 r = c.plusScaled(s, -0.5);
        Vec3 r2 = c.plusScaled(s, 0.5);
        double[][] m = AnalyticCorrelation.modeSum(table, Field.E, r, r2);
        double[][] free = AnalyticCorrelation.freeSpace(Field.E, r.minus(r2), A, VAC);
        double bound = imageBound(r, r2) * pE + 8 * nu * c0;
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                assertEquals(free[i][j], m[i][j], bound, String.format("C[%d][%d]: mode sum %.6e, closed %.6e, bound %.2e",
                    i, j, m[i][j], free[i][j], bound));
            }
        }
        double parallel = AnalyticCorrelation.freeSpaceParallel(Field.E, s.norm(), A, VAC);
        assertTrue(bound < 0.015 * parallel, "bound too loose to test: " + bound / parallel);
    }

    @Test
    void nearWallExcessFollowsTheImageFormula() {
        // Near the wall z = 0 (x = y = L/2), ⟨E²⟩ − ⟨E²⟩_free = (ħc/2π²ε0)(6Z² − 2a²)/(Z² + a²)³,
        // Z = 2z (REFERENCE-VALUES.md §6, derived), which → 3ħc/(16π²ε0z⁴) for a ≪ z (Lütken &
        // Ravndal 1985, source from memory; the limit itself is checked in NearPlaneImageTest). With
        // L = 14a the other walls are not negligible, so DIFFERENCES between z and z_ref = 5a are
        // compared: the images not reflected in z (the four side walls, their edges, the z-periodic
        // copies) are the same at both points and cancel exactly. The rest (far wall, edges and
        // corners that include the z reflection) changes by at most Σ|Δ tr(C0 S)| over those images
        // (triangle inequality, closed form, |n_i| ≤ 12; the sum has converged to 1e-3 there), and
        // the truncation by at most 24ν C(0). Tolerances: 0.2 %, 0.6 %, 1.6 % of the signal at
        // z = 1, 1.5, 2 a. B (h modes): −(the E excess)/c², same argument.
        double zRef = 5 * A;
        double[] zs = {1 * A, 1.5 * A, 2 * A};
        List<Vec3> pts = new ArrayList<>();
        for (double z : zs) {
            pts.add(onAxis(z));
        }
        pts.add(onAxis(zRef));
        ModeSumCorrelation sums = ModeSumCorrelation.of(table, pts);
        int ref = zs.length;
        double eRef = trace(sums.tensor(Field.E, ref, ref));
        double bRef = trace(sums.tensor(Field.B, ref, ref)) * C_M * C_M;
        double imageRef = trace(image(Field.E, onAxis(zRef)));
        for (int k = 0; k < zs.length; k++) {
            double signal = trace(image(Field.E, pts.get(k))) - imageRef;
            double modeE = trace(sums.tensor(Field.E, k, k)) - eRef;
            double modeB = trace(sums.tensor(Field.B, k, k)) * C_M * C_M - bRef;
            double tolE = residualBound(Field.E, zs[k], zRef, false) + 24 * nu * c0;
            double tolB = residualBound(Field.B, zs[k], zRef, false) * C_M * C_M + 24 * nu * c0;
            String at = String.format("z = %.1f a", zs[k] / A);
            assertEquals(signal, modeE, tolE, at + String.format(": E excess difference %.6e vs image %.6e (tol %.2e)",
                modeE / c0, signal / c0, tolE / c0));
            assertEquals(-signal, modeB, tolB, at + String.format(": c²B excess difference %.6e vs image %.6e (tol %.2e)",
                modeB / c0, -signal / c0, tolB / c0));
            assertTrue(tolE < 0.02 * signal, at + ": tolerance too loose to test");
        }
    }

    @Test
    void nearWallEnergyDensityHasNoExcess() {
        // (ε0⟨E²⟩ + ⟨B²⟩/μ0)/2 has no excess near one plate (REFERENCE-VALUES.md §6, derived; Lütken
        // & Ravndal 1985, source from memory), so ε0(⟨E²⟩ + c²⟨B²⟩) changes little between z = a
        // and 5a although each term changes by 0.088 C(0). Images with one or three reflections
        // cancel between E and B exactly (S_B = −S_E); those with two, one of them in z, add: the
        // bound is twice their Σ|Δ tr| plus 48ν C(0) for the truncation of both fields.
        double zRef = 5 * A;
        double z = A;
        ModeSumCorrelation sums = ModeSumCorrelation.of(table, List.of(onAxis(z), onAxis(zRef)));
        double u = trace(sums.tensor(Field.E, 0, 0)) + trace(sums.tensor(Field.B, 0, 0)) * C_M * C_M;
        double uRef = trace(sums.tensor(Field.E, 1, 1)) + trace(sums.tensor(Field.B, 1, 1)) * C_M * C_M;
        double bound = 2 * residualBound(Field.E, z, zRef, true) + 48 * nu * c0;
        double eChange = trace(image(Field.E, onAxis(z))) - trace(image(Field.E, onAxis(zRef)));
        assertEquals(0.0, u - uRef, bound, String.format("energy-density change %.3e C(0), bound %.2e, E change %.3e",
            (u - uRef) / c0, bound / c0, eChange / c0));
        assertTrue(bound < 0.005 * eChange, "bound too loose to test: " + bound / eChange);
    }

    private static Vec3 onAxis(double z) {
        return new Vec3(L / 2, L / 2, z);
    }

    private static double[][] image(Field f, Vec3 r) {
        return AnalyticCorrelation.planeImage(f, 2, 0.0, r, r, A, VAC);
    }

    private static double trace(double[][] m) {
        return m[0][0] + m[1][1] + m[2][2];
    }

    /**
     * Σ over images except the direct one of 1/|D|⁴ (m⁻⁴), |n_i| ≤ 40, plus the tail beyond:
     * images have density 1/L³ and the omitted ones lie at |D| ≥ 80L − 2√3L, so the tail is at most
     * ∫ 4πR² dR/(L³R⁴) = 4π/(L³ · 76.5 L).
     */
    private static double imageBound(Vec3 r, Vec3 r2) {
        double[] x = {r.x(), r.y(), r.z()};
        double[] y = {r2.x(), r2.y(), r2.z()};
        int cells = 40;
        double sum = 0;
        for (int nx = -cells; nx <= cells; nx++) {
            for (int ny = -cells; ny <= cells; ny++) {
                for (int nz = -cells; nz <= cells; nz++) {
                    int[] n = {nx, ny, nz};
                    for (int sigma = 0; sigma < 8; sigma++) {
                        if (sigma == 0 && nx == 0 && ny == 0 && nz == 0) {
                            continue;
                        }
                        double d2 = 0;
                        for (int i = 0; i < 3; i++) {
                            double img = (((sigma >> i) & 1) == 1 ? -y[i] : y[i]) + 2 * n[i] * L;
                            d2 += (x[i] - img) * (x[i] - img);
                        }
                        sum += 1 / (d2 * d2);
                    }
                }
            }
        }
        return sum + 4 * Math.PI / (L * L * L * 76.5 * L);
    }

    /**
     * Σ |tr(C0(D(z)) S) − tr(C0(D(zRef)) S)| over the images reflected in z, except the near wall
     * itself (n = 0, σ = z only), |n_i| ≤ 12, for points on the axis x = y = L/2; with
     * {@code evenOnly} only the images reflected in exactly one of x, y besides z. Times 1.01 for
     * the cells beyond 12 (their terms fall like |D|⁻⁵: 1e-3 of the total, measured by doubling).
     */
    private static double residualBound(Field f, double z, double zRef, boolean evenOnly) {
        int cells = 12;
        double normal = f == Field.B ? -1 : 1;
        double sum = 0;
        for (int nx = -cells; nx <= cells; nx++) {
            for (int ny = -cells; ny <= cells; ny++) {
                for (int nz = -cells; nz <= cells; nz++) {
                    int[] n = {nx, ny, nz};
                    for (int sigma = 4; sigma < 8; sigma++) {
                        int sx = sigma & 1;
                        int sy = (sigma >> 1) & 1;
                        if (sigma == 4 && nx == 0 && ny == 0 && nz == 0) {
                            continue;
                        }
                        if (evenOnly && sx + sy != 1) {
                            continue;
                        }
                        int[] sig = {sx, sy, 1};
                        double[] s = {1, 1, 1};
                        for (int i = 0; i < 3; i++) {
                            if (sig[i] == 1) {
                                for (int j = 0; j < 3; j++) {
                                    s[j] *= j == i ? normal : -normal;
                                }
                            }
                        }
                        double change = 0;
                        for (int k = 0; k < 2; k++) {
                            double[] x = {L / 2, L / 2, k == 0 ? z : zRef};
                            double[] d = new double[3];
                            for (int i = 0; i < 3; i++) {
                                d[i] = x[i] - ((sig[i] == 1 ? -x[i] : x[i]) + 2 * n[i] * L);
                            }
                            double[][] c = AnalyticCorrelation.freeSpace(f, new Vec3(d[0], d[1], d[2]), A, VAC);
                            double t = c[0][0] * s[0] + c[1][1] * s[1] + c[2][2] * s[2];
                            change += k == 0 ? t : -t;
                        }
                        sum += Math.abs(change);
                    }
                }
            }
        }
        return 1.01 * sum;
    }
}
