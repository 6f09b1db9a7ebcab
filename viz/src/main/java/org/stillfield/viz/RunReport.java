package org.stillfield.viz;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.Set;
import java.util.TreeMap;
import java.util.function.Function;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The human-readable summary of one run: a single {@code index.html} (inline style, no scripts,
 * fonts or remote resources; figures referenced by relative path) and the same content as
 * {@code report.md}.
 *
 * <p>Order of the page: the verdict first, because that is what a reader came for; then the
 * run's settings; the figures; the rows with the largest |z|; and a note on what the numbers
 * are and are not.
 */
public final class RunReport {
    /** Name of the HTML page written into the report folder. */
    public static final String HTML = "index.html";
    /** Name of the Markdown page written into the report folder. */
    public static final String MARKDOWN = "report.md";
    /** Rows listed in the table of largest deviations. */
    public static final int WORST_ROWS = 12;

    static final String NOTE = "The fields in this report come from an idealised model: perfectly conducting walls, a"
        + " lossless uniform filling and a spectral window chosen for the study. They serve design studies and the"
        + " testing of analysis code. They are not a substitute for the laboratory's own calibration of its detector.";

    private RunReport() {
    }

    /**
     * Writes {@code index.html} and {@code report.md} into the folder (created if needed).
     *
     * @param reportFolder output folder
     * @param spec the run's spec
     * @param table the run's modes
     * @param result correlation table and verdict
     * @param facts further lines to list as given (output paths, timings, ...), in map order
     * @param figures figures to show, in order; their PNGs are referenced relative to the folder
     * @return path of {@code index.html}
     * @throws IOException when a file cannot be written
     */
    public static Path write(Path reportFolder, RunSpec spec, ModeTable table, CorrelationResult result,
                             Map<String, String> facts, List<Figure> figures) throws IOException {
        return write(reportFolder, spec, table, result, facts, figures, Map.of());
    }

    /**
     * Like {@link #write(Path, RunSpec, ModeTable, CorrelationResult, Map, List)}, with further
     * titled sections of key–value lines after the run's own (e.g. the extended estimators).
     *
     * @param reportFolder output folder
     * @param spec the run's spec
     * @param table the run's modes
     * @param result correlation table and verdict
     * @param facts further lines to list as given, in map order
     * @param figures figures to show, in order
     * @param extraSections title → lines, in map order
     * @return path of {@code index.html}
     * @throws IOException when a file cannot be written
     */
    public static Path write(Path reportFolder, RunSpec spec, ModeTable table, CorrelationResult result,
                             Map<String, String> facts, List<Figure> figures,
                             Map<String, Map<String, String>> extraSections) throws IOException {
        Objects.requireNonNull(extraSections, "extraSections");
        Objects.requireNonNull(reportFolder, "reportFolder");
        Objects.requireNonNull(spec, "spec");
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(result, "result");
        Objects.requireNonNull(facts, "facts");
        Objects.requireNonNull(figures, "figures");
        Files.createDirectories(reportFolder);
        Content c = Content.of(reportFolder, spec, table, result, facts, figures);
        List<Section> more = new ArrayList<>(c.sections());
        extraSections.forEach((title, lines) -> more.add(new Section(title, new LinkedHashMap<>(lines))));
        c = new Content(c.name(), c.headline(), c.verdict(), c.samples(), c.tests(), List.copyOf(more), c.figures(),
            c.figurePaths(), c.worstHeader(), c.worst(), c.footer());
        Path html = reportFolder.resolve(HTML);
        String page = ReportHtml.render(c);
        String md = ReportMarkdown.render(c);
        // A noise page written beside this one (by the noise step) gets a link ahead of the settings.
        if (Files.isRegularFile(reportFolder.resolve(NoiseReport.HTML))) {
            page = page.replaceFirst("<h2>Settings</h2>", java.util.regex.Matcher.quoteReplacement(
                "<h2>Noise time series</h2>\n<p><a href=\"" + NoiseReport.HTML + "\">Probe time series, spectra, two-time"
                    + " correlations and noise temperatures</a> (separate page, with its own verdict).</p>\n"
                    + "<h2>Settings</h2>"));
            md = md.replaceFirst("## Settings", java.util.regex.Matcher.quoteReplacement("## Noise time series\n\n"
                + "[Probe time series, spectra, two-time correlations and noise temperatures](" + NoiseReport.HTML
                + ") (separate page, with its own verdict).\n\n## Settings"));
        }
        Files.writeString(html, page, StandardCharsets.UTF_8);
        Files.writeString(reportFolder.resolve(MARKDOWN), md, StandardCharsets.UTF_8);
        return html;
    }

