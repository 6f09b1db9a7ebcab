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
import java.util.EnumSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Version;

/**
 * Writes correlation tables and verdicts.
 *
 * <p><b>CSV</b> ({@code correlations.csv}), one header line, then one line per row, comma
 * separated, numbers in Java's shortest round-trip decimal form, SI units:
 * <pre>
 *   field, first, second, first_name, second_name, x1_m, y1_m, z1_m, x2_m, y2_m, z2_m, i, j,
 *   estimate, standard_error, analytic, z, status, unit
 * </pre>
 * i and j are the component letters x, y, z; status is {@code tested} or {@code zero_variance}
 * (z = 0 and standard_error = 0 on those rows); unit is the correlation unit, e.g. {@code (V/m)^2}.
 * Point names are the spec's references, e.g. {@code axis[3]} or {@code antenna}.
 *
 * <p><b>JSON</b> ({@code correlations.json}): format name, tool version, constants, samples N,
 * units per field, the verdict, warnings and the same rows as objects. <b>verdict.json</b>: the
 * combined verdict and its parts. No NaN or infinity is ever written. Files are written to a
 * temporary sibling and moved into place, so a reader never sees half a file.
 */
public final class CorrelationTables {
    /** Name and revision of the JSON layout. */
    public static final String FORMAT = "stillfield-correlations/1";
    /** Name and revision of the verdict layout. */
    public static final String VERDICT_FORMAT = "stillfield-verdict/1";
    /** CSV header. */
    public static final String CSV_HEADER = "field,first,second,first_name,second_name,x1_m,y1_m,z1_m,x2_m,y2_m,z2_m,"
        + "i,j,estimate,standard_error,analytic,z,status,unit";

    private static final ObjectMapper JSON = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    private CorrelationTables() {
    }

    /**
     * Point names as the spec refers to them: a one-point set by its name, other sets as name[i].
     *
     * @param sets the point sets in spec order
     * @return one name per global point index
     */
    public static List<String> pointNames(List<PointSet> sets) {
        List<String> names = new ArrayList<>();
        for (PointSet s : sets) {
            for (int i = 0; i < s.size(); i++) {
                names.add(s.kind() == PointSet.Kind.POINT ? s.name() : s.name() + "[" + i + "]");
            }
        }
        return names;
    }

    /**
     * @param result the table
     * @param points all evaluation points, global order, metres
     * @param pointNames one name per point (same order)
     * @param file target file
     * @throws IOException when writing fails
     */
    public static void writeCsv(CorrelationResult result, List<Vec3> points, List<String> pointNames, Path file)
        throws IOException {
        check(result, points, pointNames);
        AtomicText.write(file, w -> {
            w.write(CSV_HEADER);
            w.write('\n');
            for (CorrelationRow r : result.rows()) {
                Vec3 a = points.get(r.first());
                Vec3 b = points.get(r.second());
                String[] cells = {r.field().name(), Integer.toString(r.first()), Integer.toString(r.second()),
                    csv(pointNames.get(r.first())), csv(pointNames.get(r.second())), num(a.x()), num(a.y()), num(a.z()),
                    num(b.x()), num(b.y()), num(b.z()), axis(r.i()), axis(r.j()), num(r.estimate()),
                    num(r.standardError()), num(r.analytic()), num(r.z()), status(r), csv(r.field().correlationUnit())};
                w.write(String.join(",", cells));
                w.write('\n');
            }
        });
    }

