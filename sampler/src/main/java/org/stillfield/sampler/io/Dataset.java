package org.stillfield.sampler.io;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.Collections;
import java.util.EnumMap;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import org.apache.parquet.ParquetReadOptions;
import org.apache.parquet.conf.PlainParquetConfiguration;
import org.apache.parquet.hadoop.ParquetFileReader;
import org.apache.parquet.io.LocalInputFile;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Version;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecException;
import org.stillfield.sampler.spec.SpecReader;

/**
 * A dataset folder written by {@link DatasetWriter}, opened for reading. Opening checks that
 * {@code manifest.json} is present, lists the run-wide tables and both files of every part, and
 * that every file it lists exists with the listed size; files it does not list (temporary files,
 * parts of an abandoned attempt, the hidden state folder) are ignored. {@link #problems(Path)}
 * does the full check (hashes, row counts, footers).
 *
 * <p>Reads stream one Parquet row group at a time; nothing loads a whole table. Instances are
 * immutable and may be shared; each read opens its own file handles.
 */
public final class Dataset {
    private final Path folder;
    private final JsonNode manifest;
    private final String name;
    private final long samples;
    private final int modeCount;
    private final int pointCount;
    private final List<Field> fields;
    private final RunSpec.Precision precision;
    private final Map<String, Long> listedBytes;
    private final long partSamples;
    private final int partCount;
    private final String specText;

