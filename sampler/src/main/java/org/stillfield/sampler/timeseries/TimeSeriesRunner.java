package org.stillfield.sampler.timeseries;

import java.io.IOException;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;
import java.util.concurrent.ForkJoinPool;
import java.util.function.LongConsumer;
import java.util.stream.IntStream;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.engine.AmplitudeSampler;
import org.stillfield.sampler.engine.SampleStreams;

/**
 * Produces noise time series: for each sample of a range, the probe signals at every step of a
 * {@link TimeGrid}, streamed to a {@link TimeSeriesSink} with bounded memory.
 *
 * <p>Randomness: sample i uses only its own stream {@link SampleStreams#forSample}(seed, i). The
 * state at t = 0 is exactly the draw {@link AmplitudeSampler#draw} makes for that sample (so step 0
 * equals the sample of an ensemble run with the same seed); the same stream then feeds a
 * {@link ZigguratSampler.NormalizedGaussian} for the step noises in the order
 * {@link ModeEvolution} documents (per step, per lossy mode in table order, q then e). Hence every
 * value depends on (seed, sample index, plan) alone, never on threads.
 *
 * <p>Memory: samples run in groups of {@link Plan#groupSize()}; each group advances
 * {@link Plan#chunkSteps()} steps at a time (its samples in parallel), then hands one block per sample
 * to the sink. Buffers hold group × chunk × (channels [+ 2M]) doubles, independent of the number of
 * samples and steps.
 */
public final class TimeSeriesRunner {
    /** Default number of samples advanced together. */
    public static final int DEFAULT_GROUP = 16;
    /** Default budget for the buffers of one group, bytes. */
    public static final long DEFAULT_BLOCK_BYTES = 32L << 20;

    /**
     * What to run.
     *
     * @param table modes and stationary variances
     * @param damping Q and κ per mode
     * @param grid sampling times
     * @param probes channels, with distinct names (may be empty when only amplitudes are wanted)
     * @param seed master seed
     * @param firstSample global index of the first sample, ≥ 0
     * @param sampleCount number of samples, ≥ 1
     * @param threads worker threads, ≥ 1
     * @param amplitudes also hand the mode amplitudes (q, e) of every step to the sink
     * @param groupSize samples advanced together, ≥ 1
     * @param chunkSteps steps per block, ≥ 1; 0 picks it from {@link #DEFAULT_BLOCK_BYTES}
     */
    public record Plan(ModeTable table, ModeDamping damping, TimeGrid grid, List<Probe> probes, long seed,
                       long firstSample, long sampleCount, int threads, boolean amplitudes, int groupSize,
                       int chunkSteps) {
        /** Validates. */
        public Plan {
            Objects.requireNonNull(table, "table");
            Objects.requireNonNull(damping, "damping");
            Objects.requireNonNull(grid, "grid");
            probes = List.copyOf(probes);
            if (damping.size() != table.size()) {
                throw new IllegalArgumentException("damping covers " + damping.size() + " modes but the table has "
                    + table.size());
            }
            Set<String> names = new HashSet<>();
            for (Probe p : probes) {
                if (!names.add(p.name())) {
                    throw new IllegalArgumentException("probe names must be distinct: " + p.name());
                }
            }
            if (firstSample < 0) {
                throw new IllegalArgumentException("firstSample must be >= 0: " + firstSample);
            }
            if (sampleCount < 1) {
                throw new IllegalArgumentException("samples must be >= 1: " + sampleCount);
            }
            if (threads < 1) {
                throw new IllegalArgumentException("threads must be >= 1: " + threads);
            }
            if (groupSize < 1) {
                throw new IllegalArgumentException("groupSize must be >= 1: " + groupSize);
            }
            if (chunkSteps < 0) {
                throw new IllegalArgumentException("chunkSteps must be >= 0 (0 = automatic): " + chunkSteps);
            }
        }

        /**
         * Plan with default grouping, automatic chunks and no amplitudes.
         *
         * @param table modes
         * @param damping losses
         * @param grid times
         * @param probes channels
         * @param seed master seed
         * @param firstSample first global sample index
         * @param sampleCount number of samples
         * @param threads worker threads
         * @return the plan
         */
        public static Plan of(ModeTable table, ModeDamping damping, TimeGrid grid, List<Probe> probes, long seed,
                              long firstSample, long sampleCount, int threads) {
            return new Plan(table, damping, grid, probes, seed, firstSample, sampleCount, threads, false,
                DEFAULT_GROUP, 0);
        }

        /** @return a copy that also emits (or stops emitting) the mode amplitudes */
        public Plan withAmplitudes(boolean on) {
            return new Plan(table, damping, grid, probes, seed, firstSample, sampleCount, threads, on, groupSize,
                chunkSteps);
        }

        /** @return a copy with the given group size and chunk length (0 = automatic) */
        public Plan withBlocking(int group, int chunk) {
            return new Plan(table, damping, grid, probes, seed, firstSample, sampleCount, threads, amplitudes, group,
                chunk);
        }

        /** @return a copy with another thread count (values are identical for any count) */
        public Plan withThreads(int n) {
            return new Plan(table, damping, grid, probes, seed, firstSample, sampleCount, n, amplitudes, groupSize,
                chunkSteps);
        }

        /** @return steps per block actually used */
        public int effectiveChunk() {
            if (chunkSteps > 0) {
                return Math.min(chunkSteps, grid.steps());
            }
            long width = probes.size() + (amplitudes ? 2L * table.size() : 0L);
            long chunk = DEFAULT_BLOCK_BYTES / (8L * groupSize * Math.max(1, width));
            return (int) Math.max(1, Math.min(grid.steps(), chunk));
        }
    }