    /**
     * @param result the table
     * @param points all evaluation points, global order, metres
     * @param pointNames one name per point (same order)
     * @param file target file
     * @throws IOException when writing fails
     */
    public static void writeJson(CorrelationResult result, List<Vec3> points, List<String> pointNames, Path file)
        throws IOException {
        check(result, points, pointNames);
        ObjectNode root = JSON.createObjectNode();
        root.put("format", FORMAT);
        root.put("tool_version", Version.VERSION);
        root.put("constants", PhysicalConstants.SET);
        root.put("samples", result.samples());
        root.put("estimator", "(1/N) sum_s F_i(r) F_j(r'), known zero mean; standard error"
            + " sqrt((C_ii(r,r) C_jj(r',r') + C_ij(r,r')^2)/N) from the analytic mode sum (Isserlis)");
        Set<Field> fields = EnumSet.noneOf(Field.class);
        for (CorrelationRow r : result.rows()) {
            fields.add(r.field());
        }
        ObjectNode units = root.putObject("units");
        for (Field f : fields) {
            units.put(f.name(), f.correlationUnit());
        }
        root.set("verdict", verdictNode(result.verdict()));
        root.put("tested_rows", result.testedRows());
        root.put("zero_variance_rows", result.zeroVarianceRows());
        ArrayNode warnings = root.putArray("warnings");
        result.warnings().forEach(warnings::add);
        ArrayNode rows = root.putArray("rows");
        for (CorrelationRow r : result.rows()) {
            ObjectNode o = rows.addObject();
            o.put("field", r.field().name());
            o.put("first", r.first());
            o.put("second", r.second());
            o.put("first_name", pointNames.get(r.first()));
            o.put("second_name", pointNames.get(r.second()));
            o.set("r1_m", vec(points.get(r.first())));
            o.set("r2_m", vec(points.get(r.second())));
            o.put("i", axis(r.i()));
            o.put("j", axis(r.j()));
            o.put("estimate", r.estimate());
            o.put("standard_error", r.standardError());
            o.put("analytic", r.analytic());
            o.put("z", r.z());
            o.put("status", status(r));
            o.put("unit", r.field().correlationUnit());
        }
        AtomicText.write(file, w -> w.write(JSON.writeValueAsString(root) + "\n"));
    }

    /**
     * @param combined the overall verdict
     * @param parts the verdicts it combines, in order
     * @param file target file
     * @throws IOException when writing fails
     */
    public static void writeVerdict(Verdict combined, List<Verdict> parts, Path file) throws IOException {
        Objects.requireNonNull(combined, "combined");
        Objects.requireNonNull(parts, "parts");
        ObjectNode root = JSON.createObjectNode();
        root.put("format", VERDICT_FORMAT);
        root.put("tool_version", Version.VERSION);
        root.setAll(verdictNode(combined));
        ArrayNode list = root.putArray("parts");
        for (Verdict v : parts) {
            list.add(verdictNode(Objects.requireNonNull(v, "parts element")));
        }
        AtomicText.write(file, w -> w.write(JSON.writeValueAsString(root) + "\n"));
    }

    private static ObjectNode verdictNode(Verdict v) {
        ObjectNode o = JSON.createObjectNode();
        o.put("passed", v.passed());
        o.put("false_alarm", v.falseAlarm());
        o.put("tests", v.tests());
        o.put("threshold", v.threshold());
        o.put("worst", v.worst());
        o.put("method", v.method());
        return o;
    }

    private static ArrayNode vec(Vec3 v) {
        ArrayNode a = JSON.createArrayNode();
        a.add(v.x());
        a.add(v.y());
        a.add(v.z());
        return a;
    }

    private static void check(CorrelationResult result, List<Vec3> points, List<String> pointNames) {
        Objects.requireNonNull(result, "result");
        Objects.requireNonNull(points, "points");
        Objects.requireNonNull(pointNames, "pointNames");
        if (pointNames.size() != points.size()) {
            throw new IllegalArgumentException(
                "pointNames must hold one name per point (" + points.size() + "): " + pointNames.size());
        }
        for (CorrelationRow r : result.rows()) {
            if (r.first() < 0 || r.first() >= points.size() || r.second() < 0 || r.second() >= points.size()) {
                throw new IllegalArgumentException(String.format(
                    "row (%d, %d) names a point outside 0..%d", r.first(), r.second(), points.size() - 1));
            }
        }
    }

    private static String status(CorrelationRow r) {
        return r.status() == CorrelationRow.Status.TESTED ? "tested" : "zero_variance";
    }

    private static String axis(int i) {
        return String.valueOf("xyz".charAt(i));
    }

    private static String num(double v) {
        if (!Double.isFinite(v)) {
            throw new IllegalStateException("non-finite number in a correlation table: " + v);
        }
        return Double.toString(v);
    }

    /** Quotes a cell when it holds a comma, quote or line break (RFC 4180). */
    private static String csv(String s) {
        if (s.indexOf(',') < 0 && s.indexOf('"') < 0 && s.indexOf('\n') < 0 && s.indexOf('\r') < 0) {
            return s;
        }
        return '"' + s.replace("\"", "\"\"") + '"';
    }

}
