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
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.concurrent.atomic.AtomicLong;
import org.apache.parquet.schema.LogicalTypeAnnotation;
import org.apache.parquet.schema.MessageType;
import org.apache.parquet.schema.PrimitiveType.PrimitiveTypeName;
import org.apache.parquet.schema.Types;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Version;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.timeseries.AliasReport;
import org.stillfield.sampler.timeseries.ModeDamping;
import org.stillfield.sampler.timeseries.Probe;
import org.stillfield.sampler.timeseries.ProbeCoefficients;
import org.stillfield.sampler.timeseries.TimeSeriesBlock;
import org.stillfield.sampler.timeseries.TimeSeriesSink;
import org.stillfield.sampler.timeseries.TimeSeriesSpec;

/**
 * Writes the noise time series of a run ({@link #FORMAT}) into the {@value #FOLDER} subfolder of
 * the run's output folder:
 * <ul>
 *   <li>{@value #SERIES}: one row per (sample, step): {@code sample} (int64), {@code step} (int32),
 *       {@code t_s} (double, t = step·dt), then one double column per probe, named after the probe, in
 *       the probe's unit;</li>
 *   <li>{@value #AMPLITUDES} (only when the spec records amplitudes): one row per (sample, step, mode):
 *       q (V·s/m) and e (V/m);</li>
 *   <li>{@value #COEFFICIENTS}: one row per (probe, mode): the coefficients a_l (on e_l) and b_l (on q_l)
 *       with signal = Σ a_l e_l + b_l q_l, so any reader can rebuild a probe from the amplitudes;</li>
 *   <li>{@value #MODE_LOSSES}: one row per mode: f, Q, κ = ω/Q, the FWHM κ/2π, and whether the mode lies
 *       at or above the Nyquist frequency;</li>
 *   <li>{@value #MANIFEST}: written last; each file's rows, bytes and SHA-256, and the row order.</li>
 * </ul>
 * Every footer carries the dataset footer entries (spec text, constants, generator, seed, cavity,
 * window, state, table name, units; {@code stillfield.samples} is the number of trajectories) and
 * {@value #KEY_TIMESERIES}: a JSON object with dt, steps, the Nyquist frequency, the aliased modes, the
 * loss model, every probe's kind, unit, position, orientation and size, and the order of the random
 * draws ({@link #DRAW_ORDER}).
 *
 * <p>Files go into a hidden staging folder beside the target and the folder is renamed into place by
 * {@link #finish()} after the manifest is on disk; {@link #close()} without a successful finish deletes
 * it, so a failed run leaves no time series that looks complete. With overwrite, an existing time-series
 * folder (one with a manifest) is replaced only once the new one is complete.
 *
 * <p>Rows are written in the order the blocks arrive. {@link org.stillfield.sampler.timeseries.TimeSeriesRunner}
 * delivers one sample's blocks in step order and the samples of a group chunk by chunk; when each block is
 * a whole trajectory the file is sorted by (sample, step), and the manifest says whether it is.
 * Not thread-safe: blocks come from one thread.
 */
public final class TimeSeriesWriter implements TimeSeriesSink {
    /** Subfolder of the run's output folder. */
    public static final String FOLDER = "timeseries";
    /** Probe signals. */
    public static final String SERIES = "timeseries.parquet";
    /** Mode amplitudes at every step (optional). */
    public static final String AMPLITUDES = "timeseries_amplitudes.parquet";
    /** Probe coefficients. */
    public static final String COEFFICIENTS = "probe_coefficients.parquet";
    /** Per-mode losses. */
    public static final String MODE_LOSSES = "mode_losses.parquet";
    /** Manifest, written last. */
    public static final String MANIFEST = "timeseries-manifest.json";
    /** Name and revision of this layout. */
    public static final String FORMAT = "stillfield-timeseries/1";
    /** Footer key of the time-series description. */
    public static final String KEY_TIMESERIES = "stillfield.timeseries";
    /** Column names the probe columns must not take. */
    public static final List<String> RESERVED = List.of("sample", "step", "t_s");
    /**
     * Order of the random draws, as the runner and {@code ModeEvolution} document it; part of the
     * format because changing it changes every series.
     */
    public static final String DRAW_ORDER = "sample i uses only the stream SampleStreams.forSample(seed, i); step 0 is"
        + " the ensemble draw of that sample (two ziggurat normals per mode in table order, q then e); each later"
        + " step draws from a ziggurat NormalizedGaussian on the same stream, per lossy mode in table order, the q"
        + " noise then the e noise; lossless modes draw nothing";

