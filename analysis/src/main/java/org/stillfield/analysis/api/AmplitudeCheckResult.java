package org.stillfield.analysis.api;

/**
 * Outcome of the pooled normality check of standardised mode amplitudes.
 *
 * @param values number of standardised amplitudes tested
 * @param statistic Kolmogorov–Smirnov distance D = sup |F_n(x) − Φ(x)|
 * @param pValue P(D_n ≥ statistic) for N(0,1) data
 * @param verdict pass when the p-value is at least the false-alarm rate (equivalently D ≤ D*)
 */
public record AmplitudeCheckResult(int values, double statistic, double pValue, Verdict verdict) {
}
