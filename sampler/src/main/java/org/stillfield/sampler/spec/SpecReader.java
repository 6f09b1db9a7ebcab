package org.stillfield.sampler.spec;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.snakeyaml.engine.v2.api.Load;
import org.snakeyaml.engine.v2.api.LoadSettings;
import org.snakeyaml.engine.v2.exceptions.MarkedYamlEngineException;
import org.snakeyaml.engine.v2.exceptions.YamlEngineException;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.timeseries.LossModel;
import org.stillfield.sampler.timeseries.TimeSeriesSpec;

/**
 * Reads a YAML run spec (see {@code runs/} for commented examples) into a {@link RunSpec}, or
 * fails with one {@link SpecException} naming the setting and the allowed range.
 */
public final class SpecReader {
    /** Largest number of evaluation points a spec may request. */
    public static final int MAX_POINTS = 4_000_000;

    private static final List<String> TOP = List.of("name", "cavity", "state", "fields", "window", "samples", "seed",
        "evaluate", "output", "analysis", "limits", "threads", "timeseries", "probes");
    private static final Pattern REF = Pattern.compile("([A-Za-z0-9_.-]+)\\[(\\d+)]");

    private SpecReader() {
    }

    /**
     * @param file spec file; relative output folders resolve against its folder
     * @return the validated spec
     * @throws SpecException when the file is unreadable or any setting is wrong
     */
    public static RunSpec read(Path file) throws SpecException {
        String text;
        try {
            text = Files.readString(file, StandardCharsets.UTF_8);
        } catch (java.nio.file.NoSuchFileException ex) {
            throw new SpecException("", "spec file " + file + " does not exist");
        } catch (IOException | RuntimeException ex) {
            throw new SpecException("", "cannot read spec file " + file + ": " + ex.getMessage());
        }
        Path base = file.toAbsolutePath().getParent();
        String stem = file.getFileName().toString().replaceFirst("\\.ya?ml$", "");
        return parse(text, base, stem);
    }

    /**
     * @param text YAML text
     * @param baseFolder folder relative output paths resolve against
     * @param defaultName run name when the spec has none
     * @return the validated spec
     * @throws SpecException when any setting is wrong
     */
    public static RunSpec parse(String text, Path baseFolder, String defaultName) throws SpecException {
        Object doc;
        try {
            doc = new Load(LoadSettings.builder().setAllowDuplicateKeys(false).build()).loadFromString(text);
        } catch (MarkedYamlEngineException ex) {
            String where = ex.getProblemMark().map(m -> " at line " + (m.getLine() + 1) + ", column " + (m.getColumn() + 1))
                .orElse("");
            throw new SpecException("", "not valid YAML" + where + ": " + ex.getProblem());
        } catch (YamlEngineException ex) {
            throw new SpecException("", "not valid YAML: " + ex.getMessage());
        }
        if (doc == null) {
            throw new SpecException("", "the spec is empty; it needs at least cavity, window and samples");
        }
        SpecNode root = SpecNode.of("", doc);
        root.rejectUnknown(TOP);

        String name = root.string("name", defaultName);
        if (!name.matches("[A-Za-z0-9_.-]{1,80}")) {
            throw new SpecException("name", "must be 1-80 letters, digits, '_', '-' or '.', got '" + name + "'");
        }
        Cavity cavity = cavity(root.child("cavity"));
        ThermalState state = state(root.child("state"));
        Set<Field> fields = fields(root);
        Window window = window(root.child("window"));
        long samples = root.integer("samples", -1, 1, 1_000_000_000L);
        if (samples < 0) {
            throw new SpecException("samples", "is required: a whole number in [1, 1000000000]");
        }
        long seed = root.integer("seed", 1, Long.MIN_VALUE, Long.MAX_VALUE);
        List<PointSet> sets = evaluate(root.child("evaluate"), cavity);
        timeSeries(root, cavity, samples); // validated now so bad input fails early; see timeSeries(RunSpec)

        SpecNode out = root.child("output");
        out.rejectUnknown(List.of("folder", "precision", "compression", "part_samples", "shard"));
        String folder = out.string("folder", "out/" + name);
        Path outputFolder = baseFolder.resolve(folder).normalize();
        RunSpec.Precision precision = RunSpec.Precision.valueOf(
            out.choice("precision", "float64", List.of("float64", "float32")).toUpperCase(Locale.ROOT));
        RunSpec.Compression compression = RunSpec.Compression.valueOf(
            out.choice("compression", "zstd", List.of("zstd", "snappy", "none")).toUpperCase(Locale.ROOT));
        long partSamples = out.integer("part_samples", 0, 1, 1_000_000_000L);
        Shard shard = Shard.ALL;
        if (out.has("shard")) {
            Object raw = out.raw("shard");
            if (!(raw instanceof String)) {
                throw new SpecException(out.at("shard"), "must be \"i/N\" (shard i of N, 0 <= i < N), e.g. \"0/8\","
                    + " got " + SpecNode.describe(raw));
            }
            try {
                shard = Shard.parse((String) raw);
            } catch (IllegalArgumentException ex) {
                throw new SpecException(out.at("shard"), ex.getMessage());
            }
        }

        SpecNode analysis = root.child("analysis");
        analysis.rejectUnknown(List.of("pairs", "false_alarm"));
        double falseAlarm = analysis.number("false_alarm", 0.01);
        if (!(falseAlarm > 0 && falseAlarm < 0.5)) {
            throw new SpecException(analysis.at("false_alarm"), "must lie in (0, 0.5), got " + falseAlarm);
        }
        List<RunSpec.PointPair> pairs = pairs(analysis, sets);

        SpecNode limits = root.child("limits");
        limits.rejectUnknown(List.of("max_modes", "max_output_GB", "max_memory_GB"));
        long maxModes = limits.integer("max_modes", 200_000, 1, 50_000_000);
        double maxOutputGB = limit(limits, "max_output_GB");
        double maxMemoryGB = limit(limits, "max_memory_GB");
        long threads = root.integer("threads", 0, 0, 1024);
        int nThreads = threads == 0 ? Runtime.getRuntime().availableProcessors() : (int) threads;

        return new RunSpec(name, cavity, state, fields, window, samples, seed, sets, outputFolder, precision, pairs,
            falseAlarm, maxModes, nThreads, text, new RunSpec.Storage(partSamples, shard, maxOutputGB, maxMemoryGB,
                compression));
    }

