package org.stillfield.sampler.geometry;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;

/**
 * The box mode functions against their defining properties (PHYSICS.md §1): orthonormality by
 * Gauss–Legendre quadrature (Commons Math nodes), the PEC boundary conditions on every wall, and
 * ∇·u = 0, ∇·h = 0, ∇²u + k²u = 0 and h = (1/k)∇×u by central finite differences.
 *
 * <p>Finite-difference tolerances are the Taylor bounds of the central stencils applied to
 * products of sin/cos (common practice): the first difference of sin(κx) is off by at most
 * κ³δ²/6 times the amplitude, the second difference by κ⁴δ²/12; plus a rounding term of a few
 * ulp of the amplitude divided by δ (first) or δ² (second).
 */
class BoxModeFunctionsTest {
    private static final double A = 1.0;
    private static final double B = 1.3;
    private static final double D = 1.7;
    private static final double V = A * B * D;
    private static final int MODES = 30;
    private static final double EPS = Math.ulp(1.0);

    private static RectangularCavity box;
    private static List<Mode> modes;
    private static ModeFunctions functions;

    @BeforeAll
    static void lowModes() {
        box = RectangularCavity.of(A, B, D, Medium.VACUUM);
        modes = box.modesUpTo(10).subList(0, MODES);
        functions = box.modeFunctions(modes);
        long oneZero = modes.stream().filter(q -> q.i1() * q.i2() * q.i3() == 0).count();
        long pairs = modes.stream().filter(q -> q.i1() * q.i2() * q.i3() != 0 && q.family().equals("TM")).count();
        // The set must contain both kinds of mode, or the checks below would miss a normalisation.
        assertTrue(oneZero >= 5 && pairs >= 3, "one-zero modes " + oneZero + ", TE/TM pairs " + pairs);
    }

    private static double kx(Mode q) {
        return q.i1() * Math.PI / A;
    }

    private static double ky(Mode q) {
        return q.i2() * Math.PI / B;
    }

    private static double kz(Mode q) {
        return q.i3() * Math.PI / D;
    }

    private static double norm(Mode q) {
        return q.i1() * q.i2() * q.i3() == 0 ? 2.0 : Math.sqrt(8.0);
    }

