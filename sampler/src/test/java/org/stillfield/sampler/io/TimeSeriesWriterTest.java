package org.stillfield.sampler.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.apache.parquet.ParquetReadOptions;
import org.apache.parquet.column.page.PageReadStore;
import org.apache.parquet.conf.PlainParquetConfiguration;
import org.apache.parquet.example.data.Group;
import org.apache.parquet.example.data.simple.convert.GroupRecordConverter;
import org.apache.parquet.hadoop.ParquetFileReader;
import org.apache.parquet.io.ColumnIOFactory;
import org.apache.parquet.io.LocalInputFile;
import org.apache.parquet.io.MessageColumnIO;
import org.apache.parquet.io.RecordReader;
import org.apache.parquet.schema.MessageType;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecReader;
import org.stillfield.sampler.timeseries.AliasReport;
import org.stillfield.sampler.timeseries.ModeDamping;
import org.stillfield.sampler.timeseries.Probe;
import org.stillfield.sampler.timeseries.ProbeCoefficients;
import org.stillfield.sampler.timeseries.TimeSeriesBlock;
import org.stillfield.sampler.timeseries.TimeSeriesRunner;
import org.stillfield.sampler.timeseries.TimeSeriesSink;
import org.stillfield.sampler.timeseries.TimeSeriesSpec;

/** The time-series files read back through Parquet's own record assembly, their footers and manifest. */
class TimeSeriesWriterTest {
    private static final ObjectMapper JSON = new ObjectMapper();

    @TempDir
    Path dir;

    /** The 3 × 2 × 4 cm box up to 12 GHz (11 modes), three probes, 3 trajectories of 50 steps. */
    private static String yaml(boolean amplitudes) {
        return "name: w\n"
            + "cavity: {shape: box, a_m: 0.03, b_m: 0.02, d_m: 0.04}\n"
            + "state: {kind: thermal, temperature_K: 0.5}\n"
            + "window: {kind: hard, cutoff_GHz: 12}\n"
            + "samples: 3\nseed: 99\n"
            + "output: {folder: out/w}\n"
            + "timeseries:\n"
            + "  dt_s: 2.0e-11\n  steps: 50\n"
            + "  loss: {q: 400}\n"
            + (amplitudes ? "  record: [probes, amplitudes]\n" : "")
            + "  spectra: {segment: 16, correlation_lags: 5}\n"
            + "probes:\n"
            + "  - {name: pin, kind: dipole, at: [0.015, 0.01, 0.008], direction: [0, 1, 0], length_m: 0.002}\n"
            + "  - {name: coil, kind: loop, at: [0.005, 0.01, 0.02], normal: [0, 0, 1], area_m2: 1.0e-6, output: flux}\n"
            + "  - {name: bx, kind: field, field: B, component: x, at: [0.01, 0.01, 0.01]}\n"
            + "threads: 2\n";
    }

    /** What one run handed to the writer, and the inputs it was built from. */
    private record Run(RunSpec spec, TimeSeriesSpec ts, ModeTable table, ModeDamping damping,
                       List<ProbeCoefficients> coefficients, Map<String, double[]> rows, Map<String, double[]> q,
                       Map<String, double[]> e) {
    }

