package org.stillfield.sampler.engine;

import java.io.IOException;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Set;
import java.util.concurrent.ForkJoinPool;
import java.util.function.LongConsumer;
import java.util.stream.IntStream;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;

/**
 * Runs a range of samples: draws amplitudes from each sample's own stream, synthesises the
 * fields and streams the batches to a sink. Memory is bounded by the batch size, never by the
 * sample count.
 */
public final class EnsembleRunner {
    /** Default memory for one batch of field values, bytes. */
    public static final long DEFAULT_BATCH_BYTES = 128L << 20;
    /** Default memory for the cached mode-function basis, bytes. */
    public static final long DEFAULT_CACHE_BYTES = 512L << 20;

    /**
     * What to run.
     *
     * @param table modes and variances
     * @param points evaluation points, metres
     * @param fields fields to synthesise
     * @param seed master seed
     * @param firstSample global index of the first sample, ≥ 0
     * @param sampleCount number of samples, ≥ 1
     * @param threads worker threads, ≥ 1
     */
    public record Plan(ModeTable table, List<Vec3> points, Set<Field> fields, long seed,
                       long firstSample, long sampleCount, int threads) {
        /** Validates. */
        public Plan {
            Objects.requireNonNull(table, "table");
            points = List.copyOf(points);
            if (firstSample < 0) {
                throw new IllegalArgumentException("firstSample must be >= 0: " + firstSample);
            }
            if (sampleCount < 1) {
                throw new IllegalArgumentException("samples must be >= 1: " + sampleCount);
            }
            if (threads < 1) {
                throw new IllegalArgumentException("threads must be >= 1: " + threads);
            }
        }
    }

    private EnsembleRunner() {
    }

    private static List<PointSet> checked(List<PointSet> sets, List<Vec3> points) {
        int p = 0;
        for (PointSet s : sets) {
            for (Vec3 r : s.points()) {
                if (p >= points.size() || !r.equals(points.get(p))) {
                    throw new IllegalArgumentException("point sets do not match the plan's points at point " + p);
                }
                p++;
            }
        }
        if (p != points.size()) {
            throw new IllegalArgumentException("point sets hold " + p + " points, the plan " + points.size());
        }
        return sets;
    }

    /**
     * @param plan what to run
     * @param sink receives the batches in order; finish() is called at the end
     * @param progress told the number of samples done after each batch (may be null)
     * @throws IOException from the sink
     */
    public static void run(Plan plan, EnsembleSink sink, LongConsumer progress) throws IOException {
        run(plan, List.of(), sink, progress);
    }

    /**
     * Like {@link #run(Plan, EnsembleSink, LongConsumer)}, with the plan's points described by their
     * sets so that grids can use the cavity's exact fast sum.
     *
     * @param plan what to run
     * @param sets the point sets whose points, in order, are the plan's points (empty: generic path)
     * @param sink receives the batches in order
     * @param progress told the number of samples done after each batch (may be null)
     * @throws IOException from the sink
     */
    public static void run(Plan plan, List<PointSet> sets, EnsembleSink sink, LongConsumer progress) throws IOException {
        ModeTable table = plan.table();
        int m = table.size();
        int nPoints = plan.points().size();
        int nFields = plan.fields().size();
        AmplitudeSampler sampler = new AmplitudeSampler(table);
        FieldSynthesizer synth = nPoints == 0 || nFields == 0 ? null
            : sets.isEmpty() ? new FieldSynthesizer(table, plan.points(), plan.fields(), DEFAULT_CACHE_BYTES)
            : FieldSynthesizer.forSets(table, checked(sets, plan.points()), plan.fields(), DEFAULT_CACHE_BYTES);
        long perSample = 8L * (2L * m + 3L * nPoints * nFields);
        int batch = (int) Math.max(1, Math.min(256, DEFAULT_BATCH_BYTES / Math.max(1, perSample)));
        ForkJoinPool pool = new ForkJoinPool(plan.threads());
        // The sink works on batch k on its own thread while the pool computes batch k+1, so
        // writing overlaps synthesis; at most two batches are alive at once.
        java.util.concurrent.ExecutorService writer = java.util.concurrent.Executors.newSingleThreadExecutor(r -> {
            Thread t = new Thread(r, "stillfield-sink");
            t.setDaemon(true);
            return t;
        });
        java.util.concurrent.Future<?> pending = null;
        try {
            long done = 0;
            while (done < plan.sampleCount()) {
                int s = (int) Math.min(batch, plan.sampleCount() - done);
                long first = plan.firstSample() + done;
                double[][] q = new double[s][m];
                double[][] e = new double[s][m];
                Map<Field, double[][]> values = new EnumMap<>(Field.class);
                if (synth != null) {
                    for (Field f : plan.fields()) {
                        values.put(f, new double[s][]);
                    }
                }
                // The field arrays are allocated (and so zeroed) by the workers, not serially here:
                // for large grids the zeroing alone is a sizeable share of a sample's time.
                pool.submit(() -> IntStream.range(0, s).parallel().forEach(i -> {
                    sampler.draw(SampleStreams.forSample(plan.seed(), first + i), q[i], e[i]);
                    for (double[][] v : values.values()) {
                        v[i] = new double[3 * nPoints];
                    }
                })).join();
                if (synth != null) {
                    synth.synthesize(q, e, values, pool, first);
                }
                SampleBatch b = new SampleBatch(first, q, e, values);
                await(pending);
                pending = writer.submit(() -> {
                    sink.accept(b);
                    return null;
                });
                done += s;
                if (progress != null) {
                    progress.accept(done);
                }
            }
            await(pending);
            pending = null;
            sink.finish();
        } finally {
            if (pending != null) {
                pending.cancel(false);
                try {
                    pending.get();
                } catch (Exception ignored) {
                    // the run already failed; the first failure is the one reported
                }
            }
            writer.shutdownNow();
            pool.shutdownNow();
        }
    }

    /** Waits for the sink's previous batch, rethrowing its failure as it was thrown. */
    private static void await(java.util.concurrent.Future<?> f) throws IOException {
        if (f == null) {
            return;
        }
        try {
            f.get();
        } catch (InterruptedException ex) {
            Thread.currentThread().interrupt();
            throw new java.io.InterruptedIOException("interrupted while writing");
        } catch (java.util.concurrent.ExecutionException ex) {
            Throwable c = ex.getCause();
            if (c instanceof IOException) {
                throw (IOException) c;
            }
            if (c instanceof RuntimeException) {
                throw (RuntimeException) c;
            }
            if (c instanceof Error) {
                throw (Error) c;
            }
            throw new IOException(c);
        }
    }
}
