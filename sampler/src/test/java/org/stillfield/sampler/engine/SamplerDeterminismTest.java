package org.stillfield.sampler.engine;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.EnumMap;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.Future;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * Reproducibility (STYLE.md, reproducible randomness; common practice): a sample's values depend
 * on (seed, sample index) only, never on draw order, thread count or how the run is split.
 * Comparisons are bit-for-bit.
 */
class SamplerDeterminismTest {
    private static final long SEED = 4_242_4242L;

    private static ModeTable table() {
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        return ModeTable.of(box, new Window(Window.Kind.GAUSS, 2 * Math.PI * 12e9, 1e-6), ThermalState.VACUUM, 10_000);
    }

    private static List<Vec3> points() {
        List<Vec3> pts = new ArrayList<>(PointSet.grid("g", Vec3.ZERO, new Vec3(0.03, 0.02, 0.04), 4, 3, 5).points());
        pts.add(new Vec3(0.015, 0.01, 0.0));
        return pts;
    }

    private static double[] draw(AmplitudeSampler sampler, long seed, long index) {
        int m = sampler.modeCount();
        double[] q = new double[m];
        double[] e = new double[m];
        sampler.draw(SampleStreams.forSample(seed, index), q, e);
        double[] both = Arrays.copyOf(q, 2 * m);
        System.arraycopy(e, 0, both, m, m);
        return both;
    }

    @Test
    void aSamplesAmplitudesDoNotDependOnOrderOrThread() throws Exception {
        AmplitudeSampler sampler = new AmplitudeSampler(table());
        int n = 64;
        double[][] forward = new double[n][];
        for (int i = 0; i < n; i++) {
            forward[i] = draw(sampler, SEED, i);
        }
        for (int i = n - 1; i >= 0; i--) {
            assertArrayEquals(forward[i], draw(sampler, SEED, i), "reverse order, sample " + i);
        }
        ExecutorService pool = Executors.newFixedThreadPool(4);
        try {
            List<Future<double[]>> futures = new ArrayList<>();
            int[] order = new int[n];
            for (int i = 0; i < n; i++) {
                order[i] = (int) ((i * 37L) % n);
            }
            for (int i : order) {
                futures.add(pool.submit(() -> draw(sampler, SEED, i)));
            }
            for (int j = 0; j < n; j++) {
                assertArrayEquals(forward[order[j]], futures.get(j).get(), "4 threads, sample " + order[j]);
            }
        } finally {
            pool.shutdownNow();
        }
        // The streams really differ between samples and between seeds.
        assertFalse(Arrays.equals(forward[0], forward[1]), "samples 0 and 1 differ");
        assertFalse(Arrays.equals(forward[0], draw(sampler, SEED + 1, 0)), "seeds differ");
        assertThrows(IllegalArgumentException.class, () -> SampleStreams.forSample(SEED, -1));
    }

    /** Copies of every sample of a run, by global index. */
    static final class Record implements EnsembleSink {
        final Map<Long, double[]> q = new java.util.TreeMap<>();
        final Map<Long, double[]> e = new java.util.TreeMap<>();
        final Map<Field, Map<Long, double[]>> values = new EnumMap<>(Field.class);
        long expectedNext;
        int finishes;

        Record(long first) {
            expectedNext = first;
        }

        @Override
        public void accept(SampleBatch batch) throws IOException {
            assertEquals(expectedNext, batch.firstSample(), "batches arrive in sample order");
            for (int s = 0; s < batch.size(); s++) {
                long g = batch.firstSample() + s;
                q.put(g, batch.q(s).clone());
                e.put(g, batch.e(s).clone());
                for (Field f : batch.fields()) {
                    values.computeIfAbsent(f, x -> new java.util.TreeMap<>()).put(g, batch.values(f, s).clone());
                }
            }
            expectedNext += batch.size();
        }

        @Override
        public void finish() {
            finishes++;
        }
    }