    /**
     * Renders the standard figure set into {@code folder}: one correlation plot per line, field
     * and reference point found in the result; heat maps of sample 0 on the first grid (the
     * component with the largest spread over the slice, and the magnitude) for the first field of
     * the run; and the mode-count plot.
     *
     * @param folder where the PNGs go (created if needed)
     * @param spec the run's spec
     * @param table the run's modes
     * @param result correlation table and verdict
     * @param firstSampleValues sample 0's values [3P] over all points of the run, per field; null
     *     (or a function returning null) for no heat maps
     * @return the figures, in report order
     * @throws IOException when a PNG cannot be written
     */
    public static List<Figure> figuresFor(Path folder, RunSpec spec, ModeTable table, CorrelationResult result,
                                          Function<Field, double[]> firstSampleValues) throws IOException {
        Objects.requireNonNull(folder, "folder");
        Objects.requireNonNull(spec, "spec");
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(result, "result");
        ChartStyle.headless();
        Files.createDirectories(folder);
        PointNames names = new PointNames(spec.pointSets());
        List<Figure> out = new ArrayList<>();
        Verdict v = result.verdict();
        double threshold = v != null && v.threshold() > 0 && Double.isFinite(v.threshold()) ? v.threshold() : Double.NaN;

        List<PointSet> sets = spec.pointSets();
        for (int s = 0; s < sets.size(); s++) {
            PointSet set = sets.get(s);
            if (set.kind() != PointSet.Kind.LINE) {
                continue;
            }
            int off = names.offset(s);
            for (Field f : EnumSet.allOf(Field.class)) {
                Map<Integer, List<CorrelationRow>> byRef = new TreeMap<>();
                for (CorrelationRow r : result.rows()) {
                    if (r.field() == f && r.second() >= off && r.second() < off + set.size()) {
                        byRef.computeIfAbsent(r.first(), k -> new ArrayList<>()).add(r);
                    }
                }
                byRef.values().removeIf(list -> list.stream().mapToInt(CorrelationRow::second).distinct().count() < 2);
                for (Map.Entry<Integer, List<CorrelationRow>> e : byRef.entrySet()) {
                    String ref = names.name(e.getKey());
                    boolean onLine = e.getKey() >= off && e.getKey() < off + set.size();
                    Vec3 rp = names.point(e.getKey());
                    // The plot prints coordinates of r itself only when r is on the line.
                    String refLabel = onLine || rp == null ? ref : ref + " " + ChartStyle.point(rp);
                    CorrelationLinePlot plot = CorrelationLinePlot.of(f, set.points(), off, e.getValue())
                        .withReferenceLabel(refLabel)
                        .withThreshold(threshold)
                        .withTitle(CorrelationLinePlot.capitalise(f.description()) + " correlation along '"
                            + set.name() + "'");
                    String file = "correlation-" + safe(set.name()) + "-" + f.name()
                        + (byRef.size() > 1 ? "-r" + e.getKey() : "") + ".png";
                    Path png = plot.writePng(folder.resolve(file));
                    List<String> comps = plot.components().stream().map(TensorComponent::symbol).toList();
                    String cap = String.format(Locale.ROOT,
                        "Components %s of the correlation between the fixed point r = %s and each point r′ of the"
                            + " line '%s'. Markers: the"
                            + " ensemble mean of %s over N = %d samples with ±1 standard error; lines: the analytic"
                            + " mode sum over the same %d modes and window. Lower panel: (estimate − mode sum) /"
                            + " standard error%s.",
                        String.join(", ", comps), ref, set.name(), "F_i(r) F_j(r′)".replace("F", f.name()),
                        result.samples(), table.size(),
                        Double.isFinite(threshold) ? String.format(Locale.ROOT,
                            "; dashed red lines at ±%.3g, the critical |z| of the verdict", threshold) : "");
                    out.add(new Figure(f.name() + " correlation along " + set.name() + " (r = " + ref + ")", png, cap));
                }
            }
        }

        if (firstSampleValues != null) {
            out.addAll(heatMaps(folder, spec, table, names, firstSampleValues));
        }

        Path mc = ModeCountPlot.of(table).writePng(folder.resolve("mode-count.png"));
        out.add(new Figure("Mode count", mc, String.format(Locale.ROOT,
            "Number of modes with resonance at or below f (staircase, %d modes in all) against the cavity's smooth"
                + " estimate (dashed). Lower panel: the difference, which should wander about zero without a trend;"
                + " a missing or doubled family of modes would show as a drift.", table.size())));
        return out;
    }

