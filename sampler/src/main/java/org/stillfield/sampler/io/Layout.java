package org.stillfield.sampler.io;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.regex.Pattern;
import org.apache.parquet.schema.LogicalTypeAnnotation;
import org.apache.parquet.schema.MessageType;
import org.apache.parquet.schema.PrimitiveType.PrimitiveTypeName;
import org.apache.parquet.schema.Types;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Version;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.engine.SampleStreams;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The dataset layout ({@link Version#DATASET_FORMAT}): file names, table schemas with the unit
 * of every column, the footer metadata every file carries, part sizes and the run key.
 *
 * <pre>
 * DATASET/manifest.json                      written last; lists every file below
 *         modes.parquet, points.parquet      one per run
 *         amplitudes/part-00000.parquet ...  one per part: samples [k·S, min((k+1)·S, N))
 *         fields/part-00000.parquet ...
 *         .stillfield/run.json               the run key, written first (resume, shards)
 *         .stillfield/parts/part-00000.json  one per finished part: its files' rows, bytes, SHA-256
 * </pre>
 * Files in progress carry a hidden temporary name ({@code .part-00003.parquet.*.tmp}) that
 * neither a {@code *.parquet} glob nor a directory reader (which skip names starting with '.')
 * picks up, and are renamed when complete.
 */
final class Layout {
    static final String MODES = "modes.parquet";
    static final String POINTS = "points.parquet";
    static final String AMPLITUDES = "amplitudes";
    static final String FIELDS = "fields";
    static final String MANIFEST = "manifest.json";
    /** The files of a dataset that are not split into parts. */
    static final List<String> COMMON = List.of(MODES, POINTS);
    /** Hidden folder for the run key and per-part records; never read as data. */
    static final String STATE = ".stillfield";
    static final String RUN_FILE = STATE + "/run.json";
    static final String PART_RECORDS = STATE + "/parts";
    /** A part file's name inside the dataset folder. */
    static final Pattern PART_FILE = Pattern.compile("(amplitudes|fields)/part-(\\d{5,9})\\.parquet");
    /** Target raw (uncompressed) size of a part's larger table under the default part size, bytes. */
    static final long TARGET_PART_BYTES = 200_000_000L;
    /** Most parts a run may have: resume and the manifest look at every part's record. */
    static final int MAX_PARTS = 100_000;
    /** Raw bytes of one amplitude row: sample (int64), mode (int32), q, e (double). */
    static final long AMPLITUDE_ROW_BYTES = 8 + 4 + 8 + 8;

    /** @return the name of part k of a table ({@link #AMPLITUDES} or {@link #FIELDS}) */
    static String part(String table, int k) {
        return table + "/" + String.format(java.util.Locale.ROOT, "part-%05d.parquet", k);
    }

    /** @return the name of the record written when part k is complete */
    static String partRecord(int k) {
        return PART_RECORDS + "/" + String.format(java.util.Locale.ROOT, "part-%05d.json", k);
    }

    /** @return raw bytes of one field row: sample, point and 3 components per field */
    static long fieldRowBytes(int fieldCount, RunSpec.Precision precision) {
        return 8 + 4 + 3L * fieldCount * (precision == RunSpec.Precision.FLOAT32 ? 4 : 8);
    }

    /**
     * The default part size: as many samples as keep the larger of a part's two tables near
     * {@link #TARGET_PART_BYTES} raw, at least one, and enough that the run has at most
     * {@link #MAX_PARTS} parts; never more than the run has.
     */
    static long partSamples(RunSpec spec, int modes) {
        long samples = spec.samples();
        long given = spec.storage().partSamples();
        if (given > 0) {
            return Math.min(given, samples);
        }
        long points = spec.allPoints().size();
        long perSample = Math.max(AMPLITUDE_ROW_BYTES * modes, fieldRowBytes(spec.fields().size(), spec.precision()) * points);
        long atLeast = (samples + MAX_PARTS - 1) / MAX_PARTS;
        return Math.max(atLeast, Math.max(1, Math.min(samples, TARGET_PART_BYTES / Math.max(1, perSample))));
    }

    /** @return number of parts of a run of {@code samples} samples, parts of {@code partSamples} */
    static int partCount(long samples, long partSamples) {
        long k = (samples + partSamples - 1) / partSamples;
        if (k > MAX_PARTS) {
            throw new IllegalArgumentException("output.part_samples = " + partSamples + " splits " + samples
                + " samples into " + k + " parts, more than " + MAX_PARTS + "; use larger parts");
        }
        return (int) k;
    }

    /**
     * The run key: SHA-256 of the spec's settings that decide the dataset's content (the parsed
     * YAML without output.folder, output.shard, threads and limits, which change where and how a
     * run goes but not one value it writes), the effective sample count and part size, and the
     * format. Two processes may write into one folder only with equal keys.
     */
    static String runKey(String specText, long samples, long partSamples) {
        Object doc = new org.snakeyaml.engine.v2.api.Load(org.snakeyaml.engine.v2.api.LoadSettings.builder().build())
            .loadFromString(specText);
        Object tree = sorted(doc);
        if (tree instanceof Map) {
            @SuppressWarnings("unchecked")
            Map<String, Object> m = (Map<String, Object>) tree;
            m.remove("threads");
            m.remove("limits");
            Object out = m.get("output");
            if (out instanceof Map) {
                ((Map<?, ?>) out).remove("folder");
                ((Map<?, ?>) out).remove("shard");
                ((Map<?, ?>) out).remove("part_samples");
            }
        }
        ObjectNode key = JSON.createObjectNode();
        key.put("format", Version.DATASET_FORMAT);
        key.put("samples", samples);
        key.put("part_samples", partSamples);
        key.set("spec", JSON.valueToTree(tree));
        java.security.MessageDigest d = HashingOutputFile.sha256Digest();
        return java.util.HexFormat.of().formatHex(d.digest(json(key).getBytes(java.nio.charset.StandardCharsets.UTF_8)));
    }

    /** A copy of a YAML tree with every mapping's keys sorted, so that key order does not matter. */
    private static Object sorted(Object node) {
        if (node instanceof Map) {
            Map<String, Object> m = new java.util.TreeMap<>();
            for (Map.Entry<?, ?> e : ((Map<?, ?>) node).entrySet()) {
                m.put(String.valueOf(e.getKey()), sorted(e.getValue()));
            }
            return m;
        }
        if (node instanceof List) {
            List<Object> l = new ArrayList<>();
            for (Object o : (List<?>) node) {
                l.add(sorted(o));
            }
            return l;
        }
        return node;
    }

    static final String KEY_SPEC = "stillfield.spec";
    static final String KEY_VERSION = "stillfield.version";
    static final String KEY_FORMAT = "stillfield.format";
    static final String KEY_CONSTANTS = "stillfield.constants";
    static final String KEY_GENERATOR = "stillfield.generator";
    static final String KEY_SEED = "stillfield.seed";
    static final String KEY_CAVITY = "stillfield.cavity";
    static final String KEY_WINDOW = "stillfield.window";
    static final String KEY_STATE = "stillfield.state";
    static final String KEY_SAMPLES = "stillfield.samples";
    static final String KEY_TABLE = "stillfield.table";
    static final String KEY_UNITS = "stillfield.units";
    static final String KEY_RUN_KEY = "stillfield.run_key";
    static final String KEY_PART_SAMPLES = "stillfield.part_samples";
    static final String KEY_PART_COUNT = "stillfield.part_count";
    static final String KEY_PART = "stillfield.part";
    static final String KEY_FIRST_SAMPLE = "stillfield.first_sample";
    static final String KEY_SAMPLES_IN_PART = "stillfield.samples_in_part";

    /** Unit of dimensionless numbers (counts, indices, weights). */
    static final String ONE = "1";
    /** Unit entry of text and flag columns, which have none. */
    static final String NONE = "";

    static final ObjectMapper JSON = new ObjectMapper();

    private Layout() {
    }

    /** A table: its Parquet schema and the unit of each column, in column order. */
    record Table(String name, MessageType schema, Map<String, String> units) {
    }

    private static final class TableBuilder {
        private final String name;
        private final Types.MessageTypeBuilder types = Types.buildMessage();
        private final Map<String, String> units = new LinkedHashMap<>();

        TableBuilder(String name) {
            this.name = name;
        }

        TableBuilder required(PrimitiveTypeName type, String column, String unit) {
            types.required(type).named(column);
            units.put(column, unit);
            return this;
        }

        TableBuilder optional(PrimitiveTypeName type, String column, String unit) {
            types.optional(type).named(column);
            units.put(column, unit);
            return this;
        }

        TableBuilder text(String column) {
            types.required(PrimitiveTypeName.BINARY).as(LogicalTypeAnnotation.stringType()).named(column);
            units.put(column, NONE);
            return this;
        }

        Table build() {
            return new Table(name, types.named(name), units);
        }
    }

    /** Mode table: one row per mode in table order (PHYSICS.md §2 for the variances). */
    static Table modes() {
        TableBuilder t = new TableBuilder("modes")
            .required(PrimitiveTypeName.INT32, "mode", ONE)
            .text("label")
            .text("family")
            .required(PrimitiveTypeName.INT32, "i1", ONE)
            .required(PrimitiveTypeName.INT32, "i2", ONE)
            .required(PrimitiveTypeName.INT32, "i3", ONE)
            .required(PrimitiveTypeName.INT32, "orientation", ONE)
            .required(PrimitiveTypeName.DOUBLE, "k_rad_per_m", "rad/m")
            .required(PrimitiveTypeName.DOUBLE, "omega_rad_per_s", "rad/s")
            .required(PrimitiveTypeName.DOUBLE, "f_Hz", "Hz")
            .required(PrimitiveTypeName.DOUBLE, "weight", ONE)
            .required(PrimitiveTypeName.DOUBLE, "thermal_factor", ONE);
        for (Field f : Field.values()) {
            t.required(PrimitiveTypeName.DOUBLE, "var_" + f.name() + "_vacuum", f.correlationUnit());
        }
        for (Field f : Field.values()) {
            t.required(PrimitiveTypeName.DOUBLE, "var_" + f.name(), f.correlationUnit());
        }
        return t.build();
    }

    /** Evaluation points in global order. */
    static Table points() {
        return new TableBuilder("points")
            .required(PrimitiveTypeName.INT32, "point", ONE)
            .text("set")
            .text("kind")
            .required(PrimitiveTypeName.INT32, "index_in_set", ONE)
            .required(PrimitiveTypeName.INT32, "i", ONE)
            .required(PrimitiveTypeName.INT32, "j", ONE)
            .required(PrimitiveTypeName.INT32, "k", ONE)
            .required(PrimitiveTypeName.DOUBLE, "x_m", "m")
            .required(PrimitiveTypeName.DOUBLE, "y_m", "m")
            .required(PrimitiveTypeName.DOUBLE, "z_m", "m")
            .required(PrimitiveTypeName.BOOLEAN, "inside", NONE)
            .build();
    }

    /** Mode amplitudes: one row per (sample, mode). */
    static Table amplitudes() {
        return new TableBuilder("amplitudes")
            .required(PrimitiveTypeName.INT64, "sample", ONE)
            .required(PrimitiveTypeName.INT32, "mode", ONE)
            .required(PrimitiveTypeName.DOUBLE, "q", Field.A.unit())
            .required(PrimitiveTypeName.DOUBLE, "e", Field.E.unit())
            .build();
    }

    /** Field values: one row per (sample, point); null outside the cavity. */
    static Table fields(Set<Field> fields, RunSpec.Precision precision) {
        PrimitiveTypeName type = precision == RunSpec.Precision.FLOAT32 ? PrimitiveTypeName.FLOAT : PrimitiveTypeName.DOUBLE;
        TableBuilder t = new TableBuilder("fields")
            .required(PrimitiveTypeName.INT64, "sample", ONE)
            .required(PrimitiveTypeName.INT32, "point", ONE);
        for (Field f : Field.values()) {
            if (fields.contains(f)) {
                for (int i = 0; i < 3; i++) {
                    t.optional(type, f.column(i), f.unit());
                }
            }
        }
        return t.build();
    }

    /** @return footer entries shared by all files of a run */
    static Map<String, String> commonFooter(RunSpec spec, Cavity cavity, Window window, ThermalState state) {
        Map<String, String> m = new LinkedHashMap<>();
        m.put(KEY_SPEC, spec.sourceText());
        m.put(KEY_VERSION, Version.VERSION);
        m.put(KEY_FORMAT, Version.DATASET_FORMAT);
        ObjectNode c = JSON.createObjectNode();
        c.put("set", PhysicalConstants.SET);
        c.put("c", PhysicalConstants.C);
        c.put("h", PhysicalConstants.H);
        c.put("hbar", PhysicalConstants.HBAR);
        c.put("k_B", PhysicalConstants.K_B);
        c.put("epsilon_0", PhysicalConstants.EPSILON_0);
        c.put("mu_0", PhysicalConstants.MU_0);
        m.put(KEY_CONSTANTS, json(c));
        m.put(KEY_GENERATOR, SampleStreams.GENERATOR);
        m.put(KEY_SEED, Long.toString(spec.seed()));
        ObjectNode cav = JSON.createObjectNode();
        cav.put("shape", cavity.shape());
        ObjectNode params = cav.putObject("parameters");
        cavity.parameters().forEach(params::put);
        cav.put("eps_r", cavity.medium().epsilonR());
        cav.put("mu_r", cavity.medium().muR());
        cav.put("volume_m3", cavity.volume());
        m.put(KEY_CAVITY, json(cav));
        ObjectNode w = JSON.createObjectNode();
        w.put("kind", window.kind().name().toLowerCase(java.util.Locale.ROOT));
        w.put("omega_c_rad_s", window.omegaC());
        w.put("cutoff_Hz", window.omegaC() / (2 * Math.PI));
        w.put("tolerance", window.tolerance());
        w.put("truncation_omega_rad_s", window.truncationOmega());
        ObjectNode dropped = w.putObject("neglected_fraction");
        for (Field f : Field.values()) {
            dropped.put(f.name(), window.neglectedFraction(f));
        }
        m.put(KEY_WINDOW, json(w));
        ObjectNode s = JSON.createObjectNode();
        s.put("kind", state.isVacuum() ? "vacuum" : "thermal");
        s.put("temperature_K", state.temperatureKelvin());
        m.put(KEY_STATE, json(s));
        m.put(KEY_SAMPLES, Long.toString(spec.samples()));
        return m;
    }

    /** @return the common footer plus the table's name and units */
    static Map<String, String> footer(Map<String, String> common, Table table) {
        Map<String, String> m = new LinkedHashMap<>(common);
        m.put(KEY_TABLE, table.name());
        ObjectNode u = JSON.createObjectNode();
        table.units().forEach(u::put);
        m.put(KEY_UNITS, json(u));
        return m;
    }

    /** @return the fields in column order (A, E, B) */
    static List<Field> ordered(Set<Field> fields) {
        List<Field> out = new ArrayList<>();
        for (Field f : Field.values()) {
            if (fields.contains(f)) {
                out.add(f);
            }
        }
        return out;
    }

    static String json(Object node) {
        try {
            return JSON.writeValueAsString(node);
        } catch (JsonProcessingException ex) {
            throw new IllegalStateException("cannot serialise footer JSON", ex);
        }
    }
}