    /** A size limit in GB (10⁹ bytes): positive and finite when given; +∞ when absent. */
    private static double limit(SpecNode limits, String key) throws SpecException {
        if (!limits.has(key)) {
            return Double.POSITIVE_INFINITY;
        }
        double v = limits.number(key);
        if (!(v > 0) || !Double.isFinite(v)) {
            throw new SpecException(limits.at(key), "must be a positive, finite number of GB (1 GB = 1e9 bytes), got " + v);
        }
        return v;
    }

    /**
     * The noise time-series sections ({@code timeseries:} and {@code probes:}) of a spec.
     *
     * <p>They are parsed again from {@link RunSpec#sourceText()} rather than carried as a component of
     * {@link RunSpec}, so that the record's shape (and every caller that builds or copies it) stays as it
     * is; {@link #parse} has already validated the same text, so this fails only for a spec that was not
     * made by this reader. The default number of trajectories is {@code spec.samples()}, so a command-line
     * override of the sample count carries over when {@code timeseries.samples} is absent.
     *
     * @param spec a spec made by this reader
     * @return the sections, or empty when the spec has no {@code timeseries:} section
     * @throws SpecException naming the first bad setting
     */
    public static Optional<TimeSeriesSpec> timeSeries(RunSpec spec) throws SpecException {
        Object doc;
        try {
            doc = new Load(LoadSettings.builder().setAllowDuplicateKeys(false).build()).loadFromString(spec.sourceText());
        } catch (YamlEngineException ex) {
            throw new SpecException("", "not valid YAML: " + ex.getMessage());
        }
        return timeSeries(SpecNode.of("", doc), spec.cavity(), spec.samples());
    }