    private Run run(boolean amplitudes, int group, int chunk, boolean overwrite) throws Exception {
        RunSpec spec = SpecReader.parse(yaml(amplitudes), dir, "w");
        TimeSeriesSpec ts = SpecReader.timeSeries(spec).orElseThrow();
        ModeTable table = ModeTable.of(spec.cavity(), spec.window(), spec.state(), spec.maxModes());
        ModeDamping damping = ModeDamping.of(table, ts.loss());
        List<ProbeCoefficients> coefficients = new ArrayList<>();
        for (Probe p : ts.probes()) {
            coefficients.add(p.coefficients(table));
        }
        AliasReport aliasing = ts.grid().aliasing(table);
        Map<String, double[]> rows = new HashMap<>();
        Map<String, double[]> q = new HashMap<>();
        Map<String, double[]> e = new HashMap<>();
        TimeSeriesSink recorder = block -> {
            for (int s = 0; s < block.steps(); s++) {
                String key = block.sample() + "/" + (block.firstStep() + s);
                double[] v = new double[block.channels()];
                for (int c = 0; c < v.length; c++) {
                    v[c] = block.value(s, c);
                }
                rows.put(key, v);
                if (block.hasAmplitudes()) {
                    double[] qs = new double[block.modeCount()];
                    double[] es = new double[block.modeCount()];
                    block.copyAmplitudes(s, qs, es);
                    q.put(key, qs);
                    e.put(key, es);
                }
            }
        };
        TimeSeriesRunner.Plan plan = new TimeSeriesRunner.Plan(table, damping, ts.grid(), ts.probes(), spec.seed(), 0,
            ts.samples(), 2, amplitudes, group, chunk);
        try (TimeSeriesWriter w = TimeSeriesWriter.create(spec, ts, table, damping, coefficients, aliasing, overwrite)) {
            TimeSeriesRunner.run(plan, new TimeSeriesSink() {
                @Override
                public void accept(TimeSeriesBlock block) throws IOException {
                    recorder.accept(block);
                    w.accept(block);
                }

                @Override
                public void finish() throws IOException {
                    w.finish();
                }
            }, null);
        }
        return new Run(spec, ts, table, damping, coefficients, rows, q, e);
    }

    /** Every row of a small file through Parquet's example Group model, independent of the writer's row path. */
    private static List<Group> groups(Path file) throws IOException {
        try (ParquetFileReader r = open(file)) {
            MessageType schema = r.getFileMetaData().getSchema();
            MessageColumnIO io = new ColumnIOFactory().getColumnIO(schema);
            List<Group> out = new ArrayList<>();
            PageReadStore pages;
            while ((pages = r.readNextRowGroup()) != null) {
                RecordReader<Group> rr = io.getRecordReader(pages, new GroupRecordConverter(schema));
                for (long i = 0; i < pages.getRowCount(); i++) {
                    out.add(rr.read());
                }
            }
            return out;
        }
    }

    private static ParquetFileReader open(Path file) throws IOException {
        return ParquetFileReader.open(new LocalInputFile(file),
            ParquetReadOptions.builder(new PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build());
    }

    private static Map<String, String> footer(Path file) throws IOException {
        try (ParquetFileReader r = open(file)) {
            return r.getFileMetaData().getKeyValueMetaData();
        }
    }

    private static String sha256(Path p) throws Exception {
        // Digest of the bytes on disk in one piece (FIPS 180-4 SHA-256), not the writer's streaming digest.
        return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(Files.readAllBytes(p)));
    }

    @Test
    void seriesReadBackBitForBitWithTimesAndUnits() throws Exception {
        Run r = run(false, 2, 50, false);
        Path folder = r.spec().outputFolder().resolve(TimeSeriesWriter.FOLDER);
        List<Group> rows = groups(folder.resolve(TimeSeriesWriter.SERIES));
        double dt = 2.0e-11;
        assertEquals(3 * 50, rows.size(), "rows = trajectories x steps");
        String[] names = {"pin", "coil", "bx"};
        long previous = -1;
        for (Group g : rows) {
            long sample = g.getLong("sample", 0);
            int step = g.getInteger("step", 0);
            // Rows come sorted by (sample, step) when every block is a whole trajectory.
            long order = sample * 50 + step;
            assertTrue(order > previous, "row order at sample " + sample + ", step " + step);
            previous = order;
            // t_n = n dt, computed from n (definition of the uniform grid).
            assertEquals(step * dt, g.getDouble("t_s", 0), 0.0, "t at step " + step);
            double[] expected = r.rows().get(sample + "/" + step);
            for (int c = 0; c < names.length; c++) {
                assertEquals(expected[c], g.getDouble(names[c], 0), 0.0, names[c] + " at " + sample + "/" + step);
            }
        }
        Map<String, String> f = footer(folder.resolve(TimeSeriesWriter.SERIES));
        assertEquals(TimeSeriesWriter.FORMAT, f.get("stillfield.format"));
        assertEquals("timeseries", f.get("stillfield.table"));
        assertEquals("3", f.get("stillfield.samples"), "trajectories");
        assertEquals(r.spec().sourceText(), f.get("stillfield.spec"));
        JsonNode units = JSON.readTree(f.get("stillfield.units"));
        assertEquals("V", units.get("pin").asText());
        assertEquals("Wb", units.get("coil").asText());
        assertEquals("T", units.get("bx").asText());
        assertEquals("s", units.get("t_s").asText());
        JsonNode t = JSON.readTree(f.get(TimeSeriesWriter.KEY_TIMESERIES));
        assertEquals(dt, t.get("dt_s").asDouble(), 0.0);
        assertEquals(50, t.get("steps").asInt());
        // Nyquist frequency of sampling at dt: 1/(2 dt) (sampling theorem, common practice).
        assertEquals(1 / (2 * dt), t.get("nyquist_Hz").asDouble(), 1e-6);
        assertEquals(0, t.get("aliasing").get("count").asInt(), "25 GHz Nyquist is above the 12 GHz cutoff");
        assertEquals(TimeSeriesWriter.DRAW_ORDER, t.get("random_draws").asText());
        assertEquals("constant Q = 400.0", t.get("loss").get("model").asText());
        JsonNode probes = t.get("probes");
        assertEquals("dipole", probes.get(0).get("kind").asText());
        assertEquals(0.002, probes.get(0).get("length_m").asDouble(), 0.0);
        assertEquals(1.0, probes.get(0).get("direction").get(1).asDouble(), 0.0);
        assertEquals("loop", probes.get(1).get("kind").asText());
        assertEquals("flux", probes.get(1).get("output").asText());
        assertEquals(1e-6, probes.get(1).get("area_m2").asDouble(), 0.0);
        assertEquals("B", probes.get(2).get("field").asText());
        assertEquals("x", probes.get(2).get("component").asText());
        assertEquals(0.005, probes.get(1).get("position_m").get(0).asDouble(), 0.0);
    }

