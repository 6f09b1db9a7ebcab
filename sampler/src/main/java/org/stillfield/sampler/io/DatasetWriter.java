package org.stillfield.sampler.io;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.DirectoryStream;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicLong;
import org.apache.parquet.hadoop.metadata.CompressionCodecName;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Version;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.Shard;

/**
 * Writes one run, or one shard of it, as a dataset folder ({@link Version#DATASET_FORMAT}; layout
 * in {@link Layout}): {@code modes.parquet}, {@code points.parquet}, per part
 * {@code amplitudes/part-NNNNN.parquet} and {@code fields/part-NNNNN.parquet}, and, once every
 * part of the run is present, {@code manifest.json} with each file's row count, size and SHA-256.
 *
 * <p>Every file carries the run's spec text, run key, tool and format version, physical
 * constants, generator, seed, cavity, window, state, sample count, part size, table name and the
 * unit of every column in its Parquet footer (part files also their part index and first sample),
 * so a single file is self-describing.
 *
 * <p>Durability: each file is written under a hidden temporary name, forced to disk and renamed
 * when complete; a part counts as done only when its record ({@code .stillfield/parts/}) is on
 * disk, written the same way after both of its files. The manifest is written last. A folder
 * without a manifest is never a complete dataset, and a killed run leaves only finished parts and
 * temporary files, so re-running the same spec ({@link #plan}) writes just the missing parts.
 * Since every sample comes from its own random stream, the result does not depend on which
 * process wrote which part, or when.
 *
 * <p>Shards: processes given the same spec and different {@link Shard}s may write into the same
 * folder at the same time, on one machine or on a shared file system; each writes its own block
 * of parts. The run key ({@code .stillfield/run.json}) and the run-wide files are published with
 * an exclusive link, so the first writer's copy stands; whichever process finds every part done
 * writes the manifest.
 *
 * <p>Use: {@link #plan} (reads the folder, writes nothing), {@link #open()} (prepares it), then
 * batches for each range of {@link Plan#pending()} in order, through {@link #batches()} or
 * {@link #accept}, and {@link #finish()}; always {@link #close()}. Memory is bounded by one row
 * group per table (64 MiB). Within {@link #accept} the amplitude table is written on a helper
 * thread while the caller writes the field table; both are done when it returns.
 */
public final class DatasetWriter implements EnsembleSink {
    /** Target size of a row group of the large tables, bytes. */
    static final long ROW_GROUP_BYTES = 64L << 20;

    private static final AtomicLong UNIQUE = new AtomicLong();

    private enum State { OPEN, FAILED, FINISHED, CLOSED }

    /** What {@link #finish()} found. */
    public enum Outcome {
        /** This process wrote the manifest: the dataset is complete. */
        COMPLETED,
        /** The dataset was already complete (another process wrote the manifest). */
        ALREADY_COMPLETE,
        /** This process's parts are done; parts of other shards are still missing. */
        WAITING
    }

    /**
     * A range of samples to draw.
     *
     * @param firstSample first sample index
     * @param sampleCount number of samples, ≥ 1
     */
    public record Range(long firstSample, long sampleCount) {
    }

    /** What a folder holds before a run starts. */
    private enum Found { NOTHING, OURS_INCOMPLETE, COMPLETE, REPLACE }

    /**
     * What a run into a folder has to do: read from the folder without writing to it, so that
     * resource checks can refuse a run before anything is written.
     */
    public static final class Plan {
        private final RunSpec spec;
        private final ModeTable table;
        private final Path target;
        private final String runKey;
        private final long partSamples;
        private final int partCount;
        private final Shard shard;
        private final Found found;
        private final List<Integer> pendingParts;

        private Plan(RunSpec spec, ModeTable table, Path target, String runKey, long partSamples, int partCount, Found found,
                     List<Integer> pendingParts) {
            this.spec = spec;
            this.table = table;
            this.target = target;
            this.runKey = runKey;
            this.partSamples = partSamples;
            this.partCount = partCount;
            this.shard = spec.storage().shard();
            this.found = found;
            this.pendingParts = List.copyOf(pendingParts);
        }

        /** @return the dataset folder (absolute) */
        public Path folder() {
            return target;
        }

        /** @return samples per part (the last part may hold fewer) */
        public long partSamples() {
            return partSamples;
        }

        /** @return number of parts of the whole run */
        public int partCount() {
            return partCount;
        }

        /** @return the shard this process writes */
        public Shard shard() {
            return shard;
        }

        /** @return first part of this shard (inclusive) */
        public int firstPart() {
            return shard.firstPart(partCount);
        }

        /** @return end of this shard's parts (exclusive) */
        public int endPart() {
            return shard.endPart(partCount);
        }

        /** @return the run key (hex SHA-256) */
        public String runKey() {
            return runKey;
        }

        /** @return true when the folder already holds the complete dataset of this run */
        public boolean complete() {
            return found == Found.COMPLETE;
        }

        /** @return true when some of this shard's parts are already present from an earlier attempt */
        public boolean resuming() {
            return found == Found.OURS_INCOMPLETE && pendingParts.size() < endPart() - firstPart();
        }

        /** @return this shard's parts still to write, ascending */
        public List<Integer> pendingParts() {
            return pendingParts;
        }

        /** @return the sample ranges of {@link #pendingParts()}, adjacent parts merged */
        public List<Range> pending() {
            List<Range> out = new ArrayList<>();
            long start = -1;
            long end = -1;
            for (int k : pendingParts) {
                long first = k * partSamples;
                long last = Math.min(first + partSamples, spec.samples());
                if (first == end) {
                    end = last;
                } else {
                    if (start >= 0) {
                        out.add(new Range(start, end - start));
                    }
                    start = first;
                    end = last;
                }
            }
            if (start >= 0) {
                out.add(new Range(start, end - start));
            }
            return out;
        }

