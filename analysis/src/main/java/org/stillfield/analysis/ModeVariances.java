package org.stillfield.analysis;

import java.util.Locale;
import java.util.Objects;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;

/**
 * Per-mode sums of squared amplitudes, Σ_s q_l² and Σ_s e_l², over the whole ensemble and over G
 * fixed groups of samples (sample index mod G), for variance estimates σ̂_l² = (1/N) Σ_s q_l² (known
 * zero mean) and delete-one-group jackknife errors. Groups are fixed by the global sample index, so
 * parts of an ensemble merge exactly whatever the split. Memory 2M(G + 1) doubles.
 *
 * <p>The A and B kernels use q_l (b_l = k_l q_l has the same relative variance estimate), the E
 * kernel uses e_l.
 */
public final class ModeVariances implements EnsembleSink {
    private final int modes;
    private final int groups;
    private final double[] sumQ;
    private final double[] sumE;
    /** [g·M + l]. */
    private final double[] groupQ;
    private final double[] groupE;
    private final long[] groupCount;
    private long samples;

    private ModeVariances(int modes, int groups) {
        this.modes = modes;
        this.groups = groups;
        sumQ = new double[modes];
        sumE = new double[modes];
        groupQ = new double[modes * groups];
        groupE = new double[modes * groups];
        groupCount = new long[groups];
    }

    /**
     * @param table the run's modes (for M)
     * @param groups G for the jackknife, 2..1000; M·G must stay below 2^27
     * @return an empty accumulator
     */
    public static ModeVariances of(ModeTable table, int groups) {
        Objects.requireNonNull(table, "table");
        if (groups < 2 || groups > 1000) {
            throw new IllegalArgumentException("groups must lie in 2..1000: " + groups);
        }
        if ((long) table.size() * groups > (1L << 27)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                "modes x groups must stay below 2^27 for the per-group sums: %d x %d", table.size(), groups));
        }
        return new ModeVariances(table.size(), groups);
    }

    @Override
    public void accept(SampleBatch batch) {
        Objects.requireNonNull(batch, "batch");
        for (int s = 0; s < batch.size(); s++) {
            double[] q = batch.q(s);
            double[] e = batch.e(s);
            if (q.length < modes || e.length < modes) {
                throw new IllegalArgumentException("batch amplitudes must hold " + modes + " modes: " + q.length);
            }
            int g = (int) Math.floorMod(batch.firstSample() + s, (long) groups);
            int off = g * modes;
            for (int l = 0; l < modes; l++) {
                double q2 = q[l] * q[l];
                double e2 = e[l] * e[l];
                groupQ[off + l] += q2;
                groupE[off + l] += e2;
            }
            groupCount[g]++;
        }
        samples += batch.size();
        // Totals as sums of the group sums: the same numbers whatever the batch split.
        java.util.Arrays.fill(sumQ, 0);
        java.util.Arrays.fill(sumE, 0);
        for (int g = 0; g < groups; g++) {
            int off = g * modes;
            for (int l = 0; l < modes; l++) {
                sumQ[l] += groupQ[off + l];
                sumE[l] += groupE[off + l];
            }
        }
    }

    /**
     * Adds another part of the same ensemble.
     *
     * @param other an accumulator of the same modes and groups
     */
    public void merge(ModeVariances other) {
        Objects.requireNonNull(other, "other");
        if (other.modes != modes || other.groups != groups) {
            throw new IllegalArgumentException("other must have " + modes + " modes and " + groups + " groups");
        }
        for (int k = 0; k < groupQ.length; k++) {
            groupQ[k] += other.groupQ[k];
            groupE[k] += other.groupE[k];
        }
        for (int g = 0; g < groups; g++) {
            groupCount[g] += other.groupCount[g];
        }
        samples += other.samples;
        java.util.Arrays.fill(sumQ, 0);
        java.util.Arrays.fill(sumE, 0);
        for (int g = 0; g < groups; g++) {
            for (int l = 0; l < modes; l++) {
                sumQ[l] += groupQ[g * modes + l];
                sumE[l] += groupE[g * modes + l];
            }
        }
    }

    /** @return samples accumulated */
    public long samples() {
        return samples;
    }

    /** @return number of jackknife groups */
    public int groups() {
        return groups;
    }

    /** @return samples in group g */
    public long groupSamples(int g) {
        return groupCount[g];
    }

    /** @return number of modes */
    public int modes() {
        return modes;
    }

    /**
     * @param field A or B (q amplitudes) or E (e amplitudes)
     * @return a copy of Σ_s a_l² per mode
     */
    public double[] sumSquares(Field field) {
        return (field == Field.E ? sumE : sumQ).clone();
    }

    /**
     * @param field A or B (q) or E (e)
     * @param g group index
     * @return a copy of the group's Σ a_l² per mode
     */
    public double[] groupSumSquares(Field field, int g) {
        if (g < 0 || g >= groups) {
            throw new IllegalArgumentException("g must lie in 0.." + (groups - 1) + ": " + g);
        }
        double[] src = field == Field.E ? groupE : groupQ;
        return java.util.Arrays.copyOfRange(src, g * modes, (g + 1) * modes);
    }

    /**
     * Relative variance estimates σ̂_l²/σ_l² of the amplitude the field uses, from all samples
     * except group {@code leaveOut} (−1 for none).
     *
     * @param table the modes and variances the ensemble was drawn with
     * @param field A, B (q) or E (e)
     * @param leaveOut a group to leave out, or −1
     * @return per mode σ̂²/σ², and the number of samples used in element [M]
     */
    double[] ratios(ModeTable table, Field field, int leaveOut) {
        double[] sum = sumSquares(field);
        long n = samples;
        if (leaveOut >= 0) {
            double[] gs = groupSumSquares(field, leaveOut);
            for (int l = 0; l < modes; l++) {
                sum[l] -= gs[l];
            }
            n -= groupCount[leaveOut];
        }
        Field amplitude = field == Field.E ? Field.E : Field.A;
        double[] out = new double[modes + 1];
        for (int l = 0; l < modes; l++) {
            out[l] = sum[l] / n / table.variance(amplitude, l);
        }
        out[modes] = n;
        return out;
    }
}
