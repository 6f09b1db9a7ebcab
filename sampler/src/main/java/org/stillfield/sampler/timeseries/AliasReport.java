package org.stillfield.sampler.timeseries;

import java.util.List;
import java.util.Locale;

/**
 * Which modes of a run lie at or above the Nyquist frequency of its time grid
 * ({@link TimeGrid#aliasing}).
 *
 * @param dtSeconds the grid's step, s
 * @param nyquistHz Nyquist frequency 1/(2 dt), Hz
 * @param modeCount number of modes in the table
 * @param modes indices (table order) of the aliased modes
 * @param labels their labels
 * @param frequenciesHz their resonance frequencies, Hz
 * @param highestHz highest resonance frequency in the table, Hz
 */
public record AliasReport(double dtSeconds, double nyquistHz, int modeCount, List<Integer> modes,
                          List<String> labels, List<Double> frequenciesHz, double highestHz) {
    /** Copies the lists. */
    public AliasReport {
        modes = List.copyOf(modes);
        labels = List.copyOf(labels);
        frequenciesHz = List.copyOf(frequenciesHz);
    }

    /** @return number of aliased modes */
    public int count() {
        return modes.size();
    }

    /** @return true if no mode aliases */
    public boolean clean() {
        return modes.isEmpty();
    }

    /** @return largest dt that puts every mode below the Nyquist frequency, 1/(2 f_max), s */
    public double largestCleanDt() {
        return 0.5 / highestHz;
    }

    /**
     * @return a one-line warning naming the setting, the Nyquist frequency, the first aliased modes
     *     and the step that would avoid aliasing; empty when nothing aliases
     */
    public String message() {
        if (clean()) {
            return "";
        }
        StringBuilder sb = new StringBuilder();
        int shown = Math.min(3, modes.size());
        for (int i = 0; i < shown; i++) {
            if (i > 0) {
                sb.append(", ");
            }
            sb.append(String.format(Locale.ROOT, "%s at %.6g Hz", labels.get(i), frequenciesHz.get(i)));
        }
        if (modes.size() > shown) {
            sb.append(", ...");
        }
        return String.format(Locale.ROOT,
            "timeseries.dt_s = %.6g s puts the Nyquist frequency at %.6g Hz; %d of %d modes lie at or above it (%s;"
                + " highest %.6g Hz) and appear at folded frequencies in spectra; use timeseries.dt_s < %.6g s or lower"
                + " window.cutoff", dtSeconds, nyquistHz, modes.size(), modeCount, sb, highestHz, largestCleanDt());
    }
}