        /** @return number of samples in {@link #pending()} */
        public long pendingSamples() {
            return pending().stream().mapToLong(Range::sampleCount).sum();
        }

        /**
         * Upper bound of the bytes this plan writes: the raw (uncompressed) values of every
         * pending part plus 5 % and 1 MiB per file for Parquet's levels, headers and footers, and
         * the run-wide tables when they are still missing.
         *
         * @return bytes
         */
        public long estimatedBytes() {
            long points = spec.allPoints().size();
            double perSample = Layout.AMPLITUDE_ROW_BYTES * (double) table.size()
                + Layout.fieldRowBytes(spec.fields().size(), spec.precision()) * (double) points;
            double bytes = 1.05 * perSample * pendingSamples() + 2.0 * pendingParts.size() * (1 << 20);
            if (found != Found.COMPLETE) {
                // modes: 8 ints/doubles + 2 labels + 12 variances per row; points: 11 columns.
                bytes += 1.05 * (200.0 * table.size() + 100.0 * points) + 2 * (1 << 20) + spec.sourceText().length() * 8.0;
            }
            return (long) Math.min(Long.MAX_VALUE / 2, Math.ceil(bytes));
        }

        /**
         * Prepares the folder: removes a replaced dataset (manifest first), publishes the run key
         * and the run-wide tables unless present, and clears this shard's stale temporary files.
         *
         * @return the writer
         * @throws IllegalArgumentException when the folder cannot be created or another run's
         *     key appeared there meanwhile; the message names {@code output.folder}
         * @throws IOException when writing fails
         */
        public DatasetWriter open() throws IOException {
            return new DatasetWriter(this);
        }
    }

    private final Plan plan;
    private final RunSpec spec;
    private final Path target;
    private final List<Field> fields;
    private final ModeTable table;
    private final int modeCount;
    private final int pointCount;
    private final boolean[] inside;
    private final boolean float32;
    private final Map<String, String> common;
    private final ExecutorService helper = Executors.newSingleThreadExecutor(r -> {
        Thread t = new Thread(r, "stillfield-dataset-writer");
        t.setDaemon(true);
        return t;
    });
    // Finishes a closed part (fsync, rename, record) while the next part is being written.
    private final ExecutorService finisher = Executors.newSingleThreadExecutor(r -> {
        Thread t = new Thread(r, "stillfield-part-finisher");
        t.setDaemon(true);
        return t;
    });
    private Future<Void> finishing;
    private final List<Integer> pendingParts;
    private int nextPending;
    /** The part being written, or -1. */
    private int part = -1;
    private long partFirst;
    private long partEnd;
    private long nextSample = -1;
    private final CompressionCodecName codec;
    private ColumnBlockWriter amplitudes;
    private ColumnBlockWriter fieldValues;
    private Path amplitudesTemp;
    private Path fieldsTemp;
    private State state = State.OPEN;
    private Outcome outcome;
    private int partsPresent;

    /**
     * Reads the output folder and decides what a run of {@code spec} there has to do.
     *
     * @param spec the run (output folder, fields, points, precision, samples, storage, spec text)
     * @param table the run's modes, as the engine uses them
     * @param overwrite replace a dataset or incomplete run of another spec (or the same) in the
     *     folder; never anything that is not a dataset
     * @return the plan
     * @throws IllegalArgumentException when the folder holds something else: not a folder, a
     *     folder that is no dataset, a dataset or incomplete run of another spec (without
     *     overwrite), or overwrite with a shard; the message names {@code output.folder}
     * @throws IllegalStateException when a mode's variance is not finite (names the mode)
     * @throws IOException when the folder cannot be read
     */
    public static Plan plan(RunSpec spec, ModeTable table, boolean overwrite) throws IOException {
        Objects.requireNonNull(spec, "spec");
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(spec.outputFolder(), "spec.outputFolder");
        checkVariances(table);
        Path target = spec.outputFolder().toAbsolutePath().normalize();
        if (target.getParent() == null) {
            throw new IllegalArgumentException("output.folder must not be a file-system root: " + target);
        }
        long partSamples = Layout.partSamples(spec, table.size());
        int partCount = Layout.partCount(spec.samples(), partSamples);
        String key = Layout.runKey(spec.sourceText(), spec.samples(), partSamples);
        Shard shard = spec.storage().shard();
        if (overwrite && !shard.isWhole()) {
            throw new IllegalArgumentException("--overwrite cannot be combined with shard " + shard
                + " (output.shard or --shard): it would delete the other shards' parts in output.folder " + target
                + "; remove the folder first, then start the shards");
        }
        Found found = inspect(target, key, overwrite);
        List<Integer> pending = new ArrayList<>();
        for (int k = shard.firstPart(partCount); k < shard.endPart(partCount); k++) {
            if (found == Found.COMPLETE) {
                break;
            }
            if (found != Found.OURS_INCOMPLETE || readPartRecord(target, k, key) == null) {
                pending.add(k);
            }
        }
        return new Plan(spec, table, target, key, partSamples, partCount, found, pending);
    }

    /**
     * Shortcut for {@link #plan} then {@link Plan#open()}.
     *
     * @param spec the run
     * @param table its modes
     * @param overwrite replace another dataset in the folder
     * @return the writer
     * @throws IOException when the folder cannot be read or written
     */
    public static DatasetWriter create(RunSpec spec, ModeTable table, boolean overwrite) throws IOException {
        return plan(spec, table, overwrite).open();
    }

