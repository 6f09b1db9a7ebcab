package org.stillfield.sampler.io;

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
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicLong;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Version;
import org.stillfield.sampler.spec.RunSpec;

/**
 * Writes one run as a dataset folder ({@code stillfield-dataset/1}): {@code modes.parquet},
 * {@code points.parquet}, {@code amplitudes.parquet}, {@code fields.parquet} and, last,
 * {@code manifest.json} with each file's row count, size and SHA-256.
 *
 * <p>Every file carries the run's spec text, tool and format version, physical constants,
 * generator, seed, cavity, window, state, sample count, table name and the unit of every column
 * in its Parquet footer, so a single file is self-describing.
 *
 * <p>Everything is written into a hidden staging folder beside the target and renamed into place
 * by {@link #finish()} once the manifest is on disk; with overwrite, an existing dataset is
 * removed only after the new one is in place. {@link #close()} without a successful finish
 * deletes the staging folder, so an interrupted or failed run leaves nothing that looks complete.
 *
 * <p>Batches are streamed straight into the Parquet writers; memory is bounded by one row group
 * per file (64 MiB), not by the sample count. Within {@link #accept} the amplitude table is
 * written on a helper thread while the caller writes the field table; both are done when it
 * returns. Samples must arrive in order from 0 to {@code spec.samples() - 1}.
 */
public final class DatasetWriter implements EnsembleSink {
    /** Target size of a row group of the large tables, bytes. */
    static final long ROW_GROUP_BYTES = 64L << 20;

    private static final AtomicLong UNIQUE = new AtomicLong();

    private enum State { OPEN, FAILED, FINISHED, CLOSED }

    private final RunSpec spec;
    private final Path target;
    private final Path staging;
    private final boolean overwrite;
    private final List<Field> fields;
    private final int modeCount;
    private final int pointCount;
    private final boolean[] inside;
    private final boolean float32;
    private final Map<String, RowWriter> writers = new LinkedHashMap<>();
    private final RowWriter amplitudes;
    private final RowWriter fieldValues;
    private final AmplitudeRow amplitudeRow = new AmplitudeRow();
    private final FieldRow fieldRow;
    private final ExecutorService helper = Executors.newSingleThreadExecutor(r -> {
        Thread t = new Thread(r, "stillfield-dataset-writer");
        t.setDaemon(true);
        return t;
    });
    private long nextSample;
    private State state = State.OPEN;

    private DatasetWriter(RunSpec spec, ModeTable table, Path target, Path staging, boolean overwrite)
        throws IOException {
        this.spec = spec;
        this.target = target;
        this.staging = staging;
        this.overwrite = overwrite;
        this.fields = Layout.ordered(spec.fields());
        this.modeCount = table.size();
        List<Vec3> points = spec.allPoints();
        this.pointCount = points.size();
        this.inside = new boolean[pointCount];
        for (int p = 0; p < pointCount; p++) {
            inside[p] = table.cavity().contains(points.get(p));
        }
        this.float32 = spec.precision() == RunSpec.Precision.FLOAT32;
        this.fieldRow = new FieldRow(fields.size());
        Map<String, String> common = Layout.commonFooter(spec, table.cavity(), table.window(), table.state());
        writeModes(table, common);
        writePoints(common);
        this.amplitudes = open(Layout.AMPLITUDES, Layout.amplitudes(), common);
        this.fieldValues = open(Layout.FIELDS, Layout.fields(spec.fields(), spec.precision()), common);
    }

    /**
     * Prepares a dataset for the run in {@code spec.outputFolder()}.
     *
     * @param spec the run (output folder, fields, points, precision, sample count, spec text)
     * @param table the run's modes, as the engine uses them
     * @param overwrite replace an existing dataset in the output folder (only after the new one is
     *     complete); a non-empty folder that is not a dataset is never replaced
     * @return the writer, to be passed to the engine and closed afterwards
     * @throws IllegalArgumentException when the output folder exists and is not empty (without
     *     overwrite), is not a dataset, or its parent cannot be written; the message names
     *     {@code output.folder}
     * @throws IOException when the first files cannot be written
     */
    public static DatasetWriter create(RunSpec spec, ModeTable table, boolean overwrite) throws IOException {
        Objects.requireNonNull(spec, "spec");
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(spec.outputFolder(), "spec.outputFolder");
        Path target = spec.outputFolder().toAbsolutePath().normalize();
        checkTarget(target, overwrite);
        Path parent = target.getParent();
        if (parent == null) {
            throw new IllegalArgumentException("output.folder must not be a file-system root: " + target);
        }
        try {
            Files.createDirectories(parent);
        } catch (IOException ex) {
            throw new IllegalArgumentException("output.folder: cannot create its parent folder " + parent + ": " + ex, ex);
        }
        if (!Files.isDirectory(parent) || !Files.isWritable(parent)) {
            throw new IllegalArgumentException("output.folder: parent folder is not writable: " + parent);
        }
        Path staging;
        try {
            staging = createUnique(parent, target.getFileName() + ".partial-");
        } catch (IOException ex) {
            throw new IllegalArgumentException("output.folder: cannot create a staging folder in " + parent + ": " + ex, ex);
        }
        try {
            return new DatasetWriter(spec, table, target, staging, overwrite);
        } catch (IOException | RuntimeException | Error ex) {
            try {
                deleteTree(staging);
            } catch (IOException cleanup) {
                ex.addSuppressed(cleanup);
            }
            throw ex;
        }
    }

