package org.stillfield.analysis;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.stillfield.analysis.api.ConvergencePoint;
import org.stillfield.analysis.api.GaussianityResult;
import org.stillfield.analysis.api.KernelPoint;
import org.stillfield.analysis.api.NormalityTest;
import org.stillfield.analysis.api.PowerLawFit;
import org.stillfield.analysis.api.SeparationBin;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.analysis.api.WallProfileRow;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Version;

/**
 * Writes the results of an {@link EstimatorSuite} into an analysis folder. One CSV per table (one
 * header line, comma separated, SI units, numbers in Java's shortest round-trip form, an empty cell
 * where a reference is not available) and one JSON summary, {@code estimators.json}, that lists the
 * files, the verdicts, the fits and the notes. Files are written to a temporary sibling and moved
 * into place.
 *
 * <ul>
 *   <li>{@code covariance-SET-F.csv}: the columns of {@code correlations.csv} ({@link CorrelationTables}),
 *       one row per unordered pair of the line's points and component pair;</li>
 *   <li>{@code separation-SET-F.csv}: field, set, bin, low_m, high_m, mean_m, pairs, parallel,
 *       parallel_se, perpendicular, perpendicular_se, mode_sum_parallel, mode_sum_perpendicular,
 *       free_parallel, free_perpendicular, image_parallel, image_perpendicular, z_parallel,
 *       z_perpendicular, unit;</li>
 *   <li>{@code wall-profile-SET-F.csv}: field, set, point, point_name, x_m, y_m, z_m, distance_m,
 *       wall_axis, wall_position_m, component (x, y, z, sum), estimate, standard_error, mode_sum,
 *       plane_image, free_space, z, unit;</li>
 *   <li>{@code kernel-F.csv}: field, separation_m, parallel, parallel_se, perpendicular,
 *       perpendicular_se, mode_sum_parallel, mode_sum_perpendicular, free_parallel,
 *       free_perpendicular, ideal_parallel, ideal_perpendicular, z_parallel, z_perpendicular, unit
 *       (1/((field unit)^2 m^6));</li>
 *   <li>{@code gaussianity.csv}: kind, subject, n, statistic, p_value, holm_adjusted_p, in_verdict;</li>
 *   <li>{@code convergence.csv}: samples, rms_error, expected, rows.</li>
 * </ul>
 */
public final class EstimatorTables {
    /** Name and revision of the summary layout. */
    public static final String FORMAT = "stillfield-estimators/1";
    /** Name of the summary file. */
    public static final String SUMMARY = "estimators.json";

    private static final ObjectMapper JSON = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    private EstimatorTables() {
    }

