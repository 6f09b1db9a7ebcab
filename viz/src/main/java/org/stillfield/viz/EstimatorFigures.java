package org.stillfield.viz;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import org.stillfield.analysis.EstimatorSuite;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.analysis.api.GaussianityResult;
import org.stillfield.analysis.api.NormalityTest;
import org.stillfield.analysis.api.PowerLawFit;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.analysis.api.WallProfileRow;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The report's figures and summary lines for the extended estimators of an
 * {@link EstimatorSuite}: correlation matrices of the lines, separation-binned correlations, wall
 * profiles, the kernel fall-off on log–log axes with its fitted slopes, and the convergence with N.
 */
public final class EstimatorFigures {
    private EstimatorFigures() {
    }

    /**
     * Renders the figures into the folder.
     *
     * @param folder where the PNGs go (created if needed)
     * @param spec the run
     * @param table its modes
     * @param result the suite's results (null for none)
     * @return the figures, in report order
     * @throws IOException when a PNG cannot be written
     */
    public static List<Figure> figuresFor(Path folder, RunSpec spec, ModeTable table, EstimatorSuite.Result result)
        throws IOException {
        Objects.requireNonNull(folder, "folder");
        Objects.requireNonNull(spec, "spec");
        Objects.requireNonNull(table, "table");
        List<Figure> out = new ArrayList<>();
        if (result == null) {
            return out;
        }
        ChartStyle.headless();
        Files.createDirectories(folder);
        PointNames names = new PointNames(spec.pointSets());
        for (EstimatorSuite.LineCovariance c : result.covariances()) {
            int s = setIndex(spec, c.set());
            PointSet set = spec.pointSets().get(s);
            int comp = strongestComponent(c.result().rows());
            CorrelationMatrixMap map = CorrelationMatrixMap.of(c.field(), comp, set.points(), names.offset(s),
                c.result().rows(), c.result().samples(), CorrelationLinePlot.capitalise(c.field().description())
                    + " correlation matrix along '" + c.set() + "'");
            Path png = map.writePng(folder.resolve("matrix-" + safe(c.set()) + "-" + c.field() + ".png"));
            out.add(new Figure(c.field().column(comp) + " correlation matrix along " + c.set(), png, String.format(
                Locale.ROOT, "Normalised correlation ρ(r, r′) of %s between every pair of the %d points of line '%s'."
                    + " Above the diagonal the analytic mode sum, below it the ensemble estimate (N = %d): the two"
                    + " halves are mirror images when the ensemble is right. Full table with standard errors and z in"
                    + " analysis/covariance-%s-%s.csv (verdict over %d entries: %s).", c.field().column(comp),
                set.size(), c.set(), c.result().samples(), safe(c.set()), c.field(), c.result().verdict().tests(),
                c.result().verdict().passed() ? "pass" : "FAIL")));
        }
        for (EstimatorSuite.Binned b : result.binned()) {
            SeparationPlot p = SeparationPlot.of(b.bins(), CorrelationLinePlot.capitalise(b.field().description())
                + " correlation against separation, '" + b.set() + "'", b.field() + " field, " + SeparationPlot.describe(
                    b.bins()) + "; ∥ and ⊥: components along and across r′ − r");
            Path png = p.writePng(folder.resolve("separation-" + safe(b.set()) + "-" + b.field() + ".png"));
            out.add(new Figure(b.field() + " correlation against separation, " + b.set(), png, String.format(Locale.ROOT,
                "Translation average over the point pairs of '%s' binned by separation: the component along the"
                    + " separation (C∥) and across it (C⊥). Markers: ensemble, ± 1 standard error from the"
                    + " sample-to-sample spread of each bin average; solid: the mode sum averaged over the same pairs"
                    + " (the exact reference; lower panel in its standard errors); dashed: free space with the same"
                    + " window; dotted: free space plus the image in the wall nearest each pair. The cavity differs"
                    + " from free space by its walls, so only the solid line is a test.", b.set())));
        }
        for (EstimatorSuite.Profile p : result.profiles()) {
            WallProfileRow first = p.rows().get(0);
            String wall = "xyz".charAt(first.wallAxis()) + " = " + ChartStyle.metres(first.wallPositionM()) + " m";
            WallProfilePlot plot = WallProfilePlot.of(p.rows(), "Mean-square " + p.field().description() + " along '"
                + p.set() + "'", p.field() + " field against the distance from the wall " + wall);
            Path png = plot.writePng(folder.resolve("wall-profile-" + safe(p.set()) + "-" + p.field() + ".png"));
            out.add(new Figure("⟨" + p.field() + "²⟩ against the distance from the wall " + wall, png, String.format(
                Locale.ROOT, "Mean square of %s and of its components at the points of '%s' against their distance from"
                    + " the wall %s. Markers: ensemble ± 1 standard error (Isserlis); solid: the mode sum; dashed: free"
                    + " space plus that wall's image (PHYSICS.md §4), which must meet the mode sum near the wall and"
                    + " ignores the other walls; dotted: free space. Tangential E and normal B vanish on the wall.",
                p.field(), p.set(), wall)));
        }
        for (EstimatorSuite.Kernel k : result.kernels()) {
            KernelFallOffPlot plot = KernelFallOffPlot.of(k.points(), k.fits(), k.field()
                + " kernel against separation (mode subspace)", "from the middle of '" + k.set()
                + "' along the line both ways; " + k.regulator());
            Path png = plot.writePng(folder.resolve("kernel-" + k.field() + ".png"));
            String law = k.field() == Field.A ? "K_A = (2ε0c/ħ)·2(2r̂r̂ − δ)/(π²r⁴): positive along, negative across,"
                + " falling as r⁻⁴" : "K_E = (2ε0/ħc) r̂r̂/(π²r²): along the separation only, falling as r⁻²";
            out.add(new Figure(k.field() + " kernel fall-off", png, String.format(Locale.ROOT,
                "The kernel of the sampled density in the mode subspace, K = Σ ρ_l f_l f_lᵀ/(V²σ_l²), between the"
                    + " middle of '%s' and points along the line, from the ensemble's per-mode variances (bias-corrected,"
                    + " exact standard errors), against the mode sum with the drawn variances and the free-space kernel"
                    + " with the same regulator. Free space without regulator: %s. The slopes are fitted with the"
                    + " regulator's free-space effect divided out, errors by jackknife over %d groups of samples; in a"
                    + " small cavity the walls change the slope.", k.set(), law, EstimatorSuite.KERNEL_GROUPS)));
        }
        if (result.convergence() != null) {
            Path png = ConvergencePlot.of(result.convergence(), "Error against sample count").writePng(
                folder.resolve("convergence.png"));
            out.add(new Figure("Convergence with N", png, "Root mean square over the correlation table's rows of the"
                + " error of the estimate from the first N samples, in units of the single-sample standard deviation,"
                + " against N on log–log axes; dashed: 1/√N, which a correct ensemble follows (the prefixes are nested,"
                + " so neighbouring points are correlated)."));
        }
        return out;
    }

