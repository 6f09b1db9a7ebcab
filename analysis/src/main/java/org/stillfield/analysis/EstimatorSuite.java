package org.stillfield.analysis;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import java.util.Set;
import java.util.function.DoubleUnaryOperator;
import org.stillfield.analysis.api.ConvergenceResult;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.GaussianityResult;
import org.stillfield.analysis.api.KernelPoint;
import org.stillfield.analysis.api.PowerLawFit;
import org.stillfield.analysis.api.SeparationBin;
import org.stillfield.analysis.api.WallProfileRow;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The standard set of extended estimators for one run, chosen from its spec, in one pass over the
 * ensemble:
 *
 * <ul>
 *   <li>every line: the full pair covariance of its interior points ({@link FullCovarianceEstimator}),
 *       the separation-binned average ({@link SeparationBins}) and, in a box, the mean-square
 *       profile against the distance from the nearest wall ({@link WallProfile}), for every field;</li>
 *   <li>the first grid: the separation-binned average over at most {@value #MAX_GRID_POINTS}
 *       interior points (thinned by a stride per axis);</li>
 *   <li>the kernel in the mode subspace ({@link ModeSpaceKernel}) of E and A along the first line,
 *       from its middle point outwards in both directions, with the regulator ρ = W(ω)² (the run's
 *       window once more on the inverse variances, so K^ρ = Σ_l W_l f f/(V²σ²_vac)), and power-law
 *       fits between three window lengths and the end of the line;</li>
 *   <li>the Gaussianity and independence family ({@link GaussianityCheck});</li>
 *   <li>convergence of the run's correlation table with N ({@link ConvergenceTracker}).</li>
 * </ul>
 */
public final class EstimatorSuite {
    /** Largest number of grid points binned. */
    public static final int MAX_GRID_POINTS = 160;
    /** Jackknife groups for the kernel fits. */
    public static final int KERNEL_GROUPS = 20;

    private final RunSpec spec;
    private final ModeTable table;
    private final List<Vec3> points;
    private final List<Named<FullCovarianceEstimator>> covariances = new ArrayList<>();
    private final List<Named<SeparationBins>> bins = new ArrayList<>();
    private final List<Named<WallProfile>> profiles = new ArrayList<>();
    private final ModeVariances variances;
    private final String kernelLine;
    private final List<Integer> kernelPoints;
    private final GaussianityCheck gaussianity;
    private final ConvergenceTracker convergence;
    private final List<String> notes = new ArrayList<>();
    private final java.util.Map<String, Integer> lineStart = new java.util.HashMap<>();

    private record Named<T>(String set, T estimator) {
    }

    /** A full covariance of one line and field. */
    public record LineCovariance(String set, Field field, CorrelationResult result) {
    }

    /** Separation bins of one point set and field. */
    public record Binned(String set, Field field, List<SeparationBin> bins) {
    }

    /** A wall profile of one line and field. */
    public record Profile(String set, Field field, List<WallProfileRow> rows) {
    }

    /** The kernel fall-off of one field with its fits. */
    public record Kernel(String set, Field field, String regulator, List<KernelPoint> points, List<PowerLawFit> fits,
                         List<String> notes) {
    }

    /**
     * Everything the suite computed.
     *
     * @param covariances full pair covariances
     * @param binned separation bins
     * @param profiles wall profiles
     * @param kernels kernel fall-offs
     * @param gaussianity the Gaussianity family, or null when it could not run
     * @param convergence convergence with N, or null when it could not run
     * @param notes what was skipped and why
     */
    public record Result(List<LineCovariance> covariances, List<Binned> binned, List<Profile> profiles,
                         List<Kernel> kernels, GaussianityResult gaussianity, ConvergenceResult convergence,
                         List<String> notes) {
        /** Copies the lists. */
        public Result {
            covariances = List.copyOf(covariances);
            binned = List.copyOf(binned);
            profiles = List.copyOf(profiles);
            kernels = List.copyOf(kernels);
            notes = List.copyOf(notes);
        }
    }

    private EstimatorSuite(RunSpec spec, ModeTable table) {
        this.spec = spec;
        this.table = table;
        this.points = spec.allPoints();
        int pc = points.size();
        Set<Field> fields = spec.fields();
        boolean box = BoxWalls.of(table.cavity()) != null;
        List<PointSet> sets = spec.pointSets();
        int off = 0;
        String firstLine = null;
        List<Integer> firstLinePoints = null;
        boolean gridDone = false;
        for (PointSet s : sets) {
            List<Integer> inside = new ArrayList<>();
            for (int k = 0; k < s.size(); k++) {
                if (table.cavity().contains(s.points().get(k))) {
                    inside.add(off + k);
                }
            }
            if (s.kind() == PointSet.Kind.LINE && inside.size() >= 2) {
                lineStart.put(s.name(), inside.get(0));
                if (firstLine == null) {
                    firstLine = s.name();
                    firstLinePoints = List.copyOf(inside);
                }
                for (Field f : fields) {
                    if (3 * inside.size() <= MomentAccumulator.DEFAULT_MAX_DIMENSION) {
                        covariances.add(new Named<>(s.name(), FullCovarianceEstimator.of(f, inside, pc)));
                    } else {
                        notes.add(String.format(Locale.ROOT, "line '%s': %d points are too many for a full covariance"
                            + " (limit %d coordinates)", s.name(), inside.size(), MomentAccumulator.DEFAULT_MAX_DIMENSION));
                    }
                    bins.add(new Named<>(s.name(), SeparationBins.byDistance(f, inside, points)));
                    if (box) {
                        profiles.add(new Named<>(s.name(), WallProfile.of(f, inside, pc)));
                    }
                }
            } else if (s.kind() == PointSet.Kind.GRID && !gridDone && inside.size() >= 2) {
                gridDone = true;
                List<Integer> thin = thin(s, off, inside);
                if (thin.size() < inside.size()) {
                    notes.add(String.format(Locale.ROOT, "grid '%s': %d of %d interior points binned (stride per axis)",
                        s.name(), thin.size(), inside.size()));
                }
                for (Field f : fields) {
                    bins.add(new Named<>(s.name(), SeparationBins.byDistance(f, thin, points)));
                }
            }
            off += s.size();
        }
        kernelLine = firstLine;
        kernelPoints = firstLinePoints;
        variances = firstLine != null && kernelPoints.size() >= 7 ? ModeVariances.of(table, KERNEL_GROUPS) : null;
        if (variances == null) {
            notes.add("kernel fall-off needs a line of at least 7 interior points: none");
        }
        Field pf = fields.contains(Field.E) ? Field.E : fields.iterator().next();
        gaussianity = GaussianityCheck.of(table, pf, mardiaPoints(pf), points, 16, 20_000);
        convergence = spec.pairs().isEmpty() || spec.samples() < 4 ? null
            : ConvergenceTracker.of(spec.pairs(), fields, pc, ConvergenceTracker.doubling(spec.samples()));
    }

    /**
     * @param spec the run
     * @param table its modes
     * @return the suite
     */
    public static EstimatorSuite forRun(RunSpec spec, ModeTable table) {
        Objects.requireNonNull(spec, "spec");
        Objects.requireNonNull(table, "table");
        return new EstimatorSuite(spec, table);
    }

    /** Up to 3 interior points of the run's pairs where every component of the field varies. */
    private List<Integer> mardiaPoints(Field f) {
        List<Integer> candidates = new ArrayList<>();
        for (RunSpec.PointPair p : spec.pairs()) {
            for (int q : new int[] {p.first(), p.second()}) {
                if (!candidates.contains(q) && table.cavity().contains(points.get(q))) {
                    candidates.add(q);
                }
            }
        }
        List<Integer> out = new ArrayList<>();
        if (candidates.isEmpty()) {
            return out;
        }
        List<Vec3> loc = new ArrayList<>();
        List<RunSpec.PointPair> self = new ArrayList<>();
        for (int k = 0; k < candidates.size(); k++) {
            loc.add(points.get(candidates.get(k)));
            self.add(new RunSpec.PointPair(k, k));
        }
        List<double[][]> c = ModeSumCorrelation.of(table, loc).tensors(f, self);
        double max = 0;
        for (double[][] t : c) {
            max = Math.max(max, Math.max(t[0][0], Math.max(t[1][1], t[2][2])));
        }
        for (int k = 0; k < candidates.size() && out.size() < 3; k++) {
            double[][] t = c.get(k);
            if (Math.min(t[0][0], Math.min(t[1][1], t[2][2])) > 1e-6 * max) {
                out.add(candidates.get(k));
            }
        }
        return out;
    }

    private static List<Integer> thin(PointSet grid, int offset, List<Integer> inside) {
        int[] d = grid.dims();
        int stride = 1;
        while (count(d, stride) > MAX_GRID_POINTS) {
            stride++;
        }
        java.util.Set<Integer> in = new java.util.HashSet<>(inside);
        List<Integer> out = new ArrayList<>();
        for (int k = 0; k < d[2]; k += stride) {
            for (int j = 0; j < d[1]; j += stride) {
                for (int i = 0; i < d[0]; i += stride) {
                    int g = offset + i + d[0] * (j + d[1] * k);
                    if (in.contains(g)) {
                        out.add(g);
                    }
                }
            }
        }
        return out;
    }

    private static long count(int[] d, int stride) {
        long n = 1;
        for (int v : d) {
            n *= (v + stride - 1) / stride;
        }
        return n;
    }

    /** @return the sink that feeds every estimator of the suite */
    public EnsembleSink sink() {
        List<EnsembleSink> all = new ArrayList<>();
        covariances.forEach(n -> all.add(n.estimator()));
        bins.forEach(n -> all.add(n.estimator()));
        profiles.forEach(n -> all.add(n.estimator()));
        if (variances != null) {
            all.add(variances);
        }
        all.add(gaussianity);
        if (convergence != null) {
            all.add(convergence);
        }
        return new EnsembleSink() {
            @Override
            public void accept(SampleBatch batch) throws java.io.IOException {
                for (EnsembleSink s : all) {
                    s.accept(batch);
                }
            }
        };
    }

    /**
     * Computes every result. Parts that cannot be computed (too few samples, a failed fit) are
     * left out with a note instead of failing the whole analysis.
     *
     * @param falseAlarm nominal false-alarm rate of the verdicts (each part's own), in (0, 1)
     * @return the results
     */
    public Result result(double falseAlarm) {
        List<String> out = new ArrayList<>(notes);
        List<LineCovariance> cov = new ArrayList<>();
        for (Named<FullCovarianceEstimator> n : covariances) {
            cov.add(new LineCovariance(n.set(), n.estimator().field(), n.estimator().result(table, points, falseAlarm)));
        }
        List<Binned> binned = new ArrayList<>();
        for (Named<SeparationBins> n : bins) {
            SeparationBins b = n.estimator();
            if (b.samples() < 2) {
                out.add("separation bins of '" + n.set() + "' need at least 2 samples");
                continue;
            }
            FreeSpaceSpectrum free = FreeSpaceSpectrum.correlation(b.field(), table.window(), table.state(),
                table.cavity().medium());
            binned.add(new Binned(n.set(), b.field(), b.result(table, free)));
        }
        List<Profile> prof = new ArrayList<>();
        for (Named<WallProfile> n : profiles) {
            // Against the wall the line starts from: its image is the reference along the whole line.
            Vec3 first = points.get(lineStart.get(n.set()));
            BoxWalls.Wall wall = BoxWalls.of(table.cavity()).nearest(first);
            prof.add(new Profile(n.set(), n.estimator().field(), n.estimator().result(table, points, wall)));
        }
        List<Kernel> kernels = new ArrayList<>();
        if (variances != null) {
            if (variances.samples() <= 4 * KERNEL_GROUPS) {
                out.add("kernel fall-off needs more than " + 4 * KERNEL_GROUPS + " samples");
            } else {
                for (Field f : List.of(Field.E, Field.A)) {
                    kernels.add(kernel(f, out));
                }
            }
        }
        GaussianityResult g = null;
        try {
            g = gaussianity.result(falseAlarm);
        } catch (IllegalStateException ex) {
            out.add("Gaussianity checks skipped: " + ex.getMessage());
        }
        ConvergenceResult c = null;
        if (convergence != null) {
            try {
                c = convergence.result(table, points);
            } catch (IllegalStateException ex) {
                out.add("convergence skipped: " + ex.getMessage());
            }
        }
        return new Result(cov, binned, prof, kernels, g, c, out);
    }

    private Kernel kernel(Field f, List<String> out) {
        Window w = table.window();
        DoubleUnaryOperator rho = k -> {
            double wk = w.weight(table.cavity().medium().waveSpeed() * k);
            return wk * wk;
        };
        String text = w.kind() == Window.Kind.HARD ? "ρ = 1 (hard window: the bare kernel of the enumerated modes)"
            : "ρ = W(ω)² (the run's window applied to the inverse variances)";
        ModeSpaceKernel k = ModeSpaceKernel.of(table, f, rho, text);
        int mid = kernelPoints.size() / 2;
        Vec3 origin = points.get(kernelPoints.get(mid));
        Vec3 end = points.get(kernelPoints.get(kernelPoints.size() - 1));
        Vec3 start = points.get(kernelPoints.get(0));
        Vec3 dir = end.minus(start);
        double step = points.get(kernelPoints.get(1)).minus(start).norm();
        // The line's last points are left out: a line running wall to wall ends on the walls, where
        // the tangential mode functions vanish and the kernel's components with them.
        int half = Math.min(mid, kernelPoints.size() - 1 - mid) - 1;
        double[] sep = new double[half];
        for (int s = 0; s < half; s++) {
            sep[s] = (s + 1) * step;
        }
        List<String> kn = new ArrayList<>();
        ModeSpaceKernel.FallOff fo = k.fallOff(List.of(origin), List.of(dir, new Vec3(-dir.x(), -dir.y(), -dir.z())), sep);
        List<KernelPoint> pts = fo.points(variances);
        List<PowerLawFit> fits = new ArrayList<>();
        double length = w.kind() == Window.Kind.HARD ? 1 / (w.omegaC() / table.cavity().medium().waveSpeed())
            : table.cavity().medium().waveSpeed() / w.omegaC();
        double rMin = 3 * length;
        double rMax = sep[sep.length - 1];
        for (ModeSpaceKernel.Component comp : ModeSpaceKernel.Component.values()) {
            try {
                fits.add(fo.fitSampled(variances, comp, true, rMin, rMax));
                fits.add(fo.fitModeSum(comp, true, rMin, rMax));
            } catch (IllegalArgumentException | IllegalStateException ex) {
                kn.add(String.format(Locale.ROOT, "%s kernel %s fit over [%.4g, %.4g] m not possible: %s", f, comp, rMin,
                    rMax, ex.getMessage()));
            }
        }
        out.addAll(kn);
        return new Kernel(kernelLine, f, text, pts, fits, kn);
    }
}
