package org.stillfield.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.stillfield.analysis.api.GaussianityResult;
import org.stillfield.analysis.api.NormalityTest;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;

/**
 * Gaussianity and independence of an ensemble, as one family of tests with a combined verdict.
 *
 * <p><b>Data kept.</b> For m modes spread evenly over the table, the standardised amplitudes q_l/σ_q
 * and e_l/σ_e of the first {@code maxSamples} samples (2m variables), and the field values at a few
 * points for Mardia's test; memory is bounded by maxSamples whatever N. Over all samples, the sum of
 * squares of the standardised amplitudes of the other modes (a pooled scale test).
 *
 * <p><b>The verdict family</b> (each p-value exact or asymptotic as stated):
 * <ul>
 *   <li>Anderson–Darling case 0 per variable against N(0, 1) ({@link AndersonDarling});</li>
 *   <li>the largest inter-variable correlation: with known zero mean, r = Σxy/√(Σx²Σy²) of two
 *       independent normal samples gives t = r√((n−1)/(1−r²)) ~ t_{n−1} exactly (regression
 *       through the origin, standard); the smallest pairwise p times the number of pairs
 *       (Bonferroni);</li>
 *   <li>Mardia's skewness and kurtosis of the point values ({@link Mardia}, Biometrika 1970);</li>
 *   <li>pooled scale: S = Σ (a/σ)² over the unchosen modes is χ²_ν, ν = values; z = (S − ν)/√(2ν),
 *       two-sided normal. It is the most powerful of these against a variance error.</li>
 * </ul>
 * The combined verdict applies Holm's step-down procedure (Holm, Scand. J. Stat. 6, 65 (1979),
 * source from memory) at α: it passes when no test is rejected, i.e. when the smallest p-value is at
 * least α/K, so the family-wise false-alarm rate is at most α under any dependence. The family is
 * built from (nearly) independent statistics — distinct modes, the pooled sum excluding the chosen
 * modes — so the rate is close to α rather than far below it; the calibration test measures it.
 *
 * <p>Kolmogorov–Smirnov case 0 per variable is also computed and reported with its p-value, but it
 * is not part of the family: it tests the same data as Anderson–Darling (which weighs the tails
 * more and is the more powerful of the two), and counting both would make the Holm/Bonferroni
 * verdict conservative.
 */
public final class GaussianityCheck implements EnsembleSink {
    private final ModeTable table;
    private final Field pointField;
    private final int[] modes;
    private final int[] points;
    private final List<Vec3> pointLocations;
    private final int maxSamples;
    private final double[] invSigmaQ;
    private final double[] invSigmaE;
    private final boolean[] chosen;
    private long[] index;
    private double[][] amp;
    private double[][] pts;
    private int stored;
    private long samples;
    private double pooledSum;
    private long pooledCount;

    private GaussianityCheck(ModeTable table, Field pointField, int[] modes, int[] points, List<Vec3> pointLocations,
                             int maxSamples) {
        this.table = table;
        this.pointField = pointField;
        this.modes = modes;
        this.points = points;
        this.pointLocations = pointLocations;
        this.maxSamples = maxSamples;
        int m = table.size();
        invSigmaQ = new double[m];
        invSigmaE = new double[m];
        chosen = new boolean[m];
        for (int l = 0; l < m; l++) {
            invSigmaQ[l] = 1 / Math.sqrt(table.variance(Field.A, l));
            invSigmaE[l] = 1 / Math.sqrt(table.variance(Field.E, l));
        }
        for (int l : modes) {
            chosen[l] = true;
        }
        int cap = Math.min(maxSamples, 1024);
        index = new long[cap];
        amp = new double[cap][];
        pts = new double[cap][];
    }

