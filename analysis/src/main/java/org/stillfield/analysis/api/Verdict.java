package org.stillfield.analysis.api;

/**
 * Outcome of a validation test with a stated false-alarm rate.
 *
 * @param passed true when no test statistic crossed its threshold
 * @param falseAlarm nominal probability of failing a correct ensemble
 * @param tests number of statistics tested
 * @param threshold critical |z| (or other statistic)
 * @param worst largest observed statistic
 * @param method how the threshold was set, in words
 */
public record Verdict(boolean passed, double falseAlarm, int tests, double threshold, double worst, String method) {
}
