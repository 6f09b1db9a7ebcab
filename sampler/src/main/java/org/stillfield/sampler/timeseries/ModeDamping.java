package org.stillfield.sampler.timeseries;

import java.util.Objects;
import org.stillfield.sampler.api.ModeTable;

/**
 * Quality factor Q_l and energy decay rate κ_l = ω_l/Q_l (rad/s) of every mode of a table. The
 * amplitude of a free lossy mode decays as e^{−κt/2} and its line has full width at half maximum
 * κ (rad/s), f/Q in Hz (REFERENCE-VALUES.md §3). A lossless mode has Q = ∞ and κ = 0.
 *
 * <p>The damped-mode model of {@link ModeEvolution} treats both quadratures alike (input–output
 * theory in the rotating-wave approximation, Gardiner &amp; Collett, Phys. Rev. A 31, 3761
 * (1985), source from memory); it describes a cavity resonance when Q ≫ 1.
 * Immutable; arrays are copied out.
 */
public final class ModeDamping {
    private final double[] q;
    private final double[] kappa;
    private final String description;

    private ModeDamping(double[] q, double[] kappa, String description) {
        this.q = q;
        this.kappa = kappa;
        this.description = description;
    }

    /**
     * @param table the modes
     * @param model their losses
     * @return Q and κ per mode
     * @throws IllegalArgumentException if the model yields a Q that is not positive (or NaN)
     */
    public static ModeDamping of(ModeTable table, LossModel model) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(model, "model");
        return of(table, model.qualityFactors(table), model.describe());
    }

    /**
     * Per-mode quality factors given directly (measured, or from a model outside this package).
     *
     * @param table the modes
     * @param q Q_l in table order, each positive; {@link Double#POSITIVE_INFINITY} for a lossless mode
     * @param description what the values are, for footers
     * @return Q and κ per mode
     */
    public static ModeDamping of(ModeTable table, double[] q, String description) {
        Objects.requireNonNull(table, "table");
        q = q.clone();
        if (q.length != table.size()) {
            throw new IllegalArgumentException("quality factors: got " + q.length + " values for "
                + table.size() + " modes");
        }
        double[] kappa = new double[q.length];
        for (int l = 0; l < q.length; l++) {
            if (!(q[l] > 0)) {
                throw new IllegalArgumentException("quality factor of mode " + table.modes().get(l).label()
                    + " must be positive: " + q[l]);
            }
            kappa[l] = Double.isInfinite(q[l]) ? 0.0 : table.omega(l) / q[l];
        }
        return new ModeDamping(q, kappa, Objects.requireNonNull(description, "description"));
    }

    /** @return number of modes */
    public int size() {
        return q.length;
    }

    /** @return Q of mode l (∞ when lossless) */
    public double qualityFactor(int l) {
        return q[l];
    }

    /** @return κ_l = ω_l/Q_l, energy decay rate and FWHM of the line, rad/s (0 when lossless) */
    public double kappa(int l) {
        return kappa[l];
    }

    /** @return FWHM of mode l's line, κ_l/2π, Hz */
    public double linewidthHz(int l) {
        return kappa[l] / (2 * Math.PI);
    }

    /** @return true if mode l loses energy */
    public boolean lossy(int l) {
        return kappa[l] > 0;
    }

    /** @return number of lossy modes */
    public int lossyCount() {
        int n = 0;
        for (double k : kappa) {
            n += k > 0 ? 1 : 0;
        }
        return n;
    }

    /** @return smallest Q of any mode (∞ if all are lossless) */
    public double minQualityFactor() {
        double m = Double.POSITIVE_INFINITY;
        for (double v : q) {
            m = Math.min(m, v);
        }
        return m;
    }

    /** @return copy of all Q_l */
    public double[] qualityFactors() {
        return q.clone();
    }

    /** @return copy of all κ_l, rad/s */
    public double[] kappas() {
        return kappa.clone();
    }

    /** @return the loss model's description */
    public String description() {
        return description;
    }
}