    /**
     * @param table the modes and variances the ensemble was drawn with
     * @param pointField the field whose point values Mardia's test uses (ignored if points is empty)
     * @param mardiaPoints global indices of points for Mardia's test (interior points where all
     *     components vary; at most 6), may be empty
     * @param allPoints all evaluation points, metres
     * @param maxModes number of modes m tested individually, 1..256 (fewer if the table is smaller)
     * @param maxSamples samples kept for the per-mode and Mardia tests, 20..10⁶
     * @return the check
     */
    public static GaussianityCheck of(ModeTable table, Field pointField, List<Integer> mardiaPoints,
                                      List<Vec3> allPoints, int maxModes, int maxSamples) {
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(pointField, "pointField");
        Objects.requireNonNull(mardiaPoints, "mardiaPoints");
        Objects.requireNonNull(allPoints, "allPoints");
        if (maxModes < 1 || maxModes > 256) {
            throw new IllegalArgumentException("maxModes must lie in 1..256: " + maxModes);
        }
        if (maxSamples < 20 || maxSamples > 1_000_000) {
            throw new IllegalArgumentException("maxSamples must lie in 20..1000000: " + maxSamples);
        }
        if (mardiaPoints.size() > 6) {
            throw new IllegalArgumentException("mardiaPoints must name at most 6 points (18 coordinates): "
                + mardiaPoints.size());
        }
        int m = table.size();
        int k = Math.min(maxModes, m);
        int[] chosen = new int[k];
        for (int i = 0; i < k; i++) {
            chosen[i] = k == 1 ? 0 : (int) Math.round((double) i * (m - 1) / (k - 1));
        }
        int[] p = new int[mardiaPoints.size()];
        List<Vec3> loc = new ArrayList<>();
        for (int i = 0; i < p.length; i++) {
            p[i] = Objects.requireNonNull(mardiaPoints.get(i), "mardiaPoints element");
            if (p[i] < 0 || p[i] >= allPoints.size()) {
                throw new IllegalArgumentException("mardiaPoints[" + i + "] must lie in 0.." + (allPoints.size() - 1)
                    + ": " + p[i]);
            }
            loc.add(allPoints.get(p[i]));
        }
        return new GaussianityCheck(table, pointField, chosen, p, List.copyOf(loc), maxSamples);
    }

    /** @return samples seen */
    public long samples() {
        return samples;
    }

    /** @return the table indices of the individually tested modes */
    public int[] modes() {
        return modes.clone();
    }

    @Override
    public void accept(SampleBatch batch) {
        Objects.requireNonNull(batch, "batch");
        int m = table.size();
        boolean withPoints = points.length > 0 && batch.fields().contains(pointField);
        for (int s = 0; s < batch.size(); s++) {
            double[] q = batch.q(s);
            double[] e = batch.e(s);
            double sum = 0;
            for (int l = 0; l < m; l++) {
                if (!chosen[l]) {
                    double a = q[l] * invSigmaQ[l];
                    double b = e[l] * invSigmaE[l];
                    sum += a * a + b * b;
                }
            }
            pooledSum += sum;
            pooledCount += 2L * (m - modes.length);
            if (stored < maxSamples) {
                double[] row = new double[2 * modes.length];
                for (int i = 0; i < modes.length; i++) {
                    row[2 * i] = q[modes[i]] * invSigmaQ[modes[i]];
                    row[2 * i + 1] = e[modes[i]] * invSigmaE[modes[i]];
                }
                double[] pv = null;
                if (withPoints) {
                    double[] v = batch.values(pointField, s);
                    pv = new double[3 * points.length];
                    for (int i = 0; i < points.length; i++) {
                        System.arraycopy(v, 3 * points[i], pv, 3 * i, 3);
                    }
                }
                store(batch.firstSample() + s, row, pv);
            }
        }
        samples += batch.size();
    }

    private void store(long idx, double[] row, double[] pv) {
        if (stored == index.length) {
            int grown = (int) Math.min(maxSamples, 2L * index.length);
            index = Arrays.copyOf(index, grown);
            amp = Arrays.copyOf(amp, grown);
            pts = Arrays.copyOf(pts, grown);
        }
        index[stored] = idx;
        amp[stored] = row;
        pts[stored] = pv;
        stored++;
    }

