/**
 * Noise time series for detector models (PHYSICS.md §5): each sample's joint Wigner draw
 * (q_l, e_l) is evolved in time, exactly, and read out through linear probes.
 *
 * <p>Pieces, in the order a run uses them:
 * <ul>
 *   <li>{@link org.stillfield.sampler.timeseries.TimeGrid}: step dt and count, with the Nyquist check
 *       ({@link org.stillfield.sampler.timeseries.AliasReport});</li>
 *   <li>{@link org.stillfield.sampler.timeseries.LossModel} → {@link org.stillfield.sampler.timeseries.ModeDamping}:
 *       quality factor and energy decay rate κ_l = ω_l/Q_l of every mode (constant, wall conductivity of the
 *       box by direct integration of the wall losses, dielectric loss tangent, or combinations);</li>
 *   <li>{@link org.stillfield.sampler.timeseries.ModeEvolution}: one exact step of every mode — a rotation
 *       for a lossless mode, the exact discretisation of the damped, noise-driven mode (a two-dimensional
 *       Ornstein–Uhlenbeck process) for a lossy one;</li>
 *   <li>{@link org.stillfield.sampler.timeseries.Probe}: dipoles, smeared dipoles, small loops and plain field
 *       components, each reduced to per-mode coefficients
 *       ({@link org.stillfield.sampler.timeseries.ProbeCoefficients}) so a signal is Σ a_l e_l + b_l q_l;</li>
 *   <li>{@link org.stillfield.sampler.timeseries.TimeSeriesRunner}: samples × steps, streamed as
 *       {@link org.stillfield.sampler.timeseries.TimeSeriesBlock}s to a
 *       {@link org.stillfield.sampler.timeseries.TimeSeriesSink}.</li>
 * </ul>
 */
package org.stillfield.sampler.timeseries;
