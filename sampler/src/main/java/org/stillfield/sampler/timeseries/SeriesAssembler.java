package org.stillfield.sampler.timeseries;

import java.io.IOException;
import java.util.HashMap;
import java.util.Map;
import java.util.Objects;

/**
 * Sink adapter that gathers whole trajectories of selected channels and hands each sample's
 * series over once its last block has arrived. Memory: one series per channel for every sample
 * of the runner's current group.
 */
public final class SeriesAssembler implements TimeSeriesSink {
    /** Receives one sample's complete series. */
    @FunctionalInterface
    public interface Consumer {
        /**
         * @param sample global sample index
         * @param series series[j][n]: channel channels[j] at step n (owned by the callee)
         * @throws IOException when downstream output fails
         */
        void accept(long sample, double[][] series) throws IOException;
    }

    private final int[] channels;
    private final int steps;
    private final Consumer consumer;
    private final Map<Long, double[][]> open = new HashMap<>();

    /**
     * @param channels channel indices to keep
     * @param steps steps per trajectory
     * @param consumer receives completed samples, in the order they complete
     */
    public SeriesAssembler(int[] channels, int steps, Consumer consumer) {
        this.channels = channels.clone();
        if (steps < 1) {
            throw new IllegalArgumentException("steps must be >= 1: " + steps);
        }
        this.steps = steps;
        this.consumer = Objects.requireNonNull(consumer, "consumer");
    }

    @Override
    public void accept(TimeSeriesBlock block) throws IOException {
        double[][] series = open.computeIfAbsent(block.sample(), s -> new double[channels.length][steps]);
        for (int j = 0; j < channels.length; j++) {
            if (channels[j] < 0 || channels[j] >= block.channels()) {
                throw new IllegalArgumentException("channel index " + channels[j] + " out of range [0, "
                    + block.channels() + ")");
            }
            block.copyChannel(channels[j], series[j], block.firstStep());
        }
        if (block.last()) {
            open.remove(block.sample());
            consumer.accept(block.sample(), series);
        }
    }

    @Override
    public void finish() throws IOException {
        if (!open.isEmpty()) {
            throw new IllegalStateException(open.size() + " trajectories ended without their last block");
        }
    }
}
