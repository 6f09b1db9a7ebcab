package org.stillfield.sampler.timeseries;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ForkJoinPool;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.engine.FieldSynthesizer;

class ProbeTest {
    private static final Vec3 PIN = new Vec3(0.0123, 0.0071, 0.0088);
    private static final Vec3 PIN_DIR = new Vec3(0.3, -1.0, 0.5);
    private static final Vec3 LOOP = new Vec3(0.0051, 0.0132, 0.0274);
    private static final Vec3 LOOP_N = new Vec3(1.0, 0.4, -0.2);

    /** Runs a short lossy trajectory with amplitudes and the given probes. */
    private static Fixtures.Collector run(ModeTable t, List<Probe> probes, double dt, int steps) throws IOException {
        Fixtures.Collector c = new Fixtures.Collector(steps);
        TimeSeriesRunner.run(TimeSeriesRunner.Plan.of(t, ModeDamping.of(t, LossModel.constant(60)),
            new TimeGrid(dt, steps), probes, 5, 2, 2, 1).withAmplitudes(true), c, null);
        return c;
    }

    /** E and B at the points, from FieldSynthesizer on the given amplitudes (an independent path). */
    private static Map<Field, double[]> fields(ModeTable t, List<Vec3> pts, double[] q, double[] e) {
        FieldSynthesizer s = new FieldSynthesizer(t, pts, EnumSet.allOf(Field.class), 1L << 24);
        Map<Field, double[][]> out = new EnumMap<>(Field.class);
        for (Field f : Field.values()) {
            out.put(f, new double[1][3 * pts.size()]);
        }
        ForkJoinPool pool = new ForkJoinPool(1);
        try {
            s.synthesize(new double[][] {q}, new double[][] {e}, out, pool, 0);
        } finally {
            pool.shutdown();
        }
        Map<Field, double[]> r = new EnumMap<>(Field.class);
        out.forEach((f, v) -> r.put(f, v[0]));
        return r;
    }

    private static double dot(Vec3 n, double[] v, int p) {
        double len = n.norm();
        return (n.x() * v[3 * p] + n.y() * v[3 * p + 1] + n.z() * v[3 * p + 2]) / len;
    }

    @Test
    void dipoleAndLoopSignalsEqualTheSynthesisedFields() throws IOException {
        // V = ℓ n̂·E(r₀) and Φ = A n̂·B(r₀), with E, B from FieldSynthesizer (E = Σ e u, B = Σ k q h,
        // PHYSICS.md §2) at the same point, sample and step; the probe path uses its own precomputed
        // coefficients. Agreement to rounding of the two summations (1e-12 of the field scale).
        ModeTable t = Fixtures.table(20, ThermalState.VACUUM);
        double len = 0.003;
        double area = 2e-6;
        List<Probe> probes = List.of(
            new Probe.ElectricDipole("pin", PIN, PIN_DIR, len),
            new Probe.MagneticLoop("loop", LOOP, LOOP_N, area, Probe.LoopOutput.FLUX),
            new Probe.FieldProbe("Ex", Field.E, PIN, 0),
            new Probe.FieldProbe("Ay", Field.A, LOOP, 1),
            new Probe.FieldProbe("Bz", Field.B, LOOP, 2));
        Fixtures.Collector c = run(t, probes, 1.3e-11, 6);
        for (long s : c.values.keySet()) {
            for (int n = 0; n < 6; n++) {
                Map<Field, double[]> f = fields(t, List.of(PIN, LOOP), c.q.get(s)[n], c.e.get(s)[n]);
                double[] v = c.values.get(s)[n];
                double eScale = Math.sqrt(sq(f.get(Field.E), 0));
                double bScale = Math.sqrt(sq(f.get(Field.B), 1));
                double aScale = Math.sqrt(sq(f.get(Field.A), 1));
                String at = " sample " + s + " step " + n;
                assertEquals(len * dot(PIN_DIR, f.get(Field.E), 0), v[0], 1e-12 * len * eScale, "dipole" + at);
                assertEquals(area * dot(LOOP_N, f.get(Field.B), 1), v[1], 1e-12 * area * bScale, "loop" + at);
                assertEquals(f.get(Field.E)[0], v[2], 1e-12 * eScale, "E_x" + at);
                assertEquals(f.get(Field.A)[4], v[3], 1e-12 * aScale, "A_y" + at);
                assertEquals(f.get(Field.B)[5], v[4], 1e-12 * bScale, "B_z" + at);
            }
        }
    }

