package org.stillfield.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.special.Gamma;
import org.junit.jupiter.api.Test;
import org.stillfield.analysis.api.Verdict;

/** The noise verdict's critical value and decision. */
class NoiseVerdictTest {
    /** Student-t density, from its closed form with log-gamma. */
    private static double tPdf(double t, double nu) {
        double logC = Gamma.logGamma((nu + 1) / 2) - Gamma.logGamma(nu / 2) - 0.5 * Math.log(nu * Math.PI);
        return Math.exp(logC - (nu + 1) / 2 * Math.log1p(t * t / nu));
    }

    /** Two-sided tail P(|T| > t) by composite Simpson quadrature of the density on [0, t]: 1 − 2∫₀ᵗ f. */
    private static double twoSidedTail(double t, double nu) {
        int n = 20_000;
        double h = t / n;
        double s = tPdf(0, nu) + tPdf(t, nu);
        for (int i = 1; i < n; i++) {
            s += (i % 2 == 1 ? 4 : 2) * tPdf(i * h, nu);
        }
        return 1 - 2 * s * h / 3;
    }

    @Test
    void criticalValueMatchesTablesAndQuadrature() {
        // Two-sided 1 % point of Student's t with 15 degrees of freedom: 2.947 (standard t table,
        // e.g. Abramowitz & Stegun Table 26.10; value from memory).
        assertEquals(2.947, NoisePipeline.criticalT(15, 0.01, 1), 5e-4);
        // Large dof: the normal quantile z_{0.995} = 2.5758 (A&S Table 26.1; value from memory).
        assertEquals(2.5758, NoisePipeline.criticalT(1_000_000, 0.01, 1), 2e-4);
        // Bonferroni over 4 probes at alpha = 0.01 and 7 dof: the tail beyond the value is alpha/4, checked by
        // integrating the density (independent numerics; Simpson error far below the tolerance).
        double t = NoisePipeline.criticalT(7, 0.01, 4);
        assertEquals(0.01 / 4, twoSidedTail(t, 7), 1e-8, "tail at t = " + t);
    }

    @Test
    void verdictFailsOnlyBeyondTheCriticalValue() {
        double crit = NoisePipeline.criticalT(15, 0.01, 2);
        List<NoisePipeline.VarianceCheck> ok = List.of(
            new NoisePipeline.VarianceCheck("a", "V", 1.0, 0.1, 1.0 - 0.1 * (crit - 0.01), crit - 0.01),
            new NoisePipeline.VarianceCheck("b", "V", 1.0, 0.1, 1.0, 0.0));
        Verdict pass = NoisePipeline.verdict(ok, crit, 0.01, 16);
        assertTrue(pass.passed(), pass.method());
        assertEquals(2, pass.tests());
        assertEquals(crit - 0.01, pass.worst(), 1e-12);
        assertEquals(0.01, pass.falseAlarm(), 0.0);
        // Power: a probe whose variance is off by more than the critical number of standard errors fails.
        List<NoisePipeline.VarianceCheck> off = List.of(ok.get(1),
            new NoisePipeline.VarianceCheck("c", "V", 1.0, 0.1, 1.0 + 0.1 * (crit + 0.01), -(crit + 0.01)));
        Verdict fail = NoisePipeline.verdict(off, crit, 0.01, 16);
        assertFalse(fail.passed(), fail.method());
        assertEquals(crit + 0.01, fail.worst(), 1e-12);
    }
}