    private static Optional<TimeSeriesSpec> timeSeries(SpecNode root, Cavity cavity, long samples)
        throws SpecException {
        if (!root.has("timeseries")) {
            if (root.has("probes")) {
                throw new SpecException("probes", "needs a timeseries section (time step and steps) to read the probes");
            }
            return Optional.empty();
        }
        TimeSeriesSpec ts = TimeSeriesSpec.read(root.child("timeseries"), root.children("probes"), cavity, samples);
        if (ts.probes().isEmpty()) {
            throw new SpecException("probes", "the timeseries section needs at least one probe (dipole,"
                + " smeared_dipole, loop or field)");
        }
        for (int i = 0; i < ts.probes().size(); i++) {
            // The time-series table's own columns (TimeSeriesWriter.RESERVED); probe columns take the probe's name.
            if (List.of("sample", "step", "t_s").contains(ts.probes().get(i).name())) {
                throw new SpecException("probes[" + i + "].name", "'" + ts.probes().get(i).name() + "' is reserved for a"
                    + " column of the time-series table (sample, step, t_s); choose another name");
            }
        }
        if (ts.samples() < 2) {
            throw new SpecException("timeseries.samples", "must be at least 2 (standard errors come from the spread"
                + " over trajectories), got " + ts.samples());
        }
        if (usesWallLoss(ts.loss()) && !(cavity instanceof org.stillfield.sampler.geometry.RectangularCavity)) {
            throw new SpecException("timeseries.loss.wall_sigma_S_per_m", "is implemented for cavity shape box only,"
                + " got shape " + cavity.shape() + "; give timeseries.loss.q instead");
        }
        return Optional.of(ts);
    }

    private static boolean usesWallLoss(LossModel loss) {
        if (loss instanceof LossModel.WallConductivity) {
            return true;
        }
        if (loss instanceof LossModel.Combined) {
            for (LossModel part : ((LossModel.Combined) loss).parts()) {
                if (usesWallLoss(part)) {
                    return true;
                }
            }
        }
        return false;
    }

    private static Cavity cavity(SpecNode node) throws SpecException {
        if (!node.has("shape")) {
            throw new SpecException(node.at("shape"), "is required; allowed: " + String.join(", ", Geometries.shapes()));
        }
        String shape = node.choice("shape", null, Geometries.shapes());
        List<String> known = new ArrayList<>(List.of("shape", "eps_r", "mu_r"));
        known.addAll(Geometries.keys(shape));
        node.rejectUnknown(known);
        double eps = node.number("eps_r", 1.0);
        if (!(eps >= 1) || !Double.isFinite(eps)) {
            throw new SpecException(node.at("eps_r"), "must be finite and at least 1, got " + eps);
        }
        double mu = node.number("mu_r", 1.0);
        if (!(mu > 0) || !Double.isFinite(mu)) {
            throw new SpecException(node.at("mu_r"), "must be positive and finite, got " + mu);
        }
        try {
            return Geometries.read(shape, node, new Medium(eps, mu));
        } catch (IllegalArgumentException ex) {
            throw new SpecException(node.at(shape), ex.getMessage());
        }
    }

    private static ThermalState state(SpecNode node) throws SpecException {
        node.rejectUnknown(List.of("kind", "temperature_K"));
        String kind = node.choice("kind", "vacuum", List.of("vacuum", "thermal"));
        if (kind.equals("vacuum")) {
            if (node.has("temperature_K")) {
                throw new SpecException(node.at("temperature_K"), "only applies to kind: thermal");
            }
            return ThermalState.VACUUM;
        }
        if (!node.has("temperature_K")) {
            throw new SpecException(node.at("temperature_K"), "is required for a thermal state (kelvin, > 0)");
        }
        double t = node.number("temperature_K");
        if (!(t > 0) || !Double.isFinite(t)) {
            throw new SpecException(node.at("temperature_K"), "must be positive and finite (kelvin), got " + t);
        }
        return new ThermalState(t);
    }

    private static Set<Field> fields(SpecNode root) throws SpecException {
        if (!root.has("fields")) {
            return EnumSet.of(Field.E, Field.B);
        }
        List<Object> items = root.list("fields");
        if (items.isEmpty()) {
            throw new SpecException("fields", "must list at least one of A, E, B");
        }
        Set<Field> out = EnumSet.noneOf(Field.class);
        for (Object o : items) {
            String s = String.valueOf(o).trim().toUpperCase(Locale.ROOT);
            try {
                out.add(Field.valueOf(s));
            } catch (IllegalArgumentException ex) {
                throw new SpecException("fields", "unknown field '" + o + "'; allowed: A, E, B");
            }
        }
        return out;
    }

