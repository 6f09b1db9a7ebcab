package org.stillfield.sampler.timeseries;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.List;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.engine.AmplitudeSampler;
import org.stillfield.sampler.engine.SampleStreams;

class TimeSeriesRunnerTest {
    private static final long SEED = 77L;

    private static List<Probe> probes() {
        return List.of(
            new Probe.ElectricDipole("pin", new Vec3(0.015, 0.010, 0.008), new Vec3(0, 1, 0), 0.002),
            new Probe.MagneticLoop("loop", new Vec3(0.005, 0.012, 0.020), new Vec3(1, 0, 0), 1e-6,
                Probe.LoopOutput.FLUX));
    }

    @Test
    void stepZeroIsExactlyTheEnsembleDraw() throws IOException {
        // The trajectory of sample i starts from the draw an ensemble run makes for sample i
        // (AmplitudeSampler on SampleStreams.forSample(seed, i)): bit for bit, with an offset range.
        ModeTable t = Fixtures.table(12, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.constant(300));
        Fixtures.Collector c = new Fixtures.Collector(5);
        TimeSeriesRunner.run(TimeSeriesRunner.Plan.of(t, d, new TimeGrid(1e-11, 5), probes(), SEED, 40, 6, 2)
            .withAmplitudes(true), c, null);
        AmplitudeSampler sampler = new AmplitudeSampler(t);
        for (long i = 40; i < 46; i++) {
            double[] q = new double[t.size()];
            double[] e = new double[t.size()];
            sampler.draw(SampleStreams.forSample(SEED, i), q, e);
            assertArrayEquals(q, c.q.get(i)[0], 0.0, "q at step 0, sample " + i);
            assertArrayEquals(e, c.e.get(i)[0], 0.0, "e at step 0, sample " + i);
        }
        assertTrue(c.finished);
    }

    @Test
    void firstStepFollowsTheDocumentedDrawOrder() throws IOException {
        // ModeEvolution's documented recipe, rebuilt here from its formulas: after the Wigner draw the
        // same stream feeds a ziggurat normal sampler; each step draws, per lossy mode in table order,
        // ξ₁ (q) then ξ₂ (e); x' = ρ R(ω dt) x + √(1 − ρ²) σ ξ with ρ = e^{−κ dt/2}. Lossless modes
        // draw nothing: here every other mode is lossless.
        ModeTable t = Fixtures.table(12, new ThermalState(1.0));
        double[] qf = new double[t.size()];
        for (int l = 0; l < qf.length; l++) {
            qf[l] = l % 2 == 0 ? 40 : Double.POSITIVE_INFINITY;
        }
        ModeDamping d = ModeDamping.of(t, qf, "test");
        double dt = 2.1e-11;
        Fixtures.Collector c = new Fixtures.Collector(3);
        TimeSeriesRunner.run(TimeSeriesRunner.Plan.of(t, d, new TimeGrid(dt, 3), probes(), SEED, 3, 1, 1)
            .withAmplitudes(true), c, null);
        UniformRandomProvider rng = SampleStreams.forSample(SEED, 3);
        int m = t.size();
        double[] q = new double[m];
        double[] e = new double[m];
        new AmplitudeSampler(t).draw(rng, q, e);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        for (int n = 1; n < 3; n++) {
            double[] qn = new double[m];
            double[] en = new double[m];
            for (int l = 0; l < m; l++) {
                double w = t.omega(l);
                boolean lossy = l % 2 == 0;
                double rho = lossy ? Math.exp(-0.5 * w / 40 * dt) : 1.0;
                double cs = Math.cos(w * dt);
                double sn = Math.sin(w * dt);
                qn[l] = rho * (cs * q[l] - sn / w * e[l]);
                en[l] = rho * (w * sn * q[l] + cs * e[l]);
            }
            for (int l = 0; l < m; l += 2) {
                double w = t.omega(l);
                double rho = Math.exp(-0.5 * w / 40 * dt);
                double amp = Math.sqrt(1 - rho * rho);
                qn[l] += amp * Math.sqrt(t.variance(Field.A, l)) * g.sample();
                en[l] += amp * Math.sqrt(t.variance(Field.E, l)) * g.sample();
            }
            for (int l = 0; l < m; l++) {
                double sq = Math.sqrt(t.variance(Field.A, l));
                double se = Math.sqrt(t.variance(Field.E, l));
                assertEquals(qn[l], c.q.get(3L)[n][l], 1e-13 * sq, "q step " + n + " mode " + l);
                assertEquals(en[l], c.e.get(3L)[n][l], 1e-13 * se, "e step " + n + " mode " + l);
            }
            q = qn;
            e = en;
        }
    }

