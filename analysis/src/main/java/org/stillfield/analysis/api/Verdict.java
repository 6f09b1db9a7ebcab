package org.stillfield.analysis.api;

import java.util.Objects;

/**
 * Outcome of a validation test with a stated false-alarm rate.
 *
 * <p>For the correlation table the statistic is |z| and the threshold the Bonferroni critical
 * value; for the amplitude check it is the Kolmogorov–Smirnov distance D and its critical value;
 * for a combined verdict it is the largest statistic/threshold ratio of the parts and the
 * threshold is 1. All numbers are finite.
 *
 * @param passed true when no test statistic crossed its threshold
 * @param falseAlarm nominal probability of failing a correct ensemble, in (0, 1)
 * @param tests number of statistics tested
 * @param threshold critical |z| (or other statistic)
 * @param worst largest observed statistic
 * @param method how the threshold was set, in words
 */
public record Verdict(boolean passed, double falseAlarm, int tests, double threshold, double worst, String method) {
    /** Validates. */
    public Verdict {
        Objects.requireNonNull(method, "method");
        if (!(falseAlarm > 0 && falseAlarm < 1)) {
            throw new IllegalArgumentException("falseAlarm must lie in (0, 1): " + falseAlarm);
        }
        if (tests < 0) {
            throw new IllegalArgumentException("tests must be >= 0: " + tests);
        }
        if (!Double.isFinite(threshold) || !Double.isFinite(worst)) {
            throw new IllegalArgumentException("threshold and worst must be finite: " + threshold + ", " + worst);
        }
    }
}