    private static List<Figure> heatMaps(Path folder, RunSpec spec, ModeTable table, PointNames names,
                                         Function<Field, double[]> values) throws IOException {
        List<PointSet> sets = spec.pointSets();
        int g = -1;
        for (int s = 0; s < sets.size() && g < 0; s++) {
            if (sets.get(s).kind() == PointSet.Kind.GRID) {
                g = s;
            }
        }
        Set<Field> fields = spec.fields();
        if (g < 0 || fields.isEmpty()) {
            return List.of();
        }
        Field field = fields.iterator().next();
        double[] run = values.apply(field);
        if (run == null) {
            return List.of();
        }
        PointSet grid = sets.get(g);
        int off = names.offset(g);
        GridSlice.Plane plane = GridSlice.planeOf(grid);
        String best = "x";
        double bestVar = -1;
        for (String c : List.of("x", "y", "z")) {
            double var = spread(GridSlice.fromGrid(grid, off, field, c, run));
            if (var > bestVar) {
                bestVar = var;
                best = c;
            }
        }
        var outline = CavityOutline.inPlane(table.cavity(), plane);
        int[] n = grid.dims();
        String cells = n[plane.uAxis()] + " × " + n[plane.vAxis()] + " cells";
        List<Figure> out = new ArrayList<>();
        for (String c : List.of(best, GridSlice.MAGNITUDE)) {
            GridSlice slice = GridSlice.fromGrid(grid, off, field, c, run);
            slice = slice.withTitle(slice.title() + "  (sample 0)");
            FieldSliceHeatMap map = FieldSliceHeatMap.of(slice).withOutline(outline)
                .withSubtitle("grid '" + grid.name() + "', " + cells + "; black line: cavity wall");
            String file = "slice-" + safe(grid.name()) + "-" + field.name() + "-" + c + ".png";
            Path png = map.writePng(folder.resolve(file));
            String what = slice.isMagnitude() ? "|" + field.name() + "|" : field.column("xyz".indexOf(c));
            String scaleNote = slice.isMagnitude()
                ? "Sequential colour scale from zero."
                : "Colour scale symmetric about zero (white); this component had the largest spread over the slice.";
            out.add(new Figure(what + " of sample 0 on " + plane.describe(), png, String.format(Locale.ROOT,
                "%s of a single draw (sample 0) on the plane %s of grid '%s'. One draw from the ensemble, not an"
                    + " average: the pattern changes from sample to sample, while its typical size follows from"
                    + " the modes and the window. %s", what, plane.describe(), grid.name(), scaleNote)));
        }
        return out;
    }

    /** Variance over the finite cells of a slice (0 when fewer than two). */
    private static double spread(GridSlice s) {
        double sum = 0;
        double sum2 = 0;
        int n = 0;
        for (double[] row : s.values()) {
            for (double v : row) {
                if (Double.isFinite(v)) {
                    sum += v;
                    sum2 += v * v;
                    n++;
                }
            }
        }
        if (n < 2) {
            return 0;
        }
        double mean = sum / n;
        return Math.max(0, sum2 / n - mean * mean);
    }

    private static String safe(String name) {
        return name.replaceAll("[^A-Za-z0-9_.-]", "_");
    }