    /**
     * Adds another part of the same ensemble; the stored samples are the ones with the lowest
     * indices of the union, so the result does not depend on the split.
     *
     * @param other a check built with the same arguments
     */
    public void merge(GaussianityCheck other) {
        Objects.requireNonNull(other, "other");
        if (other.table.size() != table.size() || !Arrays.equals(other.modes, modes)
            || !Arrays.equals(other.points, points) || other.maxSamples != maxSamples) {
            throw new IllegalArgumentException("other must check the same modes, points and sample limit");
        }
        Integer[] order = new Integer[stored + other.stored];
        long[] idx = new long[order.length];
        double[][] a = new double[order.length][];
        double[][] p = new double[order.length][];
        for (int k = 0; k < stored; k++) {
            idx[k] = index[k];
            a[k] = amp[k];
            p[k] = pts[k];
        }
        for (int k = 0; k < other.stored; k++) {
            idx[stored + k] = other.index[k];
            a[stored + k] = other.amp[k];
            p[stored + k] = other.pts[k];
        }
        for (int k = 0; k < order.length; k++) {
            order[k] = k;
        }
        Arrays.sort(order, Comparator.comparingLong(k -> idx[k]));
        int keep = Math.min(order.length, maxSamples);
        index = new long[Math.max(keep, 1)];
        amp = new double[Math.max(keep, 1)][];
        pts = new double[Math.max(keep, 1)][];
        for (int k = 0; k < keep; k++) {
            index[k] = idx[order[k]];
            amp[k] = a[order[k]];
            pts[k] = p[order[k]];
        }
        stored = keep;
        samples += other.samples;
        pooledSum += other.pooledSum;
        pooledCount += other.pooledCount;
    }

