package org.stillfield.sampler.timeseries;

/**
 * A probe reduced to one linear functional of the mode amplitudes: its signal is
 * <pre>
 *   s = Σ_l (a_l e_l + b_l q_l),
 * </pre>
 * a_l in (signal unit)/(V/m), b_l in (signal unit)/(V·s/m). Every probe here is linear in the
 * fields, and the fields are linear in (q, e) (PHYSICS.md §2), so this is exact; a time series then
 * costs 2M multiplications per step and channel. Immutable; arrays are copied in and out.
 */
public final class ProbeCoefficients {
    private final String name;
    private final String unit;
    private final double[] onE;
    private final double[] onQ;
    private final boolean usesE;
    private final boolean usesQ;

    /**
     * @param name channel name
     * @param unit SI unit of the signal
     * @param onE a_l, coupling to e_l
     * @param onQ b_l, coupling to q_l (same length)
     */
    public ProbeCoefficients(String name, String unit, double[] onE, double[] onQ) {
        if (onE.length != onQ.length) {
            throw new IllegalArgumentException("coefficient arrays must have equal length: " + onE.length + " vs "
                + onQ.length);
        }
        this.name = name;
        this.unit = unit;
        this.onE = onE.clone();
        this.onQ = onQ.clone();
        boolean anyE = false;
        boolean anyQ = false;
        for (int l = 0; l < onE.length; l++) {
            if (!Double.isFinite(onE[l]) || !Double.isFinite(onQ[l])) {
                throw new IllegalArgumentException("probe " + name + " has a non-finite coefficient for mode " + l);
            }
            anyE |= onE[l] != 0;
            anyQ |= onQ[l] != 0;
        }
        usesE = anyE;
        usesQ = anyQ;
    }

    /** @return channel name */
    public String name() {
        return name;
    }

    /** @return SI unit of the signal */
    public String unit() {
        return unit;
    }

    /** @return number of modes M */
    public int modeCount() {
        return onE.length;
    }

    /** @return a_l */
    public double onE(int l) {
        return onE[l];
    }

    /** @return b_l */
    public double onQ(int l) {
        return onQ[l];
    }

    /** @return copy of all a_l */
    public double[] onE() {
        return onE.clone();
    }

    /** @return copy of all b_l */
    public double[] onQ() {
        return onQ.clone();
    }

    /**
     * @param q q_l
     * @param e e_l
     * @return s = Σ a_l e_l + b_l q_l, summed in mode order
     */
    public double signal(double[] q, double[] e) {
        double s = 0;
        if (usesE) {
            for (int l = 0; l < onE.length; l++) {
                s += onE[l] * e[l];
            }
        }
        if (usesQ) {
            for (int l = 0; l < onQ.length; l++) {
                s += onQ[l] * q[l];
            }
        }
        return s;
    }
}