    /**
     * @param result the suite's results
     * @param folder the analysis folder (created if needed)
     * @param points all evaluation points, metres
     * @param pointNames one name per point
     * @return the files written, summary last
     * @throws IOException when a file cannot be written
     */
    public static List<Path> write(EstimatorSuite.Result result, Path folder, List<Vec3> points, List<String> pointNames)
        throws IOException {
        Objects.requireNonNull(result, "result");
        Objects.requireNonNull(folder, "folder");
        Objects.requireNonNull(points, "points");
        Objects.requireNonNull(pointNames, "pointNames");
        Files.createDirectories(folder);
        List<Path> files = new ArrayList<>();
        ObjectNode root = JSON.createObjectNode();
        root.put("format", FORMAT);
        root.put("tool_version", Version.VERSION);
        root.put("constants", PhysicalConstants.SET);
        ArrayNode covs = root.putArray("covariances");
        for (EstimatorSuite.LineCovariance c : result.covariances()) {
            Path f = folder.resolve("covariance-" + safe(c.set()) + "-" + c.field() + ".csv");
            CorrelationTables.writeCsv(c.result(), points, pointNames, f);
            files.add(f);
            ObjectNode o = covs.addObject();
            o.put("set", c.set());
            o.put("field", c.field().name());
            o.put("file", f.getFileName().toString());
            o.put("rows", c.result().rows().size());
            o.set("verdict", verdict(c.result().verdict()));
        }
        ArrayNode bins = root.putArray("separation_bins");
        for (EstimatorSuite.Binned b : result.binned()) {
            Path f = folder.resolve("separation-" + safe(b.set()) + "-" + b.field() + ".csv");
            List<String> lines = new ArrayList<>();
            lines.add("field,set,bin,low_m,high_m,mean_m,pairs,parallel,parallel_se,perpendicular,perpendicular_se,"
                + "mode_sum_parallel,mode_sum_perpendicular,free_parallel,free_perpendicular,image_parallel,"
                + "image_perpendicular,z_parallel,z_perpendicular,unit");
            for (SeparationBin s : b.bins()) {
                lines.add(String.join(",", s.field().name(), csv(b.set()), csv(s.label()), num(s.lowM()), num(s.highM()),
                    num(s.meanM()), Integer.toString(s.pairs()), num(s.parallel()), num(s.parallelSe()),
                    num(s.perpendicular()), num(s.perpendicularSe()), num(s.modeSumParallel()),
                    num(s.modeSumPerpendicular()), num(s.freeParallel()), num(s.freePerpendicular()),
                    num(s.imageParallel()), num(s.imagePerpendicular()), num(s.zParallel()), num(s.zPerpendicular()),
                    csv(s.field().correlationUnit())));
            }
            writeLines(f, lines);
            files.add(f);
            ObjectNode o = bins.addObject();
            o.put("set", b.set());
            o.put("field", b.field().name());
            o.put("file", f.getFileName().toString());
            o.put("bins", b.bins().size());
        }
        ArrayNode profs = root.putArray("wall_profiles");
        for (EstimatorSuite.Profile p : result.profiles()) {
            Path f = folder.resolve("wall-profile-" + safe(p.set()) + "-" + p.field() + ".csv");
            List<String> lines = new ArrayList<>();
            lines.add("field,set,point,point_name,x_m,y_m,z_m,distance_m,wall_axis,wall_position_m,component,estimate,"
                + "standard_error,mode_sum,plane_image,free_space,z,unit");
            for (WallProfileRow r : p.rows()) {
                Vec3 v = points.get(r.point());
                lines.add(String.join(",", r.field().name(), csv(p.set()), Integer.toString(r.point()),
                    csv(pointNames.get(r.point())), num(v.x()), num(v.y()), num(v.z()), num(r.distanceM()),
                    String.valueOf("xyz".charAt(r.wallAxis())), num(r.wallPositionM()), r.componentName(),
                    num(r.estimate()), num(r.standardError()), num(r.modeSum()), num(r.planeImage()), num(r.freeSpace()),
                    num(r.z()), csv(r.field().correlationUnit())));
            }
            writeLines(f, lines);
            files.add(f);
            ObjectNode o = profs.addObject();
            o.put("set", p.set());
            o.put("field", p.field().name());
            o.put("file", f.getFileName().toString());
        }
        ArrayNode kern = root.putArray("kernels");
        for (EstimatorSuite.Kernel k : result.kernels()) {
            Path f = folder.resolve("kernel-" + k.field() + ".csv");
            List<String> lines = new ArrayList<>();
            lines.add("field,separation_m,parallel,parallel_se,perpendicular,perpendicular_se,mode_sum_parallel,"
                + "mode_sum_perpendicular,free_parallel,free_perpendicular,ideal_parallel,ideal_perpendicular,"
                + "z_parallel,z_perpendicular,unit");
            String unit = kernelUnit(k.field());
            for (KernelPoint p : k.points()) {
                lines.add(String.join(",", p.field().name(), num(p.separationM()), num(p.parallel()), num(p.parallelSe()),
                    num(p.perpendicular()), num(p.perpendicularSe()), num(p.modeSumParallel()),
                    num(p.modeSumPerpendicular()), num(p.freeParallel()), num(p.freePerpendicular()),
                    num(p.idealParallel()), num(p.idealPerpendicular()), num(p.zParallel()), num(p.zPerpendicular()),
                    csv(unit)));
            }
            writeLines(f, lines);
            files.add(f);
            ObjectNode o = kern.addObject();
            o.put("set", k.set());
            o.put("field", k.field().name());
            o.put("file", f.getFileName().toString());
            o.put("regulator", k.regulator());
            o.put("unit", unit);
            ArrayNode fits = o.putArray("fits");
            for (PowerLawFit fit : k.fits()) {
                fits.add(fit(fit));
            }
            ArrayNode n = o.putArray("notes");
            k.notes().forEach(n::add);
        }
        GaussianityResult g = result.gaussianity();
        if (g != null) {
            Path f = folder.resolve("gaussianity.csv");
            List<String> lines = new ArrayList<>();
            lines.add("kind,subject,n,statistic,p_value,holm_adjusted_p,in_verdict");
            for (NormalityTest t : g.tests()) {
                lines.add(String.join(",", t.kind(), csv(t.subject()), Integer.toString(t.n()), num(t.statistic()),
                    num(t.pValue()), num(t.adjustedP()), Boolean.toString(t.inVerdict())));
            }
            writeLines(f, lines);
            files.add(f);
            ObjectNode o = root.putObject("gaussianity");
            o.put("file", f.getFileName().toString());
            o.put("samples", g.samples());
            o.set("verdict", verdict(g.verdict()));
            ArrayNode w = o.putArray("warnings");
            g.warnings().forEach(w::add);
        }
        if (result.convergence() != null) {
            Path f = folder.resolve("convergence.csv");
            List<String> lines = new ArrayList<>();
            lines.add("samples,rms_error,expected,rows");
            for (ConvergencePoint p : result.convergence().points()) {
                lines.add(String.join(",", Long.toString(p.samples()), num(p.rmsError()), num(p.expected()),
                    Integer.toString(p.rows())));
            }
            writeLines(f, lines);
            files.add(f);
            ObjectNode o = root.putObject("convergence");
            o.put("file", f.getFileName().toString());
            putNumber(o, "slope", result.convergence().slope());
            putNumber(o, "slope_se", result.convergence().slopeSe());
            o.put("expected_slope", -0.5);
            o.put("method", result.convergence().method());
        }
        ArrayNode notes = root.putArray("notes");
        result.notes().forEach(notes::add);
        Path summary = folder.resolve(SUMMARY);
        AtomicText.write(summary, w -> w.write(JSON.writeValueAsString(root) + "\n"));
        files.add(summary);
        return files;
    }

