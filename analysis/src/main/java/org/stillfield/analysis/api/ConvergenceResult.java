package org.stillfield.analysis.api;

import java.util.List;

/**
 * Error against sample count, with the slope of ln(rms error) on ln N (expected −1/2).
 *
 * @param points one per prefix, increasing N
 * @param slope least-squares slope of ln rmsError on ln N
 * @param slopeSe its standard error from the residuals (NaN for two points); the prefixes are nested,
 *     so this understates the true uncertainty
 * @param method how the errors were formed
 */
public record ConvergenceResult(List<ConvergencePoint> points, double slope, double slopeSe, String method) {
    /** Copies the list. */
    public ConvergenceResult {
        points = List.copyOf(points);
    }
}