    /** A table with a non-finite or negative variance would write noise of unknown scale: stop. */
    private static void checkVariances(ModeTable table) {
        for (int l = 0; l < table.size(); l++) {
            for (Field f : Field.values()) {
                double v = table.variance(f, l);
                double v0 = table.vacuumVariance(f, l);
                if (!(v >= 0 && v < Double.POSITIVE_INFINITY && v0 >= 0 && v0 < Double.POSITIVE_INFINITY)) {
                    throw new IllegalStateException("mode " + table.modes().get(l).label() + " (mode " + l + ", f = "
                        + table.frequency(l) + " Hz) has a non-finite or negative variance of " + f + ": " + v
                        + " (vacuum " + v0 + ", thermal factor " + table.thermalFactor(l) + "); nothing was written");
                }
            }
        }
    }

    private static Found inspect(Path target, String key, boolean overwrite) throws IOException {
        if (!Files.exists(target, LinkOption.NOFOLLOW_LINKS)) {
            return Found.NOTHING;
        }
        if (!Files.isDirectory(target, LinkOption.NOFOLLOW_LINKS)) {
            throw new IllegalArgumentException("output.folder exists and is not a folder: " + target + "; choose another folder");
        }
        boolean hasManifest = Files.isRegularFile(target.resolve(Layout.MANIFEST));
        boolean hasRun = Files.isRegularFile(target.resolve(Layout.RUN_FILE));
        if (!hasManifest && !hasRun) {
            if (onlyState(target)) {
                // A run killed before it published its key: nothing of value is there.
                return overwrite ? Found.REPLACE : Found.NOTHING;
            }
            throw new IllegalArgumentException("output.folder already exists and is not a dataset (no " + Layout.MANIFEST
                + " or " + Layout.RUN_FILE + "): " + target + "; it is not replaced even with --overwrite; choose another folder");
        }
        if (overwrite) {
            return Found.REPLACE;
        }
        String existing = hasManifest ? keyOf(target.resolve(Layout.MANIFEST)) : keyOf(target.resolve(Layout.RUN_FILE));
        if (existing == null && hasManifest) {
            throw new IllegalArgumentException("output.folder " + target + " holds a dataset of another format than "
                + Version.DATASET_FORMAT + " (no run key in its " + Layout.MANIFEST
                + "); choose another folder or pass --overwrite to replace it");
        }
        if (!key.equals(existing)) {
            throw new IllegalArgumentException("output.folder " + target + " already holds "
                + (hasManifest ? "a complete dataset" : "an incomplete run") + " of another spec (run key "
                + abbreviate(existing) + ", this spec's " + abbreviate(key) + "; a run continues only with the same spec"
                + " and sample count); choose another folder or pass --overwrite to replace it");
        }
        return hasManifest ? Found.COMPLETE : Found.OURS_INCOMPLETE;
    }

    private static String abbreviate(String key) {
        return key == null ? "none" : key.substring(0, Math.min(12, key.length()));
    }

    /** @return the run key in a manifest or run file, or null when it has none or is unreadable */
    private static String keyOf(Path json) {
        try {
            JsonNode n = Layout.JSON.readTree(json.toFile());
            JsonNode k = n == null ? null : n.get("run_key");
            return k != null && k.isTextual() ? k.asText() : null;
        } catch (IOException ex) {
            return null;
        }
    }

    /** @return true when the folder holds nothing but (possibly) the state folder without a run file */
    private static boolean onlyState(Path target) throws IOException {
        try (DirectoryStream<Path> s = Files.newDirectoryStream(target)) {
            for (Path p : s) {
                if (!p.getFileName().toString().equals(Layout.STATE)) {
                    return false;
                }
            }
        }
        return true;
    }

    /**
     * @return the record of part k when it is complete: it parses, has this run's key, and every
     *     file it lists exists with the listed size; null otherwise
     */
    static JsonNode readPartRecord(Path target, int k, String key) {
        Path rec = target.resolve(Layout.partRecord(k));
        if (!Files.isRegularFile(rec)) {
            return null;
        }
        try {
            JsonNode n = Layout.JSON.readTree(rec.toFile());
            if (n == null || !key.equals(n.path("run_key").asText()) || n.path("part").asInt(-1) != k) {
                return null;
            }
            JsonNode files = n.path("files");
            if (files.size() != 2) {
                return null;
            }
            for (JsonNode f : files) {
                Path p = target.resolve(f.path("name").asText("")).normalize();
                if (!p.startsWith(target) || !Files.isRegularFile(p) || Files.size(p) != f.path("bytes").asLong(-1)) {
                    return null;
                }
            }
            return n;
        } catch (IOException | RuntimeException ex) {
            return null;
        }
    }

    private DatasetWriter(Plan plan) throws IOException {
        this.plan = plan;
        this.spec = plan.spec;
        this.target = plan.target;
        this.table = plan.table;
        this.fields = Layout.ordered(spec.fields());
        this.modeCount = table.size();
        List<Vec3> points = spec.allPoints();
        this.pointCount = points.size();
        this.inside = new boolean[pointCount];
        for (int p = 0; p < pointCount; p++) {
            inside[p] = table.cavity().contains(points.get(p));
        }
        this.float32 = spec.precision() == RunSpec.Precision.FLOAT32;
        this.codec = codec(spec.storage().compression());
        this.pendingParts = plan.pendingParts;
        Map<String, String> c = Layout.commonFooter(spec, table.cavity(), table.window(), table.state());
        c.put(Layout.KEY_RUN_KEY, plan.runKey);
        c.put(Layout.KEY_PART_SAMPLES, Long.toString(plan.partSamples));
        c.put(Layout.KEY_PART_COUNT, Integer.toString(plan.partCount));
        this.common = c;
        if (plan.found == Found.COMPLETE) {
            return;
        }
        try {
            prepare();
        } catch (IOException ex) {
            helper.shutdown();
            finisher.shutdown();
            throw failure(ex);
        } catch (RuntimeException | Error ex) {
            helper.shutdown();
            finisher.shutdown();
            throw ex;
        }
    }