    /** Target row-group size, bytes. */
    static final long ROW_GROUP_BYTES = 64L << 20;

    private static final AtomicLong UNIQUE = new AtomicLong();

    private enum State { OPEN, FAILED, FINISHED, CLOSED }

    private final Path target;
    private final Path staging;
    private final boolean overwrite;
    private final RunSpec spec;
    private final long samples;
    private final int steps;
    private final int channels;
    private final int modes;
    private final boolean amplitudes;
    private final Map<String, RowWriter> writers = new LinkedHashMap<>();
    private final RowWriter series;
    private final RowWriter amplitudeRows;
    private final SeriesRow seriesRow;
    private final AmplitudeRow amplitudeRow = new AmplitudeRow();
    private final List<String> probeNames = new ArrayList<>();
    /** Next step expected of each sample whose trajectory has begun but not ended. */
    private final Map<Long, Integer> open = new HashMap<>();
    private long completed;
    private long nextSample;
    private int nextStep;
    private boolean sorted = true;
    private State state = State.OPEN;

    private TimeSeriesWriter(RunSpec spec, TimeSeriesSpec ts, ModeTable table, ModeDamping damping,
                             List<ProbeCoefficients> coefficients, AliasReport aliasing, Path target, Path staging,
                             boolean overwrite) throws IOException {
        this.spec = spec;
        this.target = target;
        this.staging = staging;
        this.overwrite = overwrite;
        this.samples = ts.samples();
        this.steps = ts.grid().steps();
        this.channels = ts.probes().size();
        this.modes = table.size();
        this.amplitudes = ts.amplitudes();
        ts.probes().forEach(p -> probeNames.add(p.name()));
        this.seriesRow = new SeriesRow(channels);
        Map<String, String> common = Layout.commonFooter(spec.withSamples(ts.samples()), table.cavity(),
            table.window(), table.state());
        common.put(Layout.KEY_FORMAT, FORMAT);
        common.put(KEY_TIMESERIES, Layout.json(description(ts, table, damping, coefficients, aliasing)));
        writeModeLosses(table, damping, aliasing, common);
        writeCoefficients(ts, coefficients, common);
        this.series = open(SERIES, seriesTable(ts), common);
        this.amplitudeRows = amplitudes ? open(AMPLITUDES, amplitudeTable(), common) : null;
    }

    /**
     * Prepares the time series of a run in {@code spec.outputFolder()/}{@value #FOLDER}.
     *
     * @param spec the run (output folder, seed, spec text)
     * @param ts its time-series sections
     * @param table the run's modes, as the runner uses them
     * @param damping the modes' losses
     * @param coefficients every probe's coefficients on the table's modes, in probe order
     * @param aliasing the grid's aliasing report for the table
     * @param overwrite replace an existing time-series folder (only after the new one is complete)
     * @return the writer, to be given to the runner and closed afterwards
     * @throws IllegalArgumentException when the target exists (without overwrite), is not a time-series
     *     folder, cannot be created, or the inputs disagree; the message names {@code output.folder} or the
     *     offending argument
     * @throws IOException when the first files cannot be written
     */
    public static TimeSeriesWriter create(RunSpec spec, TimeSeriesSpec ts, ModeTable table, ModeDamping damping,
                                          List<ProbeCoefficients> coefficients, AliasReport aliasing,
                                          boolean overwrite) throws IOException {
        Objects.requireNonNull(spec, "spec");
        Objects.requireNonNull(ts, "ts");
        Objects.requireNonNull(table, "table");
        Objects.requireNonNull(damping, "damping");
        Objects.requireNonNull(coefficients, "coefficients");
        Objects.requireNonNull(aliasing, "aliasing");
        Objects.requireNonNull(spec.outputFolder(), "spec.outputFolder");
        check(ts, table, damping, coefficients);
        Path parent = spec.outputFolder().toAbsolutePath().normalize();
        Path target = parent.resolve(FOLDER);
        checkTarget(target, overwrite);
        try {
            Files.createDirectories(parent);
        } catch (IOException ex) {
            throw new IllegalArgumentException("output.folder: cannot create " + parent + ": " + ex, ex);
        }
        if (!Files.isDirectory(parent) || !Files.isWritable(parent)) {
            throw new IllegalArgumentException("output.folder is not a writable folder: " + parent);
        }
        Path staging;
        try {
            staging = createUnique(parent, FOLDER + ".partial-");
        } catch (IOException ex) {
            throw new IllegalArgumentException("output.folder: cannot create a staging folder in " + parent + ": " + ex,
                ex);
        }
        try {
            return new TimeSeriesWriter(spec, ts, table, damping, coefficients, aliasing, target, staging, overwrite);
        } catch (IOException | RuntimeException | Error ex) {
            try {
                deleteTree(staging);
            } catch (IOException cleanup) {
                ex.addSuppressed(cleanup);
            }
            throw ex;
        }
    }