    @Test
    void electricAndMagneticModeFunctionsAreOrthonormalByQuadrature() {
        // ∫ u_l·u_l' = V δ_ll' and ∫ h_l·h_l' = V δ_ll' (PHYSICS.md §1). Gauss–Legendre with n nodes
        // integrates polynomials of degree 2n−1 exactly; the integrands are trigonometric of index
        // ≤ 2·max(l,m,n) ≤ 8 here, so 24 nodes per axis leave an error far below the 1e-12 bound.
        int n = 24;
        GaussIntegratorFactory factory = new GaussIntegratorFactory();
        GaussIntegrator gx = factory.legendre(n, 0, A);
        GaussIntegrator gy = factory.legendre(n, 0, B);
        GaussIntegrator gz = factory.legendre(n, 0, D);
        double[][] gu = new double[MODES][MODES];
        double[][] gh = new double[MODES][MODES];
        double[] u = new double[3 * MODES];
        double[] h = new double[3 * MODES];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                for (int k = 0; k < n; k++) {
                    double w = gx.getWeight(i) * gy.getWeight(j) * gz.getWeight(k);
                    functions.evaluate(gx.getPoint(i), gy.getPoint(j), gz.getPoint(k), u, h);
                    for (int p = 0; p < MODES; p++) {
                        for (int q = p; q < MODES; q++) {
                            gu[p][q] += w * dot(u, p, q);
                            gh[p][q] += w * dot(h, p, q);
                        }
                    }
                }
            }
        }
        for (int p = 0; p < MODES; p++) {
            for (int q = p; q < MODES; q++) {
                double expect = p == q ? 1.0 : 0.0;
                String pair = modes.get(p).label() + " · " + modes.get(q).label();
                assertEquals(expect, gu[p][q] / V, 1e-12, "∫u·u/V for " + pair);
                assertEquals(expect, gh[p][q] / V, 1e-12, "∫h·h/V for " + pair);
            }
        }
    }

    private static double dot(double[] f, int p, int q) {
        return f[3 * p] * f[3 * q] + f[3 * p + 1] * f[3 * q + 1] + f[3 * p + 2] * f[3 * q + 2];
    }

    @Test
    void tangentialElectricAndNormalMagneticComponentsVanishOnEveryWall() {
        // PEC: n × u = 0 and n · h = 0 on ∂Ω (PHYSICS.md §1). 40 seeded random points per wall.
        long seed = 0x5eed_0001L;
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        double[] size = {A, B, D};
        double[] u = new double[3 * MODES];
        double[] h = new double[3 * MODES];
        double largestNormalU = 0;
        for (int axis = 0; axis < 3; axis++) {
            for (int side = 0; side < 2; side++) {
                for (int s = 0; s < 40; s++) {
                    double[] r = {rng.nextDouble() * A, rng.nextDouble() * B, rng.nextDouble() * D};
                    r[axis] = side * size[axis];
                    functions.evaluate(r[0], r[1], r[2], u, h);
                    for (int l = 0; l < MODES; l++) {
                        for (int i = 0; i < 3; i++) {
                            String where = String.format("%s at (%.6f, %.6f, %.6f), seed %d", modes.get(l).label(),
                                r[0], r[1], r[2], seed);
                            if (i != axis) {
                                // sin(lπ) is ~1e-16·l in floating point, not 0.
                                assertEquals(0.0, u[3 * l + i], 1e-13, "tangential u_" + i + " of " + where);
                            } else {
                                assertEquals(0.0, h[3 * l + i], 1e-13, "normal h_" + i + " of " + where);
                                largestNormalU = Math.max(largestNormalU, Math.abs(u[3 * l + i]));
                            }
                        }
                    }
                }
            }
        }
        // The normal E and tangential B are not forced to zero: the points really sample live fields.
        assertTrue(largestNormalU > 1.0, "largest normal u on the walls: " + largestNormalU);
    }

    /** Seeded interior points away from the walls (the stencils reach δ outside each point). */
    private static double[][] interiorPoints(long seed, int n) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        double[][] pts = new double[n][];
        for (int i = 0; i < n; i++) {
            pts[i] = new double[] {0.01 + 0.98 * A * rng.nextDouble(), 0.01 + 0.98 * B * rng.nextDouble(),
                0.01 + 0.98 * D * rng.nextDouble()};
        }
        return pts;
    }

    /** u (which = 0) or h (which = 1) of every mode at a point. */
    private static double[] field(int which, double x, double y, double z) {
        double[] f = new double[3 * MODES];
        functions.evaluate(x, y, z, which == 0 ? f : null, which == 1 ? f : null);
        return f;
    }

    /** Central first difference ∂f_·/∂x_axis of every component of every mode. */
    private static double[] derivative(int which, double[] r, int axis, double delta) {
        double[] plus = r.clone();
        double[] minus = r.clone();
        plus[axis] += delta;
        minus[axis] -= delta;
        double[] fp = field(which, plus[0], plus[1], plus[2]);
        double[] fm = field(which, minus[0], minus[1], minus[2]);
        double[] out = new double[fp.length];
        for (int i = 0; i < out.length; i++) {
            out[i] = (fp[i] - fm[i]) / (2 * delta);
        }
        return out;
    }

    @Test
    void modeFunctionsAreDivergenceFreeAndHIsTheCurlOfUOverK() {
        long seed = 0x5eed_0002L;
        double delta = 1e-4;
        for (double[] r : interiorPoints(seed, 25)) {
            double[][] du = new double[3][];
            double[][] dh = new double[3][];
            for (int axis = 0; axis < 3; axis++) {
                du[axis] = derivative(0, r, axis, delta);
                dh[axis] = derivative(1, r, axis, delta);
            }
            double[] h = field(1, r[0], r[1], r[2]);
            for (int l = 0; l < MODES; l++) {
                Mode q = modes.get(l);
                double n = norm(q);
                double k3 = Math.pow(kx(q), 3) + Math.pow(ky(q), 3) + Math.pow(kz(q), 3);
                // Taylor bound κ³δ²/6 per derivative (|e_i| ≤ 1, |sin|,|cos| ≤ 1) plus rounding.
                double tol = n * k3 * delta * delta / 6 + 3 * 8 * EPS * n / delta;
                String where = String.format("%s at (%.6f, %.6f, %.6f), seed %d, δ = %g m", q.label(), r[0], r[1],
                    r[2], seed, delta);
                double divU = du[0][3 * l] + du[1][3 * l + 1] + du[2][3 * l + 2];
                double divH = dh[0][3 * l] + dh[1][3 * l + 1] + dh[2][3 * l + 2];
                assertEquals(0.0, divU, tol, "∇·u of " + where);
                assertEquals(0.0, divH, tol, "∇·h of " + where);
                double[] curl = {
                    du[1][3 * l + 2] - du[2][3 * l + 1],
                    du[2][3 * l] - du[0][3 * l + 2],
                    du[0][3 * l + 1] - du[1][3 * l]};
                for (int i = 0; i < 3; i++) {
                    assertEquals(h[3 * l + i], curl[i] / q.k(), 2 * tol / q.k(), "h_" + i + " = (∇×u)_" + i + "/k of " + where);
                }
            }
        }
    }

    @Test
    void electricModeFunctionsSolveTheHelmholtzEquationWithTheirOwnK() {
        long seed = 0x5eed_0003L;
        double delta = 1e-3;
        for (double[] r : interiorPoints(seed, 25)) {
            double[] u0 = field(0, r[0], r[1], r[2]);
            double[] lap = new double[3 * MODES];
            for (int axis = 0; axis < 3; axis++) {
                double[] plus = r.clone();
                double[] minus = r.clone();
                plus[axis] += delta;
                minus[axis] -= delta;
                double[] up = field(0, plus[0], plus[1], plus[2]);
                double[] um = field(0, minus[0], minus[1], minus[2]);
                for (int i = 0; i < lap.length; i++) {
                    lap[i] += (up[i] - 2 * u0[i] + um[i]) / (delta * delta);
                }
            }
            for (int l = 0; l < MODES; l++) {
                Mode q = modes.get(l);
                double n = norm(q);
                double k4 = Math.pow(kx(q), 4) + Math.pow(ky(q), 4) + Math.pow(kz(q), 4);
                // Taylor bound κ⁴δ²/12 per second difference, plus 4 ulp of n per point over δ².
                double tol = n * k4 * delta * delta / 12 + 3 * 4 * 8 * EPS * n / (delta * delta);
                for (int i = 0; i < 3; i++) {
                    double residual = lap[3 * l + i] + q.k() * q.k() * u0[3 * l + i];
                    assertEquals(0.0, residual, tol, String.format("(∇²u + k²u)_%d of %s at (%.6f, %.6f, %.6f), seed %d,"
                        + " δ = %g m", i, q.label(), r[0], r[1], r[2], seed, delta));
                }
            }
        }
    }

    @Test
    void skippingOneOutputLeavesTheOtherUnchanged() {
        double[] u1 = new double[3 * MODES];
        double[] h1 = new double[3 * MODES];
        functions.evaluate(0.3, 0.4, 0.5, u1, h1);
        double[] u2 = field(0, 0.3, 0.4, 0.5);
        double[] h2 = field(1, 0.3, 0.4, 0.5);
        assertEquals(java.util.Arrays.toString(u1), java.util.Arrays.toString(u2));
        assertEquals(java.util.Arrays.toString(h1), java.util.Arrays.toString(h2));
        assertEquals(MODES, functions.modeCount());
    }
}