    private Dataset(Path folder, JsonNode manifest) throws IOException {
        this.folder = folder;
        this.manifest = manifest;
        String format = manifest.path("format").asText("");
        if (!Version.DATASET_FORMAT.equals(format)) {
            throw new IOException(folder + " holds format '" + format + "', this reader understands "
                + Version.DATASET_FORMAT);
        }
        this.name = text(manifest, "name");
        this.samples = number(manifest, "samples");
        this.modeCount = Math.toIntExact(number(manifest, "modes"));
        this.pointCount = Math.toIntExact(number(manifest, "points"));
        this.partSamples = number(manifest, "part_samples");
        this.partCount = Math.toIntExact(number(manifest, "part_count"));
        if (partSamples < 1 || samples < 1 || partCount != Layout.partCount(samples, partSamples)) {
            throw new IOException("manifest.json in " + folder + ": part_count " + partCount + " does not match samples "
                + samples + " in parts of part_samples " + partSamples);
        }
        List<Field> f = new ArrayList<>();
        for (JsonNode n : manifest.path("fields")) {
            try {
                f.add(Field.valueOf(n.asText()));
            } catch (IllegalArgumentException ex) {
                throw new IOException("manifest.json lists an unknown field '" + n.asText() + "' in " + folder, ex);
            }
        }
        this.fields = List.copyOf(f);
        try {
            this.precision = RunSpec.Precision.valueOf(text(manifest, "precision").toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException ex) {
            throw new IOException("manifest.json has an unknown precision in " + folder, ex);
        }
        Map<String, Long> bytes = new LinkedHashMap<>();
        for (JsonNode e : manifest.path("files")) {
            String file = text(e, "name");
            if (!isDatasetName(file)) {
                throw new IOException("manifest.json in " + folder + " lists a file outside the folder or its layout: '" + file + "'");
            }
            bytes.put(file, number(e, "bytes"));
        }
        for (String required : requiredFiles(partCount)) {
            if (!bytes.containsKey(required)) {
                throw new IOException("manifest.json in " + folder + " does not list " + required);
            }
        }
        for (Map.Entry<String, Long> e : bytes.entrySet()) {
            Path p = folder.resolve(e.getKey());
            if (!Files.isRegularFile(p)) {
                throw new IOException("dataset file is missing: " + p);
            }
            long size = Files.size(p);
            if (size != e.getValue()) {
                throw new IOException("dataset file " + p + " has " + size + " bytes, manifest.json says " + e.getValue());
            }
        }
        this.listedBytes = Collections.unmodifiableMap(bytes);
        String spec = footer(Layout.MODES).get(Layout.KEY_SPEC);
        if (spec == null) {
            throw new IOException(Layout.MODES + " in " + folder + " has no " + Layout.KEY_SPEC + " footer entry");
        }
        this.specText = spec;
    }

    /** @return the files a complete dataset of {@code parts} parts must list */
    static List<String> requiredFiles(int parts) {
        List<String> out = new ArrayList<>(Layout.COMMON);
        for (int k = 0; k < parts; k++) {
            out.add(Layout.part(Layout.AMPLITUDES, k));
            out.add(Layout.part(Layout.FIELDS, k));
        }
        return out;
    }

    /**
     * @param folder a dataset folder
     * @return the dataset
     * @throws IOException when manifest.json is missing or unreadable, or a listed file is
     *     missing or has another size
     */
    public static Dataset open(Path folder) throws IOException {
        Objects.requireNonNull(folder, "folder");
        Path dir = folder.toAbsolutePath().normalize();
        Path m = dir.resolve(Layout.MANIFEST);
        if (!Files.isRegularFile(m)) {
            throw new IOException("not a dataset (no " + Layout.MANIFEST + "): " + dir);
        }
        JsonNode node;
        try {
            node = Layout.JSON.readTree(m.toFile());
        } catch (IOException ex) {
            throw new IOException("cannot read " + m + ": " + ex.getMessage(), ex);
        }
        return new Dataset(dir, node);
    }

    private static String text(JsonNode n, String key) throws IOException {
        JsonNode v = n.get(key);
        if (v == null || !v.isTextual()) {
            throw new IOException("manifest.json: '" + key + "' is missing or not text");
        }
        return v.asText();
    }

    private static long number(JsonNode n, String key) throws IOException {
        JsonNode v = n.get(key);
        if (v == null || !v.canConvertToLong() || v.asLong() < 0) {
            throw new IOException("manifest.json: '" + key + "' is missing or not a whole number >= 0");
        }
        return v.asLong();
    }

    /** @return the dataset folder (absolute) */
    public Path folder() {
        return folder;
    }

    /** @return a copy of manifest.json */
    public JsonNode manifest() {
        return manifest.deepCopy();
    }

    /** @return the run name */
    public String name() {
        return name;
    }

    /** @return number of samples, indexed 0 to samples() − 1 */
    public long samples() {
        return samples;
    }

    /** @return number of modes M */
    public int modeCount() {
        return modeCount;
    }

    /** @return number of evaluation points P */
    public int pointCount() {
        return pointCount;
    }

    /** @return samples per part (the last part may hold fewer) */
    public long partSamples() {
        return partSamples;
    }

    /** @return number of parts */
    public int partCount() {
        return partCount;
    }

    /**
     * @param k part index in [0, partCount())
     * @return the part's amplitude and field files, relative to the folder
     */
    public List<String> partFiles(int k) {
        if (k < 0 || k >= partCount) {
            throw new IllegalArgumentException("part must lie in [0, " + partCount + "): " + k);
        }
        return List.of(Layout.part(Layout.AMPLITUDES, k), Layout.part(Layout.FIELDS, k));
    }

    /** @return the fields stored, in column order (A, E, B) */
    public List<Field> fields() {
        return fields;
    }

    /** @return storage precision of the field values */
    public RunSpec.Precision precision() {
        return precision;
    }

    /** @return the run spec exactly as written */
    public String specText() {
        return specText;
    }

    /**
     * The run spec, re-read from the stored text with relative paths against the dataset's parent
     * folder and the output folder set to this dataset.
     *
     * @return the spec
     * @throws SpecException when the stored text no longer validates (e.g. a newer reader)
     */
    public RunSpec spec() throws SpecException {
        return SpecReader.parse(specText, folder.getParent(), name).withOutputFolder(folder);
    }

    /**
     * @param fileName one of the files listed in manifest.json, e.g. {@code fields/part-00000.parquet}
     * @return the file's Parquet footer key-value metadata
     * @throws IllegalArgumentException when the file is not listed
     * @throws IOException when the footer cannot be read
     */
    public Map<String, String> footer(String fileName) throws IOException {
        if (!listed(fileName) || !fileName.endsWith(".parquet")) {
            throw new IllegalArgumentException("fileName must be a Parquet file listed in manifest.json: " + fileName);
        }
        return readFooter(folder.resolve(fileName));
    }

    private boolean listed(String fileName) {
        return listedBytes.containsKey(fileName);
    }

    /** A manifest may only name the files of the layout: nothing outside the folder, nothing else. */
    static boolean isDatasetName(String name) {
        return Layout.COMMON.contains(name) || Layout.PART_FILE.matcher(name).matches();
    }

    private static Map<String, String> readFooter(Path file) throws IOException {
        try (ParquetFileReader r = ParquetFileReader.open(new LocalInputFile(file),
            ParquetReadOptions.builder(new PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build())) {
            return Collections.unmodifiableMap(new LinkedHashMap<>(r.getFileMetaData().getKeyValueMetaData()));
        }
    }

    /**
     * Hands the stored ensemble to a sink as the engine would: batches in sample order with q, e
     * per sample and, per field, values[3p + i] (NaN at points outside the cavity; float32 values
     * widened exactly), then calls {@code sink.finish()}. The parts are read in order; a batch may
     * span two parts. The sink is not closed.
     *
     * @param sink receives the batches
     * @param batchSize samples per batch, ≥ 1
     * @throws IOException when reading fails or the tables are not in (sample, mode/point) order
     */
    public void replay(EnsembleSink sink, int batchSize) throws IOException {
        Objects.requireNonNull(sink, "sink");
        if (batchSize < 1) {
            throw new IllegalArgumentException("batchSize must be >= 1: " + batchSize);
        }
        try (PartReader parts = new PartReader()) {
            for (long first = 0; first < samples; first += batchSize) {
                int n = (int) Math.min(batchSize, samples - first);
                double[][] q = new double[n][modeCount];
                double[][] e = new double[n][modeCount];
                Map<Field, double[][]> values = new EnumMap<>(Field.class);
                double[][][] byField = new double[fields.size()][][];
                if (pointCount > 0) {
                    for (int f = 0; f < fields.size(); f++) {
                        byField[f] = new double[n][3 * pointCount];
                        values.put(fields.get(f), byField[f]);
                    }
                }
                for (int s = 0; s < n; s++) {
                    long sample = first + s;
                    parts.moveTo(sample);
                    ColumnScan amp = parts.amp;
                    String ampName = parts.ampName;
                    for (int l = 0; l < modeCount; l++) {
                        if (!amp.next() || amp.getLong(0) != sample || amp.getInt(1) != l) {
                            throw new IOException(ampName + ": expected the row of sample " + sample + ", mode " + l);
                        }
                        q[s][l] = amp.getDouble(2);
                        e[s][l] = amp.getDouble(3);
                    }
                    if (pointCount == 0) {
                        continue;
                    }
                    ColumnScan fld = parts.fld;
                    for (int p = 0; p < pointCount; p++) {
                        if (!fld.next() || fld.getLong(0) != sample || fld.getInt(1) != p) {
                            throw new IOException(parts.fldName + ": expected the row of sample " + sample + ", point " + p);
                        }
                        int c = 2;
                        for (double[][] v : byField) {
                            v[s][3 * p] = fld.getDouble(c++);
                            v[s][3 * p + 1] = fld.getDouble(c++);
                            v[s][3 * p + 2] = fld.getDouble(c++);
                        }
                    }
                }
                sink.accept(new SampleBatch(first, q, e, values));
            }
        }
        sink.finish();
    }

    /** The scans of the part that holds the current sample; opens the next part when needed. */
    private final class PartReader implements AutoCloseable {
        int part = -1;
        long end;
        ColumnScan amp;
        ColumnScan fld;
        String ampName;
        String fldName;

        void moveTo(long sample) throws IOException {
            if (part >= 0 && sample < end) {
                return;
            }
            close();
            part = (int) (sample / partSamples);
            long first = part * partSamples;
            end = Math.min(first + partSamples, samples);
            ampName = Layout.part(Layout.AMPLITUDES, part);
            fldName = Layout.part(Layout.FIELDS, part);
            amp = new ColumnScan(folder.resolve(ampName), List.of("sample", "mode", "q", "e"));
            expectRows(ampName, amp.rowCount(), (end - first) * modeCount);
            if (pointCount > 0) {
                fld = new ColumnScan(folder.resolve(fldName), fieldColumns(fields));
                expectRows(fldName, fld.rowCount(), (end - first) * pointCount);
            }
        }

        @Override
        public void close() throws IOException {
            try {
                if (amp != null) {
                    amp.close();
                }
            } finally {
                amp = null;
                if (fld != null) {
                    fld.close();
                }
                fld = null;
            }
        }
    }

    private static void expectRows(String file, long actual, long expected) throws IOException {
        if (actual != expected) {
            throw new IOException(file + " has " + actual + " rows, expected " + expected);
        }
    }

    private static List<String> fieldColumns(List<Field> fields) {
        List<String> cols = new ArrayList<>(List.of("sample", "point"));
        for (Field f : fields) {
            for (int i = 0; i < 3; i++) {
                cols.add(f.column(i));
            }
        }
        return cols;
    }

    /**
     * Reads one sample of one field from its part, touching only the pages that hold it (Parquet
     * offset index).
     *
     * @param sample sample index in [0, samples())
     * @param field a stored field
     * @return values[3p + i], component i at point p; NaN outside the cavity
     * @throws IllegalArgumentException when the sample is out of range or the field not stored
     * @throws IOException when reading fails or the sample is incomplete
     */
    public double[] sample(long sample, Field field) throws IOException {
        Objects.requireNonNull(field, "field");
        if (!fields.contains(field)) {
            throw new IllegalArgumentException("field must be one of those stored " + fields + ": " + field);
        }
        if (sample < 0 || sample >= samples) {
            throw new IllegalArgumentException("sample must lie in [0, " + samples + "): " + sample);
        }
        double[] out = new double[3 * pointCount];
        if (pointCount == 0) {
            return out;
        }
        int part = (int) (sample / partSamples);
        long local = sample - part * partSamples;
        String file = Layout.part(Layout.FIELDS, part);
        int found = 0;
        try (ColumnScan scan = new ColumnScan(folder.resolve(file), fieldColumns(List.of(field)))) {
            // Rows are stored densely in (sample, point) order, so sample s is rows sP .. sP + P - 1 of its part.
            scan.restrictTo(local * pointCount, local * pointCount + pointCount - 1);
            while (scan.next()) {
                long s = scan.getLong(0);
                if (s < sample) {
                    continue;
                }
                if (s > sample) {
                    break;
                }
                int p = scan.getInt(1);
                if (p != found) {
                    throw new IOException(file + ": expected the row of sample " + sample + ", point " + found
                        + ", found point " + p);
                }
                out[3 * p] = scan.getDouble(2);
                out[3 * p + 1] = scan.getDouble(3);
                out[3 * p + 2] = scan.getDouble(4);
                found++;
            }
        }
        if (found != pointCount) {
            throw new IOException(file + " holds " + found + " of " + pointCount + " points of sample " + sample);
        }
        return out;
    }

    /**
     * Full check of a dataset folder. Each problem is one line naming the file (or
     * {@code manifest.json}) and what is wrong: manifest missing (with a note on how many parts of
     * an incomplete run are present) or unreadable; a file missing, outside the layout, of another
     * size or SHA-256 than listed; Parquet row counts unequal to the manifest's and to
     * samples × modes / points of the part; a footer whose run key, spec (compared through the run
     * key it implies), sample count, part index or first sample disagree with the manifest.
     *
     * @param folder the dataset folder
     * @return human-readable problems, empty when the dataset is intact
     */
    public static List<String> problems(Path folder) {
        List<String> out = new ArrayList<>();
        Path dir = folder.toAbsolutePath().normalize();
        Path mf = dir.resolve(Layout.MANIFEST);
        if (!Files.isRegularFile(mf)) {
            out.add(Layout.MANIFEST + ": missing in " + dir + incompleteNote(dir));
            return out;
        }
        JsonNode m;
        try {
            m = Layout.JSON.readTree(mf.toFile());
        } catch (IOException ex) {
            out.add(Layout.MANIFEST + ": cannot be read: " + ex.getMessage());
            return out;
        }
        String format = m.path("format").asText("");
        if (!Version.DATASET_FORMAT.equals(format)) {
            out.add(Layout.MANIFEST + ": format is '" + format + "', expected " + Version.DATASET_FORMAT);
        }
        long samples = m.path("samples").asLong(-1);
        long modes = m.path("modes").asLong(-1);
        long points = m.path("points").asLong(-1);
        long partSamples = m.path("part_samples").asLong(-1);
        long parts = m.path("part_count").asLong(-1);
        String runKey = m.path("run_key").asText("");
        if (partSamples < 1 || samples < 1 || parts != (samples + partSamples - 1) / partSamples) {
            out.add(Layout.MANIFEST + ": part_count = " + parts + " does not match samples = " + samples
                + " in parts of part_samples = " + partSamples);
            return out;
        }
        Map<String, JsonNode> listed = new LinkedHashMap<>();
        for (JsonNode e : m.path("files")) {
            String name = e.path("name").asText("");
            if (listed.put(name, e) != null) {
                out.add(Layout.MANIFEST + ": lists " + name + " twice");
            }
        }
        for (String f : requiredFiles((int) parts)) {
            if (!listed.containsKey(f)) {
                out.add(Layout.MANIFEST + ": does not list " + f);
            }
        }
        long totalAmplitudeRows = 0;
        long totalFieldRows = 0;
        for (Map.Entry<String, JsonNode> e : listed.entrySet()) {
            String name = e.getKey();
            JsonNode entry = e.getValue();
            if (!isDatasetName(name)) {
                out.add(Layout.MANIFEST + ": lists an invalid file name '" + name + "'");
                continue;
            }
            Path p = dir.resolve(name);
            if (!Files.isRegularFile(p)) {
                out.add(name + ": missing");
                continue;
            }
            try {
                long size = Files.size(p);
                if (size != entry.path("bytes").asLong(-1)) {
                    out.add(name + ": has " + size + " bytes, " + Layout.MANIFEST + " says " + entry.path("bytes").asText());
                }
                String sha = sha256(p);
                if (!sha.equals(entry.path("sha256").asText(""))) {
                    out.add(name + ": SHA-256 is " + sha + ", " + Layout.MANIFEST + " says " + entry.path("sha256").asText()
                        + " (the file was changed or damaged)");
                }
            } catch (IOException ex) {
                out.add(name + ": cannot be read: " + ex.getMessage());
                continue;
            }
            // What this file must hold: rows from the manifest's shape; part files also their part.
            long want;
            int part = -1;
            long first = 0;
            java.util.regex.Matcher pm = Layout.PART_FILE.matcher(name);
            if (pm.matches()) {
                part = Integer.parseInt(pm.group(2));
                if (part >= parts) {
                    out.add(name + ": part " + part + " lies beyond part_count = " + parts);
                    continue;
                }
                first = part * partSamples;
                long n = Math.min(partSamples, samples - first);
                want = pm.group(1).equals(Layout.AMPLITUDES) ? n * modes : n * points;
                if (entry.path("part").asLong(-1) != part || entry.path("first_sample").asLong(-1) != first
                    || entry.path("samples").asLong(-1) != n) {
                    out.add(name + ": " + Layout.MANIFEST + " entry says part " + entry.path("part").asText() + ", first sample "
                        + entry.path("first_sample").asText() + ", " + entry.path("samples").asText() + " samples; expected part "
                        + part + ", first sample " + first + ", " + n + " samples");
                }
            } else {
                want = name.equals(Layout.MODES) ? modes : points;
            }
            try (ParquetFileReader r = ParquetFileReader.open(new LocalInputFile(p),
                ParquetReadOptions.builder(new PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build())) {
                long rows = r.getRecordCount();
                long listedRows = entry.path("rows").asLong(-1);
                if (rows != listedRows) {
                    out.add(name + ": " + rows + " rows in its Parquet footer, " + Layout.MANIFEST + " says " + listedRows);
                }
                if (rows != want) {
                    out.add(name + ": " + rows + " rows, expected " + want + " from the manifest's samples, modes and points");
                }
                if (pm.matches()) {
                    if (pm.group(1).equals(Layout.AMPLITUDES)) {
                        totalAmplitudeRows += rows;
                    } else {
                        totalFieldRows += rows;
                    }
                }
                footerProblems(name, r.getFileMetaData().getKeyValueMetaData(), runKey, samples, partSamples, parts, part,
                    first, out);
            } catch (IOException | RuntimeException ex) {
                out.add(name + ": cannot be read as Parquet: " + ex.getMessage());
            }
        }
        if (out.isEmpty() && (totalAmplitudeRows != samples * modes || totalFieldRows != samples * points)) {
            out.add(Layout.MANIFEST + ": parts hold " + totalAmplitudeRows + " amplitude and " + totalFieldRows
                + " field rows, expected " + samples * modes + " and " + samples * points);
        }
        return out;
    }

    /** Footer checks of one file against the manifest. */
    private static void footerProblems(String name, Map<String, String> kv, String runKey, long samples, long partSamples,
                                       long parts, int part, long first, List<String> out) {
        String spec = kv.get(Layout.KEY_SPEC);
        if (spec == null) {
            out.add(name + ": footer has no " + Layout.KEY_SPEC);
        } else {
            String implied;
            try {
                implied = Layout.runKey(spec, samples, partSamples);
            } catch (RuntimeException ex) {
                implied = "unreadable (" + ex.getMessage() + ")";
            }
            if (!runKey.equals(implied)) {
                out.add(name + ": footer holds another spec than the run's (its spec gives run key " + shortKey(implied)
                    + ", " + Layout.MANIFEST + " says " + shortKey(runKey) + ")");
            }
        }
        if (!runKey.equals(kv.get(Layout.KEY_RUN_KEY))) {
            out.add(name + ": footer says " + Layout.KEY_RUN_KEY + " = " + shortKey(kv.get(Layout.KEY_RUN_KEY)) + ", "
                + Layout.MANIFEST + " says " + shortKey(runKey));
        }
        expectKey(name, kv, Layout.KEY_SAMPLES, Long.toString(samples), out);
        expectKey(name, kv, Layout.KEY_FORMAT, Version.DATASET_FORMAT, out);
        expectKey(name, kv, Layout.KEY_PART_SAMPLES, Long.toString(partSamples), out);
        expectKey(name, kv, Layout.KEY_PART_COUNT, Long.toString(parts), out);
        if (part >= 0) {
            expectKey(name, kv, Layout.KEY_PART, Integer.toString(part), out);
            expectKey(name, kv, Layout.KEY_FIRST_SAMPLE, Long.toString(first), out);
        }
    }

    private static void expectKey(String name, Map<String, String> kv, String key, String want, List<String> out) {
        if (!want.equals(kv.get(key))) {
            out.add(name + ": footer says " + key + " = " + kv.get(key) + ", expected " + want);
        }
    }

    private static String shortKey(String key) {
        return key == null ? "none" : key.length() > 16 ? key.substring(0, 16) + "…" : key;
    }

    /** For a folder without manifest: how far an incomplete run got, from its part records. */
    private static String incompleteNote(Path dir) {
        Path run = dir.resolve(Layout.RUN_FILE);
        if (!Files.isRegularFile(run)) {
            return " (not a dataset)";
        }
        try {
            JsonNode r = Layout.JSON.readTree(run.toFile());
            String key = r.path("run_key").asText("");
            int parts = r.path("part_count").asInt(0);
            List<Integer> missing = new ArrayList<>();
            for (int k = 0; k < parts; k++) {
                if (DatasetWriter.readPartRecord(dir, k, key) == null) {
                    missing.add(k);
                }
            }
            return " (an incomplete run: " + (parts - missing.size()) + " of " + parts + " parts present, missing "
                + ranges(missing) + "; re-run the same spec, or its missing shards, to complete it)";
        } catch (IOException | RuntimeException ex) {
            return " (an incomplete run whose " + Layout.RUN_FILE + " cannot be read)";
        }
    }

    /** "0-3, 7, 9-10" from an ascending list. */
    static String ranges(List<Integer> list) {
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < list.size();) {
            int j = i;
            while (j + 1 < list.size() && list.get(j + 1) == list.get(j) + 1) {
                j++;
            }
            if (sb.length() > 0) {
                sb.append(", ");
            }
            sb.append(list.get(i));
            if (j > i) {
                sb.append('-').append(list.get(j));
            }
            i = j + 1;
        }
        return sb.length() == 0 ? "none" : "part " + sb;
    }

    /** @return the row count in a Parquet file's footer */
    static long parquetRows(Path p) throws IOException {
        try (ParquetFileReader r = ParquetFileReader.open(new LocalInputFile(p),
            ParquetReadOptions.builder(new PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build())) {
            return r.getRecordCount();
        }
    }

    static String sha256(Path p) throws IOException {
        MessageDigest d = HashingOutputFile.sha256Digest();
        byte[] buf = new byte[1 << 16];
        try (InputStream in = Files.newInputStream(p)) {
            int n;
            while ((n = in.read(buf)) > 0) {
                d.update(buf, 0, n);
            }
        }
        return HexFormat.of().formatHex(d.digest());
    }
}