    private static void check(TimeSeriesSpec ts, ModeTable table, ModeDamping damping,
                              List<ProbeCoefficients> coefficients) {
        if (damping.size() != table.size()) {
            throw new IllegalArgumentException("damping covers " + damping.size() + " modes, the table has "
                + table.size());
        }
        if (coefficients.size() != ts.probes().size()) {
            throw new IllegalArgumentException("coefficients: got " + coefficients.size() + " probes, the spec has "
                + ts.probes().size());
        }
        for (int p = 0; p < coefficients.size(); p++) {
            ProbeCoefficients c = coefficients.get(p);
            String name = ts.probes().get(p).name();
            if (!c.name().equals(name)) {
                throw new IllegalArgumentException("coefficients[" + p + "] belong to probe '" + c.name()
                    + "', expected '" + name + "'");
            }
            if (c.modeCount() != table.size()) {
                throw new IllegalArgumentException("coefficients of probe '" + name + "' cover " + c.modeCount()
                    + " modes, the table has " + table.size());
            }
            if (RESERVED.contains(name)) {
                throw new IllegalArgumentException("probe name '" + name + "' is a reserved column name; reserved: "
                    + String.join(", ", RESERVED));
            }
        }
    }

    /** Refuses targets that must not be written or replaced. */
    private static void checkTarget(Path target, boolean overwrite) throws IOException {
        if (!Files.exists(target, LinkOption.NOFOLLOW_LINKS)) {
            return;
        }
        if (!Files.isDirectory(target, LinkOption.NOFOLLOW_LINKS)) {
            throw new IllegalArgumentException("output.folder: " + target + " exists and is not a folder; choose"
                + " another output folder");
        }
        if (isEmpty(target)) {
            return;
        }
        if (!overwrite) {
            throw new IllegalArgumentException("output.folder already holds a time series: " + target
                + "; choose another folder or pass --overwrite");
        }
        // Overwrite deletes the old folder: only ever one this writer made.
        if (!Files.isRegularFile(target.resolve(MANIFEST))) {
            throw new IllegalArgumentException("output.folder: " + target + " exists and is not a time series (no "
                + MANIFEST + "); it is not replaced even with --overwrite");
        }
    }

    private static boolean isEmpty(Path dir) throws IOException {
        try (DirectoryStream<Path> s = Files.newDirectoryStream(dir)) {
            return !s.iterator().hasNext();
        }
    }