    /**
     * Summary lines for the report.
     *
     * @param result the suite's results (null for none)
     * @return section title → lines
     */
    public static Map<String, Map<String, String>> sections(EstimatorSuite.Result result) {
        Map<String, Map<String, String>> out = new LinkedHashMap<>();
        if (result == null) {
            return out;
        }
        GaussianityResult g = result.gaussianity();
        if (g != null) {
            Map<String, String> lines = new LinkedHashMap<>();
            Verdict v = g.verdict();
            lines.put("verdict", (v.passed() ? "PASS" : "FAIL") + String.format(Locale.ROOT, " at α = %s over %d tests"
                + " (Holm)", ReportHtml.percent(v.falseAlarm()), v.tests()));
            List<NormalityTest> family = new ArrayList<>(g.tests().stream().filter(NormalityTest::inVerdict).toList());
            family.sort(Comparator.comparingDouble(NormalityTest::pValue));
            for (int i = 0; i < Math.min(3, family.size()); i++) {
                NormalityTest t = family.get(i);
                lines.put("smallest p, " + (i + 1), String.format(Locale.ROOT, "%s, %s: p = %.3g (Holm-adjusted %.3g)",
                    t.kind(), t.subject(), t.pValue(), t.adjustedP()));
            }
            for (String kind : List.of("pooled-scale", "max-correlation", "mardia-skewness", "mardia-kurtosis")) {
                g.tests().stream().filter(t -> t.kind().equals(kind)).findFirst().ifPresent(t -> lines.put(kind,
                    String.format(Locale.ROOT, "statistic %.4g, p = %.3g; %s", t.statistic(), t.pValue(), t.subject())));
            }
            g.warnings().forEach(w -> lines.put("note", w));
            lines.put("table", "analysis/gaussianity.csv (Kolmogorov–Smirnov per mode also listed, outside the verdict)");
            out.put("Gaussianity and independence", lines);
        }
        Map<String, String> k = new LinkedHashMap<>();
        for (EstimatorSuite.Kernel kr : result.kernels()) {
            for (PowerLawFit f : kr.fits()) {
                k.put(f.quantity(), String.format(Locale.ROOT, "slope %.3f%s over %s–%s m (%d points), free space %.0f",
                    f.exponent(), f.exponentSe() > 0 ? String.format(Locale.ROOT, " ± %.3f", f.exponentSe()) : "",
                    EstimatorCharts.num(f.rMinM()), EstimatorCharts.num(f.rMaxM()), f.points(), f.expected()));
            }
        }
        if (result.convergence() != null) {
            k.put("error against N", String.format(Locale.ROOT, "log–log slope %.3f (expected −0.5), N = %d to %d",
                result.convergence().slope(), result.convergence().points().get(0).samples(),
                result.convergence().points().get(result.convergence().points().size() - 1).samples()));
        }
        for (EstimatorSuite.LineCovariance c : result.covariances()) {
            Verdict v = c.result().verdict();
            k.put("all pairs of " + c.set() + ", " + c.field(), String.format(Locale.ROOT,
                "%s: worst |z| %.3g of %d, critical %.3g", v.passed() ? "pass" : "FAIL", v.worst(), v.tests(),
                v.threshold()));
        }
        for (int n = 0; n < result.notes().size(); n++) {
            k.put("note " + (n + 1), result.notes().get(n));
        }
        if (!k.isEmpty()) {
            out.put("Kernel, convergence and pair tables", k);
        }
        return out;
    }

    /** The diagonal component with the largest mean mode-sum variance over the rows' points. */
    private static int strongestComponent(List<CorrelationRow> rows) {
        double[] sum = new double[3];
        for (CorrelationRow r : rows) {
            if (r.first() == r.second() && r.i() == r.j()) {
                sum[r.i()] += r.analytic();
            }
        }
        int best = 0;
        for (int c = 1; c < 3; c++) {
            if (sum[c] > sum[best]) {
                best = c;
            }
        }
        return best;
    }

    private static int setIndex(RunSpec spec, String name) {
        for (int s = 0; s < spec.pointSets().size(); s++) {
            if (spec.pointSets().get(s).name().equals(name)) {
                return s;
            }
        }
        throw new IllegalArgumentException("no point set named " + name);
    }

    private static String safe(String name) {
        return name.replaceAll("[^A-Za-z0-9_.-]", "_");
    }
}
