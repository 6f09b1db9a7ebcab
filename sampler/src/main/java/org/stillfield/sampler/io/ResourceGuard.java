package org.stillfield.sampler.io;

import java.util.List;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.spec.RunSpec;

/**
 * Estimates what a run needs before it starts (heap for the basis cache, one batch and the two
 * open row groups; disk for every part still to write, as an uncompressed upper bound) and
 * refuses it, with the estimate, when that exceeds the machine (the JVM's maximum heap, the usable
 * space of the output folder's file system) or the spec's {@code limits.max_memory_GB} /
 * {@code limits.max_output_GB}. Nothing is written by the check.
 */
public final class ResourceGuard {
    /** Bytes per GB in the limits: decimal, as disk sizes are quoted. */
    public static final double GB = 1e9;

    private ResourceGuard() {
    }

    /**
     * What a run is estimated to need and what is available.
     *
     * @param diskBytes upper bound of the bytes the run writes
     * @param memoryBytes estimated heap in use while sampling, bytes
     * @param usableBytes usable space of the output folder's file system, or -1 when not checked
     * @param maxHeapBytes the JVM's maximum heap, bytes
     */
    public record Estimate(long diskBytes, long memoryBytes, long usableBytes, long maxHeapBytes) {
    }

    /**
     * Estimated heap while sampling: the cached mode-function basis (u and/or h at every point,
     * capped by the engine's cache budget, beyond which it is evaluated per batch), two batches of
     * amplitudes and field values (the one being written and the next), the per-axis tables of
     * grid sums, two open row groups, and the mode table and point list.
     *
     * @param spec the run
     * @param modes number of modes M
     * @return bytes
     */
    public static long memoryBytes(RunSpec spec, int modes) {
        double m = modes;
        double points = spec.allPoints().size();
        int nFields = spec.fields().size();
        boolean needU = spec.fields().contains(Field.A) || spec.fields().contains(Field.E);
        boolean needH = spec.fields().contains(Field.B);
        // Grids of a cavity with an exact tensor-product sum need no per-point basis, only small
        // per-axis sin/cos tables (at most ~2(6M/π)^{1/3} indices per axis) and per-thread scratch.
        boolean fastGrids = spec.cavity().tensorGridSum(List.of(), new double[] {0}, new double[] {0}, new double[] {0}) != null;
        double axisIndices = 2 * Math.cbrt(6 * m / Math.PI) + 2;
        double grids = 0;
        double genericPoints = 0;
        for (PointSet s : spec.pointSets()) {
            if (s.kind() == PointSet.Kind.GRID && fastGrids) {
                int[] d = s.dims();
                grids += 6 * 8 * axisIndices * ((double) d[0] + d[1] + d[2]) + 16.0 * 8 * axisIndices * axisIndices * axisIndices;
            } else {
                genericPoints += s.size();
            }
        }
        double basis = 3 * m * 8 * ((needU ? 1 : 0) + (needH ? 1 : 0)) * genericPoints;
        double cache = Math.min(basis, EnsembleRunner.DEFAULT_CACHE_BYTES);
        double perSample = 8 * (2 * m + 3 * points * nFields);
        double batch = Math.max(1, Math.min(256, Math.floor(EnsembleRunner.DEFAULT_BATCH_BYTES / Math.max(1, perSample))));
        double tables = 512 * m + 128 * points;
        double bytes = cache + 2 * batch * perSample + grids + 2.0 * DatasetWriter.ROW_GROUP_BYTES + tables;
        return (long) Math.min(Long.MAX_VALUE / 2, Math.ceil(bytes));
    }

    /**
     * Checks a plan against the machine and the spec's limits.
     *
     * @param plan what the run will write
     * @param spec the run (limits)
     * @param table its modes
     * @param checkSpace compare with the file system's usable space (off where it misreports,
     *     e.g. quotas the JVM cannot see)
     * @return the estimate
     * @throws IllegalArgumentException naming {@code limits.max_memory_GB},
     *     {@code limits.max_output_GB} or {@code output.folder} with the estimate, when it does
     *     not fit
     * @throws IOException when the file system cannot be queried
     */
    public static Estimate check(DatasetWriter.Plan plan, RunSpec spec, ModeTable table, boolean checkSpace)
        throws IOException {
        long disk = plan.estimatedBytes();
        long memory = memoryBytes(spec, table.size());
        long heap = Runtime.getRuntime().maxMemory();
        RunSpec.Storage limits = spec.storage();
        String what = String.format(Locale.ROOT, "%d samples in %d part(s) of %d modes and %d points",
            plan.pendingSamples(), plan.pendingParts().size(), table.size(), spec.allPoints().size());
        if (memory > limits.maxMemoryGB() * GB) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                "limits.max_memory_GB = %s: sampling needs about %s of heap (%s); raise the limit, or use fewer points or modes",
                plain(limits.maxMemoryGB()), size(memory), what));
        }
        if (memory > heap) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                "sampling needs about %s of heap (%s) but the JVM may use only %s; raise -Xmx (e.g. STILLFIELD_JAVA_OPTS=-Xmx%dg)"
                    + " or use fewer points or modes", size(memory), what, size(heap), (long) Math.ceil(memory * 1.5 / (1L << 30))));
        }
        if (disk > limits.maxOutputGB() * GB) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                "limits.max_output_GB = %s: the dataset may need up to %s on disk (%s, uncompressed upper bound);"
                    + " raise the limit, or use fewer samples, points or fields, or precision float32",
                plain(limits.maxOutputGB()), size(disk), what));
        }
        long usable = -1;
        if (checkSpace) {
            Path existing = plan.folder();
            while (existing != null && !Files.exists(existing)) {
                existing = existing.getParent();
            }
            if (existing != null) {
                usable = Files.getFileStore(existing).getUsableSpace();
                if (disk > usable) {
                    throw new IllegalArgumentException(String.format(Locale.ROOT,
                        "output.folder %s: the dataset may need up to %s on disk (%s, uncompressed upper bound) but its file"
                            + " system has %s free; free space, choose another folder or use fewer samples"
                            + " (--no-space-check skips this estimate)", plan.folder(), size(disk), what, size(usable)));
                }
            }
        }
        return new Estimate(disk, memory, usable, heap);
    }

    /** @return e.g. "1.23 GB" (decimal units) */
    public static String size(long bytes) {
        if (bytes >= 1e12) {
            return String.format(Locale.ROOT, "%.3g TB", bytes / 1e12);
        }
        if (bytes >= 1e9) {
            return String.format(Locale.ROOT, "%.3g GB", bytes / 1e9);
        }
        if (bytes >= 1e6) {
            return String.format(Locale.ROOT, "%.3g MB", bytes / 1e6);
        }
        return String.format(Locale.ROOT, "%.3g kB", bytes / 1e3);
    }

    private static String plain(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }
}
