package org.stillfield.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;
import org.stillfield.analysis.api.SeparationBin;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;

/**
 * Translation-averaged correlation binned by separation: for each unordered pair p &lt; q of a
 * chosen point set, the products F(r_p)·d̂ F(r_q)·d̂ and F(r_p)·F(r_q) of every sample are averaged
 * over the pairs of the pair's bin, giving per sample and bin the averages y_∥ and y_⊥ = (y_tr −
 * y_∥)/2 (see {@link SeparationBin}). Their ensemble means are the estimates; their sample-to-sample
 * spread gives the standard errors, so the errors account for the correlation between pairs of one
 * bin without any model. The per-sample bin averages go into a {@link MomentAccumulator}, so parts of
 * an ensemble merge exactly.
 *
 * <p>Bins: by distance |d| between given edges ({@link #byDistance}), or by separation vector
 * ({@link #byVector}: pairs whose d agree to a tolerance, d and −d identified). The cost is
 * O(pairs) per sample; at most {@value #MAX_PAIRS} pairs are accepted.
 *
 * <p>References (averaged over the same pairs): the analytic mode sum with the run's modes
 * (exact, the z-scores use it), the free-space correlation with the same window
 * ({@link FreeSpaceSpectrum#correlation}), and free space plus the image in the wall nearest each
 * pair's midpoint (box cavities only). The latter two are physics references, not tests: a cavity
 * differs from free space by its walls.
 */
public final class SeparationBins implements EnsembleSink {
    /** Largest number of point pairs. */
    public static final int MAX_PAIRS = 2_000_000;

    private final Field field;
    private final int[] globalPoints;
    private final List<Vec3> chosen;
    private final int pointCount;
    private final int[] pairA;
    private final int[] pairB;
    private final int[] pairBin;
    private final double[] unit;
    private final String[] labels;
    private final double[] low;
    private final double[] high;
    private final int[] binPairs;
    private final double[] binMeanR;
    private final MomentAccumulator moments;

    private SeparationBins(Field field, int[] globalPoints, List<Vec3> chosen, int pointCount, int[] pairA, int[] pairB,
                           int[] pairBin, double[] unit, String[] labels, double[] low, double[] high) {
        this.field = field;
        this.globalPoints = globalPoints;
        this.chosen = chosen;
        this.pointCount = pointCount;
        this.pairA = pairA;
        this.pairB = pairB;
        this.pairBin = pairBin;
        this.unit = unit;
        this.labels = labels;
        this.low = low;
        this.high = high;
        int nb = labels.length;
        binPairs = new int[nb];
        binMeanR = new double[nb];
        for (int k = 0; k < pairA.length; k++) {
            binPairs[pairBin[k]]++;
            binMeanR[pairBin[k]] += chosen.get(pairB[k]).minus(chosen.get(pairA[k])).norm();
        }
        for (int b = 0; b < nb; b++) {
            binMeanR[b] /= binPairs[b];
        }
        moments = MomentAccumulator.of(2 * nb, MomentAccumulator.CEILING);
    }

    /**
     * Bins by distance with edges e_0 &lt; e_1 &lt; ...; a pair with e_k ≤ |d| &lt; e_{k+1} falls in bin
     * k, pairs outside all bins are ignored, and empty bins are dropped.
     *
     * @param field the field
     * @param globalPoints global indices of the chosen points (distinct, inside the cavity)
     * @param allPoints all evaluation points, global order, metres
     * @param edges bin edges, metres, strictly increasing, at least 2
     * @return the estimator
     */
    public static SeparationBins byDistance(Field field, List<Integer> globalPoints, List<Vec3> allPoints,
                                            double[] edges) {
        Objects.requireNonNull(edges, "edges");
        if (edges.length < 2) {
            throw new IllegalArgumentException("edges must hold at least 2 values: " + edges.length);
        }
        for (int k = 0; k < edges.length; k++) {
            if (!Double.isFinite(edges[k]) || (k > 0 && !(edges[k] > edges[k - 1]))) {
                throw new IllegalArgumentException("edges must be finite and strictly increasing: " + Arrays.toString(edges));
            }
        }
        int[] g = indices(globalPoints, allPoints);
        List<Vec3> chosen = chosen(g, allPoints);
        double[] e = edges.clone();
        return build(field, g, chosen, allPoints.size(), (d, r) -> {
            int k = Arrays.binarySearch(e, r);
            int bin = k >= 0 ? k : -k - 2;
            return bin >= 0 && bin < e.length - 1 ? String.format(Locale.ROOT, "%05d", bin) : null;
        }, key -> {
            int k = Integer.parseInt(key);
            return new double[] {e[k], e[k + 1]};
        }, key -> {
            int k = Integer.parseInt(key);
            return String.format(Locale.ROOT, "[%.4g, %.4g) m", e[k], e[k + 1]);
        });
    }

