package org.stillfield.sampler.timeseries;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ForkJoinPool;
import org.apache.commons.rng.sampling.distribution.NormalizedGaussianSampler;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.engine.AmplitudeSampler;
import org.stillfield.sampler.engine.FieldSynthesizer;
import org.stillfield.sampler.engine.SampleStreams;

class ModeEvolutionTest {
    private static final double EPS = Math.ulp(1.0);
    private static final NormalizedGaussianSampler NO_NOISE = () -> {
        throw new AssertionError("a lossless step must not draw random numbers");
    };

    private static ModeTable table() {
        return Fixtures.table(16, ThermalState.VACUUM);
    }

    private static double[][] draw(ModeTable t, long seed) {
        double[] q = new double[t.size()];
        double[] e = new double[t.size()];
        new AmplitudeSampler(t).draw(SampleStreams.forSample(seed, 0), q, e);
        return new double[][] {q, e};
    }

    @Test
    void losslessSteppingMatchesTheClosedForm() {
        // PHYSICS.md §5: q(t) = q cos ωt − (e/ω) sin ωt, e(t) = ω q sin ωt + e cos ωt, evaluated here
        // directly at t = n dt. Rounding bound: each rotation step and the reference's argument ω n dt
        // carry a few ulp, so the difference grows at most linearly, |Δx| ≤ 16 n ε |x| in the scaled
        // coordinates x = (ωq, e).
        ModeTable t = table();
        int steps = 20_000;
        double dt = 7.31e-12;
        ModeEvolution evo = ModeEvolution.of(t, ModeDamping.of(t, LossModel.lossless()), dt);
        double[][] x0 = draw(t, 11);
        double[] q = x0[0].clone();
        double[] e = x0[1].clone();
        double worst = 0;
        for (int n = 1; n <= steps; n++) {
            evo.step(q, e, NO_NOISE);
            if (n % 997 == 0 || n == steps) {
                for (int l = 0; l < t.size(); l++) {
                    double w = t.omega(l);
                    double c = Math.cos(w * n * dt);
                    double s = Math.sin(w * n * dt);
                    double qRef = x0[0][l] * c - x0[1][l] / w * s;
                    double eRef = w * x0[0][l] * s + x0[1][l] * c;
                    double norm = Math.hypot(w * x0[0][l], x0[1][l]);
                    double err = Math.hypot(w * (q[l] - qRef), e[l] - eRef) / norm;
                    worst = Math.max(worst, err / (n * EPS));
                }
            }
        }
        assertTrue(worst <= 16, "stepped vs closed form: worst error " + worst + " n·ε (bound 16)");
    }

    @Test
    void losslessSteppingConservesEachModeEnergy() {
        // H_l = (εV/2)(e² + ω²q²) (PHYSICS.md §2) is invariant under the rotation; the rounded
        // rotation changes |x|² by at most ~2ε per step (c² + s² = 1 ± 2ε), bound 4 n ε.
        ModeTable t = table();
        int steps = 50_000;
        ModeEvolution evo = ModeEvolution.of(t, ModeDamping.of(t, LossModel.lossless()), 3.3e-12);
        double[][] x0 = draw(t, 12);
        double[] q = x0[0].clone();
        double[] e = x0[1].clone();
        for (int n = 0; n < steps; n++) {
            evo.step(q, e, NO_NOISE);
        }
        double eps0 = PhysicalConstants.EPSILON_0;
        double v = t.cavity().volume();
        for (int l = 0; l < t.size(); l++) {
            double w = t.omega(l);
            double h0 = 0.5 * eps0 * v * (x0[1][l] * x0[1][l] + w * w * x0[0][l] * x0[0][l]);
            double h1 = 0.5 * eps0 * v * (e[l] * e[l] + w * w * q[l] * q[l]);
            assertEquals(h0, h1, 4 * steps * EPS * h0, "energy of " + t.modes().get(l).label());
        }
    }

    @Test
    void eIsMinusQDotAndTheModeOscillatesAtOmega() {
        // Sign convention of PHYSICS.md §2, e = −q̇, and q̈ = −ω²q, checked on the stepped solution by
        // central differences over h with ωh = 1e-3: truncation (ωh)²/6 ≈ 1.7e-7, rounding ε/(ωh) ≈ 2e-13.
        ModeTable t = table();
        double[][] x = draw(t, 13);
        for (int l = 0; l < t.size(); l++) {
            double w = t.omega(l);
            double h = 1e-3 / w;
            ModeEvolution evo = ModeEvolution.of(t, ModeDamping.of(t, LossModel.lossless()), h);
            double[] q = x[0].clone();
            double[] e = x[1].clone();
            double[] q1 = q.clone();
            double[] e1 = e.clone();
            evo.step(q1, e1, NO_NOISE);
            double[] q2 = q1.clone();
            double[] e2 = e1.clone();
            evo.step(q2, e2, NO_NOISE);
            double qDot = (q2[l] - q[l]) / (2 * h);
            double eDot = (e2[l] - e[l]) / (2 * h);
            double scale = Math.hypot(w * q1[l], e1[l]);
            assertEquals(-e1[l], qDot, 1e-6 * scale, "q̇ = −e for " + t.modes().get(l).label());
            assertEquals(w * w * q1[l], eDot, 1e-6 * scale * w, "ė = ω² q for " + t.modes().get(l).label());
        }
    }