    private void prepare() throws IOException {
        Path parent = target.getParent();
        try {
            Files.createDirectories(parent);
        } catch (IOException ex) {
            throw new IllegalArgumentException("output.folder: cannot create its parent folder " + parent + ": " + reason(ex), ex);
        }
        if (!Files.isDirectory(parent) || !Files.isWritable(parent)) {
            throw new IllegalArgumentException("output.folder: parent folder is not writable: " + parent);
        }
        if (plan.found == Found.REPLACE) {
            clear();
        }
        try {
            Files.createDirectories(target.resolve(Layout.STATE));
        } catch (IOException ex) {
            throw new IllegalArgumentException("output.folder: cannot create " + target + ": " + reason(ex), ex);
        }
        if (!Files.isWritable(target)) {
            throw new IllegalArgumentException("output.folder is not writable: " + target);
        }
        // The run key first: until it exists, the folder holds nothing but the state folder, which
        // a concurrent shard reads as a fresh start (see inspect).
        publishRunFile();
        Files.createDirectories(target.resolve(Layout.PART_RECORDS));
        Files.createDirectories(target.resolve(Layout.AMPLITUDES));
        Files.createDirectories(target.resolve(Layout.FIELDS));
        if (!Files.isRegularFile(target.resolve(Layout.MODES))) {
            writeOnce(Layout.MODES, this::writeModes);
        }
        if (!Files.isRegularFile(target.resolve(Layout.POINTS))) {
            writeOnce(Layout.POINTS, this::writePoints);
        }
        for (int k : pendingParts) {
            removeTemps(k);
        }
    }

    /** Removes a replaced dataset: its manifest first, so that it never looks complete half-deleted. */
    private void clear() throws IOException {
        Files.deleteIfExists(target.resolve(Layout.MANIFEST));
        syncFolder(target);
        try (DirectoryStream<Path> s = Files.newDirectoryStream(target)) {
            for (Path p : s) {
                deleteTree(p);
            }
        }
    }

    private ObjectNode runNode() {
        ObjectNode m = Layout.JSON.createObjectNode();
        m.put("format", Version.DATASET_FORMAT);
        m.put("version", Version.VERSION);
        m.put("name", spec.name());
        m.put("run_key", plan.runKey);
        m.put("seed", spec.seed());
        m.put("samples", spec.samples());
        m.put("part_samples", plan.partSamples);
        m.put("part_count", plan.partCount);
        m.put("modes", modeCount);
        m.put("points", pointCount);
        ArrayNode f = m.putArray("fields");
        fields.forEach(x -> f.add(x.name()));
        m.put("precision", spec.precision().name().toLowerCase(Locale.ROOT));
        m.put("compression", codec.name());
        return m;
    }

    /** The run key goes first; a concurrent shard with another spec is refused here at the latest. */
    private void publishRunFile() throws IOException {
        Path run = target.resolve(Layout.RUN_FILE);
        if (!Files.isRegularFile(run)) {
            Path tmp = temp(run);
            writeJson(tmp, runNode());
            linkOnce(tmp, run);
        }
        String key = keyOf(run);
        if (!plan.runKey.equals(key)) {
            throw new IllegalArgumentException("output.folder " + target + " was claimed by a run of another spec (run key "
                + abbreviate(key) + ", this spec's " + abbreviate(plan.runKey) + "); choose another folder");
        }
    }

    @FunctionalInterface
    private interface TableBody {
        void write(ColumnBlockWriter w) throws IOException;
    }

    /** Writes a run-wide table under a temporary name and links it into place unless another process was first. */
    private void writeOnce(String name, TableBody body) throws IOException {
        Path dest = target.resolve(name);
        Path tmp = temp(dest);
        Layout.Table t = name.equals(Layout.MODES) ? Layout.modes() : Layout.points();
        int rows = name.equals(Layout.MODES) ? modeCount : pointCount;
        try (ColumnBlockWriter w = new ColumnBlockWriter(tmp, t.schema(), Layout.footer(common, t), ROW_GROUP_BYTES, codec,
            ColumnBlockWriter.pageRows(rows))) {
            body.write(w);
        } catch (IOException | RuntimeException ex) {
            Files.deleteIfExists(tmp);
            throw ex;
        }
        linkOnce(tmp, dest);
    }

    /**
     * Publishes a complete file under its final name only if that name is free (a hard link is
     * created atomically or not at all, also over NFS), so run-wide files are written once; where
     * links are not supported, a rename that does not replace.
     */
    private static void linkOnce(Path tmp, Path dest) throws IOException {
        try {
            Files.createLink(dest, tmp);
        } catch (FileAlreadyExistsException ex) {
            // Another process published it first; its copy stands.
        } catch (UnsupportedOperationException | IOException ex) {
            if (!Files.exists(dest)) {
                try {
                    Files.move(tmp, dest);
                } catch (FileAlreadyExistsException again) {
                    // Lost the race; fine.
                }
            }
        } finally {
            Files.deleteIfExists(tmp);
        }
        syncFolder(dest.getParent());
    }

