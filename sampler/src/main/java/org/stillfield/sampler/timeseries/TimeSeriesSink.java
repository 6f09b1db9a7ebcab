package org.stillfield.sampler.timeseries;

import java.io.IOException;

/**
 * Receives trajectories block by block from {@link TimeSeriesRunner}, from a single thread.
 * The blocks of one sample arrive in increasing step order; blocks of the samples of one group
 * are interleaved chunk by chunk in increasing sample order. That layout depends on the plan only,
 * never on the thread count.
 */
public interface TimeSeriesSink extends AutoCloseable {
    /**
     * @param block the steps
     * @throws IOException when output fails
     */
    void accept(TimeSeriesBlock block) throws IOException;

    /**
     * Completes the output after the last block. Not called when the run fails.
     *
     * @throws IOException when output fails
     */
    default void finish() throws IOException {
    }

    /** Releases resources. */
    @Override
    default void close() throws IOException {
    }
}
