package org.stillfield.sampler.timeseries;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.stillfield.sampler.api.ModeTable;

/**
 * Uniform sampling times t_n = n·dt, n = 0 … steps − 1, of a noise time series.
 *
 * <p>Sampling at dt represents frequencies up to the Nyquist frequency f_N = 1/(2 dt)
 * (ω_N = π/dt). A mode at or above it is still evolved exactly at the sample times, but its
 * power appears at a folded (aliased) frequency in any spectrum of the series; see
 * {@link #aliasing(ModeTable)}.
 *
 * @param dtSeconds step, s, positive and finite
 * @param steps number of sampling times per trajectory, ≥ 1
 */
public record TimeGrid(double dtSeconds, int steps) {
    /** Validates. */
    public TimeGrid {
        if (!(dtSeconds > 0) || !Double.isFinite(dtSeconds)) {
            throw new IllegalArgumentException("timeseries.dt_s must be positive and finite (seconds): " + dtSeconds);
        }
        if (steps < 1) {
            throw new IllegalArgumentException("timeseries.steps must be >= 1: " + steps);
        }
    }

    /**
     * @param n step index
     * @return t_n = n·dt, s (computed from n, never accumulated, so it carries no drift)
     */
    public double time(int n) {
        return n * dtSeconds;
    }

    /** @return span covered by the samples, (steps − 1)·dt, s */
    public double span() {
        return (steps - 1) * dtSeconds;
    }

    /** @return Nyquist angular frequency π/dt, rad/s */
    public double nyquistOmega() {
        return Math.PI / dtSeconds;
    }

    /** @return Nyquist frequency 1/(2 dt), Hz */
    public double nyquistHz() {
        return 0.5 / dtSeconds;
    }

    /**
     * Lists the modes whose ω is at or above π/dt. A mode exactly at the Nyquist frequency counts:
     * its sine quadrature vanishes at every sample time, so it is not represented faithfully either.
     *
     * @param table the modes
     * @return the modes that alias, with the numbers for a warning
     */
    public AliasReport aliasing(ModeTable table) {
        Objects.requireNonNull(table, "table");
        double limit = nyquistOmega();
        List<Integer> aliased = new ArrayList<>();
        double highest = 0;
        for (int l = 0; l < table.size(); l++) {
            highest = Math.max(highest, table.omega(l));
            if (table.omega(l) >= limit) {
                aliased.add(l);
            }
        }
        List<String> labels = new ArrayList<>();
        List<Double> freqs = new ArrayList<>();
        for (int l : aliased) {
            labels.add(table.modes().get(l).label());
            freqs.add(table.frequency(l));
        }
        return new AliasReport(dtSeconds, nyquistHz(), table.size(), aliased, labels, freqs, highest / (2 * Math.PI));
    }
}