    /** A hidden temporary name beside the destination, unique to this process and call. */
    private static Path temp(Path dest) {
        return dest.resolveSibling("." + dest.getFileName() + "." + ProcessHandle.current().pid() + "-" + System.nanoTime()
            + "-" + UNIQUE.incrementAndGet() + ".tmp");
    }

    /** Removes temporary files of part k left by a killed attempt (this shard owns part k). */
    private void removeTemps(int k) throws IOException {
        for (String t : List.of(Layout.AMPLITUDES, Layout.FIELDS)) {
            Path dest = target.resolve(Layout.part(t, k));
            String prefix = "." + dest.getFileName() + ".";
            try (DirectoryStream<Path> s = Files.newDirectoryStream(dest.getParent(), prefix + "*.tmp")) {
                for (Path p : s) {
                    Files.deleteIfExists(p);
                }
            }
        }
    }

    private void writeModes(ColumnBlockWriter w) throws IOException {
        List<Mode> modes = table.modes();
        Field[] all = Field.values();
        w.append(modeCount, (first, n, page, at) -> {
            for (int r = 0; r < n; r++) {
                int l = (int) first + r;
                Mode m = modes.get(l);
                int row = at + r;
                page.int32(0)[row] = l;
                page.text(1)[row] = m.label();
                page.text(2)[row] = m.family();
                page.int32(3)[row] = m.i1();
                page.int32(4)[row] = m.i2();
                page.int32(5)[row] = m.i3();
                page.int32(6)[row] = m.orientation();
                page.float64(7)[row] = m.k();
                page.float64(8)[row] = table.omega(l);
                page.float64(9)[row] = table.frequency(l);
                page.float64(10)[row] = table.weight(l);
                page.float64(11)[row] = table.thermalFactor(l);
                for (int f = 0; f < all.length; f++) {
                    page.float64(12 + f)[row] = table.vacuumVariance(all[f], l);
                    page.float64(12 + all.length + f)[row] = table.variance(all[f], l);
                }
            }
        });
    }

    private void writePoints(ColumnBlockWriter w) throws IOException {
        int global = 0;
        for (PointSet set : spec.pointSets()) {
            int[] dims = set.dims();
            String name = set.name();
            String kind = set.kind().name().toLowerCase(Locale.ROOT);
            List<Vec3> pts = set.points();
            int base = global;
            w.append(set.size(), (first, n, page, at) -> {
                for (int r = 0; r < n; r++) {
                    int idx = (int) first + r;
                    int p = base + idx;
                    int row = at + r;
                    Vec3 x = pts.get(idx);
                    page.int32(0)[row] = p;
                    page.text(1)[row] = name;
                    page.text(2)[row] = kind;
                    page.int32(3)[row] = idx;
                    // Grid index (i, j, k) with x fastest; a line's index is i; a lone point is (0, 0, 0).
                    page.int32(4)[row] = idx % dims[0];
                    page.int32(5)[row] = (idx / dims[0]) % dims[1];
                    page.int32(6)[row] = idx / (dims[0] * dims[1]);
                    page.float64(7)[row] = x.x();
                    page.float64(8)[row] = x.y();
                    page.float64(9)[row] = x.z();
                    page.bool(10)[row] = inside[p];
                }
            });
            global += set.size();
        }
    }

    /** @return the plan this writer carries out */
    public Plan plan() {
        return plan;
    }

    /**
     * A view that passes batches to {@link #accept} and ignores {@code finish()}, for handing one
     * pending range at a time to the engine (which finishes its sink after each range); call
     * {@link #finish()} on the writer after the last range.
     *
     * @return the view
     */
    public EnsembleSink batches() {
        return new EnsembleSink() {
            @Override
            public void accept(SampleBatch batch) throws IOException {
                DatasetWriter.this.accept(batch);
            }

            @Override
            public void finish() {
                // The writer is finished once, after all ranges.
            }
        };
    }

    /**
     * Streams one batch into the part files. Batches cover {@link Plan#pending()} in order: a
     * part starts at its first sample, and samples follow each other within a range.
     *
     * @param batch the next samples
     * @throws IllegalStateException when the batch is out of order, outside the pending parts,
     *     has the wrong shape or a non-finite amplitude (named by mode and sample), or the writer
     *     is finished or failed
     * @throws IOException when writing fails; the message names the folder
     */
    @Override
    public void accept(SampleBatch batch) throws IOException {
        requireOpen();
        try {
            check(batch);
            int s = 0;
            while (s < batch.size()) {
                long sample = batch.firstSample() + s;
                if (part < 0) {
                    startPart(sample);
                }
                int n = (int) Math.min(batch.size() - s, partEnd - sample);
                writeSegment(batch, s, n);
                s += n;
                nextSample = sample + n;
                if (nextSample == partEnd) {
                    endPart();
                }
            }
        } catch (IOException ex) {
            state = State.FAILED;
            throw failure(ex);
        } catch (RuntimeException | Error ex) {
            state = State.FAILED;
            IOException io = ioCause(ex);
            if (io != null) {
                throw failure(io);
            }
            throw ex;
        }
    }

