package org.stillfield.analysis.api;

import java.util.List;

/**
 * The Gaussianity and independence checks of one ensemble.
 *
 * @param samples samples used
 * @param tests every test, verdict family first
 * @param verdict the combined verdict over the family (Holm, overall false-alarm rate α)
 * @param warnings conditions to know about (e.g. samples beyond the stored limit ignored)
 */
public record GaussianityResult(long samples, List<NormalityTest> tests, Verdict verdict, List<String> warnings) {
    /** Copies the lists. */
    public GaussianityResult {
        tests = List.copyOf(tests);
        warnings = List.copyOf(warnings);
    }
}
