package org.stillfield.sampler.io;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;
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
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecException;
import org.stillfield.sampler.spec.SpecReader;

/** Small runs for the dataset tests: a 1 × 1.3 × 1.7 m box, a few dozen modes, 18 points. */
final class TestRuns {
    /** The part files of a run small enough for one part. */
    static final String AMPLITUDES0 = Layout.part(Layout.AMPLITUDES, 0);
    static final String FIELDS0 = Layout.part(Layout.FIELDS, 0);

    private TestRuns() {
    }

    /** Hard cutoff at 380 MHz keeps about 33 modes (Weyl estimate V k³/3π² − (a+b+d) k/2π + 1/2). */
    static String yaml(String precision, long seed, int samples) {
        return "name: t\n"
            + "cavity: {shape: box, a_m: 1.0, b_m: 1.3, d_m: 1.7}\n"
            + "fields: [A, E, B]\n"
            + "window: {kind: hard, cutoff_GHz: 0.38}\n"
            + "samples: " + samples + "\n"
            + "seed: " + seed + "\n"
            + "evaluate:\n"
            + "  points:\n"
            + "    - {name: p, at: [0.3, 0.4, 0.5]}\n"
            + "  lines:\n"
            + "    - {name: l, from: [0.1, 0.1, 0.1], to: [0.9, 1.2, 1.6], n: 5}\n"
            + "  grids:\n"
            + "    - {name: g, n: [3, 2, 2]}\n"
            + "output: {folder: out/t, precision: " + precision + "}\n"
            + "threads: 1\n";
    }

    /** Like {@link #yaml(String, long, int)}, split into parts of {@code partSamples} samples. */
    static String yaml(String precision, long seed, int samples, int partSamples) {
        return yaml(precision, seed, samples).replace("output: {folder: out/t, precision: " + precision + "}",
            "output: {folder: out/t, precision: " + precision + ", part_samples: " + partSamples + "}");
    }

    /** @return the first n samples of a batch, as the engine would have delivered them */
    static SampleBatch head(SampleBatch b, int n) {
        double[][] q = new double[n][];
        double[][] e = new double[n][];
        Map<Field, double[][]> v = new EnumMap<>(Field.class);
        for (int s = 0; s < n; s++) {
            q[s] = b.q(s);
            e[s] = b.e(s);
        }
        for (Field f : b.fields()) {
            double[][] x = new double[n][];
            for (int s = 0; s < n; s++) {
                x[s] = b.values(f, s);
            }
            v.put(f, x);
        }
        return new SampleBatch(b.firstSample(), q, e, v);
    }

    static RunSpec spec(Path dir, String yaml) throws SpecException {
        return SpecReader.parse(yaml, dir, "t");
    }

    static RunSpec spec(Path dir) throws SpecException {
        return spec(dir, yaml("float64", 12345, 50));
    }

    static ModeTable table(RunSpec spec) {
        return ModeTable.of(spec.cavity(), spec.window(), spec.state(), spec.maxModes());
    }

    static EnsembleRunner.Plan plan(RunSpec spec, ModeTable table) {
        return new EnsembleRunner.Plan(table, spec.allPoints(), spec.fields(), spec.seed(), 0, spec.samples(),
            spec.threads());
    }

    /** Runs the engine into a dataset and returns a copy of everything the writer was given. */
    static Recorder write(RunSpec spec, ModeTable table, boolean overwrite) throws IOException {
        Recorder rec = new Recorder();
        try (DatasetWriter w = DatasetWriter.create(spec, table, overwrite)) {
            // The ranges still missing, as the command line runs them (all of them in a new folder).
            for (DatasetWriter.Range r : w.plan().pending()) {
                EnsembleRunner.Plan p = new EnsembleRunner.Plan(table, spec.allPoints(), spec.fields(), spec.seed(),
                    r.firstSample(), r.sampleCount(), spec.threads());
                EnsembleRunner.run(p, new Tee(rec, w.batches()), null);
            }
            w.finish();
        }
        return rec;
    }

    static Recorder write(RunSpec spec) throws IOException {
        return write(spec, table(spec), false);
    }

    static Recorder replay(Dataset d, int batchSize) throws IOException {
        Recorder rec = new Recorder();
        d.replay(rec, batchSize);
        assertEquals(1, rec.finishes, "replay calls finish() once");
        return rec;
    }

    /** Copies every batch it is handed (batch arrays are shared and must not be kept). */
    static final class Recorder implements EnsembleSink {
        final List<double[]> q = new ArrayList<>();
        final List<double[]> e = new ArrayList<>();
        final Map<Field, List<double[]>> values = new EnumMap<>(Field.class);
        long next;
        long first = -1;
        int finishes;

        @Override
        public void accept(SampleBatch batch) {
            if (first < 0) {
                first = batch.firstSample();
                next = first;
            }
            assertEquals(next, batch.firstSample(), "batches arrive in sample order");
            for (int s = 0; s < batch.size(); s++) {
                q.add(batch.q(s).clone());
                e.add(batch.e(s).clone());
                for (Field f : batch.fields()) {
                    values.computeIfAbsent(f, k -> new ArrayList<>()).add(batch.values(f, s).clone());
                }
            }
            next += batch.size();
        }

        @Override
        public void finish() {
            finishes++;
        }
    }

    /** Hands each batch to two sinks. */
    static final class Tee implements EnsembleSink {
        private final EnsembleSink a;
        private final EnsembleSink b;

        Tee(EnsembleSink a, EnsembleSink b) {
            this.a = a;
            this.b = b;
        }

        @Override
        public void accept(SampleBatch batch) throws IOException {
            a.accept(batch);
            b.accept(batch);
        }

        @Override
        public void finish() throws IOException {
            a.finish();
            b.finish();
        }
    }

    /**
     * Reads a whole (small) Parquet file through Parquet's own record assembly and example Group
     * model, a path independent of the column-level reader under test.
     */
    static List<Group> groups(Path file) throws IOException {
        try (ParquetFileReader r = ParquetFileReader.open(new LocalInputFile(file),
            ParquetReadOptions.builder(new PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build())) {
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
}