    /**
     * @param falseAlarm the family-wise false-alarm rate α of the verdict, in (0, 1)
     * @return every test and the Holm verdict
     */
    public GaussianityResult result(double falseAlarm) {
        if (!(falseAlarm > 0 && falseAlarm < 1)) {
            throw new IllegalArgumentException("falseAlarm must lie in (0, 1): " + falseAlarm);
        }
        if (stored < 20) {
            throw new IllegalStateException("needs at least 20 stored samples: " + stored);
        }
        // Stored rows are in arrival order; sort by sample index so the split does not matter.
        Integer[] order = new Integer[stored];
        for (int k = 0; k < stored; k++) {
            order[k] = k;
        }
        Arrays.sort(order, Comparator.comparingLong(k -> index[k]));
        int n = stored;
        int v = 2 * modes.length;
        double[][] cols = new double[v][n];
        for (int k = 0; k < n; k++) {
            double[] row = amp[order[k]];
            for (int c = 0; c < v; c++) {
                cols[c][k] = row[c];
            }
        }
        List<NormalityTest> family = new ArrayList<>();
        List<NormalityTest> extra = new ArrayList<>();
        List<String> warnings = new ArrayList<>();
        if (samples > stored) {
            warnings.add(String.format(Locale.ROOT, "per-mode, correlation and Mardia tests use the first %d of %d"
                + " samples (memory limit); the pooled scale test uses all", stored, samples));
        }
        NormalDistribution normal = new NormalDistribution(null, 0, 1);
        KolmogorovSmirnovTest ks = AmplitudeCheck.ksTest();
        for (int c = 0; c < v; c++) {
            String subject = subject(c);
            double a2 = AndersonDarling.statistic(cols[c]);
            family.add(new NormalityTest("anderson-darling", subject, n, a2, AndersonDarling.pValue(a2), Double.NaN, true));
            double d = ks.kolmogorovSmirnovStatistic(normal, cols[c]);
            double p = Math.max(0, 1.0 - ks.cdf(d, n, false));
            extra.add(new NormalityTest("kolmogorov-smirnov", subject, n, d, p, Double.NaN, false));
        }
        if (v >= 2) {
            double[] norm2 = new double[v];
            for (int c = 0; c < v; c++) {
                for (double x : cols[c]) {
                    norm2[c] += x * x;
                }
            }
            double best = 0;
            String which = "";
            for (int a = 0; a < v; a++) {
                for (int b = a + 1; b < v; b++) {
                    double dot = 0;
                    double[] x = cols[a];
                    double[] y = cols[b];
                    for (int k = 0; k < n; k++) {
                        dot += x[k] * y[k];
                    }
                    double r = dot / Math.sqrt(norm2[a] * norm2[b]);
                    if (Math.abs(r) > Math.abs(best)) {
                        best = r;
                        which = subject(a) + " vs " + subject(b);
                    }
                }
            }
            long pairs = (long) v * (v - 1) / 2;
            double t = Math.abs(best) * Math.sqrt((n - 1) / Math.max(1e-300, 1 - best * best));
            TDistribution td = new TDistribution(null, n - 1);
            double pPair = 2 * td.cumulativeProbability(-t);
            family.add(new NormalityTest("max-correlation", String.format(Locale.ROOT,
                "largest |r| of %d pairs (%s), Bonferroni over pairs", pairs, which), n, Math.abs(best),
                Math.min(1.0, pairs * pPair), Double.NaN, true));
        }
        if (points.length > 0 && pts[order[0]] != null) {
            double[][] x = new double[n][];
            for (int k = 0; k < n; k++) {
                x[k] = pts[order[k]];
            }
            try {
                Mardia.Result mr = Mardia.test(x);
                String subj = String.format(Locale.ROOT, "%s at %d point(s), p = %d", pointField, points.length, mr.p());
                family.add(new NormalityTest("mardia-skewness", subj, n, n * mr.b1() / 6, mr.skewnessP(), Double.NaN,
                    true));
                family.add(new NormalityTest("mardia-kurtosis", subj, n, mr.kurtosisZ(), mr.kurtosisP(), Double.NaN,
                    true));
            } catch (IllegalArgumentException ex) {
                warnings.add("Mardia's test skipped: " + ex.getMessage());
            }
        }
        if (pooledCount > 0) {
            double z = (pooledSum - pooledCount) / Math.sqrt(2.0 * pooledCount);
            family.add(new NormalityTest("pooled-scale", String.format(Locale.ROOT,
                "sum of %d squared standardised amplitudes of the other %d modes, ratio %.6f", pooledCount,
                table.size() - modes.length, pooledSum / pooledCount), (int) Math.min(Integer.MAX_VALUE, samples), z,
                2 * normal.cumulativeProbability(-Math.abs(z)), Double.NaN, true));
        }
        int k = family.size();
        double[] adj = holm(family.stream().mapToDouble(NormalityTest::pValue).toArray());
        List<NormalityTest> all = new ArrayList<>();
        double minAdj = 1;
        for (int i = 0; i < k; i++) {
            NormalityTest t = family.get(i);
            all.add(new NormalityTest(t.kind(), t.subject(), t.n(), t.statistic(), t.pValue(), adj[i], true));
            minAdj = Math.min(minAdj, adj[i]);
        }
        double[] adjExtra = holm(extra.stream().mapToDouble(NormalityTest::pValue).toArray());
        for (int i = 0; i < extra.size(); i++) {
            NormalityTest t = extra.get(i);
            all.add(new NormalityTest(t.kind(), t.subject(), t.n(), t.statistic(), t.pValue(), adjExtra[i], false));
        }
        boolean passed = minAdj >= falseAlarm;
        String method = String.format(Locale.ROOT,
            "Holm over %d tests (%d Anderson-Darling case 0 per mode amplitude, largest inter-mode correlation, Mardia"
                + " skewness and kurtosis, pooled scale): pass when every Holm-adjusted p >= alpha = %.3g; smallest"
                + " adjusted p = %.4g; statistic = -log10(smallest adjusted p), threshold -log10(alpha)", k, v,
            falseAlarm, minAdj);
        Verdict verdict = new Verdict(passed, falseAlarm, k, -Math.log10(falseAlarm),
            -Math.log10(Math.max(minAdj, 1e-300)), method);
        return new GaussianityResult(samples, all, verdict, warnings);
    }

    /**
     * Holm-adjusted p-values: with p sorted ascending, adj_(i) = max_{j ≤ i} min(1, (K − j + 1) p_(j)).
     *
     * @param p raw p-values
     * @return adjusted p-values in the original order
     */
    static double[] holm(double[] p) {
        int k = p.length;
        Integer[] order = new Integer[k];
        for (int i = 0; i < k; i++) {
            order[i] = i;
        }
        Arrays.sort(order, Comparator.comparingDouble(i -> p[i]));
        double[] adj = new double[k];
        double running = 0;
        for (int j = 0; j < k; j++) {
            running = Math.max(running, Math.min(1.0, (k - j) * p[order[j]]));
            adj[order[j]] = running;
        }
        return adj;
    }

    private String subject(int c) {
        int l = modes[c / 2];
        return String.format(Locale.ROOT, "mode %d (%s) %s", l, table.modes().get(l).label(), c % 2 == 0 ? "q" : "e");
    }
}