    /** A new hidden sibling folder (default permissions, unlike a temporary folder). */
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
        RowWriter w = new RowWriter(staging.resolve(name), table.schema(), Layout.footer(common, table),
            ROW_GROUP_BYTES, DatasetWriter.codec(spec.storage().compression()));
        writers.put(name, w);
        return w;
    }

    // ---- tables --------------------------------------------------------------------------------

    private static Layout.Table seriesTable(TimeSeriesSpec ts) {
        Types.MessageTypeBuilder b = Types.buildMessage();
        Map<String, String> units = new LinkedHashMap<>();
        b.required(PrimitiveTypeName.INT64).named("sample");
        units.put("sample", Layout.ONE);
        b.required(PrimitiveTypeName.INT32).named("step");
        units.put("step", Layout.ONE);
        b.required(PrimitiveTypeName.DOUBLE).named("t_s");
        units.put("t_s", "s");
        for (Probe p : ts.probes()) {
            b.required(PrimitiveTypeName.DOUBLE).named(p.name());
            units.put(p.name(), p.unit());
        }
        return new Layout.Table("timeseries", b.named("timeseries"), units);
    }

    private static Layout.Table amplitudeTable() {
        MessageType m = Types.buildMessage()
            .required(PrimitiveTypeName.INT64).named("sample")
            .required(PrimitiveTypeName.INT32).named("step")
            .required(PrimitiveTypeName.INT32).named("mode")
            .required(PrimitiveTypeName.DOUBLE).named("q")
            .required(PrimitiveTypeName.DOUBLE).named("e")
            .named("timeseries_amplitudes");
        Map<String, String> units = new LinkedHashMap<>();
        units.put("sample", Layout.ONE);
        units.put("step", Layout.ONE);
        units.put("mode", Layout.ONE);
        units.put("q", Field.A.unit());
        units.put("e", Field.E.unit());
        return new Layout.Table("timeseries_amplitudes", m, units);
    }

    private static Layout.Table coefficientTable() {
        MessageType m = Types.buildMessage()
            .required(PrimitiveTypeName.BINARY).as(LogicalTypeAnnotation.stringType()).named("probe")
            .required(PrimitiveTypeName.INT32).named("mode")
            .required(PrimitiveTypeName.DOUBLE).named("a_on_e")
            .required(PrimitiveTypeName.DOUBLE).named("b_on_q")
            .named("probe_coefficients");
        Map<String, String> units = new LinkedHashMap<>();
        units.put("probe", Layout.NONE);
        units.put("mode", Layout.ONE);
        // The signal unit differs between probes; the footer's probe list gives it.
        units.put("a_on_e", "(probe unit)/(V/m)");
        units.put("b_on_q", "(probe unit)/(V*s/m)");
        return new Layout.Table("probe_coefficients", m, units);
    }

    private static Layout.Table modeLossTable() {
        MessageType m = Types.buildMessage()
            .required(PrimitiveTypeName.INT32).named("mode")
            .required(PrimitiveTypeName.BINARY).as(LogicalTypeAnnotation.stringType()).named("label")
            .required(PrimitiveTypeName.DOUBLE).named("f_Hz")
            .required(PrimitiveTypeName.DOUBLE).named("Q")
            .required(PrimitiveTypeName.DOUBLE).named("kappa_rad_s")
            .required(PrimitiveTypeName.DOUBLE).named("linewidth_Hz")
            .required(PrimitiveTypeName.BOOLEAN).named("aliased")
            .named("mode_losses");
        Map<String, String> units = new LinkedHashMap<>();
        units.put("mode", Layout.ONE);
        units.put("label", Layout.NONE);
        units.put("f_Hz", "Hz");
        units.put("Q", Layout.ONE);
        units.put("kappa_rad_s", "rad/s");
        units.put("linewidth_Hz", "Hz");
        units.put("aliased", Layout.NONE);
        return new Layout.Table("mode_losses", m, units);
    }

    private void writeModeLosses(ModeTable table, ModeDamping damping, AliasReport aliasing,
                                 Map<String, String> common) throws IOException {
        boolean[] aliased = new boolean[modes];
        for (int l : aliasing.modes()) {
            aliased[l] = true;
        }
        try (RowWriter w = open(MODE_LOSSES, modeLossTable(), common)) {
            for (int l = 0; l < modes; l++) {
                int index = l;
                String label = table.modes().get(l).label();
                // Q = +inf marks a lossless mode (κ = 0); Parquet doubles hold it as IEEE infinity.
                w.write(r -> {
                    r.addInt(index);
                    r.addString(label);
                    r.addDouble(table.frequency(index));
                    r.addDouble(damping.qualityFactor(index));
                    r.addDouble(damping.kappa(index));
                    r.addDouble(damping.linewidthHz(index));
                    r.addBoolean(aliased[index]);
                });
            }
        }
    }

    private void writeCoefficients(TimeSeriesSpec ts, List<ProbeCoefficients> coefficients,
                                   Map<String, String> common) throws IOException {
        try (RowWriter w = open(COEFFICIENTS, coefficientTable(), common)) {
            for (int p = 0; p < coefficients.size(); p++) {
                ProbeCoefficients c = coefficients.get(p);
                String name = ts.probes().get(p).name();
                for (int l = 0; l < modes; l++) {
                    int index = l;
                    w.write(r -> {
                        r.addString(name);
                        r.addInt(index);
                        r.addDouble(c.onE(index));
                        r.addDouble(c.onQ(index));
                    });
                }
            }
        }
    }

    // ---- footer description --------------------------------------------------------------------

    private static ObjectNode description(TimeSeriesSpec ts, ModeTable table, ModeDamping damping,
                                          List<ProbeCoefficients> coefficients, AliasReport aliasing) {
        ObjectNode o = Layout.JSON.createObjectNode();
        o.put("dt_s", ts.grid().dtSeconds());
        o.put("sample_rate_Hz", 1 / ts.grid().dtSeconds());
        o.put("steps", ts.grid().steps());
        o.put("span_s", ts.grid().span());
        o.put("samples", ts.samples());
        o.put("nyquist_Hz", ts.grid().nyquistHz());
        o.put("modes", table.size());
        ObjectNode a = o.putObject("aliasing");
        a.put("policy", ts.failOnAliasing() ? "fail" : "warn");
        a.put("count", aliasing.count());
        a.put("highest_mode_Hz", aliasing.highestHz());
        a.put("largest_clean_dt_s", aliasing.largestCleanDt());
        ArrayNode am = a.putArray("modes");
        for (int i = 0; i < aliasing.count(); i++) {
            ObjectNode m = am.addObject();
            m.put("mode", aliasing.modes().get(i));
            m.put("label", aliasing.labels().get(i));
            m.put("f_Hz", aliasing.frequenciesHz().get(i));
        }
        ObjectNode loss = o.putObject("loss");
        loss.put("model", damping.description());
        loss.put("lossy_modes", damping.lossyCount());
        double qMin = damping.minQualityFactor();
        if (Double.isFinite(qMin)) {
            loss.put("min_Q", qMin);
        } else {
            loss.putNull("min_Q");
        }
        ArrayNode probes = o.putArray("probes");
        for (int p = 0; p < ts.probes().size(); p++) {
            probes.add(probe(ts.probes().get(p), coefficients.get(p)));
        }
        ArrayNode rec = o.putArray("record");
        rec.add("probes");
        if (ts.amplitudes()) {
            rec.add("amplitudes");
        }
        ObjectNode s = o.putObject("spectra");
        s.put("segment", ts.spectra().segment());
        s.put("detrend", ts.spectra().removeMean() ? "mean" : "none");
        s.put("confidence", ts.spectra().confidence());
        s.put("correlation_lags", ts.spectra().correlationLags());
        s.put("origins", ts.spectra().allOrigins() ? "all" : "first");
        o.put("random_draws", DRAW_ORDER);
        return o;
    }

    private static ObjectNode probe(Probe probe, ProbeCoefficients c) {
        ObjectNode o = Layout.JSON.createObjectNode();
        o.put("name", probe.name());
        o.put("column", probe.name());
        o.put("unit", probe.unit());
        if (probe instanceof Probe.ElectricDipole) {
            Probe.ElectricDipole d = (Probe.ElectricDipole) probe;
            o.put("kind", "dipole");
            o.put("signal", "V = length * direction . E(position)");
            vector(o, "position_m", d.position());
            vector(o, "direction", d.direction());
            o.put("length_m", d.lengthMetres());
        } else if (probe instanceof Probe.SmearedDipole) {
            Probe.SmearedDipole d = (Probe.SmearedDipole) probe;
            o.put("kind", "smeared_dipole");
            o.put("signal", "V = length * direction . (E averaged over an isotropic Gaussian of width width_m)");
            vector(o, "position_m", d.position());
            vector(o, "direction", d.direction());
            o.put("length_m", d.lengthMetres());
            o.put("width_m", d.widthMetres());
        } else if (probe instanceof Probe.MagneticLoop) {
            Probe.MagneticLoop d = (Probe.MagneticLoop) probe;
            boolean flux = d.output() == Probe.LoopOutput.FLUX;
            o.put("kind", "loop");
            o.put("output", flux ? "flux" : "emf");
            o.put("signal", flux ? "flux = area * normal . B(centre)" : "emf = -d(flux)/dt = area * normal . curl E(centre)");
            vector(o, "position_m", d.centre());
            vector(o, "normal", d.normal());
            o.put("area_m2", d.areaSquareMetres());
        } else {
            Probe.FieldProbe d = (Probe.FieldProbe) probe;
            o.put("kind", "field");
            o.put("field", d.field().name());
            o.put("component", String.valueOf("xyz".charAt(d.component())));
            o.put("signal", d.field().column(d.component()) + "(position)");
            vector(o, "position_m", d.position());
        }
        o.put("couples_to", couples(c));
        return o;
    }

    private static String couples(ProbeCoefficients c) {
        boolean e = false;
        boolean q = false;
        for (int l = 0; l < c.modeCount(); l++) {
            e |= c.onE(l) != 0;
            q |= c.onQ(l) != 0;
        }
        return e && q ? "e and q" : e ? "e" : q ? "q" : "nothing";
    }

    private static void vector(ObjectNode o, String key, Vec3 v) {
        ArrayNode a = o.putArray(key);
        a.add(v.x());
        a.add(v.y());
        a.add(v.z());
    }

    // ---- streaming -----------------------------------------------------------------------------

    /**
     * Writes one block's rows (and amplitude rows when recorded).
     *
     * @param block the steps of one sample
     * @throws IllegalStateException when the block does not fit the run (channels, sample range,
     *     steps, amplitudes) or the writer is not open
     * @throws IOException when writing fails
     */
    @Override
    public void accept(TimeSeriesBlock block) throws IOException {
        requireOpen();
        try {
            check(block);
            long sample = block.sample();
            int end = block.firstStep() + block.steps();
            // Sorted by (sample, step) as long as every block continues exactly where the last one ended.
            sorted &= sample == nextSample && block.firstStep() == nextStep;
            nextSample = end == steps ? sample + 1 : sample;
            nextStep = end == steps ? 0 : end;
            seriesRow.block = block;
            for (int s = 0; s < block.steps(); s++) {
                seriesRow.s = s;
                series.write(seriesRow);
            }
            if (amplitudeRows != null) {
                amplitudeRow.block = block;
                for (int s = 0; s < block.steps(); s++) {
                    amplitudeRow.s = s;
                    for (int l = 0; l < modes; l++) {
                        amplitudeRow.mode = l;
                        amplitudeRows.write(amplitudeRow);
                    }
                }
            }
            if (block.last()) {
                open.remove(sample);
                completed++;
            } else {
                open.put(sample, end);
            }
        } catch (IOException | RuntimeException | Error ex) {
            state = State.FAILED;
            throw ex;
        }
    }

    private void check(TimeSeriesBlock block) {
        if (block.channels() != channels) {
            throw new IllegalStateException("block has " + block.channels() + " channels, the run has " + channels
                + " probes");
        }
        if (block.sample() < 0 || block.sample() >= samples) {
            throw new IllegalStateException("block of sample " + block.sample() + " is outside [0, " + samples + ")");
        }
        if (block.firstStep() < 0 || block.steps() < 1 || (long) block.firstStep() + block.steps() > steps) {
            throw new IllegalStateException("block of steps " + block.firstStep() + " + " + block.steps()
                + " does not fit the run's " + steps + " steps");
        }
        int expected = open.getOrDefault(block.sample(), 0);
        if (block.firstStep() != expected) {
            throw new IllegalStateException("block of sample " + block.sample() + " starts at step " + block.firstStep()
                + ", expected " + expected + " (one sample's blocks arrive in step order, each trajectory once)");
        }
        if (block.last() != ((long) block.firstStep() + block.steps() == steps)) {
            throw new IllegalStateException("block of sample " + block.sample() + " ending at step "
                + (block.firstStep() + block.steps()) + " disagrees with the run's " + steps + " steps");
        }
        if (amplitudes && (!block.hasAmplitudes() || block.modeCount() != modes)) {
            throw new IllegalStateException("the run records amplitudes of " + modes + " modes, the block has "
                + (block.hasAmplitudes() ? block.modeCount() : 0));
        }
    }

    /**
     * Closes the tables, writes the manifest and renames the folder into place.
     *
     * @throws IllegalStateException when some trajectory is incomplete
     * @throws IOException when writing or renaming fails
     */
    @Override
    public void finish() throws IOException {
        requireOpen();
        try {
            if (completed != samples || !open.isEmpty() || series.rows() != samples * steps) {
                throw new IllegalStateException("time series received " + completed + " complete trajectories ("
                    + open.size() + " unfinished, " + series.rows() + " rows), the spec asks for " + samples + " of "
                    + steps + " steps");
            }
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
        m.put("format", FORMAT);
        m.put("version", Version.VERSION);
        m.put("name", spec.name());
        m.put("seed", spec.seed());
        m.put("samples", samples);
        m.put("steps", steps);
        m.put("modes", modes);
        ArrayNode p = m.putArray("probes");
        probeNames.forEach(p::add);
        m.put("amplitudes", amplitudes);
        m.put("row_order", sorted ? "sample, step" : "by block: one sample's rows in step order, samples interleaved");
        m.put("compression", DatasetWriter.codec(spec.storage().compression()).name());
        ArrayNode files = m.putArray("files");
        for (Map.Entry<String, RowWriter> e : writers.entrySet()) {
            ObjectNode o = files.addObject();
            o.put("name", e.getKey());
            o.put("rows", e.getValue().rows());
            o.put("bytes", e.getValue().file().length());
            o.put("sha256", e.getValue().file().sha256());
        }
        byte[] bytes = Layout.JSON.writerWithDefaultPrettyPrinter().writeValueAsBytes(m);
        try (FileChannel ch = FileChannel.open(staging.resolve(MANIFEST), StandardOpenOption.CREATE_NEW,
            StandardOpenOption.WRITE)) {
            ByteBuffer buf = ByteBuffer.wrap(bytes);
            while (buf.hasRemaining()) {
                ch.write(buf);
            }
            ch.force(true);
        }
    }

    /** Atomic rename of the staging folder onto the target; an old time series is moved aside first. */
    private void publish() throws IOException {
        Path parent = target.getParent();
        if (Files.exists(target, LinkOption.NOFOLLOW_LINKS)) {
            // Re-check: the folder may have been filled since create().
            checkTarget(target, overwrite);
            Path old = createUnique(parent, FOLDER + ".old-");
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
            deleteTree(old);
        } else {
            Files.move(staging, target, StandardCopyOption.ATOMIC_MOVE);
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
            return;
        }
        state = State.CLOSED;
        for (RowWriter w : writers.values()) {
            try {
                w.close();
            } catch (IOException | RuntimeException ex) {
                // The run already failed; its half-written files are deleted below.
            }
        }
        deleteTree(staging);
    }

    /** @return the folder the time series is renamed to by {@link #finish()} */
    public Path folder() {
        return target;
    }

    private void requireOpen() {
        if (state != State.OPEN) {
            throw new IllegalStateException("time-series writer for " + target + " is "
                + state.name().toLowerCase(Locale.ROOT));
        }
    }

    private static void deleteTree(Path root) throws IOException {
        if (!Files.exists(root, LinkOption.NOFOLLOW_LINKS)) {
            return;
        }
        List<Path> all = new ArrayList<>();
        try (var walk = Files.walk(root)) {
            walk.forEach(all::add);
        }
        // Children before their folders: walk lists a folder before its entries.
        for (int i = all.size() - 1; i >= 0; i--) {
            Files.deleteIfExists(all.get(i));
        }
    }

    /** One (sample, step) row of the probe table; reused for every row. */
    private static final class SeriesRow implements RowWriter.Row {
        private final int channels;
        TimeSeriesBlock block;
        int s;

        SeriesRow(int channels) {
            this.channels = channels;
        }

        @Override
        public void emit(RowWriter w) {
            w.addLong(block.sample());
            w.addInt(block.firstStep() + s);
            w.addDouble(block.time(s));
            for (int c = 0; c < channels; c++) {
                w.addDouble(block.value(s, c));
            }
        }
    }

    /** One (sample, step, mode) row of the amplitude table; reused for every row. */
    private static final class AmplitudeRow implements RowWriter.Row {
        TimeSeriesBlock block;
        int s;
        int mode;

        @Override
        public void emit(RowWriter w) {
            w.addLong(block.sample());
            w.addInt(block.firstStep() + s);
            w.addInt(mode);
            w.addDouble(block.q(s, mode));
            w.addDouble(block.e(s, mode));
        }
    }
}