    private static Window window(SpecNode node) throws SpecException {
        node.rejectUnknown(List.of("kind", "cutoff_Hz", "cutoff_GHz", "omega_c_rad_s", "tolerance"));
        String kind = node.choice("kind", "hard", List.of("hard", "exp", "gauss"));
        int given = (node.has("cutoff_Hz") ? 1 : 0) + (node.has("cutoff_GHz") ? 1 : 0) + (node.has("omega_c_rad_s") ? 1 : 0);
        if (given != 1) {
            throw new SpecException(node.at("cutoff_GHz"),
                "give exactly one of cutoff_Hz, cutoff_GHz (f_c) or omega_c_rad_s (ω_c), got " + given);
        }
        double omegaC;
        if (node.has("cutoff_Hz")) {
            omegaC = 2 * Math.PI * node.positive("cutoff_Hz", "Hz");
        } else if (node.has("cutoff_GHz")) {
            omegaC = 2 * Math.PI * 1e9 * node.positive("cutoff_GHz", "GHz");
        } else {
            omegaC = node.positive("omega_c_rad_s", "rad/s");
        }
        double tol = node.number("tolerance", Window.DEFAULT_TOLERANCE);
        if (!(tol >= 1e-300 && tol < 0.5)) {
            throw new SpecException(node.at("tolerance"), "must lie in [1e-300, 0.5), got " + tol);
        }
        return new Window(Window.Kind.valueOf(kind.toUpperCase(Locale.ROOT)), omegaC, tol);
    }

    private static List<PointSet> evaluate(SpecNode node, Cavity cavity) throws SpecException {
        node.rejectUnknown(List.of("points", "lines", "grids"));
        List<PointSet> sets = new ArrayList<>();
        Map<String, String> names = new HashMap<>();
        long total = 0;
        for (SpecNode p : node.children("points")) {
            p.rejectUnknown(List.of("name", "at"));
            String n = setName(p, names);
            Vec3 r = inside(p, "at", cavity);
            sets.add(PointSet.point(n, r));
            total += 1;
        }
        for (SpecNode l : node.children("lines")) {
            l.rejectUnknown(List.of("name", "from", "to", "n"));
            String n = setName(l, names);
            Vec3 a = withinBounds(l, "from", cavity);
            Vec3 b = withinBounds(l, "to", cavity);
            int count = (int) l.integer("n", 21, 2, MAX_POINTS);
            sets.add(PointSet.line(n, a, b, count));
            total += count;
        }
        for (SpecNode g : node.children("grids")) {
            g.rejectUnknown(List.of("name", "from", "to", "n"));
            String n = setName(g, names);
            Vec3[] bounds = cavity.bounds();
            Vec3 a = g.has("from") ? withinBounds(g, "from", cavity) : bounds[0];
            Vec3 b = g.has("to") ? withinBounds(g, "to", cavity) : bounds[1];
            List<Object> dims = g.list("n");
            if (dims.size() != 3) {
                throw new SpecException(g.at("n"), "must be three whole numbers [nx, ny, nz], each >= 1");
            }
            long[] nd = new long[3];
            for (int i = 0; i < 3; i++) {
                Object o = dims.get(i);
                if (!(o instanceof Integer || o instanceof Long) || ((Number) o).longValue() < 1
                    || ((Number) o).longValue() > MAX_POINTS) {
                    throw new SpecException(g.at("n") + "[" + i + "]", "must be a whole number in [1, " + MAX_POINTS
                        + "], got " + o);
                }
                nd[i] = ((Number) o).longValue();
            }
            // Three sizes up to MAX_POINTS each can overflow a long product: compare in double first.
            if ((double) nd[0] * nd[1] * nd[2] > MAX_POINTS) {
                throw new SpecException(g.at("n"), "grid of " + nd[0] + " x " + nd[1] + " x " + nd[2]
                    + " points exceeds the limit of " + MAX_POINTS);
            }
            long count = nd[0] * nd[1] * nd[2];
            sets.add(PointSet.grid(n, a, b, (int) nd[0], (int) nd[1], (int) nd[2]));
            total += count;
        }
        if (total > MAX_POINTS) {
            throw new SpecException("evaluate", total + " points in all exceed the limit of " + MAX_POINTS);
        }
        return sets;
    }

    private static String setName(SpecNode n, Map<String, String> seen) throws SpecException {
        String name = n.string("name");
        if (!name.matches("[A-Za-z0-9_.-]{1,40}")) {
            throw new SpecException(n.at("name"), "must be 1-40 letters, digits, '_', '-' or '.', got '" + name + "'");
        }
        if (seen.put(name, name) != null) {
            throw new SpecException(n.at("name"), "'" + name + "' is used twice; point-set names must be unique");
        }
        return name;
    }

    private static Vec3 inside(SpecNode n, String key, Cavity cavity) throws SpecException {
        double[] t = n.triple(key);
        Vec3 r = new Vec3(t[0], t[1], t[2]);
        if (!cavity.contains(r)) {
            Vec3[] b = cavity.bounds();
            throw new SpecException(n.at(key), String.format("point (%g, %g, %g) m lies outside the cavity (bounds %s to %s)",
                r.x(), r.y(), r.z(), fmt(b[0]), fmt(b[1])));
        }
        return r;
    }

