package org.stillfield.sampler.spec;

import java.nio.file.Path;
import java.util.EnumSet;
import java.util.List;
import java.util.Set;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Window;

/**
 * A validated run specification. Built only by {@link SpecReader}; the original text is kept so
 * every output file can carry it.
 *
 * @param name run name
 * @param cavity the cavity (geometry and filling)
 * @param state vacuum or thermal state
 * @param fields fields to synthesise
 * @param window spectral window
 * @param samples number of samples, ≥ 1
 * @param seed master seed
 * @param pointSets evaluation points
 * @param outputFolder where the dataset goes (resolved against the spec's folder)
 * @param precision float64 or float32 field values
 * @param pairs point pairs the analysis estimates C_ij for
 * @param falseAlarm nominal false-alarm rate of the validation verdict
 * @param maxModes largest mode count allowed
 * @param threads worker threads (≥ 1)
 * @param sourceText the spec file as written
 * @param storage how the dataset is split and guarded (parts, shard, resource limits)
 */
public record RunSpec(String name, Cavity cavity, ThermalState state, Set<Field> fields, Window window,
                      long samples, long seed, List<PointSet> pointSets, Path outputFolder, Precision precision,
                      List<PointPair> pairs, double falseAlarm, long maxModes, int threads, String sourceText,
                      Storage storage) {
    /**
     * Page compression of the dataset files. Gaussian noise is nearly incompressible: ZSTD saves
     * about 15 % of a float32 field table, SNAPPY about 8 % at three to four times ZSTD's speed,
     * NONE nothing at no cost.
     */
    public enum Compression {
        /** Zstandard (smallest files). */
        ZSTD,
        /** Snappy (fast). */
        SNAPPY,
        /** Uncompressed pages. */
        NONE
    }

    /** Storage precision of field values. */
    public enum Precision {
        /** IEEE double. */
        FLOAT64,
        /** IEEE single: half the size, ~7 significant digits. */
        FLOAT32
    }

    /**
     * Two evaluation points, by global index, whose correlation tensor the analysis estimates.
     *
     * @param first global index of r
     * @param second global index of r′
     */
    public record PointPair(int first, int second) {
    }

    /**
     * How a run's dataset is split into parts and shards, and the resource limits checked before
     * it starts.
     *
     * @param partSamples samples per part file, ≥ 1, or 0 for the default (parts of about
     *     {@code DatasetWriter.TARGET_PART_BYTES})
     * @param shard the part of the run this process writes
     * @param maxOutputGB refuse a run whose files could exceed this many GB (10⁹ bytes); +∞ = no limit
     * @param maxMemoryGB refuse a run whose estimated heap need exceeds this many GB; +∞ = no limit
     * @param compression page compression of the dataset's Parquet files
     */
    public record Storage(long partSamples, Shard shard, double maxOutputGB, double maxMemoryGB,
                          Compression compression) {
        /** Defaults: automatic part size, the whole run, no limits beyond the machine's, ZSTD pages. */
        public static final Storage DEFAULTS = new Storage(0, Shard.ALL, Double.POSITIVE_INFINITY,
            Double.POSITIVE_INFINITY, Compression.ZSTD);

        /** Default compression. */
        public Storage(long partSamples, Shard shard, double maxOutputGB, double maxMemoryGB) {
            this(partSamples, shard, maxOutputGB, maxMemoryGB, Compression.ZSTD);
        }

        /** Validates. */
        public Storage {
            java.util.Objects.requireNonNull(shard, "shard");
            java.util.Objects.requireNonNull(compression, "compression");
            if (partSamples < 0) {
                throw new IllegalArgumentException("output.part_samples must be >= 1 (or 0 = default), got " + partSamples);
            }
            if (!(maxOutputGB > 0)) {
                throw new IllegalArgumentException("limits.max_output_GB must be > 0, got " + maxOutputGB);
            }
            if (!(maxMemoryGB > 0)) {
                throw new IllegalArgumentException("limits.max_memory_GB must be > 0, got " + maxMemoryGB);
            }
        }

        /** @return the same settings for another shard */
        public Storage withShard(Shard s) {
            return new Storage(partSamples, s, maxOutputGB, maxMemoryGB, compression);
        }
    }

    /** Copies collections. */
    public RunSpec {
        fields = EnumSet.copyOf(fields);
        pointSets = List.copyOf(pointSets);
        pairs = List.copyOf(pairs);
        java.util.Objects.requireNonNull(storage, "storage");
    }

    /**
     * A spec with the default {@link Storage}.
     *
     * @param name run name
     * @param cavity the cavity
     * @param state vacuum or thermal state
     * @param fields fields to synthesise
     * @param window spectral window
     * @param samples number of samples
     * @param seed master seed
     * @param pointSets evaluation points
     * @param outputFolder where the dataset goes
     * @param precision float64 or float32
     * @param pairs analysed point pairs
     * @param falseAlarm verdict false-alarm rate
     * @param maxModes largest mode count
     * @param threads worker threads
     * @param sourceText the spec as written
     */
    public RunSpec(String name, Cavity cavity, ThermalState state, Set<Field> fields, Window window,
                   long samples, long seed, List<PointSet> pointSets, Path outputFolder, Precision precision,
                   List<PointPair> pairs, double falseAlarm, long maxModes, int threads, String sourceText) {
        this(name, cavity, state, fields, window, samples, seed, pointSets, outputFolder, precision, pairs, falseAlarm,
            maxModes, threads, sourceText, Storage.DEFAULTS);
    }

    @Override
    public Set<Field> fields() {
        return EnumSet.copyOf(fields);
    }

    /** @return all evaluation points in global order (sets in spec order, each set in its order) */
    public List<org.stillfield.sampler.api.Vec3> allPoints() {
        List<org.stillfield.sampler.api.Vec3> out = new java.util.ArrayList<>();
        for (PointSet s : pointSets) {
            out.addAll(s.points());
        }
        return out;
    }

    /** @return the same spec with another sample count */
    public RunSpec withSamples(long n) {
        return new RunSpec(name, cavity, state, fields, window, n, seed, pointSets, outputFolder, precision, pairs,
            falseAlarm, maxModes, threads, sourceText, storage);
    }

    /** @return the same spec with another thread count */
    public RunSpec withThreads(int n) {
        return new RunSpec(name, cavity, state, fields, window, samples, seed, pointSets, outputFolder, precision, pairs,
            falseAlarm, maxModes, n, sourceText, storage);
    }

    /** @return the same spec writing to another folder */
    public RunSpec withOutputFolder(Path folder) {
        return new RunSpec(name, cavity, state, fields, window, samples, seed, pointSets, folder, precision, pairs,
            falseAlarm, maxModes, threads, sourceText, storage);
    }

    /** @return the same spec writing only the given shard of its parts */
    public RunSpec withShard(Shard s) {
        return new RunSpec(name, cavity, state, fields, window, samples, seed, pointSets, outputFolder, precision, pairs,
            falseAlarm, maxModes, threads, sourceText, storage.withShard(s));
    }
}
