package org.stillfield.analysis.api;

import java.util.List;

/**
 * The correlation table of one ensemble and its verdict.
 *
 * @param samples number of samples N used
 * @param rows the table
 * @param verdict validation outcome
 */
public record CorrelationResult(long samples, List<CorrelationRow> rows, Verdict verdict) {
    /** Copies the rows. */
    public CorrelationResult {
        rows = List.copyOf(rows);
    }
}