    private void check(SampleBatch batch) {
        if (part >= 0 && batch.firstSample() != nextSample) {
            throw new IllegalStateException("batch starts at sample " + batch.firstSample() + ", expected " + nextSample
                + " (part " + part + " is not finished)");
        }
        for (int s = 0; s < batch.size(); s++) {
            long sample = batch.firstSample() + s;
            double[] q = batch.q(s);
            double[] e = batch.e(s);
            if (q.length != modeCount || e.length != modeCount) {
                throw new IllegalStateException("sample " + sample + " has " + q.length + " q and " + e.length
                    + " e amplitudes, the mode table has " + modeCount);
            }
            for (int l = 0; l < modeCount; l++) {
                if (!Double.isFinite(q[l]) || !Double.isFinite(e[l])) {
                    throw new IllegalStateException("non-finite amplitude of mode " + table.modes().get(l).label() + " (mode "
                        + l + ") in sample " + sample + ": q = " + q[l] + ", e = " + e[l] + "; the run is stopped");
                }
            }
            if (pointCount == 0) {
                continue;
            }
            for (Field f : fields) {
                int n = batch.values(f, s).length;
                if (n != 3 * pointCount) {
                    throw new IllegalStateException("sample " + sample + " has " + n + " " + f + " values, expected 3 x "
                        + pointCount + " points");
                }
            }
        }
    }

    private void startPart(long sample) throws IOException {
        if (nextPending >= pendingParts.size()) {
            throw new IllegalStateException("batch at sample " + sample + " lies beyond this writer's parts "
                + describeParts());
        }
        int k = pendingParts.get(nextPending);
        long first = k * plan.partSamples;
        if (sample != first) {
            throw new IllegalStateException("batch starts at sample " + sample + ", expected " + first
                + ", the first sample of the next part to write (" + k + ")");
        }
        part = k;
        partFirst = first;
        partEnd = Math.min(first + plan.partSamples, spec.samples());
        Map<String, String> footer = new java.util.LinkedHashMap<>(common);
        footer.put(Layout.KEY_PART, Integer.toString(k));
        footer.put(Layout.KEY_FIRST_SAMPLE, Long.toString(partFirst));
        footer.put(Layout.KEY_SAMPLES_IN_PART, Long.toString(partEnd - partFirst));
        amplitudesTemp = temp(target.resolve(Layout.part(Layout.AMPLITUDES, k)));
        fieldsTemp = temp(target.resolve(Layout.part(Layout.FIELDS, k)));
        Layout.Table at = Layout.amplitudes();
        Layout.Table ft = Layout.fields(spec.fields(), spec.precision());
        amplitudes = new ColumnBlockWriter(amplitudesTemp, at.schema(), Layout.footer(footer, at), ROW_GROUP_BYTES, codec,
            ColumnBlockWriter.pageRows(modeCount));
        fieldValues = new ColumnBlockWriter(fieldsTemp, ft.schema(), Layout.footer(footer, ft), ROW_GROUP_BYTES, codec,
            ColumnBlockWriter.pageRows(pointCount));
        amplitudes.file().deferForce();
        fieldValues.file().deferForce();
    }

    private String describeParts() {
        return plan.pendingParts.isEmpty() ? "(none pending)" : "(parts " + plan.pendingParts + ")";
    }

    private void writeSegment(SampleBatch batch, int from, int count) throws IOException {
        if (pointCount == 0) {
            writeAmplitudes(batch, from, count);
            return;
        }
        // The two tables are independent: write them on two threads. Both finish before this
        // returns, so the shared batch arrays are never read afterwards.
        Future<Void> amp = helper.submit(() -> {
            writeAmplitudes(batch, from, count);
            return null;
        });
        Exception failure = null;
        try {
            writeFields(batch, from, count);
        } catch (IOException | RuntimeException ex) {
            failure = ex;
        }
        try {
            await(amp);
        } catch (IOException | RuntimeException ex) {
            if (failure == null) {
                failure = ex;
            } else {
                failure.addSuppressed(ex);
            }
        }
        if (failure instanceof IOException) {
            throw (IOException) failure;
        }
        if (failure != null) {
            throw (RuntimeException) failure;
        }
    }

    private void writeAmplitudes(SampleBatch batch, int from, int count) throws IOException {
        for (int s = from; s < from + count; s++) {
            long sample = batch.firstSample() + s;
            double[] q = batch.q(s);
            double[] e = batch.e(s);
            amplitudes.append(modeCount, (first, n, page, at) -> {
                int l0 = (int) first;
                java.util.Arrays.fill(page.int64(0), at, at + n, sample);
                int[] mode = page.int32(1);
                for (int r = 0; r < n; r++) {
                    mode[at + r] = l0 + r;
                }
                System.arraycopy(q, l0, page.float64(2), at, n);
                System.arraycopy(e, l0, page.float64(3), at, n);
            });
        }
    }

    private void writeFields(SampleBatch batch, int from, int count) throws IOException {
        double[][] values = new double[fields.size()][];
        for (int s = from; s < from + count; s++) {
            for (int f = 0; f < fields.size(); f++) {
                values[f] = batch.values(fields.get(f), s);
            }
            long sample = batch.firstSample() + s;
            fieldValues.append(pointCount, (first, n, page, at) -> {
                int p0 = (int) first;
                java.util.Arrays.fill(page.int64(0), at, at + n, sample);
                int[] point = page.int32(1);
                boolean[] present = page.present();
                for (int r = 0; r < n; r++) {
                    point[at + r] = p0 + r;
                    present[at + r] = inside[p0 + r];
                }
                // Columns 2.. are the fields' x, y, z components in schema order; values are
                // interleaved per point (v[3p + i]).
                // One pass per field over its interleaved values: three strided passes would read
                // the whole array three times.
                for (int f = 0; f < values.length; f++) {
                    double[] v = values[f];
                    int col = 2 + 3 * f;
                    if (float32) {
                        float[] x = page.float32(col);
                        float[] y = page.float32(col + 1);
                        float[] z = page.float32(col + 2);
                        for (int r = 0; r < n; r++) {
                            int b = 3 * (p0 + r);
                            x[at + r] = (float) v[b];
                            y[at + r] = (float) v[b + 1];
                            z[at + r] = (float) v[b + 2];
                        }
                    } else {
                        double[] x = page.float64(col);
                        double[] y = page.float64(col + 1);
                        double[] z = page.float64(col + 2);
                        for (int r = 0; r < n; r++) {
                            int b = 3 * (p0 + r);
                            x[at + r] = v[b];
                            y[at + r] = v[b + 1];
                            z[at + r] = v[b + 2];
                        }
                    }
                }
            });
        }
    }