    private static double sq(double[] v, int p) {
        return v[3 * p] * v[3 * p] + v[3 * p + 1] * v[3 * p + 1] + v[3 * p + 2] * v[3 * p + 2];
    }

    @Test
    void loopEmfIsMinusTheRateOfChangeOfFlux() throws IOException {
        // Faraday's law for the loop: EMF = −dΦ/dt. Lossless trajectory, central difference over
        // h with ω_max h = 1e-3 (truncation (ωh)²/6 ≈ 2e-7 of the largest term); tolerance 1e-5.
        ModeTable t = Fixtures.table(20, ThermalState.VACUUM);
        double h = 1e-3 / t.omega(t.size() - 1);
        List<Probe> probes = List.of(
            new Probe.MagneticLoop("flux", LOOP, LOOP_N, 1e-6, Probe.LoopOutput.FLUX),
            new Probe.MagneticLoop("emf", LOOP, LOOP_N, 1e-6, Probe.LoopOutput.EMF));
        Fixtures.Collector c = new Fixtures.Collector(3);
        TimeSeriesRunner.run(TimeSeriesRunner.Plan.of(t, ModeDamping.of(t, LossModel.lossless()), new TimeGrid(h, 3),
            probes, 9, 0, 3, 1), c, null);
        assertEquals("Wb", probes.get(0).unit());
        assertEquals("V", probes.get(1).unit());
        for (long s : c.values.keySet()) {
            double[][] v = c.values.get(s);
            double dPhi = (v[2][0] - v[0][0]) / (2 * h);
            assertEquals(-dPhi, v[1][1], 1e-5 * Math.abs(v[1][1]) + 1e-30, "sample " + s);
        }
    }

    @Test
    void smearedDipoleIsTheGaussianAverageOfThePointDipole() {
        // Box hook: ⟨u_l⟩_w = e^{−k_l²w²/2} u_l(r₀) (normal characteristic function, E[e^{ikX}] =
        // e^{ikx₀ − k²w²/2}). Checked against (1) an independent 3-D trapezoid quadrature of the mode
        // functions over ±7w with the normal weight (Gaussian tails beyond 7w are < 1e-11; the
        // trapezoid rule on a smooth, effectively compactly supported integrand converges
        // geometrically), and (2) the generic Gauss–Hermite path.
        ModeTable t = Fixtures.table(20, ThermalState.VACUUM);
        Vec3 r0 = new Vec3(0.0141, 0.0093, 0.0207);
        double w = 1.1e-3;
        double[] analytic = GaussianSmearing.analyticBox(t, r0, w);
        double[] hermite = GaussianSmearing.quadrature(t, r0, w, "test");
        double[] trap = trapezoid(t, r0, w, 7, 60);
        double kMax = t.modes().get(t.size() - 1).k();
        assertTrue(kMax * w > 0.3, "the smearing must matter: k w = " + kMax * w);
        for (int i = 0; i < analytic.length; i++) {
            assertEquals(trap[i], analytic[i], 1e-9, "trapezoid vs analytic, entry " + i);
            assertEquals(hermite[i], analytic[i], 1e-9, "Gauss–Hermite vs analytic, entry " + i);
        }
        // The probe uses the analytic coefficients: a = ℓ n̂·⟨u⟩.
        ProbeCoefficients sm = new Probe.SmearedDipole("s", r0, new Vec3(0, 0, 2), 0.01, w).coefficients(t);
        ProbeCoefficients pt = new Probe.ElectricDipole("p", r0, new Vec3(0, 0, 1), 0.01).coefficients(t);
        for (int l = 0; l < t.size(); l++) {
            double k = t.modes().get(l).k();
            assertEquals(Math.exp(-0.5 * k * k * w * w) * pt.onE(l), sm.onE(l), 1e-15 + 1e-13 * Math.abs(pt.onE(l)));
            assertEquals(0.01 * analytic[3 * l + 2], sm.onE(l), 1e-15);
        }
    }

