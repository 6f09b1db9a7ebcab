/**
 * Estimators over sampled ensembles and the analytic references they are compared with.
 *
 * <p>{@link org.stillfield.analysis.CorrelationEstimator} and {@link org.stillfield.analysis.AmplitudeCheck}
 * are {@link org.stillfield.sampler.api.EnsembleSink}s: they work on a live run or on a replayed
 * dataset alike. {@link org.stillfield.analysis.AnalyticCorrelation}, {@link org.stillfield.analysis.ModeSumCorrelation}
 * and {@link org.stillfield.analysis.BoxImageSum} are deterministic references usable without
 * sampling. {@link org.stillfield.analysis.Verdicts} combines verdicts under one false-alarm budget;
 * {@link org.stillfield.analysis.CorrelationTables} writes the tables. Conventions: PHYSICS.md.
 */
package org.stillfield.analysis;