    /** Closes the part's files (forced to disk), renames them into place, then writes its record. */
    private void endPart() throws IOException {
        amplitudes.close();
        fieldValues.close();
        ObjectNode rec = Layout.JSON.createObjectNode();
        rec.put("run_key", plan.runKey);
        rec.put("part", part);
        rec.put("first_sample", partFirst);
        rec.put("samples", partEnd - partFirst);
        ArrayNode files = rec.putArray("files");
        String[] names = {Layout.part(Layout.AMPLITUDES, part), Layout.part(Layout.FIELDS, part)};
        ColumnBlockWriter[] writers = {amplitudes, fieldValues};
        Path[] temps = {amplitudesTemp, fieldsTemp};
        for (int i = 0; i < 2; i++) {
            ObjectNode o = files.addObject();
            o.put("name", names[i]);
            o.put("rows", writers[i].rows());
            o.put("bytes", writers[i].file().length());
            o.put("sha256", writers[i].file().sha256());
        }
        int k = part;
        amplitudes = null;
        fieldValues = null;
        amplitudesTemp = null;
        fieldsTemp = null;
        part = -1;
        nextPending++;
        // One part at a time in the finisher: records stay in part order, a failure surfaces at the
        // next part's end at the latest, and at most one closed part waits for the disk.
        awaitFinisher();
        finishing = finisher.submit(() -> {
            try {
                finishPart(k, names, writers, temps, rec);
            } catch (IOException | RuntimeException | Error ex) {
                for (Path t : temps) {
                    Files.deleteIfExists(t);
                }
                throw ex;
            }
            return null;
        });
    }

