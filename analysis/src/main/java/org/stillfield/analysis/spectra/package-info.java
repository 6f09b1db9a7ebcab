/**
 * Spectra and two-time correlations of probe time series, and their analytic references
 * (PHYSICS.md §5).
 *
 * <ul>
 *   <li>{@link org.stillfield.analysis.spectra.WelchPsd} and {@link org.stillfield.analysis.spectra.WelchCsd}:
 *       Welch's averaged periodogram (Hann window, 50 % overlap) over segments and ensemble samples, one-sided,
 *       normalised so that it integrates to the variance, with χ² confidence bands from the equivalent
 *       degrees of freedom;</li>
 *   <li>{@link org.stillfield.analysis.spectra.TwoTimeCorrelation}: the ensemble estimate of
 *       ⟨x(t+τ) y(t)⟩, which for Wigner-sampled linear dynamics is the symmetrised quantum correlation
 *       ½⟨{x̂(t+τ), ŷ(t)}⟩;</li>
 *   <li>{@link org.stillfield.analysis.spectra.ProbeNoiseModel}: the analytic correlation and spectrum of
 *       probe signals — Lorentzians for lossy modes, lines for lossless ones;</li>
 *   <li>{@link org.stillfield.analysis.spectra.NoiseTemperature}: noise as an equivalent temperature, with the
 *       quantum limit ħω/2k_B and the Planck part separated.</li>
 * </ul>
 */
package org.stillfield.analysis.spectra;