    /** Everything the two renderers print, computed once so HTML and Markdown agree. */
    record Content(String name, String headline, Verdict verdict, long samples, int tests,
                   List<Section> sections, List<Figure> figures, List<String> figurePaths,
                   List<String[]> worstHeader, List<String[]> worst, String footer) {
        static Content of(Path folder, RunSpec spec, ModeTable table, CorrelationResult result,
                          Map<String, String> facts, List<Figure> figures) {
            Cavity cav = spec.cavity();
            PointNames names = new PointNames(spec.pointSets());
            List<Section> sections = new ArrayList<>();

            Map<String, String> cavity = new LinkedHashMap<>();
            cavity.put("shape", cav.shape());
            for (Map.Entry<String, Double> e : cav.parameters().entrySet()) {
                cavity.put(parameterName(e.getKey()), parameterValue(e.getKey(), e.getValue()));
            }
            cavity.put("volume", num(cav.volume()) + " m³ (" + num(cav.volume() * 1e6) + " cm³)");
            Medium m = cav.medium();
            cavity.put("filling", m.epsilonR() == 1.0 && m.muR() == 1.0 ? "empty (ε_r = 1, μ_r = 1)"
                : String.format(Locale.ROOT, "ε_r = %s, μ_r = %s (wave speed %.6g m/s)", num(m.epsilonR()),
                num(m.muR()), m.waveSpeed()));
            cavity.put("walls", "perfect electric conductor");
            sections.add(new Section("Cavity", cavity));

            Map<String, String> field = new LinkedHashMap<>();
            field.put("state", spec.state().isVacuum() ? "vacuum (T = 0)"
                : String.format(Locale.ROOT, "thermal, T = %s K", num(spec.state().temperatureKelvin())));
            Window w = spec.window();
            field.put("window", windowText(w));
            field.put("cutoff f_c", ghz(w.omegaC()));
            if (w.kind() != Window.Kind.HARD) {
                field.put("truncation", String.format(Locale.ROOT, "modes with W < %s dropped: enumerated up to %s",
                    num(w.tolerance()), ghz(w.truncationOmega())));
                for (Field f : spec.fields()) {
                    field.put("dropped share of ⟨" + f.name() + "²⟩", String.format(Locale.ROOT,
                        "%.3g (smooth-density estimate)", w.neglectedFraction(f)));
                }
            }
            List<String> fl = new ArrayList<>();
            for (Field f : spec.fields()) {
                fl.add(f.name() + " (" + f.description() + ", " + ChartStyle.prettyUnit(f.unit()) + ")");
            }
            field.put("fields", String.join("; ", fl));
            sections.add(new Section("Field, state and window", field));

            Map<String, String> run = new LinkedHashMap<>();
            run.put("samples", Long.toString(spec.samples()));
            run.put("seed", Long.toString(spec.seed()));
            run.put("modes", String.format(Locale.ROOT, "%d (limit %d)", table.size(), spec.maxModes()));
            if (table.size() > 0) {
                run.put("lowest mode", String.format(Locale.ROOT, "%s at %.6g GHz", table.modes().get(0).label(),
                    table.frequency(0) / 1e9));
                run.put("highest mode", String.format(Locale.ROOT, "%s at %.6g GHz",
                    table.modes().get(table.size() - 1).label(), table.frequency(table.size() - 1) / 1e9));
            }
            for (PointSet s : spec.pointSets()) {
                run.put("points: " + s.name(), describe(s));
            }
            run.put("correlation pairs", Integer.toString(spec.pairs().size()));
            run.put("precision", spec.precision().name().toLowerCase(Locale.ROOT));
            run.put("constants", PhysicalConstants.SET);
            sections.add(new Section("Run", run));

            if (!facts.isEmpty()) {
                sections.add(new Section("Outputs and notes", new LinkedHashMap<>(facts)));
            }

            String headline = String.format(Locale.ROOT, "%s field of a %s cavity (%s): %s, %d samples",
                spec.state().isVacuum() ? "Vacuum" : "Thermal", cav.shape(), dimensions(cav),
                String.join(", ", spec.fields().stream().map(Field::name).toList()),
                result.samples());

            List<String> paths = new ArrayList<>();
            Path base = folder.toAbsolutePath().normalize();
            for (Figure f : figures) {
                Path p = f.png().toAbsolutePath().normalize();
                String rel;
                try {
                    rel = base.relativize(p).toString();
                } catch (IllegalArgumentException ex) {
                    // Different roots (another drive): fall back to the absolute path.
                    rel = p.toUri().toString();
                }
                paths.add(rel.replace('\\', '/'));
            }

            List<CorrelationRow> sorted = new ArrayList<>(result.rows());
            sorted.sort(Comparator.comparingDouble((CorrelationRow r) -> Double.isNaN(r.z()) ? -1 : Math.abs(r.z()))
                .reversed());
            // Values in the same SI-prefixed units as the figures: one prefix per field.
            Map<Field, Double> largest = new java.util.EnumMap<>(Field.class);
            for (CorrelationRow r : result.rows()) {
                double a = Math.max(Math.abs(r.analytic()), Math.abs(r.estimate()));
                if (Double.isFinite(a)) {
                    largest.merge(r.field(), a, Math::max);
                }
            }
            List<String[]> worst = new ArrayList<>();
            for (int k = 0; k < Math.min(WORST_ROWS, sorted.size()); k++) {
                CorrelationRow r = sorted.get(k);
                UnitScale us = UnitScale.forCorrelation(r.field().unit(), largest.getOrDefault(r.field(), 0.0));
                worst.add(new String[] {
                    r.field().name(), new TensorComponent(r.i(), r.j()).symbol(),
                    names.name(r.first()), names.name(r.second()),
                    fixed(us.apply(r.estimate())), fixed(us.apply(r.analytic())), fixed(us.apply(r.standardError())),
                    String.format(Locale.ROOT, "%+.2f", r.z()), us.label()});
            }
            List<String[]> header = List.<String[]>of(new String[] {"field", "component", "r", "r′", "estimate",
                "mode sum", "std. error", "z", "unit"});

            String footer = NOTE;
            Verdict v = result.verdict();
            return new Content(spec.name(), headline, v, result.samples(), v == null ? 0 : v.tests(),
                sections, List.copyOf(figures), paths, header, worst, footer);
        }
    }

