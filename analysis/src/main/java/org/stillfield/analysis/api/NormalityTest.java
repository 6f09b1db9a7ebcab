package org.stillfield.analysis.api;

import java.util.Objects;

/**
 * One test of the Gaussianity and independence family, with its p-value and its Holm-adjusted
 * p-value within the verdict's family.
 *
 * @param kind the test, e.g. "anderson-darling", "kolmogorov-smirnov", "mardia-skewness"
 * @param subject what was tested, e.g. "mode 12 (TE_1,0,1) q" or "E at 3 points"
 * @param n sample size
 * @param statistic the test statistic (A², D, n b₁/6, z, max |r|, ...)
 * @param pValue P(statistic at least as extreme) under the null, in [0, 1]
 * @param adjustedP Holm-adjusted p-value within the verdict family, or NaN for a test reported but
 *     not part of the verdict
 * @param inVerdict whether the test enters the combined verdict
 */
public record NormalityTest(String kind, String subject, int n, double statistic, double pValue, double adjustedP,
                            boolean inVerdict) {
    /** Validates. */
    public NormalityTest {
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(subject, "subject");
        if (!(pValue >= 0 && pValue <= 1) || !Double.isFinite(statistic)) {
            throw new IllegalArgumentException(String.format("test %s of %s must have a finite statistic and p in [0, 1]:"
                + " %s, %s", kind, subject, statistic, pValue));
        }
    }
}