    @Test
    void manifestListsEveryFileWithRowsBytesAndHashes() throws Exception {
        Run r = run(false, 2, 50, false);
        Path folder = r.spec().outputFolder().resolve(TimeSeriesWriter.FOLDER);
        JsonNode m = JSON.readTree(folder.resolve(TimeSeriesWriter.MANIFEST).toFile());
        assertEquals(TimeSeriesWriter.FORMAT, m.get("format").asText());
        assertEquals("sample, step", m.get("row_order").asText());
        Map<String, Long> rows = Map.of(TimeSeriesWriter.SERIES, 150L, TimeSeriesWriter.COEFFICIENTS,
            3L * r.table().size(), TimeSeriesWriter.MODE_LOSSES, (long) r.table().size());
        assertEquals(3, m.get("files").size());
        for (JsonNode f : m.get("files")) {
            Path p = folder.resolve(f.get("name").asText());
            assertEquals(rows.get(f.get("name").asText()), f.get("rows").asLong(), p + " rows");
            assertEquals(Files.size(p), f.get("bytes").asLong(), p + " bytes");
            assertEquals(sha256(p), f.get("sha256").asText(), p + " sha256");
            try (ParquetFileReader pr = open(p)) {
                assertEquals(f.get("rows").asLong(), pr.getRecordCount(), p + " Parquet row count");
            }
        }
        try (Stream<Path> left = Files.list(r.spec().outputFolder())) {
            assertEquals(List.of(folder), left.toList(), "only the published folder remains");
        }
    }

    @Test
    void coefficientAndLossTablesHoldTheRunsValues() throws Exception {
        Run r = run(false, 2, 50, false);
        Path folder = r.spec().outputFolder().resolve(TimeSeriesWriter.FOLDER);
        List<Group> coeff = groups(folder.resolve(TimeSeriesWriter.COEFFICIENTS));
        int m = r.table().size();
        for (int k = 0; k < coeff.size(); k++) {
            Group g = coeff.get(k);
            int p = k / m;
            int l = g.getInteger("mode", 0);
            assertEquals(r.ts().probes().get(p).name(), g.getString("probe", 0));
            assertEquals(k % m, l);
            assertEquals(r.coefficients().get(p).onE(l), g.getDouble("a_on_e", 0), 0.0);
            assertEquals(r.coefficients().get(p).onQ(l), g.getDouble("b_on_q", 0), 0.0);
        }
        List<Group> loss = groups(folder.resolve(TimeSeriesWriter.MODE_LOSSES));
        assertEquals(m, loss.size());
        for (Group g : loss) {
            int l = g.getInteger("mode", 0);
            assertEquals(400.0, g.getDouble("Q", 0), 0.0);
            // κ = ω/Q and the FWHM κ/2π = f/Q of a Lorentzian line (Pozar, cavity resonator Q).
            double f = r.table().frequency(l);
            assertEquals(f, g.getDouble("f_Hz", 0), 0.0);
            assertEquals(2 * Math.PI * f / 400, g.getDouble("kappa_rad_s", 0), 1e-6 * 2 * Math.PI * f / 400);
            assertEquals(f / 400, g.getDouble("linewidth_Hz", 0), 1e-9 * f / 400);
            assertEquals(r.table().modes().get(l).label(), g.getString("label", 0));
            assertFalse(g.getBoolean("aliased", 0));
        }
    }