    /**
     * A titled list of key–value lines.
     *
     * @param title heading
     * @param lines key → value, in display order
     */
    record Section(String title, Map<String, String> lines) {
    }

    static String verdictWord(Verdict v) {
        if (v == null) {
            return "NO VERDICT";
        }
        return v.passed() ? "PASS" : "FAIL";
    }

    static String verdictSentence(Verdict v) {
        if (v == null) {
            return "No validation was run for this ensemble.";
        }
        if (v.passed()) {
            return String.format(Locale.ROOT, "The ensemble agrees with the analytic mode sum: all %d statistics lie"
                + " within the critical |z| = %.3g (largest %.3g).", v.tests(), v.threshold(), v.worst());
        }
        return String.format(Locale.ROOT, "The ensemble disagrees with the analytic mode sum: the largest of %d"
            + " statistics is %.3g, beyond the critical |z| = %.3g.", v.tests(), v.worst(), v.threshold());
    }

    static String windowText(Window w) {
        switch (w.kind()) {
            case HARD:
                return "hard: W = 1 up to f_c, no modes above";
            case EXP:
                return "exponential: W = exp(−f/f_c)";
            default:
                return "Gaussian: W = exp(−(f/f_c)²)";
        }
    }

    static String ghz(double omega) {
        return num(omega / (2 * Math.PI) / 1e9) + " GHz";
    }

    static String num(double v) {
        return ChartStyle.trimZeros(String.format(Locale.ROOT, "%.6g", v));
    }

    /**
     * Four decimals for values already scaled to one to three digits before the point; values
     * that round to zero there (e.g. a vanishing mode sum) are printed in full precision.
     */
    static String fixed(double v) {
        if (!Double.isFinite(v)) {
            return String.valueOf(v);
        }
        if (v != 0 && Math.abs(v) < 5e-5) {
            return ChartStyle.trimZeros(String.format(Locale.ROOT, "%.2e", v));
        }
        return String.format(Locale.ROOT, "%.4f", v);
    }

    static String parameterName(String key) {
        return ChartStyle.parameterName(key);
    }

    /** A parameter with its unit; lengths also in millimetres, the size a cavity is drawn in. */
    static String parameterValue(String key, double v) {
        String unit = ChartStyle.parameterUnit(key);
        if (unit.equals("m")) {
            return String.format(Locale.ROOT, "%s m (%s mm)", num(v), num(v * 1e3));
        }
        return num(v) + (unit.isEmpty() ? "" : " " + unit);
    }

    private static String dimensions(Cavity cav) {
        List<String> parts = new ArrayList<>();
        for (Map.Entry<String, Double> e : cav.parameters().entrySet()) {
            parts.add(parameterName(e.getKey()) + " = " + parameterValue(e.getKey(), e.getValue())
                .replaceFirst(" \\(.*\\)$", ""));
        }
        return String.join(", ", parts);
    }

    private static String describe(PointSet s) {
        List<Vec3> p = s.points();
        switch (s.kind()) {
            case POINT:
                return "point at " + ChartStyle.point(p.get(0));
            case LINE:
                return String.format(Locale.ROOT, "line of %d points from %s to %s", s.size(),
                    ChartStyle.point(p.get(0)).replace(" m", ""), ChartStyle.point(p.get(p.size() - 1)));
            default: {
                int[] d = s.dims();
                return String.format(Locale.ROOT, "grid %d × %d × %d (%d cell centres)", d[0], d[1], d[2], s.size());
            }
        }
    }
}
