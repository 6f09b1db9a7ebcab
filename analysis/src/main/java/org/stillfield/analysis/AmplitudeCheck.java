package org.stillfield.analysis;

import java.util.Arrays;
import java.util.Locale;
import java.util.Objects;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.stillfield.analysis.api.AmplitudeCheckResult;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;

/**
 * Checks that the sampled mode amplitudes are N(0, σ²) with the table's σ: pools the standardised
 * values q_l/σ_q,l and e_l/σ_e,l (σ² = {@link ModeTable#variance(Field, int)} for A and E) into one
 * fully specified ("case 0") Kolmogorov–Smirnov test against N(0,1) (REFERENCE-VALUES.md §8: the
 * theory fixes every σ, so no parameter is estimated).
 *
 * <p><b>Which values are kept.</b> Pooling every amplitude of a large run would need memory ∝ N·M,
 * so a bounded deterministic subset is kept. Every amplitude has a global index
 * g = 2M·sample + 2l + (0 for q, 1 for e); it is kept when the lowest {@code level} bits of the
 * SplitMix64 finaliser of g are zero. The level starts at 0 (keep everything) and rises by one
 * whenever the buffer would exceed {@code maxValues}, dropping the kept values that fail the new
 * test. The subset depends only on the indices, never on the values, so the kept amplitudes are
 * still independent N(0,1) draws for a correct sampler; it spreads evenly over samples, modes, q and
 * e whatever N is, and holds between about maxValues/2 and maxValues values once the run is large.
 *
 * <p>p-value: Commons Math {@link KolmogorovSmirnovTest} with exact = false, i.e. the Marsaglia–Tsang–Wang
 * matrix method in double precision for n ≤ 140 and the Pelz–Good asymptotic series above.
 */
public final class AmplitudeCheck implements EnsembleSink {
    /** Default bound on the number of pooled values. */
    public static final int DEFAULT_MAX_VALUES = 20_000;

    private final int modes;
    private final int maxValues;
    private final double[] invSigmaQ;
    private final double[] invSigmaE;
    private double[] values;
    private long[] hashes;
    private int size;
    private int level;
    private long seen;

    /** @param table the modes and variances the ensemble was drawn with */
    public AmplitudeCheck(ModeTable table) {
        this(table, DEFAULT_MAX_VALUES);
    }

    /**
     * @param table the modes and variances the ensemble was drawn with
     * @param maxValues bound on the pooled values, ≥ 2
     */
    public AmplitudeCheck(ModeTable table, int maxValues) {
        Objects.requireNonNull(table, "table");
        if (maxValues < 2) {
            throw new IllegalArgumentException("maxValues must be >= 2: " + maxValues);
        }
        this.modes = table.size();
        this.maxValues = maxValues;
        invSigmaQ = new double[modes];
        invSigmaE = new double[modes];
        for (int l = 0; l < modes; l++) {
            double vq = table.variance(Field.A, l);
            double ve = table.variance(Field.E, l);
            if (!(vq > 0) || !(ve > 0)) {
                throw new IllegalArgumentException("mode " + table.modes().get(l).label()
                    + " must have positive amplitude variances: " + vq + ", " + ve);
            }
            invSigmaQ[l] = 1.0 / Math.sqrt(vq);
            invSigmaE[l] = 1.0 / Math.sqrt(ve);
        }
        values = new double[Math.min(maxValues, 1024)];
        hashes = new long[values.length];
    }

    @Override
    public void accept(SampleBatch batch) {
        Objects.requireNonNull(batch, "batch");
        for (int s = 0; s < batch.size(); s++) {
            double[] q = batch.q(s);
            double[] e = batch.e(s);
            if (q.length < modes || e.length < modes) {
                throw new IllegalArgumentException(String.format(
                    "batch amplitudes must hold %d modes: q %d, e %d in sample %d", modes, q.length, e.length,
                    batch.firstSample() + s));
            }
            long base = 2L * modes * (batch.firstSample() + s);
            for (int l = 0; l < modes; l++) {
                offer(base + 2L * l, q[l] * invSigmaQ[l]);
                offer(base + 2L * l + 1, e[l] * invSigmaE[l]);
            }
            seen += 2L * modes;
        }
    }