    /** Refuses targets that must not be written or replaced. */
    private static void checkTarget(Path target, boolean overwrite) throws IOException {
        if (!Files.exists(target, LinkOption.NOFOLLOW_LINKS)) {
            return;
        }
        if (!Files.isDirectory(target)) {
            throw new IllegalArgumentException("output.folder exists and is not a folder: " + target + "; choose another folder");
        }
        if (isEmpty(target)) {
            return;
        }
        if (!overwrite) {
            throw new IllegalArgumentException("output.folder already exists: " + target
                + "; choose another folder or pass --overwrite");
        }
        // --overwrite deletes the old folder: only ever do that to a dataset, never to e.g. a home folder.
        if (!Files.isRegularFile(target.resolve(Layout.MANIFEST))) {
            throw new IllegalArgumentException("output.folder already exists and is not a dataset (no "
                + Layout.MANIFEST + "): " + target + "; it is not replaced even with --overwrite; choose another folder");
        }
    }

    private static boolean isEmpty(Path dir) throws IOException {
        try (DirectoryStream<Path> s = Files.newDirectoryStream(dir)) {
            return !s.iterator().hasNext();
        }
    }

    /** A new hidden sibling folder; created with the default permissions (unlike a temp dir). */
    private static Path createUnique(Path parent, String stem) throws IOException {
        for (int attempt = 0; ; attempt++) {
            Path p = parent.resolve("." + stem + ProcessHandle.current().pid() + "-" + System.nanoTime() + "-"
                + UNIQUE.incrementAndGet());
            try {
                return Files.createDirectory(p);
            } catch (FileAlreadyExistsException ex) {
                if (attempt > 100) {
                    throw ex;
                }
            }
        }
    }

    private RowWriter open(String name, Layout.Table table, Map<String, String> common) throws IOException {
        RowWriter w = new RowWriter(staging.resolve(name), table.schema(), Layout.footer(common, table), ROW_GROUP_BYTES);
        writers.put(name, w);
        return w;
    }

    private void writeModes(ModeTable table, Map<String, String> common) throws IOException {
        try (RowWriter w = open(Layout.MODES, Layout.modes(), common)) {
            for (int l = 0; l < modeCount; l++) {
                int index = l;
                Mode m = table.modes().get(l);
                w.write(r -> {
                    r.addInt(index);
                    r.addString(m.label());
                    r.addString(m.family());
                    r.addInt(m.i1());
                    r.addInt(m.i2());
                    r.addInt(m.i3());
                    r.addInt(m.orientation());
                    r.addDouble(m.k());
                    r.addDouble(table.omega(index));
                    r.addDouble(table.frequency(index));
                    r.addDouble(table.weight(index));
                    r.addDouble(table.thermalFactor(index));
                    for (Field f : Field.values()) {
                        r.addDouble(table.vacuumVariance(f, index));
                    }
                    for (Field f : Field.values()) {
                        r.addDouble(table.variance(f, index));
                    }
                });
            }
        }
    }

    private void writePoints(Map<String, String> common) throws IOException {
        try (RowWriter w = open(Layout.POINTS, Layout.points(), common)) {
            int global = 0;
            for (PointSet set : spec.pointSets()) {
                int[] dims = set.dims();
                String kind = set.kind().name().toLowerCase(Locale.ROOT);
                for (int n = 0; n < set.size(); n++) {
                    int p = global++;
                    int idx = n;
                    Vec3 r = set.points().get(n);
                    // Grid index (i, j, k) with x fastest; a line's index is i; a lone point is (0, 0, 0).
                    int i = idx % dims[0];
                    int j = (idx / dims[0]) % dims[1];
                    int k = idx / (dims[0] * dims[1]);
                    w.write(row -> {
                        row.addInt(p);
                        row.addString(set.name());
                        row.addString(kind);
                        row.addInt(idx);
                        row.addInt(i);
                        row.addInt(j);
                        row.addInt(k);
                        row.addDouble(r.x());
                        row.addDouble(r.y());
                        row.addDouble(r.z());
                        row.addBoolean(inside[p]);
                    });
                }
            }
        }
    }