    @Test
    void evolvedFieldsSatisfyFaradayAndAmpere() {
        // Maxwell's equations in the source-free filling: ∇×E = −∂B/∂t and ∇×B = (1/c²) ∂E/∂t. The fields
        // are E = Σ e u, B = Σ k q h of PHYSICS.md §2 synthesised by FieldSynthesizer, the time derivative
        // a central difference of the stepped evolution, the curl a central difference in space. This
        // checks the convention e = −q̇ together with B = Σ k q h: with the opposite sign of e Faraday's
        // law would fail by a factor −1. Tolerance 1e-4 relative to the largest term: truncation (kδ)²/6
        // and (ωh)²/6 with kδ = ωh/c·c = 1e-3 for the highest mode.
        ModeTable t = table();
        double kMax = t.modes().get(t.size() - 1).k();
        double delta = 1e-3 / kMax;
        double wMax = t.omega(t.size() - 1);
        double h = 1e-3 / wMax;
        ModeEvolution evo = ModeEvolution.of(t, ModeDamping.of(t, LossModel.lossless()), h);
        double[][] x = draw(t, 14);
        double[][] q = new double[3][];
        double[][] e = new double[3][];
        q[0] = x[0].clone();
        e[0] = x[1].clone();
        for (int i = 1; i < 3; i++) {
            q[i] = q[i - 1].clone();
            e[i] = e[i - 1].clone();
            evo.step(q[i], e[i], NO_NOISE);
        }
        Vec3 r = new Vec3(0.0113, 0.0071, 0.0262);
        List<Vec3> pts = new java.util.ArrayList<>();
        pts.add(r);
        for (int axis = 0; axis < 3; axis++) {
            for (int sgn = -1; sgn <= 1; sgn += 2) {
                double[] c = {r.x(), r.y(), r.z()};
                c[axis] += sgn * delta;
                pts.add(new Vec3(c[0], c[1], c[2]));
            }
        }
        FieldSynthesizer synth = new FieldSynthesizer(t, pts, EnumSet.of(Field.E, Field.B), 1L << 24);
        double[][][] fe = new double[3][][];
        double[][][] fb = new double[3][][];
        ForkJoinPool pool = new ForkJoinPool(1);
        try {
            for (int i = 0; i < 3; i++) {
                double[][] oe = new double[1][3 * pts.size()];
                double[][] ob = new double[1][3 * pts.size()];
                synth.synthesize(new double[][] {q[i]}, new double[][] {e[i]}, Map.of(Field.E, oe, Field.B, ob), pool, 0);
                fe[i] = oe;
                fb[i] = ob;
            }
        } finally {
            pool.shutdown();
        }
        double[] curlE = curl(fe[1][0], delta);
        double[] curlB = curl(fb[1][0], delta);
        double c2 = Math.pow(t.cavity().medium().waveSpeed(), 2);
        double scaleE = 0;
        double scaleB = 0;
        for (int i = 0; i < 3; i++) {
            scaleE = Math.max(scaleE, Math.abs(curlE[i]));
            scaleB = Math.max(scaleB, Math.abs(curlB[i]));
        }
        for (int i = 0; i < 3; i++) {
            double bDot = (fb[2][0][i] - fb[0][0][i]) / (2 * h);
            double eDot = (fe[2][0][i] - fe[0][0][i]) / (2 * h);
            assertEquals(-bDot, curlE[i], 1e-4 * scaleE, "Faraday, component " + i);
            assertEquals(eDot / c2, curlB[i], 1e-4 * scaleB, "Ampère, component " + i);
        }
    }

    /** Curl from the six displaced points (index 1 + 2·axis + {0: −δ, 1: +δ}). */
    private static double[] curl(double[] f, double delta) {
        double[][] d = new double[3][3];
        for (int axis = 0; axis < 3; axis++) {
            int minus = 1 + 2 * axis;
            int plus = minus + 1;
            for (int comp = 0; comp < 3; comp++) {
                d[axis][comp] = (f[3 * plus + comp] - f[3 * minus + comp]) / (2 * delta);
            }
        }
        return new double[] {d[1][2] - d[2][1], d[2][0] - d[0][2], d[0][1] - d[1][0]};
    }

    @Test
    void rejectsMismatchedDampingAndBadStep() {
        ModeTable t = table();
        ModeTable small = Fixtures.table(7, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(small, LossModel.lossless());
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> ModeEvolution.of(t, d, 1e-12));
        assertTrue(ex.getMessage().contains("damping covers 1 modes"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class,
            () -> ModeEvolution.of(t, ModeDamping.of(t, LossModel.lossless()), 0.0));
        assertTrue(ex.getMessage().contains("timeseries.dt_s") && ex.getMessage().contains("0.0"), ex.getMessage());
    }
}