    private TimeSeriesRunner() {
    }

    /**
     * @param plan what to run
     * @param sink receives the blocks; finish() is called at the end
     * @param progress told the number of samples completed after each group (may be null)
     * @throws IOException from the sink
     */
    public static void run(Plan plan, TimeSeriesSink sink, LongConsumer progress) throws IOException {
        Objects.requireNonNull(sink, "sink");
        ModeTable table = plan.table();
        List<ProbeCoefficients> channels = new ArrayList<>();
        for (Probe p : plan.probes()) {
            channels.add(p.coefficients(table));
        }
        ModeEvolution evolution = ModeEvolution.of(table, plan.damping(), plan.grid().dtSeconds());
        AmplitudeSampler sampler = new AmplitudeSampler(table);
        int chunk = plan.effectiveChunk();
        int steps = plan.grid().steps();
        ForkJoinPool pool = new ForkJoinPool(plan.threads());
        try {
            long done = 0;
            while (done < plan.sampleCount()) {
                int n = (int) Math.min(plan.groupSize(), plan.sampleCount() - done);
                long first = plan.firstSample() + done;
                Trajectory[] group = new Trajectory[n];
                for (int i = 0; i < n; i++) {
                    group[i] = new Trajectory(first + i, table.size(), channels, chunk, plan.amplitudes());
                }
                for (int start = 0; start < steps; start += chunk) {
                    int len = Math.min(chunk, steps - start);
                    int s0 = start;
                    pool.submit(() -> IntStream.range(0, n).parallel()
                        .forEach(i -> group[i].advance(plan.seed(), sampler, evolution, s0, len))).join();
                    for (Trajectory t : group) {
                        sink.accept(t.block(s0, len, steps, plan.grid().dtSeconds()));
                    }
                }
                done += n;
                if (progress != null) {
                    progress.accept(done);
                }
            }
            sink.finish();
        } finally {
            pool.shutdownNow();
        }
    }

    /** One sample's state and its block buffers. */
    private static final class Trajectory {
        private final long sample;
        private final List<ProbeCoefficients> channels;
        private final double[] q;
        private final double[] e;
        private final double[] values;
        private final double[] qOut;
        private final double[] eOut;
        private ZigguratSampler.NormalizedGaussian gauss;

        Trajectory(long sample, int modes, List<ProbeCoefficients> channels, int chunk, boolean amplitudes) {
            this.sample = sample;
            this.channels = channels;
            q = new double[modes];
            e = new double[modes];
            values = new double[chunk * channels.size()];
            qOut = amplitudes ? new double[chunk * modes] : null;
            eOut = amplitudes ? new double[chunk * modes] : null;
        }

        void advance(long seed, AmplitudeSampler sampler, ModeEvolution evolution, int start, int len) {
            int m = q.length;
            int p = channels.size();
            for (int s = 0; s < len; s++) {
                int n = start + s;
                if (n == 0) {
                    UniformRandomProvider rng = SampleStreams.forSample(seed, sample);
                    sampler.draw(rng, q, e);
                    gauss = ZigguratSampler.NormalizedGaussian.of(rng);
                } else {
                    evolution.step(q, e, gauss);
                }
                for (int c = 0; c < p; c++) {
                    values[s * p + c] = channels.get(c).signal(q, e);
                }
                if (qOut != null) {
                    System.arraycopy(q, 0, qOut, s * m, m);
                    System.arraycopy(e, 0, eOut, s * m, m);
                }
            }
        }

        TimeSeriesBlock block(int start, int len, int total, double dt) {
            return new TimeSeriesBlock(sample, start, len, total, dt, channels.size(), values,
                qOut == null ? 0 : q.length, qOut, eOut);
        }
    }
}