    private static Record run(ModeTable t, long first, long count, int threads) throws IOException {
        Record r = new Record(first);
        List<Long> progress = new ArrayList<>();
        EnsembleRunner.run(new EnsembleRunner.Plan(t, points(), EnumSet.allOf(Field.class), SEED, first, count, threads), r,
            progress::add);
        assertEquals(1, r.finishes, "finish() once");
        assertEquals(count, (long) progress.get(progress.size() - 1), "progress ends at the sample count");
        return r;
    }

    @Test
    void ensembleIsBitIdenticalForAnyThreadCountAndSplit() throws IOException {
        ModeTable t = table();
        Record whole = run(t, 0, 30, 1);
        Record twoThreads = run(t, 0, 30, 2);
        Record head = run(t, 0, 10, 2);
        Record tail = run(t, 10, 20, 1);
        for (long g = 0; g < 30; g++) {
            Record part = g < 10 ? head : tail;
            assertArrayEquals(whole.q.get(g), twoThreads.q.get(g), "q, 1 vs 2 threads, sample " + g);
            assertArrayEquals(whole.e.get(g), twoThreads.e.get(g), "e, 1 vs 2 threads, sample " + g);
            assertArrayEquals(whole.q.get(g), part.q.get(g), "q, one run vs split at 10, sample " + g);
            assertArrayEquals(whole.e.get(g), part.e.get(g), "e, one run vs split at 10, sample " + g);
            for (Field f : Field.values()) {
                assertArrayEquals(whole.values.get(f).get(g), twoThreads.values.get(f).get(g),
                    f + ", 1 vs 2 threads, sample " + g);
                assertArrayEquals(whole.values.get(f).get(g), part.values.get(f).get(g),
                    f + ", one run vs split at 10, sample " + g);
            }
        }
        assertEquals(30, whole.q.size());
        // The amplitudes are the sample streams' own draws.
        AmplitudeSampler sampler = new AmplitudeSampler(t);
        double[] direct = draw(sampler, SEED, 17);
        assertArrayEquals(Arrays.copyOf(direct, t.size()), whole.q.get(17L), "q of sample 17 from its stream");
    }

    @Test
    void cachedAndUncachedBasesGiveTheSameFieldsOnAnyPool() {
        ModeTable t = table();
        List<Vec3> pts = points();
        int s = 5;
        int m = t.size();
        double[][] q = new double[s][m];
        double[][] e = new double[s][m];
        AmplitudeSampler sampler = new AmplitudeSampler(t);
        for (int i = 0; i < s; i++) {
            sampler.draw(SampleStreams.forSample(SEED, i), q[i], e[i]);
        }
        Map<Field, double[][]> cached = synth(new FieldSynthesizer(t, pts, EnumSet.allOf(Field.class), Long.MAX_VALUE),
            q, e, pts.size(), 1);
        Map<Field, double[][]> uncached = synth(new FieldSynthesizer(t, pts, EnumSet.allOf(Field.class), 0), q, e,
            pts.size(), 3);
        for (Field f : Field.values()) {
            for (int i = 0; i < s; i++) {
                assertArrayEquals(cached.get(f)[i], uncached.get(f)[i], f + " sample " + i + ", cached vs uncached");
            }
        }
        // The wall point keeps a finite field and the grid points are all inside.
        assertTrue(Arrays.stream(cached.get(Field.E)[0]).allMatch(Double::isFinite), "finite E everywhere");
    }

    private static Map<Field, double[][]> synth(FieldSynthesizer fs, double[][] q, double[][] e, int points, int threads) {
        Map<Field, double[][]> out = new EnumMap<>(Field.class);
        for (Field f : Field.values()) {
            out.put(f, new double[q.length][3 * points]);
        }
        ForkJoinPool pool = new ForkJoinPool(threads);
        try {
            fs.synthesize(q, e, out, pool, 0);
        } finally {
            pool.shutdownNow();
        }
        return out;
    }
}
