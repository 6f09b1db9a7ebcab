package org.stillfield.sampler.engine;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;

/**
 * Draws one field configuration from the vacuum (or thermal) Gaussian: for each mode l in table
 * order, q_l ~ N(0, Wσ_A²) and then e_l ~ N(0, Wσ_E²), independently (a draw from the Wigner
 * function, PHYSICS.md §2). B uses b_l = k_l q_l, so B = ∇×A holds sample by sample.
 *
 * <p>Provider calls: two {@link ZigguratSampler.NormalizedGaussian} draws per mode, q first, in
 * mode order (McFarland, "A modified ziggurat algorithm for generating exponentially and normally
 * distributed pseudorandom numbers", J. Stat. Comput. Simul. 86, 2016). Changing this order
 * changes every dataset.
 */
public final class AmplitudeSampler {
    private final double[] sigmaQ;
    private final double[] sigmaE;

    /** @param table modes with their variances */
    public AmplitudeSampler(ModeTable table) {
        int m = table.size();
        sigmaQ = new double[m];
        sigmaE = new double[m];
        for (int l = 0; l < m; l++) {
            sigmaQ[l] = Math.sqrt(table.variance(Field.A, l));
            sigmaE[l] = Math.sqrt(table.variance(Field.E, l));
        }
    }

    /** @return number of modes */
    public int modeCount() {
        return sigmaQ.length;
    }

    /**
     * @param rng the sample's own stream
     * @param q output q_l, length ≥ M
     * @param e output e_l, length ≥ M
     */
    public void draw(UniformRandomProvider rng, double[] q, double[] e) {
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        for (int l = 0; l < sigmaQ.length; l++) {
            q[l] = sigmaQ[l] * g.sample();
            e[l] = sigmaE[l] * g.sample();
        }
    }
}
