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
 * {@code manifest.json} is present and that every file it lists exists with the listed size;
 * files it does not list are ignored. {@link #problems(Path)} does the full check (hashes, row
 * counts, footers).
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
            if (!isPlainName(folder, file)) {
                throw new IOException("manifest.json in " + folder + " lists a file outside the folder: '" + file + "'");
            }
            bytes.put(file, number(e, "bytes"));
        }
        for (String required : Layout.FILES) {
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
     * @param fileName one of the files listed in manifest.json, e.g. {@code fields.parquet}
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

    /** A manifest may only name files directly inside its own folder. */
    private static boolean isPlainName(Path dir, String name) {
        if (name.isEmpty()) {
            return false;
        }
        Path p = dir.resolve(name).normalize();
        return dir.equals(p.getParent());
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
     * widened exactly), then calls {@code sink.finish()}. The sink is not closed.
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
        try (ColumnScan amp = new ColumnScan(folder.resolve(Layout.AMPLITUDES), List.of("sample", "mode", "q", "e"));
             ColumnScan fld = pointCount == 0 ? null : new ColumnScan(folder.resolve(Layout.FIELDS), fieldColumns(fields))) {
            expectRows(Layout.AMPLITUDES, amp.rowCount(), samples * modeCount);
            if (fld != null) {
                expectRows(Layout.FIELDS, fld.rowCount(), samples * pointCount);
            }
            for (long first = 0; first < samples; first += batchSize) {
                int n = (int) Math.min(batchSize, samples - first);
                double[][] q = new double[n][modeCount];
                double[][] e = new double[n][modeCount];
                Map<Field, double[][]> values = new EnumMap<>(Field.class);
                double[][][] byField = new double[fields.size()][][];
                if (fld != null) {
                    for (int f = 0; f < fields.size(); f++) {
                        byField[f] = new double[n][3 * pointCount];
                        values.put(fields.get(f), byField[f]);
                    }
                }
                for (int s = 0; s < n; s++) {
                    long sample = first + s;
                    for (int l = 0; l < modeCount; l++) {
                        if (!amp.next() || amp.getLong(0) != sample || amp.getInt(1) != l) {
                            throw new IOException(Layout.AMPLITUDES + ": expected the row of sample " + sample + ", mode " + l);
                        }
                        q[s][l] = amp.getDouble(2);
                        e[s][l] = amp.getDouble(3);
                    }
                    if (fld == null) {
                        continue;
                    }
                    for (int p = 0; p < pointCount; p++) {
                        if (!fld.next() || fld.getLong(0) != sample || fld.getInt(1) != p) {
                            throw new IOException(Layout.FIELDS + ": expected the row of sample " + sample + ", point " + p);
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
     * Reads one sample of one field, touching only the pages that hold it (Parquet offset index).
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
        int found = 0;
        try (ColumnScan scan = new ColumnScan(folder.resolve(Layout.FIELDS), fieldColumns(List.of(field)))) {
            // Rows are stored densely in (sample, point) order, so sample s is rows sP .. sP + P - 1.
            scan.restrictTo(sample * pointCount, sample * pointCount + pointCount - 1);
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
                    throw new IOException(Layout.FIELDS + ": expected the row of sample " + sample + ", point " + found
                        + ", found point " + p);
                }
                out[3 * p] = scan.getDouble(2);
                out[3 * p + 1] = scan.getDouble(3);
                out[3 * p + 2] = scan.getDouble(4);
                found++;
            }
        }
        if (found != pointCount) {
            throw new IOException(Layout.FIELDS + " holds " + found + " of " + pointCount + " points of sample " + sample);
        }
        return out;
    }

    /**
     * Full check of a dataset folder: manifest present and readable; every listed file present
     * with the listed size and SHA-256; Parquet row counts equal to the manifest's and to
     * samples × modes / points; the same spec text and sample count in every footer.
     *
     * @param folder the dataset folder
     * @return human-readable problems, empty when the dataset is intact
     */
    public static List<String> problems(Path folder) {
        List<String> out = new ArrayList<>();
        Path dir = folder.toAbsolutePath().normalize();
        Path mf = dir.resolve(Layout.MANIFEST);
        if (!Files.isRegularFile(mf)) {
            out.add(Layout.MANIFEST + " is missing in " + dir);
            return out;
        }
        JsonNode m;
        try {
            m = Layout.JSON.readTree(mf.toFile());
        } catch (IOException ex) {
            out.add(Layout.MANIFEST + " cannot be read: " + ex.getMessage());
            return out;
        }
        String format = m.path("format").asText("");
        if (!Version.DATASET_FORMAT.equals(format)) {
            out.add(Layout.MANIFEST + ": format is '" + format + "', expected " + Version.DATASET_FORMAT);
        }
        long samples = m.path("samples").asLong(-1);
        long modes = m.path("modes").asLong(-1);
        long points = m.path("points").asLong(-1);
        Map<String, Long> expected = Map.of(Layout.MODES, modes, Layout.POINTS, points,
            Layout.AMPLITUDES, samples * modes, Layout.FIELDS, samples * points);
        Map<String, JsonNode> listed = new LinkedHashMap<>();
        for (JsonNode e : m.path("files")) {
            listed.put(e.path("name").asText(""), e);
        }
        for (String f : Layout.FILES) {
            if (!listed.containsKey(f)) {
                out.add(Layout.MANIFEST + " does not list " + f);
            }
        }
        String firstSpec = null;
        String firstSpecFile = null;
        for (Map.Entry<String, JsonNode> e : listed.entrySet()) {
            String name = e.getKey();
            JsonNode entry = e.getValue();
            Path p = dir.resolve(name);
            if (!isPlainName(dir, name)) {
                out.add(Layout.MANIFEST + " lists an invalid file name '" + name + "'");
                continue;
            }
            if (!Files.isRegularFile(p)) {
                out.add(name + " is missing");
                continue;
            }
            try {
                long size = Files.size(p);
                if (size != entry.path("bytes").asLong(-1)) {
                    out.add(name + " has " + size + " bytes, " + Layout.MANIFEST + " says " + entry.path("bytes").asText());
                }
                String sha = sha256(p);
                if (!sha.equals(entry.path("sha256").asText(""))) {
                    out.add(name + " has SHA-256 " + sha + ", " + Layout.MANIFEST + " says " + entry.path("sha256").asText()
                        + " (the file was changed or damaged)");
                }
            } catch (IOException ex) {
                out.add(name + " cannot be read: " + ex.getMessage());
                continue;
            }
            if (!name.endsWith(".parquet")) {
                continue;
            }
            try (ParquetFileReader r = ParquetFileReader.open(new LocalInputFile(p),
                ParquetReadOptions.builder(new PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build())) {
                long rows = r.getRecordCount();
                long listedRows = entry.path("rows").asLong(-1);
                if (rows != listedRows) {
                    out.add(name + " has " + rows + " rows in its Parquet footer, " + Layout.MANIFEST + " says " + listedRows);
                }
                Long want = expected.get(name);
                if (want != null && rows != want) {
                    out.add(name + " has " + rows + " rows, expected " + want + " from the manifest's samples, modes and points");
                }
                Map<String, String> kv = r.getFileMetaData().getKeyValueMetaData();
                String spec = kv.get(Layout.KEY_SPEC);
                if (spec == null) {
                    out.add(name + " footer has no " + Layout.KEY_SPEC);
                } else if (firstSpec == null) {
                    firstSpec = spec;
                    firstSpecFile = name;
                } else if (!firstSpec.equals(spec)) {
                    out.add(name + " footer holds another spec than " + firstSpecFile);
                }
                if (!Long.toString(samples).equals(kv.get(Layout.KEY_SAMPLES))) {
                    out.add(name + " footer says " + Layout.KEY_SAMPLES + " = " + kv.get(Layout.KEY_SAMPLES) + ", "
                        + Layout.MANIFEST + " says " + samples);
                }
                if (!Version.DATASET_FORMAT.equals(kv.get(Layout.KEY_FORMAT))) {
                    out.add(name + " footer says " + Layout.KEY_FORMAT + " = " + kv.get(Layout.KEY_FORMAT));
                }
            } catch (IOException | RuntimeException ex) {
                out.add(name + " cannot be read as Parquet: " + ex.getMessage());
            }
        }
        return out;
    }

    private static String sha256(Path p) throws IOException {
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