    /**
     * Streams one batch into {@code amplitudes.parquet} and {@code fields.parquet}.
     *
     * @param batch the next samples, starting where the previous batch ended
     * @throws IllegalStateException when the batch is out of order, has the wrong shape or the
     *     writer is finished or failed
     * @throws IOException when writing fails
     */
    @Override
    public void accept(SampleBatch batch) throws IOException {
        requireOpen();
        try {
            check(batch);
            if (pointCount == 0) {
                writeAmplitudes(batch);
            } else {
                // The two tables are independent: write them on two threads. Both finish before
                // accept returns, so the shared batch arrays are never read afterwards.
                Future<Void> amp = helper.submit(() -> {
                    writeAmplitudes(batch);
                    return null;
                });
                Exception failure = null;
                try {
                    writeFields(batch);
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
            nextSample += batch.size();
        } catch (IOException | RuntimeException | Error ex) {
            state = State.FAILED;
            throw ex;
        }
    }

    private void check(SampleBatch batch) {
        if (batch.firstSample() != nextSample) {
            throw new IllegalStateException("batch starts at sample " + batch.firstSample() + ", expected " + nextSample);
        }
        if (nextSample + batch.size() > spec.samples()) {
            throw new IllegalStateException("batch ends at sample " + (nextSample + batch.size() - 1)
                + ", beyond samples = " + spec.samples());
        }
        for (int s = 0; s < batch.size(); s++) {
            long sample = nextSample + s;
            if (batch.q(s).length != modeCount || batch.e(s).length != modeCount) {
                throw new IllegalStateException("sample " + sample + " has " + batch.q(s).length + " q and "
                    + batch.e(s).length + " e amplitudes, the mode table has " + modeCount);
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

    private void writeAmplitudes(SampleBatch batch) throws IOException {
        for (int s = 0; s < batch.size(); s++) {
            amplitudeRow.sample = nextSample + s;
            amplitudeRow.q = batch.q(s);
            amplitudeRow.e = batch.e(s);
            for (int l = 0; l < modeCount; l++) {
                amplitudeRow.mode = l;
                amplitudes.write(amplitudeRow);
            }
        }
    }

    private void writeFields(SampleBatch batch) throws IOException {
        for (int s = 0; s < batch.size(); s++) {
            for (int f = 0; f < fields.size(); f++) {
                fieldRow.values[f] = batch.values(fields.get(f), s);
            }
            fieldRow.sample = nextSample + s;
            for (int p = 0; p < pointCount; p++) {
                fieldRow.point = p;
                fieldValues.write(fieldRow);
            }
        }
    }

    /** Waits for the helper even when interrupted: returning early would let it race with close(). */
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
                    Throwable cause = ex.getCause();
                    if (cause instanceof IOException) {
                        throw (IOException) cause;
                    }
                    if (cause instanceof RuntimeException) {
                        throw (RuntimeException) cause;
                    }
                    if (cause instanceof Error) {
                        throw (Error) cause;
                    }
                    throw new IOException("amplitude writer failed", cause);
                }
            }
        } finally {
            if (interrupted) {
                Thread.currentThread().interrupt();
            }
        }
    }

    /**
     * Closes the tables, writes {@code manifest.json} and renames the dataset into place.
     *
     * @throws IllegalStateException when fewer samples than {@code spec.samples()} arrived
     * @throws IOException when writing or renaming fails (nothing is left in the target then,
     *     except a replaced dataset that is restored)
     */
    @Override
    public void finish() throws IOException {
        requireOpen();
        try {
            if (nextSample != spec.samples()) {
                throw new IllegalStateException("dataset received " + nextSample + " samples, the spec asks for samples = "
                    + spec.samples());
            }
            helper.shutdown();
            for (RowWriter w : writers.values()) {
                w.close();
            }
            writeManifest();
            publish();
            state = State.FINISHED;
        } catch (IOException | RuntimeException | Error ex) {
            state = State.FAILED;
            throw ex;
        }
    }

    private void writeManifest() throws IOException {
        ObjectNode m = Layout.JSON.createObjectNode();
        m.put("format", Version.DATASET_FORMAT);
        m.put("version", Version.VERSION);
        m.put("name", spec.name());
        m.put("seed", spec.seed());
        m.put("samples", spec.samples());
        m.put("modes", modeCount);
        m.put("points", pointCount);
        ArrayNode f = m.putArray("fields");
        fields.forEach(x -> f.add(x.name()));
        m.put("precision", spec.precision().name().toLowerCase(Locale.ROOT));
        m.put("compression", RowWriter.CODEC.name());
        ArrayNode files = m.putArray("files");
        for (Map.Entry<String, RowWriter> e : writers.entrySet()) {
            ObjectNode o = files.addObject();
            o.put("name", e.getKey());
            o.put("rows", e.getValue().rows());
            o.put("bytes", e.getValue().file().length());
            o.put("sha256", e.getValue().file().sha256());
        }
        byte[] bytes = Layout.JSON.writerWithDefaultPrettyPrinter().writeValueAsBytes(m);
        try (FileChannel ch = FileChannel.open(staging.resolve(Layout.MANIFEST), StandardOpenOption.CREATE_NEW,
            StandardOpenOption.WRITE)) {
            ByteBuffer buf = ByteBuffer.wrap(bytes);
            while (buf.hasRemaining()) {
                ch.write(buf);
            }
            ch.force(true);
        }
    }

    /** Atomic rename of the staging folder onto the target; an old dataset is moved aside first. */
    private void publish() throws IOException {
        Path parent = target.getParent();
        if (Files.exists(target, LinkOption.NOFOLLOW_LINKS)) {
            // Re-check: the folder may have been filled since create().
            checkTarget(target, overwrite);
            Path old = createUnique(parent, target.getFileName() + ".old-");
            Files.delete(old);
            Files.move(target, old, StandardCopyOption.ATOMIC_MOVE);
            try {
                Files.move(staging, target, StandardCopyOption.ATOMIC_MOVE);
            } catch (IOException ex) {
                try {
                    Files.move(old, target, StandardCopyOption.ATOMIC_MOVE);
                } catch (IOException restore) {
                    ex.addSuppressed(restore);
                }
                throw ex;
            }
            syncFolder(parent);
            try {
                deleteTree(old);
            } catch (IOException ex) {
                throw new IOException("dataset written to " + target + ", but the replaced folder " + old
                    + " could not be removed: " + ex, ex);
            }
        } else {
            Files.move(staging, target, StandardCopyOption.ATOMIC_MOVE);
            syncFolder(parent);
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

    /**
     * Releases the writers; without a successful {@link #finish()}, deletes everything written.
     *
     * @throws IOException when the staging folder cannot be removed
     */
    @Override
    public void close() throws IOException {
        if (state == State.FINISHED || state == State.CLOSED) {
            state = State.CLOSED;
            helper.shutdown();
            return;
        }
        state = State.CLOSED;
        helper.shutdown();
        for (RowWriter w : writers.values()) {
            try {
                w.close();
            } catch (IOException | RuntimeException ex) {
                // The run already failed; its half-written files are deleted below.
            }
        }
        deleteTree(staging);
    }

    /** @return the folder the dataset is renamed to by {@link #finish()} */
    public Path folder() {
        return target;
    }

    private void requireOpen() {
        if (state != State.OPEN) {
            throw new IllegalStateException("dataset writer for " + target + " is " + state.name().toLowerCase(Locale.ROOT));
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

    /** One (sample, mode) row; reused for every row. */
    private static final class AmplitudeRow implements RowWriter.Row {
        long sample;
        int mode;
        double[] q;
        double[] e;

        @Override
        public void emit(RowWriter w) {
            w.addLong(sample);
            w.addInt(mode);
            w.addDouble(q[mode]);
            w.addDouble(e[mode]);
        }
    }

    /** One (sample, point) row; reused for every row. Outside the cavity the values are null. */
    private final class FieldRow implements RowWriter.Row {
        long sample;
        int point;
        final double[][] values;

        FieldRow(int fieldCount) {
            values = new double[fieldCount][];
        }

        @Override
        public void emit(RowWriter w) {
            w.addLong(sample);
            w.addInt(point);
            int base = 3 * point;
            if (!inside[point]) {
                for (int n = 0; n < 3 * values.length; n++) {
                    w.addNull();
                }
                return;
            }
            for (double[] v : values) {
                if (float32) {
                    w.addFloat((float) v[base]);
                    w.addFloat((float) v[base + 1]);
                    w.addFloat((float) v[base + 2]);
                } else {
                    w.addDouble(v[base]);
                    w.addDouble(v[base + 1]);
                    w.addDouble(v[base + 2]);
                }
            }
        }
    }
}
