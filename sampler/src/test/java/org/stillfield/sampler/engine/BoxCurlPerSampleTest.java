package org.stillfield.sampler.engine;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.List;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * B = ∇×A holds sample by sample (PHYSICS.md §2): the synthesised B at a point equals the central
 * finite-difference curl of the synthesised A of the same sample at ±δ offsets.
 */
class BoxCurlPerSampleTest {
    /** Keeps copies of everything a run hands over. */
    static final class Collect implements EnsembleSink {
        final List<double[]> q = new ArrayList<>();
        final List<double[]> a = new ArrayList<>();
        final List<double[]> b = new ArrayList<>();
        boolean finished;

        @Override
        public void accept(SampleBatch batch) throws IOException {
            for (int s = 0; s < batch.size(); s++) {
                q.add(batch.q(s).clone());
                a.add(batch.values(Field.A, s).clone());
                b.add(batch.values(Field.B, s).clone());
            }
        }

        @Override
        public void finish() {
            finished = true;
        }
    }

    @Test
    void synthesisedBIsTheFiniteDifferenceCurlOfSynthesisedA() throws IOException {
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        ModeTable table = ModeTable.of(box, new Window(Window.Kind.HARD, 2 * Math.PI * 30e9, Window.DEFAULT_TOLERANCE),
            ThermalState.VACUUM, 10_000);
        int m = table.size();
        assertTrue(m > 100, "enough modes to make the sum non-trivial: " + m);
        double delta = 1e-6;
        long pointSeed = 0x5eed_0010L;
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(pointSeed);
        List<Vec3> points = new ArrayList<>();
        int centres = 4;
        for (int c = 0; c < centres; c++) {
            Vec3 r = new Vec3(0.001 + 0.028 * rng.nextDouble(), 0.001 + 0.018 * rng.nextDouble(),
                0.001 + 0.038 * rng.nextDouble());
            points.add(r);
            for (int axis = 0; axis < 3; axis++) {
                Vec3 e = new Vec3(axis == 0 ? delta : 0, axis == 1 ? delta : 0, axis == 2 ? delta : 0);
                points.add(r.plusScaled(e, 1));
                points.add(r.plusScaled(e, -1));
            }
        }
        long seed = 77;
        int samples = 6;
        Collect sink = new Collect();
        EnsembleRunner.run(new EnsembleRunner.Plan(table, points, EnumSet.of(Field.A, Field.B), seed, 0, samples, 2),
            sink, null);
        assertTrue(sink.finished, "finish() called");
        assertEquals(samples, sink.a.size());

        double eps = Math.ulp(1.0);
        for (int s = 0; s < samples; s++) {
            // Error bound of the stencil: each ∂_j A_i is off by ≤ Σ_l |q_l| N_l k_l³ δ²/6 (Taylor,
            // common practice), two derivatives per curl component; rounding of an M-term sum is
            // ≤ M ulp of Σ|q_l|N_l per value, divided by 2δ.
            double[] q = sink.q.get(s);
            double amp = 0;
            double trunc = 0;
            for (int l = 0; l < m; l++) {
                Mode mode = table.modes().get(l);
                amp += Math.abs(q[l]) * Math.sqrt(8);
                trunc += Math.abs(q[l]) * Math.sqrt(8) * Math.pow(mode.k(), 3) * delta * delta / 6;
            }
            double tol = 2 * trunc + 2 * m * eps * amp / delta;
            double[] av = sink.a.get(s);
            double[] bv = sink.b.get(s);
            for (int c = 0; c < centres; c++) {
                int p0 = 7 * c;
                double[][] grad = new double[3][3];
                for (int axis = 0; axis < 3; axis++) {
                    int plus = p0 + 1 + 2 * axis;
                    int minus = plus + 1;
                    for (int i = 0; i < 3; i++) {
                        grad[axis][i] = (av[3 * plus + i] - av[3 * minus + i]) / (2 * delta);
                    }
                }
                double[] curl = {grad[1][2] - grad[2][1], grad[2][0] - grad[0][2], grad[0][1] - grad[1][0]};
                double bNorm = Math.sqrt(sq(bv[3 * p0]) + sq(bv[3 * p0 + 1]) + sq(bv[3 * p0 + 2]));
                assertTrue(tol < 1e-4 * bNorm, "tolerance " + tol + " must be far below |B| = " + bNorm);
                for (int i = 0; i < 3; i++) {
                    assertEquals(bv[3 * p0 + i], curl[i], tol, String.format(
                        "B_%d vs (∇×A)_%d at %s, sample %d, seed %d, δ = %g m, %d modes", i, i, points.get(p0), s, seed,
                        delta, m));
                }
            }
        }
    }

    private static double sq(double x) {
        return x * x;
    }
}
