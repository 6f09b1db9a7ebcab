package org.stillfield.analysis;

import java.util.Locale;
import java.util.Objects;
import org.stillfield.analysis.api.Verdict;

/**
 * Combines verdicts whose false-alarm rates were split from one budget (Bonferroni): for example
 * the correlation table at α/2 and the amplitude check at α/2. By the union bound the chance that a
 * correct ensemble fails any part is at most the sum of the parts' rates, whatever their
 * dependence, so the combined verdict has false-alarm rate ≤ α.
 */
public final class Verdicts {
    /** Slack for rounding when the parts' rates are compared with the budget. */
    private static final double SLACK = 1e-12;

    private Verdicts() {
    }

    /**
     * The rate each of {@code parts} checks should use so that together they spend α.
     *
     * @param alpha the budget, in (0, 1)
     * @param parts number of checks, ≥ 1
     * @return α / parts
     */
    public static double share(double alpha, int parts) {
        checkAlpha(alpha);
        if (parts < 1) {
            throw new IllegalArgumentException("parts must be >= 1: " + parts);
        }
        return alpha / parts;
    }

    /**
     * Passes when every part passes. The combined statistic is the largest ratio worst/threshold of
     * the parts (a part with threshold 0 tested nothing and contributes 0), with threshold 1; tests
     * are summed.
     *
     * @param alpha the budget the parts were split from, in (0, 1)
     * @param parts the verdicts, at least one
     * @return the combined verdict with false-alarm rate alpha
     * @throws IllegalArgumentException if the parts' rates add up to more than alpha
     */
    public static Verdict combine(double alpha, Verdict... parts) {
        checkAlpha(alpha);
        Objects.requireNonNull(parts, "parts");
        if (parts.length == 0) {
            throw new IllegalArgumentException("parts must hold at least one verdict");
        }
        double spent = 0;
        int tests = 0;
        boolean passed = true;
        double ratio = 0;
        StringBuilder names = new StringBuilder();
        for (int k = 0; k < parts.length; k++) {
            Verdict v = Objects.requireNonNull(parts[k], "parts[" + k + "]");
            spent += v.falseAlarm();
            tests += v.tests();
            passed &= v.passed();
            if (v.threshold() > 0) {
                ratio = Math.max(ratio, v.worst() / v.threshold());
            }
            names.append(k == 0 ? "" : " + ").append(String.format(Locale.ROOT, "%.3g", v.falseAlarm()));
        }
        if (spent > alpha * (1 + SLACK)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                "parts' false-alarm rates must add up to at most alpha = %.6g: %s = %.6g", alpha, names, spent));
        }
        String method = String.format(Locale.ROOT,
            "all %d checks must pass; Bonferroni split of alpha = %.3g as %s; statistic = largest worst/threshold"
                + " ratio (%.4f)", parts.length, alpha, names, ratio);
        return new Verdict(passed, alpha, tests, 1.0, ratio, method);
    }

    private static void checkAlpha(double alpha) {
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("alpha must lie in (0, 1): " + alpha);
        }
    }
}