    /**
     * Bins by distance with edges (k + ½)·δ, k = 0, 1, ..., centred on multiples of the smallest
     * nonzero separation δ of the points (the natural bins of a line or regular grid).
     *
     * @param field the field
     * @param globalPoints global indices of the chosen points (distinct, inside the cavity, at least 2)
     * @param allPoints all evaluation points, metres
     * @return the estimator
     */
    public static SeparationBins byDistance(Field field, List<Integer> globalPoints, List<Vec3> allPoints) {
        int[] g = indices(globalPoints, allPoints);
        List<Vec3> chosen = chosen(g, allPoints);
        double min = Double.POSITIVE_INFINITY;
        double max = 0;
        for (int a = 0; a < chosen.size(); a++) {
            for (int b = a + 1; b < chosen.size(); b++) {
                double r = chosen.get(b).minus(chosen.get(a)).norm();
                if (r > 0) {
                    min = Math.min(min, r);
                }
                max = Math.max(max, r);
            }
        }
        if (!(min < Double.POSITIVE_INFINITY)) {
            throw new IllegalArgumentException("globalPoints must hold at least two distinct points");
        }
        int n = (int) Math.ceil(max / min + 0.5) + 1;
        if (n > 100_000) {
            throw new IllegalArgumentException("separations span " + n + " bins of the smallest spacing " + min
                + " m; give explicit edges");
        }
        double[] edges = new double[n + 1];
        for (int k = 0; k <= n; k++) {
            edges[k] = (k + 0.5) * min;
        }
        return byDistance(field, globalPoints, allPoints, edges);
    }

    /**
     * Bins by separation vector: pairs whose d (or −d) agree to {@code resolution} in every
     * component share a bin.
     *
     * @param field the field
     * @param globalPoints global indices of the chosen points
     * @param allPoints all evaluation points, metres
     * @param resolution metres, positive (e.g. a tenth of the grid spacing)
     * @return the estimator
     */
    public static SeparationBins byVector(Field field, List<Integer> globalPoints, List<Vec3> allPoints,
                                          double resolution) {
        if (!(resolution > 0) || !Double.isFinite(resolution)) {
            throw new IllegalArgumentException("resolution must be positive and finite (metres): " + resolution);
        }
        int[] g = indices(globalPoints, allPoints);
        List<Vec3> chosen = chosen(g, allPoints);
        Map<String, Double> length = new LinkedHashMap<>();
        return build(field, g, chosen, allPoints.size(), (d, r) -> {
            long[] c = {Math.round(d.x() / resolution), Math.round(d.y() / resolution), Math.round(d.z() / resolution)};
            // d and −d give the same bin: make the first nonzero component positive.
            int sign = c[0] != 0 ? Long.signum(c[0]) : c[1] != 0 ? Long.signum(c[1]) : Long.signum(c[2]);
            String key = String.format(Locale.ROOT, "(%d,%d,%d)", sign * c[0], sign * c[1], sign * c[2]);
            length.putIfAbsent(key, r);
            return key;
        }, key -> new double[] {length.get(key), length.get(key)}, key -> "d = " + key + " x "
            + String.format(Locale.ROOT, "%.4g m", resolution));
    }

    private interface Binner {
        String key(Vec3 d, double r);
    }

