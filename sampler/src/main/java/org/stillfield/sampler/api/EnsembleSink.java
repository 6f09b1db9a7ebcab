package org.stillfield.sampler.api;

import java.io.IOException;

/**
 * Receives the ensemble batch by batch, in sample order. Writers and streaming estimators
 * implement it; nothing downstream ever holds the whole ensemble.
 */
public interface EnsembleSink extends AutoCloseable {
    /**
     * Takes one batch; called in increasing sample order from a single thread.
     *
     * @param batch the samples
     * @throws IOException when output fails
     */
    void accept(SampleBatch batch) throws IOException;

    /**
     * Completes the output after the last batch. Not called when the run fails.
     *
     * @throws IOException when output fails
     */
    default void finish() throws IOException {
    }

    /** Releases resources; after a failure, removes anything that could look complete. */
    @Override
    default void close() throws IOException {
    }
}
