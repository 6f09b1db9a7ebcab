package org.stillfield.analysis.api;

import java.util.List;

/**
 * The correlation table of one ensemble and its verdict.
 *
 * @param samples number of samples N used
 * @param rows the table, fields in {@link org.stillfield.sampler.api.Field} order, then pairs in
 *     the order given, then i, then j
 * @param verdict validation outcome over the tested rows
 * @param warnings conditions under which the verdict should not be trusted (e.g. N &lt; 100), or
 *     pairs left out of the table; empty when there are none
 */
public record CorrelationResult(long samples, List<CorrelationRow> rows, Verdict verdict, List<String> warnings) {
    /** Copies the lists. */
    public CorrelationResult {
        rows = List.copyOf(rows);
        warnings = List.copyOf(warnings);
    }

    /** A result without warnings. */
    public CorrelationResult(long samples, List<CorrelationRow> rows, Verdict verdict) {
        this(samples, rows, verdict, List.of());
    }

    /** @return number of rows that entered the verdict */
    public int testedRows() {
        int n = 0;
        for (CorrelationRow r : rows) {
            if (r.tested()) {
                n++;
            }
        }
        return n;
    }

    /** @return number of rows flagged {@link CorrelationRow.Status#ZERO_VARIANCE} */
    public int zeroVarianceRows() {
        return rows.size() - testedRows();
    }
}
