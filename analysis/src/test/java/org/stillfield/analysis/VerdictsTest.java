package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.Verdict;

/** Bonferroni combination of verdicts (union bound: P(any part fails) ≤ Σ α_k; common practice). */
class VerdictsTest {
    private static Verdict part(boolean passed, double alpha, double threshold, double worst) {
        return new Verdict(passed, alpha, 3, threshold, worst, "part");
    }

    @Test
    void passesOnlyWhenEveryPartPasses() {
        Verdict a = part(true, 0.005, 4.0, 3.0);
        Verdict b = part(true, 0.005, 0.02, 0.01);
        Verdict c = part(false, 0.005, 0.02, 0.03);
        Verdict ok = Verdicts.combine(0.01, a, b);
        assertTrue(ok.passed());
        assertEquals(0.01, ok.falseAlarm());
        assertEquals(6, ok.tests());
        assertEquals(0.75, ok.worst(), 1e-15, "largest worst/threshold ratio");
        assertEquals(1.0, ok.threshold());
        Verdict bad = Verdicts.combine(0.01, a, c);
        assertFalse(bad.passed());
        assertEquals(1.5, bad.worst(), 1e-15);
    }

    @Test
    void refusesPartsThatOverspendTheBudget() {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> Verdicts.combine(0.01, part(true, 0.01, 1, 0), part(true, 0.01, 1, 0)));
        assertTrue(ex.getMessage().contains("at most alpha"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> Verdicts.combine(0.01));
        assertThrows(IllegalArgumentException.class, () -> Verdicts.combine(1.5, part(true, 0.01, 1, 0)));
        assertEquals(0.005, Verdicts.share(0.01, 2));
    }

    @Test
    void verdictRejectsNonFiniteNumbers() {
        assertThrows(IllegalArgumentException.class, () -> new Verdict(true, 0.01, 1, Double.NaN, 0, "m"));
        assertThrows(IllegalArgumentException.class, () -> new Verdict(true, 0.0, 1, 1, 0, "m"));
    }
}
