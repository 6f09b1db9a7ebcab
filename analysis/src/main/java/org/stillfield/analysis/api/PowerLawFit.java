package org.stillfield.analysis.api;

import java.util.Objects;

/**
 * A power law y = A·r^p fitted by weighted least squares to ln|y| against ln r over [rMin, rMax].
 *
 * @param quantity what was fitted, e.g. "E kernel, parallel, sampled"
 * @param exponent the fitted p
 * @param exponentSe its standard error: delete-one-group jackknife over the samples for sampled
 *     data, 0 for deterministic curves
 * @param exponentSeWls the weighted-least-squares error from the pointwise errors alone (ignores
 *     their correlation; 0 for deterministic curves)
 * @param amplitude A, in the unit of y per m^p
 * @param expected the free-space exponent the fit is compared with (−2 or −4), or NaN
 * @param rMinM lower end of the fit range, metres
 * @param rMaxM upper end, metres
 * @param points number of separations in the range
 * @param method how the fit was made, in words (weights, correction divided out, error method)
 */
public record PowerLawFit(String quantity, double exponent, double exponentSe, double exponentSeWls, double amplitude,
                          double expected, double rMinM, double rMaxM, int points, String method) {
    /** Validates. */
    public PowerLawFit {
        Objects.requireNonNull(quantity, "quantity");
        Objects.requireNonNull(method, "method");
        if (!Double.isFinite(exponent) || !(exponentSe >= 0) || !(exponentSeWls >= 0) || points < 2) {
            throw new IllegalArgumentException(String.format(
                "fit %s must have a finite exponent, errors >= 0 and >= 2 points: %s +- %s (%d points)", quantity,
                exponent, exponentSe, points));
        }
    }

    /** @return (exponent − expected)/exponentSe, NaN when either is unavailable */
    public double z() {
        return exponentSe > 0 && Double.isFinite(expected) ? (exponent - expected) / exponentSe : Double.NaN;
    }
}