    /** Forces a closed part's files to disk, renames them into place, then writes its record. */
    private void finishPart(int k, String[] names, ColumnBlockWriter[] writers, Path[] temps, ObjectNode rec)
        throws IOException {
        for (int i = 0; i < 2; i++) {
            writers[i].file().force();
            Path dest = target.resolve(names[i]);
            // A final name left by a killed attempt (renamed, but no record yet) is replaced.
            Files.move(temps[i], dest, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
        }
        syncFolder(target.resolve(Layout.AMPLITUDES));
        syncFolder(target.resolve(Layout.FIELDS));
        Path record = target.resolve(Layout.partRecord(k));
        Path tmp = temp(record);
        writeJson(tmp, rec);
        Files.move(tmp, record, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
        syncFolder(record.getParent());
    }

    /** Waits for the previous part's finishing, rethrowing its failure. */
    private void awaitFinisher() throws IOException {
        Future<Void> f = finishing;
        finishing = null;
        if (f != null) {
            await(f);
        }
    }

    /** Waits for a writer task even when interrupted: returning early would let it race with close(). */
    private static void await(Future<Void> task) throws IOException {
        boolean interrupted = false;
        try {
            while (true) {
                try {
                    task.get();
                    return;
                } catch (InterruptedException ex) {
                    interrupted = true;
                } catch (ExecutionException ex) {
                    throw Tasks.failure(ex, "dataset writer task failed");
                }
            }
        } finally {
            if (interrupted) {
                Thread.currentThread().interrupt();
            }
        }
    }

    /**
     * Checks that this writer's parts are all written, then writes {@code manifest.json} if every
     * part of the run is present (see {@link #outcome()}).
     *
     * @throws IllegalStateException when a pending part was not (fully) written
     * @throws IOException when writing fails; the message names the folder
     */
    @Override
    public void finish() throws IOException {
        requireOpen();
        try {
            if (part >= 0 || nextPending != pendingParts.size()) {
                long missing = part >= 0 ? part : pendingParts.get(nextPending);
                throw new IllegalStateException("dataset writer received only part of its samples: part " + missing
                    + " of " + describeParts() + " is not complete");
            }
            helper.shutdown();
            awaitFinisher();
            finisher.shutdown();
            if (plan.found == Found.COMPLETE) {
                outcome = Outcome.ALREADY_COMPLETE;
                partsPresent = plan.partCount;
            } else {
                outcome = completeIfReady();
            }
            state = State.FINISHED;
        } catch (IOException ex) {
            state = State.FAILED;
            throw failure(ex);
        } catch (RuntimeException | Error ex) {
            state = State.FAILED;
            throw ex;
        }
    }

    /** Writes the manifest when every part's record is present. */
    private Outcome completeIfReady() throws IOException {
        Path manifest = target.resolve(Layout.MANIFEST);
        if (Files.isRegularFile(manifest)) {
            partsPresent = plan.partCount;
            return Outcome.ALREADY_COMPLETE;
        }
        List<JsonNode> records = new ArrayList<>();
        for (int k = 0; k < plan.partCount; k++) {
            JsonNode r = readPartRecord(target, k, plan.runKey);
            if (r != null) {
                records.add(r);
            }
        }
        partsPresent = records.size();
        if (records.size() < plan.partCount) {
            return Outcome.WAITING;
        }
        ObjectNode m = runNode();
        ArrayNode files = m.putArray("files");
        for (String name : Layout.COMMON) {
            Path p = target.resolve(name);
            ObjectNode o = files.addObject();
            o.put("name", name);
            o.put("rows", Dataset.parquetRows(p));
            o.put("bytes", Files.size(p));
            o.put("sha256", Dataset.sha256(p));
        }
        for (JsonNode r : records) {
            for (JsonNode f : r.path("files")) {
                ObjectNode o = files.addObject();
                o.put("name", f.path("name").asText());
                o.put("part", r.path("part").asInt());
                o.put("first_sample", r.path("first_sample").asLong());
                o.put("samples", r.path("samples").asLong());
                o.put("rows", f.path("rows").asLong());
                o.put("bytes", f.path("bytes").asLong());
                o.put("sha256", f.path("sha256").asText());
            }
        }
        Path tmp = temp(manifest);
        writeJson(tmp, m);
        try {
            Files.createLink(manifest, tmp);
        } catch (FileAlreadyExistsException ex) {
            Files.deleteIfExists(tmp);
            return Outcome.ALREADY_COMPLETE;
        } catch (UnsupportedOperationException | IOException ex) {
            Files.move(tmp, manifest, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
        }
        Files.deleteIfExists(tmp);
        syncFolder(target);
        return Outcome.COMPLETED;
    }

    /** @return what {@link #finish()} found; null before it */
    public Outcome outcome() {
        return outcome;
    }

    /** @return number of parts of the run present after {@link #finish()} */
    public int partsPresent() {
        return partsPresent;
    }

    private static void writeJson(Path file, ObjectNode node) throws IOException {
        byte[] bytes = Layout.JSON.writerWithDefaultPrettyPrinter().writeValueAsBytes(node);
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE)) {
            ByteBuffer buf = ByteBuffer.wrap(bytes);
            while (buf.hasRemaining()) {
                ch.write(buf);
            }
            ch.force(true);
        } catch (IOException ex) {
            Files.deleteIfExists(file);
            throw ex;
        }
    }

    /** Makes a rename durable; not every platform can open a folder, and then there is nothing to do. */
    private static void syncFolder(Path dir) {
        try (FileChannel ch = FileChannel.open(dir, StandardOpenOption.READ)) {
            ch.force(true);
        } catch (IOException | UnsupportedOperationException ex) {
            // Best effort only.
        }
    }

    /** @return the first IOException among a throwable's causes, or null */
    private static IOException ioCause(Throwable t) {
        for (Throwable c = t; c != null; c = c.getCause()) {
            if (c instanceof IOException) {
                return (IOException) c;
            }
        }
        return null;
    }

    private static boolean noSpace(Throwable t) {
        for (Throwable c = t; c != null; c = c.getCause()) {
            String m = c.getMessage();
            if (m != null && (m.contains("No space left") || m.contains("Disk quota exceeded"))) {
                return true;
            }
        }
        return false;
    }

    private static String reason(Throwable t) {
        String m = t.getMessage();
        return t.getClass().getSimpleName() + (m == null ? "" : ": " + m);
    }

    /** One line naming the folder and, when the disk is full, saying so. */
    private IOException failure(IOException ex) {
        if (ex.getMessage() != null && ex.getMessage().startsWith("cannot write dataset in ")) {
            return ex;
        }
        String what = noSpace(ex) ? "no space left on device (" + reason(ex) + ")" : reason(ex);
        return new IOException("cannot write dataset in " + target + ": " + what
            + "; finished parts are kept, re-run the same spec to complete the dataset", ex);
    }

    /**
     * Releases the writers and deletes this process's unfinished temporary files; finished parts
     * stay, for a later run to resume from.
     *
     * @throws IOException when a temporary file cannot be removed
     */
    @Override
    public void close() throws IOException {
        if (state == State.CLOSED) {
            return;
        }
        state = State.CLOSED;
        helper.shutdown();
        try {
            awaitFinisher();
        } catch (IOException | RuntimeException ex) {
            // Already reported by accept() or finish(), or the run failed otherwise first; the
            // finisher removed its part's temporary files.
        }
        finisher.shutdown();
        for (ColumnBlockWriter w : new ColumnBlockWriter[] {amplitudes, fieldValues}) {
            if (w != null) {
                try {
                    w.close();
                } catch (IOException | RuntimeException ex) {
                    // The run already failed; its half-written files are deleted below.
                }
            }
        }
        for (Path t : new Path[] {amplitudesTemp, fieldsTemp}) {
            if (t != null) {
                Files.deleteIfExists(t);
            }
        }
    }

    /** @return the dataset folder */
    public Path folder() {
        return target;
    }

    private void requireOpen() {
        if (state != State.OPEN) {
            throw new IllegalStateException("dataset writer for " + target + " is " + state.name().toLowerCase(Locale.ROOT));
        }
    }

    static CompressionCodecName codec(RunSpec.Compression c) {
        switch (c) {
            case ZSTD: return CompressionCodecName.ZSTD;
            case SNAPPY: return CompressionCodecName.SNAPPY;
            case NONE: return CompressionCodecName.UNCOMPRESSED;
            default: throw new IllegalArgumentException("compression " + c);
        }
    }

    static void deleteTree(Path root) throws IOException {
        if (!Files.exists(root, LinkOption.NOFOLLOW_LINKS)) {
            return;
        }
        List<Path> all = new ArrayList<>();
        try (var walk = Files.walk(root)) {
            walk.forEach(all::add);
        }
        for (int i = all.size() - 1; i >= 0; i--) {
            Files.deleteIfExists(all.get(i));
        }
    }
}
