package org.stillfield.analysis.spectra;

import java.io.IOException;
import java.util.List;
import java.util.Objects;
import org.stillfield.sampler.timeseries.SeriesAssembler;
import org.stillfield.sampler.timeseries.TimeSeriesBlock;
import org.stillfield.sampler.timeseries.TimeSeriesSink;

/**
 * A {@link TimeSeriesSink} that accumulates, over the ensemble, the Welch PSD of every channel, the
 * cross spectrum of every pair i &lt; j and the two-time correlation ⟨x_i(t+τ) x_j(t)⟩ of every
 * ordered pair. Whole trajectories are gathered per sample ({@link SeriesAssembler}), so memory is
 * the runner's group size × steps × channels. Correlations with all origins cost
 * O(steps × lags) per pair and sample.
 */
public final class ProbeSpectra implements TimeSeriesSink {
    private final List<String> channels;
    private final WelchPsd[] psd;
    private final WelchCsd[][] csd;
    private final TwoTimeCorrelation[][] corr;
    private final SeriesAssembler assembler;

    private ProbeSpectra(List<String> channels, int steps, double dt, int segment, Detrend detrend, int maxLag,
                         TwoTimeCorrelation.Origins origins) {
        this.channels = List.copyOf(channels);
        int p = channels.size();
        if (p == 0) {
            throw new IllegalArgumentException("spectra need at least one probe channel");
        }
        if (segment > steps) {
            throw new IllegalArgumentException("spectra segment " + segment + " exceeds steps = " + steps);
        }
        psd = new WelchPsd[p];
        csd = new WelchCsd[p][p];
        corr = new TwoTimeCorrelation[p][p];
        for (int i = 0; i < p; i++) {
            psd[i] = WelchPsd.of(segment, dt, detrend);
            for (int j = 0; j < p; j++) {
                if (i < j) {
                    csd[i][j] = WelchCsd.of(segment, dt, detrend);
                }
                corr[i][j] = TwoTimeCorrelation.of(maxLag, dt, origins);
            }
        }
        int[] all = new int[p];
        for (int i = 0; i < p; i++) {
            all[i] = i;
        }
        assembler = new SeriesAssembler(all, steps, (sample, s) -> {
            for (int i = 0; i < p; i++) {
                psd[i].add(s[i]);
                for (int j = 0; j < p; j++) {
                    if (i < j) {
                        csd[i][j].add(s[i], s[j]);
                    }
                    corr[i][j].add(s[i], s[j]);
                }
            }
        });
    }

    /**
     * @param channels channel names in runner order
     * @param steps steps per trajectory
     * @param dtSeconds step, s
     * @param segment Welch segment length, power of two ≤ steps
     * @param detrend segment detrending
     * @param maxLag largest correlation lag, steps (&lt; steps)
     * @param origins correlation origins
     * @return an empty accumulator
     */
    public static ProbeSpectra of(List<String> channels, int steps, double dtSeconds, int segment, Detrend detrend,
                                  int maxLag, TwoTimeCorrelation.Origins origins) {
        Objects.requireNonNull(channels, "channels");
        if (maxLag >= steps) {
            throw new IllegalArgumentException("correlation lag " + maxLag + " must be below steps = " + steps);
        }
        return new ProbeSpectra(channels, steps, dtSeconds, segment, detrend, maxLag, origins);
    }

    @Override
    public void accept(TimeSeriesBlock block) throws IOException {
        assembler.accept(block);
    }

    @Override
    public void finish() throws IOException {
        assembler.finish();
    }

    /** @return channel names */
    public List<String> channels() {
        return channels;
    }

    /** @return PSD estimate of channel i */
    public PsdEstimate psd(int i) {
        return psd[i].estimate();
    }

    /** @return cross spectrum of channels i &lt; j */
    public CsdEstimate csd(int i, int j) {
        if (!(i < j)) {
            throw new IllegalArgumentException("cross spectra are kept for i < j, got " + i + ", " + j);
        }
        return csd[i][j].estimate();
    }

    /** @return the correlation accumulator of ⟨x_i(t+τ) x_j(t)⟩ */
    public TwoTimeCorrelation correlation(int i, int j) {
        return corr[i][j];
    }
}
