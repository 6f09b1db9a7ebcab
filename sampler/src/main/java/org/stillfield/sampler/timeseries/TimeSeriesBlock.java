package org.stillfield.sampler.timeseries;

/**
 * Consecutive steps of one sample's trajectory: the probe signals at every step and, when the
 * run asks for them, the mode amplitudes.
 *
 * <p>Arrays are shared, not copied: sinks must not modify them or keep references after
 * {@code accept} returns.
 */
public final class TimeSeriesBlock {
    private final long sample;
    private final int firstStep;
    private final int steps;
    private final int totalSteps;
    private final double dt;
    private final int channels;
    private final double[] values;
    private final int modes;
    private final double[] q;
    private final double[] e;

    /**
     * @param sample global sample index
     * @param firstStep index of the block's first step in the trajectory
     * @param steps number of steps in the block
     * @param totalSteps steps in the whole trajectory
     * @param dt step, s
     * @param channels number of probe channels
     * @param values values[s·channels + c] for relative step s
     * @param modes number of modes M (0 when amplitudes are absent)
     * @param q q[s·M + l], or null
     * @param e e[s·M + l], or null
     */
    public TimeSeriesBlock(long sample, int firstStep, int steps, int totalSteps, double dt, int channels,
                           double[] values, int modes, double[] q, double[] e) {
        this.sample = sample;
        this.firstStep = firstStep;
        this.steps = steps;
        this.totalSteps = totalSteps;
        this.dt = dt;
        this.channels = channels;
        this.values = values;
        this.modes = modes;
        this.q = q;
        this.e = e;
    }

    /** @return global sample index */
    public long sample() {
        return sample;
    }

    /** @return index of the first step of the block within the trajectory */
    public int firstStep() {
        return firstStep;
    }

    /** @return number of steps in the block */
    public int steps() {
        return steps;
    }

    /** @return true if the block ends the sample's trajectory */
    public boolean last() {
        return firstStep + steps == totalSteps;
    }

    /** @return number of probe channels */
    public int channels() {
        return channels;
    }

    /** @return t of relative step s, (firstStep + s)·dt, seconds */
    public double time(int s) {
        return (firstStep + s) * dt;
    }

    /** @return signal of channel c at relative step s */
    public double value(int s, int c) {
        return values[s * channels + c];
    }

    /**
     * Copies one channel's values into dest.
     *
     * @param c channel
     * @param dest destination
     * @param offset where the block's first step goes
     */
    public void copyChannel(int c, double[] dest, int offset) {
        for (int s = 0; s < steps; s++) {
            dest[offset + s] = values[s * channels + c];
        }
    }

    /** @return true if mode amplitudes are included */
    public boolean hasAmplitudes() {
        return q != null;
    }

    /** @return number of modes in the amplitude arrays (0 without amplitudes) */
    public int modeCount() {
        return modes;
    }

    /** @return q_l at relative step s, V·s/m */
    public double q(int s, int l) {
        requireAmplitudes();
        return q[s * modes + l];
    }

    /** @return e_l at relative step s, V/m */
    public double e(int s, int l) {
        requireAmplitudes();
        return e[s * modes + l];
    }

    /**
     * Copies the amplitudes of relative step s.
     *
     * @param s relative step
     * @param qOut receives q_l, length ≥ M
     * @param eOut receives e_l, length ≥ M
     */
    public void copyAmplitudes(int s, double[] qOut, double[] eOut) {
        requireAmplitudes();
        System.arraycopy(q, s * modes, qOut, 0, modes);
        System.arraycopy(e, s * modes, eOut, 0, modes);
    }

    private void requireAmplitudes() {
        if (q == null) {
            throw new IllegalStateException("amplitudes were not requested for this run (Plan.withAmplitudes)");
        }
    }
}