    private void offer(long index, double v) {
        long h = mix64(index);
        if (!keep(h, level)) {
            return;
        }
        while (size == maxValues) {
            level++;
            int n = 0;
            for (int k = 0; k < size; k++) {
                if (keep(hashes[k], level)) {
                    values[n] = values[k];
                    hashes[n] = hashes[k];
                    n++;
                }
            }
            size = n;
            if (!keep(h, level)) {
                return;
            }
        }
        if (size == values.length) {
            int grown = (int) Math.min(maxValues, 2L * values.length);
            values = Arrays.copyOf(values, grown);
            hashes = Arrays.copyOf(hashes, grown);
        }
        values[size] = v;
        hashes[size] = h;
        size++;
    }

    private static boolean keep(long hash, int level) {
        return level == 0 || (hash & ((1L << level) - 1)) == 0;
    }

    /** Stafford's variant 13 finaliser (the output function of SplitMix64): a fixed, well-mixed hash. */
    static long mix64(long z) {
        z = (z ^ (z >>> 30)) * 0xbf58476d1ce4e5b9L;
        z = (z ^ (z >>> 27)) * 0x94d049bb133111ebL;
        return z ^ (z >>> 31);
    }

    /** @return number of values currently pooled */
    public int size() {
        return size;
    }

    /** @return number of amplitudes offered so far (2M per sample) */
    public long offered() {
        return seen;
    }

    /** @return a copy of the pooled standardised values, in arrival order */
    public double[] values() {
        return Arrays.copyOf(values, size);
    }

    /**
     * @param falseAlarm nominal false-alarm rate α, in (0, 1)
     * @return the KS statistic, p-value and verdict
     */
    public AmplitudeCheckResult result(double falseAlarm) {
        if (!(falseAlarm > 0 && falseAlarm < 1)) {
            throw new IllegalArgumentException("falseAlarm must lie in (0, 1): " + falseAlarm);
        }
        if (size == 0) {
            throw new IllegalStateException("no amplitudes accumulated");
        }
        double[] data = values();
        // No generators: the normal law is only evaluated, and the one-sample test never draws.
        NormalDistribution normal = new NormalDistribution(null, 0.0, 1.0);
        KolmogorovSmirnovTest ks = ksTest();
        double d = ks.kolmogorovSmirnovStatistic(normal, data);
        double p = 1.0 - ks.cdf(d, data.length, false);
        double critical = criticalD(ks, data.length, falseAlarm);
        boolean passed = p >= falseAlarm;
        String method = String.format(Locale.ROOT,
            "Kolmogorov-Smirnov (case 0) of %d standardised amplitudes q/sigma_q, e/sigma_e against N(0,1):"
                + " D = %.5f, p = %.4g, pass when p >= alpha = %.3g (D <= %.5f)", data.length, d, p, falseAlarm,
            critical);
        return new AmplitudeCheckResult(data.length, d, p, new Verdict(passed, falseAlarm, 1, critical, d, method));
    }

    /**
     * @param falseAlarm nominal false-alarm rate α, in (0, 1)
     * @return the verdict of {@link #result(double)}
     */
    public Verdict verdict(double falseAlarm) {
        return result(falseAlarm).verdict();
    }

    /**
     * A KS test object without a generator. The one-sample statistic and distribution never draw;
     * the default constructor would seed a generator from the clock, so pass none. That constructor
     * is deprecated in Commons Math 3.6.1 only in view of 4.0's API.
     */
    @SuppressWarnings("deprecation")
    static KolmogorovSmirnovTest ksTest() {
        return new KolmogorovSmirnovTest(null);
    }

    /** D* with P(D_n &gt; D*) = α, by bisection on the same distribution function as the p-value. */
    static double criticalD(KolmogorovSmirnovTest ks, int n, double alpha) {
        double lo = 0;
        double hi = 1;
        for (int it = 0; it < 100 && hi - lo > 1e-15; it++) {
            double mid = 0.5 * (lo + hi);
            if (1.0 - ks.cdf(mid, n, false) > alpha) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return hi;
    }
}