    /** Lines and grids may cross the outside of a curved cavity; their points there are masked. */
    private static Vec3 withinBounds(SpecNode n, String key, Cavity cavity) throws SpecException {
        double[] t = n.triple(key);
        Vec3 r = new Vec3(t[0], t[1], t[2]);
        Vec3[] b = cavity.bounds();
        for (int i = 0; i < 3; i++) {
            if (r.get(i) < b[0].get(i) || r.get(i) > b[1].get(i)) {
                throw new SpecException(n.at(key), String.format("point (%g, %g, %g) m lies outside the cavity's bounds %s to %s",
                    r.x(), r.y(), r.z(), fmt(b[0]), fmt(b[1])));
            }
        }
        return r;
    }

    private static String fmt(Vec3 v) {
        return String.format("(%g, %g, %g)", v.x(), v.y(), v.z());
    }

    private static List<RunSpec.PointPair> pairs(SpecNode analysis, List<PointSet> sets) throws SpecException {
        Map<String, int[]> ranges = new LinkedHashMap<>();
        int offset = 0;
        for (PointSet s : sets) {
            ranges.put(s.name(), new int[] {offset, s.size()});
            offset += s.size();
        }
        List<RunSpec.PointPair> out = new ArrayList<>();
        if (analysis.has("pairs")) {
            List<Object> items = analysis.list("pairs");
            for (int i = 0; i < items.size(); i++) {
                String path = analysis.at("pairs") + "[" + i + "]";
                Object item = items.get(i);
                if (!(item instanceof List) || ((List<?>) item).size() != 2) {
                    throw new SpecException(path, "must be [first, second]: a point 'set[i]' (or a one-point set's name)"
                        + " and a point or a whole set's name");
                }
                int first = single(path, String.valueOf(((List<?>) item).get(0)), ranges);
                for (int j : many(path, String.valueOf(((List<?>) item).get(1)), ranges)) {
                    out.add(new RunSpec.PointPair(first, j));
                }
            }
            return out;
        }
        // Default: every line's midpoint against the whole line, every lone point with itself.
        offset = 0;
        for (PointSet s : sets) {
            if (s.kind() == PointSet.Kind.LINE) {
                int mid = offset + s.size() / 2;
                for (int j = 0; j < s.size(); j++) {
                    out.add(new RunSpec.PointPair(mid, offset + j));
                }
            } else if (s.kind() == PointSet.Kind.POINT) {
                out.add(new RunSpec.PointPair(offset, offset));
            }
            offset += s.size();
        }
        if (out.isEmpty() && !sets.isEmpty()) {
            int c = ranges.values().iterator().next()[1] / 2;
            out.add(new RunSpec.PointPair(c, c));
        }
        return out;
    }

    private static int single(String path, String ref, Map<String, int[]> ranges) throws SpecException {
        int[] r = resolve(path, ref, ranges);
        if (r[1] != 1) {
            throw new SpecException(path, "'" + ref + "' names " + r[1] + " points; the first of a pair must be one point");
        }
        return r[0];
    }

    private static int[] many(String path, String ref, Map<String, int[]> ranges) throws SpecException {
        int[] r = resolve(path, ref, ranges);
        int[] out = new int[r[1]];
        for (int i = 0; i < r[1]; i++) {
            out[i] = r[0] + i;
        }
        return out;
    }

    private static int[] resolve(String path, String ref, Map<String, int[]> ranges) throws SpecException {
        Matcher m = REF.matcher(ref.trim());
        String name = m.matches() ? m.group(1) : ref.trim();
        int[] range = ranges.get(name);
        if (range == null) {
            throw new SpecException(path, "no point set named '" + name + "'; known: " + String.join(", ", ranges.keySet())
                + SpecNode.suggestion(name, ranges.keySet()));
        }
        if (!m.matches()) {
            return range;
        }
        String digits = m.group(2);
        // \d+ can exceed a long; any index that long is out of range anyway.
        long i = digits.length() > 18 ? Long.MAX_VALUE : Long.parseLong(digits);
        if (i >= range[1]) {
            throw new SpecException(path, "index " + digits + " is out of range for '" + name + "' (0 to " + (range[1] - 1) + ")");
        }
        return new int[] {range[0] + (int) i, 1};
    }
}
