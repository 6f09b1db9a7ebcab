package org.stillfield.sampler.api;

import java.util.List;
import java.util.Objects;

/**
 * The modes of one run with everything the sampler and the analysis need per mode: ω, the window
 * weight W, the thermal factor, and the per-field amplitude variances of PHYSICS.md §2,
 *
 * <pre>
 *   σ_A² = ħ/(2εVω),  σ_E² = ħω/(2εV),  σ_B² = ħω/(2εVc_m²) = μħω/(2V),
 * </pre>
 *
 * with ε = ε0ε_r, μ = μ0μ_r, c_m = c/√(ε_rμ_r). The variance a draw uses is
 * W·coth(ħω/2k_BT)·σ_vacuum². Immutable; arrays are copied out.
 */
public final class ModeTable {
    private final Cavity cavity;
    private final Window window;
    private final ThermalState state;
    private final List<Mode> modes;
    private final double[] omega;
    private final double[] weight;
    private final double[] thermal;

    private ModeTable(Cavity cavity, Window window, ThermalState state, List<Mode> modes) {
        this.cavity = cavity;
        this.window = window;
        this.state = state;
        this.modes = List.copyOf(modes);
        int m = modes.size();
        omega = new double[m];
        weight = new double[m];
        thermal = new double[m];
        double c = cavity.medium().waveSpeed();
        for (int l = 0; l < m; l++) {
            omega[l] = c * modes.get(l).k();
            weight[l] = window.weight(omega[l]);
            thermal[l] = state.varianceFactor(omega[l]);
        }
    }

    /**
     * Enumerates the cavity's modes up to the window's truncation frequency, after checking with
     * Weyl's law that there are not more than {@code maxModes}.
     *
     * @param cavity the cavity
     * @param window spectral window
     * @param state vacuum or thermal state
     * @param maxModes largest number of modes allowed, ≥ 1
     * @return the table
     * @throws IllegalArgumentException if the estimate exceeds maxModes or the cutoff lies below
     *     the lowest mode; the message names the setting to change
     */
    public static ModeTable of(Cavity cavity, Window window, ThermalState state, long maxModes) {
        Objects.requireNonNull(cavity, "cavity");
        Objects.requireNonNull(window, "window");
        Objects.requireNonNull(state, "state");
        double kMax = window.truncationOmega() / cavity.medium().waveSpeed();
        double lowest = cavity.lowestK();
        if (kMax < lowest) {
            double fLowest = lowest * cavity.medium().waveSpeed() / (2 * Math.PI);
            double fTrunc = window.truncationOmega() / (2 * Math.PI);
            throw new IllegalArgumentException(String.format(
                "window.cutoff keeps no mode: modes are enumerated up to %.6g Hz but the lowest mode is at %.6g Hz;"
                    + " raise the cutoff above the lowest mode", fTrunc, fLowest));
        }
        double estimate = cavity.weylCount(kMax);
        if (estimate > maxModes) {
            throw new IllegalArgumentException(String.format(
                "window.cutoff would enumerate about %.3g modes (Weyl estimate), more than limits.max_modes = %d;"
                    + " lower the cutoff or raise limits.max_modes", estimate, maxModes));
        }
        return new ModeTable(cavity, window, state, cavity.modesUpTo(kMax));
    }

    /** @return the cavity */
    public Cavity cavity() {
        return cavity;
    }

    /** @return the window */
    public Window window() {
        return window;
    }

    /** @return the state */
    public ThermalState state() {
        return state;
    }

    /** @return the modes, sorted by k */
    public List<Mode> modes() {
        return modes;
    }

    /** @return number of modes M */
    public int size() {
        return modes.size();
    }

    /** @return ω of mode l, rad/s */
    public double omega(int l) {
        return omega[l];
    }

    /** @return resonance frequency of mode l, Hz */
    public double frequency(int l) {
        return omega[l] / (2 * Math.PI);
    }

    /** @return window weight W of mode l */
    public double weight(int l) {
        return weight[l];
    }

    /** @return thermal variance factor coth(ħω/2k_BT) of mode l */
    public double thermalFactor(int l) {
        return thermal[l];
    }

    /** @return vacuum variance of mode l's amplitude for the field, without window (PHYSICS.md §2) */
    public double vacuumVariance(Field field, int l) {
        double eps = cavity.medium().permittivity();
        double v = cavity.volume();
        double w = omega[l];
        switch (field) {
            case A: return PhysicalConstants.HBAR / (2 * eps * v * w);
            case E: return PhysicalConstants.HBAR * w / (2 * eps * v);
            default: return cavity.medium().permeability() * PhysicalConstants.HBAR * w / (2 * v);
        }
    }

    /** @return variance actually drawn for mode l: W · thermal factor · vacuum variance */
    public double variance(Field field, int l) {
        return weight[l] * thermal[l] * vacuumVariance(field, l);
    }

    /** @return a copy of ω for all modes */
    public double[] omegas() {
        return omega.clone();
    }
}