    /** @return the unit of a kernel of the field, e.g. 1/((V/m)^2 m^6) */
    public static String kernelUnit(Field field) {
        return "1/(" + field.correlationUnit() + " m^6)";
    }

    private static ObjectNode fit(PowerLawFit f) {
        ObjectNode o = JSON.createObjectNode();
        o.put("quantity", f.quantity());
        o.put("exponent", f.exponent());
        o.put("exponent_se", f.exponentSe());
        o.put("exponent_se_wls", f.exponentSeWls());
        o.put("amplitude", f.amplitude());
        putNumber(o, "expected", f.expected());
        o.put("r_min_m", f.rMinM());
        o.put("r_max_m", f.rMaxM());
        o.put("points", f.points());
        o.put("method", f.method());
        return o;
    }

    private static ObjectNode verdict(Verdict v) {
        ObjectNode o = JSON.createObjectNode();
        o.put("passed", v.passed());
        o.put("false_alarm", v.falseAlarm());
        o.put("tests", v.tests());
        o.put("threshold", v.threshold());
        o.put("worst", v.worst());
        o.put("method", v.method());
        return o;
    }

    private static void putNumber(ObjectNode o, String key, double v) {
        if (Double.isFinite(v)) {
            o.put(key, v);
        } else {
            o.putNull(key);
        }
    }

    /** A number, or an empty cell for a reference that is not available (NaN). */
    private static String num(double v) {
        if (Double.isNaN(v)) {
            return "";
        }
        if (Double.isInfinite(v)) {
            throw new IllegalStateException("infinite number in an estimator table");
        }
        return Double.toString(v);
    }

    private static String csv(String s) {
        if (s.indexOf(',') < 0 && s.indexOf('"') < 0 && s.indexOf('\n') < 0 && s.indexOf('\r') < 0) {
            return s;
        }
        return '"' + s.replace("\"", "\"\"") + '"';
    }

    private static String safe(String name) {
        return name.replaceAll("[^A-Za-z0-9_.-]", "_");
    }

    private static void writeLines(Path file, List<String> lines) throws IOException {
        AtomicText.write(file, w -> {
            for (String l : lines) {
                w.write(l);
                w.write('\n');
            }
        });
    }

}