    @Test
    void valuesDoNotDependOnThreadsOrBlocking() throws IOException {
        ModeTable t = Fixtures.table(14, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.constant(500));
        TimeGrid grid = new TimeGrid(1.7e-11, 53);
        TimeSeriesRunner.Plan base = TimeSeriesRunner.Plan.of(t, d, grid, probes(), SEED, 5, 11, 1);
        Fixtures.Collector a = new Fixtures.Collector(53);
        TimeSeriesRunner.run(base.withBlocking(3, 7), a, null);
        Fixtures.Collector b = new Fixtures.Collector(53);
        TimeSeriesRunner.run(base.withThreads(3), b, null);
        assertEquals(a.values.keySet(), b.values.keySet());
        for (long s : a.values.keySet()) {
            for (int n = 0; n < 53; n++) {
                assertArrayEquals(a.values.get(s)[n], b.values.get(s)[n], 0.0, "sample " + s + " step " + n);
            }
        }
    }

    @Test
    void blocksOfASampleArriveInStepOrderGroupByGroup() throws IOException {
        ModeTable t = Fixtures.table(10, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.lossless());
        Fixtures.Collector c = new Fixtures.Collector(10);
        TimeSeriesRunner.run(TimeSeriesRunner.Plan.of(t, d, new TimeGrid(1e-11, 10), probes(), SEED, 0, 5, 2)
            .withBlocking(2, 4), c, null);
        // groups {0,1}, {2,3}, {4}; chunks of 4, 4, 2 steps; within a chunk samples in order.
        long[][] expected = {
            {0, 0, 4, 0}, {1, 0, 4, 0}, {0, 4, 4, 0}, {1, 4, 4, 0}, {0, 8, 2, 1}, {1, 8, 2, 1},
            {2, 0, 4, 0}, {3, 0, 4, 0}, {2, 4, 4, 0}, {3, 4, 4, 0}, {2, 8, 2, 1}, {3, 8, 2, 1},
            {4, 0, 4, 0}, {4, 4, 4, 0}, {4, 8, 2, 1}};
        assertEquals(expected.length, c.order.size());
        for (int i = 0; i < expected.length; i++) {
            assertArrayEquals(expected[i], c.order.get(i), "block " + i);
        }
    }

    @Test
    void automaticChunkRespectsTheMemoryBudget() {
        ModeTable t = Fixtures.table(10, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.lossless());
        TimeSeriesRunner.Plan p = TimeSeriesRunner.Plan.of(t, d, new TimeGrid(1e-11, 100_000_000), probes(), 1, 0, 1, 1)
            .withAmplitudes(true);
        long bytes = 8L * p.groupSize() * p.effectiveChunk() * (probes().size() + 2L * t.size());
        assertTrue(bytes <= TimeSeriesRunner.DEFAULT_BLOCK_BYTES, "buffer bytes " + bytes);
        assertTrue(p.effectiveChunk() >= 1000, "chunk " + p.effectiveChunk());
    }

    @Test
    void rejectsBadPlans() {
        ModeTable t = Fixtures.table(10, ThermalState.VACUUM);
        ModeDamping d = ModeDamping.of(t, LossModel.lossless());
        TimeGrid g = new TimeGrid(1e-11, 3);
        Probe p = probes().get(0);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> TimeSeriesRunner.Plan.of(t, d, g, List.of(p, p), 1, 0, 1, 1));
        assertTrue(ex.getMessage().contains("distinct") && ex.getMessage().contains("pin"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class, () -> TimeSeriesRunner.Plan.of(t, d, g, List.of(), 1, 0, 0, 1));
        assertTrue(ex.getMessage().contains("samples") && ex.getMessage().contains("0"), ex.getMessage());
        ModeDamping other = ModeDamping.of(Fixtures.table(7, ThermalState.VACUUM), LossModel.lossless());
        ex = assertThrows(IllegalArgumentException.class, () -> TimeSeriesRunner.Plan.of(t, other, g, List.of(), 1, 0, 1, 1));
        assertTrue(ex.getMessage().contains("damping covers"), ex.getMessage());
    }
}