    private static SeparationBins build(Field field, int[] g, List<Vec3> chosen, int pointCount, Binner binner,
                                        java.util.function.Function<String, double[]> range,
                                        java.util.function.Function<String, String> label) {
        Objects.requireNonNull(field, "field");
        long total = (long) g.length * (g.length - 1) / 2;
        if (total > MAX_PAIRS) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                "globalPoints must give at most %d pairs for binning: %d points give %d; thin the point set",
                MAX_PAIRS, g.length, total));
        }
        Map<String, Integer> index = new java.util.TreeMap<>();
        List<String> keys = new ArrayList<>();
        int[] a = new int[(int) total];
        int[] b = new int[(int) total];
        String[] key = new String[(int) total];
        double[] u = new double[3 * (int) total];
        int n = 0;
        for (int p = 0; p < g.length; p++) {
            for (int q = p + 1; q < g.length; q++) {
                Vec3 d = chosen.get(q).minus(chosen.get(p));
                double r = d.norm();
                if (!(r > 0)) {
                    throw new IllegalArgumentException("globalPoints " + g[p] + " and " + g[q] + " coincide");
                }
                String k = binner.key(d, r);
                if (k == null) {
                    continue;
                }
                a[n] = p;
                b[n] = q;
                key[n] = k;
                u[3 * n] = d.x() / r;
                u[3 * n + 1] = d.y() / r;
                u[3 * n + 2] = d.z() / r;
                n++;
                index.putIfAbsent(k, 0);
            }
        }
        if (n == 0) {
            throw new IllegalArgumentException("no point pair falls in any bin");
        }
        keys.addAll(index.keySet());
        // Bins sorted by length, then key, so the table reads outward.
        keys.sort(java.util.Comparator.comparingDouble((String s) -> range.apply(s)[0]).thenComparing(s -> s));
        for (int k = 0; k < keys.size(); k++) {
            index.put(keys.get(k), k);
        }
        int[] bin = new int[n];
        for (int k = 0; k < n; k++) {
            bin[k] = index.get(key[k]);
        }
        String[] labels = new String[keys.size()];
        double[] lo = new double[keys.size()];
        double[] hi = new double[keys.size()];
        for (int k = 0; k < keys.size(); k++) {
            double[] rg = range.apply(keys.get(k));
            lo[k] = rg[0];
            hi[k] = rg[1];
            labels[k] = label.apply(keys.get(k));
        }
        return new SeparationBins(field, g, chosen, pointCount, Arrays.copyOf(a, n), Arrays.copyOf(b, n), bin,
            Arrays.copyOf(u, 3 * n), labels, lo, hi);
    }

    private static int[] indices(List<Integer> globalPoints, List<Vec3> allPoints) {
        Objects.requireNonNull(globalPoints, "globalPoints");
        Objects.requireNonNull(allPoints, "allPoints");
        if (globalPoints.size() < 2) {
            throw new IllegalArgumentException("globalPoints must name at least 2 points: " + globalPoints.size());
        }
        int[] g = new int[globalPoints.size()];
        java.util.Set<Integer> seen = new java.util.HashSet<>();
        for (int k = 0; k < g.length; k++) {
            int p = Objects.requireNonNull(globalPoints.get(k), "globalPoints element");
            if (p < 0 || p >= allPoints.size() || !seen.add(p)) {
                throw new IllegalArgumentException("globalPoints[" + k + "] must be a distinct index in 0.."
                    + (allPoints.size() - 1) + ": " + p);
            }
            g[k] = p;
        }
        return g;
    }

    private static List<Vec3> chosen(int[] g, List<Vec3> allPoints) {
        List<Vec3> out = new ArrayList<>(g.length);
        for (int p : g) {
            out.add(allPoints.get(p));
        }
        return List.copyOf(out);
    }

    /** @return the field */
    public Field field() {
        return field;
    }

    /** @return number of bins */
    public int bins() {
        return labels.length;
    }

    /** @return number of pairs binned */
    public int pairs() {
        return pairA.length;
    }

    /** @return samples accumulated */
    public long samples() {
        return moments.count();
    }

    /** @return the accumulator of per-sample bin averages (∥ of bin b at 2b, ⊥ at 2b + 1; live) */
    public MomentAccumulator moments() {
        return moments;
    }

    @Override
    public void accept(SampleBatch batch) {
        Objects.requireNonNull(batch, "batch");
        int n = batch.size();
        int nb = labels.length;
        double[][] rows = new double[n][2 * nb];
        double[] par = new double[nb];
        double[] tr = new double[nb];
        for (int s = 0; s < n; s++) {
            double[] v = batch.values(field, s);
            if (v.length != 3 * pointCount) {
                throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "batch values of %s must hold 3 x %d points: %d in sample %d", field, pointCount, v.length,
                    batch.firstSample() + s));
            }
            Arrays.fill(par, 0);
            Arrays.fill(tr, 0);
            for (int k = 0; k < pairA.length; k++) {
                int pa = 3 * globalPoints[pairA[k]];
                int pb = 3 * globalPoints[pairB[k]];
                double ax = v[pa];
                double ay = v[pa + 1];
                double az = v[pa + 2];
                double bx = v[pb];
                double by = v[pb + 1];
                double bz = v[pb + 2];
                double ux = unit[3 * k];
                double uy = unit[3 * k + 1];
                double uz = unit[3 * k + 2];
                int bin = pairBin[k];
                par[bin] += (ux * ax + uy * ay + uz * az) * (ux * bx + uy * by + uz * bz);
                tr[bin] += ax * bx + ay * by + az * bz;
            }
            double[] row = rows[s];
            for (int b = 0; b < nb; b++) {
                double mp = par[b] / binPairs[b];
                double mt = tr[b] / binPairs[b];
                if (!Double.isFinite(mt) || !Double.isFinite(mp)) {
                    throw new IllegalArgumentException(String.format(Locale.ROOT,
                        "non-finite %s value at a binned point in sample %d (outside the cavity?)", field,
                        batch.firstSample() + s));
                }
                row[2 * b] = mp;
                row[2 * b + 1] = 0.5 * (mt - mp);
            }
        }
        moments.addAll(rows, n);
    }

    /**
     * Adds another part of the same ensemble, binned the same way.
     *
     * @param other built with the same arguments
     */
    public void merge(SeparationBins other) {
        Objects.requireNonNull(other, "other");
        if (other.field != field || !Arrays.equals(other.globalPoints, globalPoints)
            || !Arrays.equals(other.pairBin, pairBin) || !Arrays.equals(other.labels, labels)) {
            throw new IllegalArgumentException("other must bin the same field, points and bins");
        }
        moments.merge(other.moments);
    }

    /**
     * The bins with their references.
     *
     * @param table the modes the ensemble was drawn with (for the mode sum)
     * @param free the free-space correlation of the same field and window, or null for none
     * @return one entry per bin, in bin order
     */
    public List<SeparationBin> result(ModeTable table, FreeSpaceSpectrum free) {
        Objects.requireNonNull(table, "table");
        long n = moments.count();
        if (n < 2) {
            throw new IllegalStateException("needs at least 2 samples for standard errors: " + n);
        }
        int nb = labels.length;
        double[] mean = moments.mean();
        double[] com = moments.comoment();
        int dim = moments.dimension();
        DMatrixRMaj c = ModeSumMatrix.covariance(table, field, chosen, new int[] {0, 1, 2});
        BoxWalls walls = BoxWalls.of(table.cavity());
        double[] msPar = new double[nb];
        double[] msPerp = new double[nb];
        double[] frPar = new double[nb];
        double[] frPerp = new double[nb];
        double[] imPar = new double[nb];
        double[] imPerp = new double[nb];
        double[][] t = new double[3][3];
        for (int k = 0; k < pairA.length; k++) {
            int a = pairA[k];
            int b = pairB[k];
            int bin = pairBin[k];
            for (int i = 0; i < 3; i++) {
                for (int j = 0; j < 3; j++) {
                    t[i][j] = c.get(3 * a + i, 3 * b + j);
                }
            }
            double[] pp = project(t, k);
            msPar[bin] += pp[0];
            msPerp[bin] += pp[1];
            if (free != null) {
                Vec3 ra = chosen.get(a);
                Vec3 rb = chosen.get(b);
                double[] f = project(free.tensor(ra.minus(rb)), k);
                frPar[bin] += f[0];
                frPerp[bin] += f[1];
                if (walls != null) {
                    BoxWalls.Wall w = walls.nearest(ra, rb);
                    double[] im = project(free.nearPlane(field, w.axis(), w.position(), ra, rb), k);
                    imPar[bin] += im[0];
                    imPerp[bin] += im[1];
                }
            }
        }
        List<SeparationBin> out = new ArrayList<>(nb);
        for (int b = 0; b < nb; b++) {
            int m = binPairs[b];
            double sePar = Math.sqrt(Math.max(0, com[(2 * b) * dim + 2 * b]) / (n - 1) / n);
            double sePerp = Math.sqrt(Math.max(0, com[(2 * b + 1) * dim + 2 * b + 1]) / (n - 1) / n);
            out.add(new SeparationBin(field, labels[b], low[b], high[b], binMeanR[b], m, mean[2 * b], sePar,
                mean[2 * b + 1], sePerp, msPar[b] / m, msPerp[b] / m, free == null ? Double.NaN : frPar[b] / m,
                free == null ? Double.NaN : frPerp[b] / m, free == null || walls == null ? Double.NaN : imPar[b] / m,
                free == null || walls == null ? Double.NaN : imPerp[b] / m));
        }
        return out;
    }

    /** {C_∥, C_⊥} of a tensor for pair k: d̂ᵀCd̂ and (tr C − C_∥)/2. */
    private double[] project(double[][] t, int k) {
        double ux = unit[3 * k];
        double uy = unit[3 * k + 1];
        double uz = unit[3 * k + 2];
        double[] u = {ux, uy, uz};
        double par = 0;
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                par += u[i] * t[i][j] * u[j];
            }
        }
        double tr = t[0][0] + t[1][1] + t[2][2];
        return new double[] {par, 0.5 * (tr - par)};
    }
}
