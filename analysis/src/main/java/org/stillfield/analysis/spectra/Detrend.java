package org.stillfield.analysis.spectra;

/** What is removed from each segment before windowing. */
public enum Detrend {
    /** Nothing: right for the zero-mean fields of the sampler, keeps E[Σ G Δf] = variance exact. */
    NONE,
    /** The segment mean: for data with an offset; biases the lowest bins and the integral down. */
    MEAN
}