    @Test
    void interleavedBlocksAndAmplitudesAreKeptAndSaidToBeUnsorted() throws Exception {
        // Groups of 2 and chunks of 20 steps: the runner interleaves the samples of a group.
        Run r = run(true, 2, 20, false);
        Path folder = r.spec().outputFolder().resolve(TimeSeriesWriter.FOLDER);
        JsonNode m = JSON.readTree(folder.resolve(TimeSeriesWriter.MANIFEST).toFile());
        assertTrue(m.get("row_order").asText().startsWith("by block"), m.get("row_order").asText());
        assertTrue(m.get("amplitudes").asBoolean());
        List<Group> rows = groups(folder.resolve(TimeSeriesWriter.SERIES));
        assertEquals(150, rows.size());
        for (Group g : rows) {
            String key = g.getLong("sample", 0) + "/" + g.getInteger("step", 0);
            assertEquals(r.rows().get(key)[0], g.getDouble("pin", 0), 0.0, key);
        }
        List<Group> amps = groups(folder.resolve(TimeSeriesWriter.AMPLITUDES));
        assertEquals(150L * r.table().size(), amps.size(), "rows = trajectories x steps x modes");
        for (Group g : amps) {
            String key = g.getLong("sample", 0) + "/" + g.getInteger("step", 0);
            int l = g.getInteger("mode", 0);
            assertEquals(r.q().get(key)[l], g.getDouble("q", 0), 0.0, key + " q" + l);
            assertEquals(r.e().get(key)[l], g.getDouble("e", 0), 0.0, key + " e" + l);
        }
    }

    @Test
    void existingSeriesIsReplacedOnlyWithOverwrite() throws Exception {
        Run first = run(false, 2, 50, false);
        Path folder = first.spec().outputFolder().resolve(TimeSeriesWriter.FOLDER);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> run(false, 2, 50, false));
        assertTrue(ex.getMessage().contains("output.folder") && ex.getMessage().contains("--overwrite"), ex.getMessage());
        run(false, 3, 50, true);
        assertTrue(Files.isRegularFile(folder.resolve(TimeSeriesWriter.MANIFEST)));
        // A folder the writer did not make is never replaced.
        Files.delete(folder.resolve(TimeSeriesWriter.MANIFEST));
        ex = assertThrows(IllegalArgumentException.class, () -> run(false, 2, 50, true));
        assertTrue(ex.getMessage().contains("not a time series"), ex.getMessage());
    }

    @Test
    void unfinishedRunLeavesNothingBehind() throws Exception {
        RunSpec spec = SpecReader.parse(yaml(false), dir, "w");
        TimeSeriesSpec ts = SpecReader.timeSeries(spec).orElseThrow();
        ModeTable table = ModeTable.of(spec.cavity(), spec.window(), spec.state(), spec.maxModes());
        ModeDamping damping = ModeDamping.of(table, ts.loss());
        List<ProbeCoefficients> coefficients = new ArrayList<>();
        for (Probe p : ts.probes()) {
            coefficients.add(p.coefficients(table));
        }
        try (TimeSeriesWriter w = TimeSeriesWriter.create(spec, ts, table, damping, coefficients,
            ts.grid().aliasing(table), false)) {
            IllegalStateException ex = assertThrows(IllegalStateException.class, w::finish);
            assertTrue(ex.getMessage().contains("0 complete trajectories"), ex.getMessage());
        }
        try (Stream<Path> left = Files.list(spec.outputFolder())) {
            assertEquals(0, left.count(), "no staging folder and no published folder");
        }
    }
}