    private static double[] trapezoid(ModeTable t, Vec3 r0, double w, double span, int n) {
        double hstep = 2 * span * w / n;
        double[] acc = new double[3 * t.size()];
        double[] u = new double[3 * t.size()];
        var f = t.cavity().modeFunctions(t.modes());
        double norm = Math.pow(2 * Math.PI * w * w, -1.5) * hstep * hstep * hstep;
        for (int i = 0; i <= n; i++) {
            double x = -span * w + i * hstep;
            for (int j = 0; j <= n; j++) {
                double y = -span * w + j * hstep;
                for (int k = 0; k <= n; k++) {
                    double z = -span * w + k * hstep;
                    double wt = ((i == 0 || i == n) ? 0.5 : 1) * ((j == 0 || j == n) ? 0.5 : 1)
                        * ((k == 0 || k == n) ? 0.5 : 1) * norm * Math.exp(-(x * x + y * y + z * z) / (2 * w * w));
                    f.evaluate(r0.x() + x, r0.y() + y, r0.z() + z, u, null);
                    for (int c = 0; c < u.length; c++) {
                        acc[c] += wt * u[c];
                    }
                }
            }
        }
        return acc;
    }

    @Test
    void rejectsProbesOutsideTheCavityOrWithBadParameters() {
        ModeTable t = Fixtures.table(10, ThermalState.VACUUM);
        Probe out = new Probe.ElectricDipole("tip", new Vec3(0.05, 0.01, 0.01), new Vec3(0, 1, 0), 1e-3);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> out.coefficients(t));
        assertTrue(ex.getMessage().contains("tip") && ex.getMessage().contains("outside"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class,
            () -> new Probe.ElectricDipole("tip", PIN, Vec3.ZERO, 1e-3));
        assertTrue(ex.getMessage().contains("tip.direction") && ex.getMessage().contains("non-zero"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class,
            () -> new Probe.MagneticLoop("l", LOOP, LOOP_N, -1, Probe.LoopOutput.FLUX));
        assertTrue(ex.getMessage().contains("l.area_m2") && ex.getMessage().contains("-1"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class, () -> new Probe.FieldProbe("f", Field.E, PIN, 3));
        assertTrue(ex.getMessage().contains("component"), ex.getMessage());
        // Generic quadrature needs its whole stencil inside the cavity.
        ex = assertThrows(IllegalArgumentException.class,
            () -> GaussianSmearing.quadrature(t, new Vec3(0.001, 0.01, 0.02), 1e-3, "near-wall"));
        assertTrue(ex.getMessage().contains("near-wall") && ex.getMessage().contains("width_m"), ex.getMessage());
    }

    @Test
    void coefficientsAreLinearAndCoupleToTheRightQuadrature() {
        // Dipoles and EMF couple to e only; flux, A and B to q only (E = Σ e u; A = Σ q u; B = Σ k q h).
        ModeTable t = Fixtures.table(12, ThermalState.VACUUM);
        List<Probe> eProbes = new ArrayList<>(List.of(new Probe.ElectricDipole("d", PIN, PIN_DIR, 1),
            new Probe.MagneticLoop("emf", LOOP, LOOP_N, 1, Probe.LoopOutput.EMF), new Probe.FieldProbe("e", Field.E, PIN, 1)));
        List<Probe> qProbes = List.of(new Probe.MagneticLoop("flux", LOOP, LOOP_N, 1, Probe.LoopOutput.FLUX),
            new Probe.FieldProbe("a", Field.A, PIN, 1), new Probe.FieldProbe("b", Field.B, PIN, 1));
        for (Probe p : eProbes) {
            ProbeCoefficients c = p.coefficients(t);
            for (int l = 0; l < t.size(); l++) {
                assertEquals(0.0, c.onQ(l), p.name());
            }
        }
        for (Probe p : qProbes) {
            ProbeCoefficients c = p.coefficients(t);
            for (int l = 0; l < t.size(); l++) {
                assertEquals(0.0, c.onE(l), p.name());
            }
        }
    }
}
