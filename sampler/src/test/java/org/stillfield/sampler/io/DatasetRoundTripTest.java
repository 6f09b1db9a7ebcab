package org.stillfield.sampler.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.apache.parquet.example.data.Group;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.spec.RunSpec;

/**
 * What is read back equals what the engine handed the writer. Reference: the written values
 * themselves. Parquet DOUBLE/FLOAT hold IEEE 754 binary64/binary32 unchanged under PLAIN and
 * BYTE_STREAM_SPLIT encodings (Parquet format specification, Encodings.md), so equality is exact.
 */
class DatasetRoundTripTest {
    @TempDir
    Path dir;

    private static void assertSameSamples(TestRuns.Recorder expected, TestRuns.Recorder actual, Field f) {
        assertEquals(expected.values.get(f).size(), actual.values.get(f).size(), f + " sample count");
        for (int s = 0; s < expected.values.get(f).size(); s++) {
            assertArrayEquals(expected.values.get(f).get(s), actual.values.get(f).get(s), 0.0, f + " sample " + s);
        }
    }

    private static void assertSameAmplitudes(TestRuns.Recorder expected, TestRuns.Recorder actual) {
        assertEquals(expected.q.size(), actual.q.size(), "sample count");
        for (int s = 0; s < expected.q.size(); s++) {
            assertArrayEquals(expected.q.get(s), actual.q.get(s), 0.0, "q of sample " + s);
            assertArrayEquals(expected.e.get(s), actual.e.get(s), 0.0, "e of sample " + s);
        }
    }

    @Test
    void float64ReadsBackBitForBit() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        TestRuns.Recorder written = TestRuns.write(spec);
        Dataset d = Dataset.open(spec.outputFolder());
        assertEquals(50, d.samples());
        assertEquals(18, d.pointCount());
        assertEquals(List.of(Field.A, Field.E, Field.B), d.fields());
        // A batch size unrelated to the engine's, so batches straddle row groups and pages differently.
        TestRuns.Recorder read = TestRuns.replay(d, 7);
        assertSameAmplitudes(written, read);
        for (Field f : Field.values()) {
            assertSameSamples(written, read, f);
            for (long s : new long[] {0, 23, 49}) {
                assertArrayEquals(written.values.get(f).get((int) s), d.sample(s, f), 0.0, f + " sample(" + s + ")");
            }
        }
    }

    @Test
    void oneSampleIsReadFromItsPagesAlone() throws Exception {
        // 1300 samples x 18 points = 23400 rows: more than Parquet's default 20000-row page limit,
        // so sample 1111 (rows 19998..20015) straddles a page boundary.
        RunSpec spec = TestRuns.spec(dir, TestRuns.yaml("float64", 77, 1300).replace("fields: [A, E, B]", "fields: [B]"));
        TestRuns.Recorder written = TestRuns.write(spec);
        Path fields = spec.outputFolder().resolve(TestRuns.FIELDS0);
        try (org.apache.parquet.hadoop.ParquetFileReader r = org.apache.parquet.hadoop.ParquetFileReader.open(
            new org.apache.parquet.io.LocalInputFile(fields), org.apache.parquet.ParquetReadOptions.builder(
                new org.apache.parquet.conf.PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build())) {
            int pages = r.readOffsetIndex(r.getRowGroups().get(0).getColumns().get(0)).getPageCount();
            assertTrue(pages > 1, "test needs several pages, got " + pages);
        }
        Dataset d = Dataset.open(spec.outputFolder());
        for (long s : new long[] {0, 1110, 1111, 1112, 1299}) {
            assertArrayEquals(written.values.get(Field.B).get((int) s), d.sample(s, Field.B), 0.0, "B sample(" + s + ")");
        }
    }

    @Test
    void float32StoresTheNarrowedDoubleAndAmplitudesStayExact() throws Exception {
        RunSpec spec = TestRuns.spec(dir, TestRuns.yaml("float32", 99, 20));
        TestRuns.Recorder written = TestRuns.write(spec);
        Dataset d = Dataset.open(spec.outputFolder());
        assertEquals(RunSpec.Precision.FLOAT32, d.precision());
        TestRuns.Recorder read = TestRuns.replay(d, 64);
        // Amplitudes are always float64: lossless.
        assertSameAmplitudes(written, read);
        for (Field f : Field.values()) {
            for (int s = 0; s < 20; s++) {
                double[] w = written.values.get(f).get(s);
                double[] r = read.values.get(f).get(s);
                for (int i = 0; i < w.length; i++) {
                    // Round-to-nearest narrowing, JLS §5.1.3, widened back exactly (JLS §5.1.2).
                    assertEquals((double) (float) w[i], r[i], 0.0, f + " sample " + s + " value " + i);
                }
            }
        }
        Group row = TestRuns.groups(spec.outputFolder().resolve(TestRuns.FIELDS0)).get(0);
        assertEquals("FLOAT", row.getType().getType("E_x").asPrimitiveType().getPrimitiveTypeName().name());
    }

    @Test
    void threadCountDoesNotChangeTheData() throws Exception {
        RunSpec base = TestRuns.spec(dir);
        ModeTable table = TestRuns.table(base);
        RunSpec one = base.withThreads(1).withOutputFolder(dir.resolve("one"));
        RunSpec two = base.withThreads(2).withOutputFolder(dir.resolve("two"));
        TestRuns.write(one, table, false);
        TestRuns.write(two, table, false);
        TestRuns.Recorder a = TestRuns.replay(Dataset.open(one.outputFolder()), 50);
        TestRuns.Recorder b = TestRuns.replay(Dataset.open(two.outputFolder()), 50);
        assertSameAmplitudes(a, b);
        for (Field f : Field.values()) {
            assertSameSamples(a, b, f);
        }
    }

    /** A box whose part with x above 0.55 m counts as outside: masking without a curved cavity. */
    private record HalfBox(Cavity box) implements Cavity {
        @Override
        public String shape() {
            return "halfbox";
        }

        @Override
        public Map<String, Double> parameters() {
            return box.parameters();
        }

        @Override
        public Medium medium() {
            return box.medium();
        }

        @Override
        public double volume() {
            return box.volume();
        }

        @Override
        public Vec3[] bounds() {
            return box.bounds();
        }

        @Override
        public boolean contains(Vec3 r) {
            return box.contains(r) && r.x() <= 0.55;
        }

        @Override
        public double weylCount(double k) {
            return box.weylCount(k);
        }

        @Override
        public double lowestK() {
            return box.lowestK();
        }

        @Override
        public List<Mode> modesUpTo(double kMax) {
            return box.modesUpTo(kMax);
        }

        @Override
        public ModeFunctions modeFunctions(List<Mode> modes) {
            return box.modeFunctions(modes);
        }
    }

    @Test
    void pointsOutsideTheCavityAreStoredAsNullAndReadAsNaN() throws Exception {
        RunSpec base = TestRuns.spec(dir, TestRuns.yaml("float64", 5, 6));
        Cavity half = new HalfBox(base.cavity());
        Vec3[] b = half.bounds();
        // Cell centres at x = 0.125, 0.375 (inside) and 0.625, 0.875 m (outside).
        PointSet grid = PointSet.grid("g", b[0], b[1], 4, 2, 2);
        RunSpec spec = new RunSpec(base.name(), half, base.state(), base.fields(), base.window(), base.samples(),
            base.seed(), List.of(grid), base.outputFolder(), base.precision(), List.of(), base.falseAlarm(),
            base.maxModes(), 1, base.sourceText());
        ModeTable table = ModeTable.of(half, spec.window(), spec.state(), spec.maxModes());
        TestRuns.Recorder written = TestRuns.write(spec, table, false);
        Path folder = spec.outputFolder();

        List<Group> points = TestRuns.groups(folder.resolve(Layout.POINTS));
        for (int p = 0; p < 16; p++) {
            boolean inside = grid.points().get(p).x() < 0.5;
            assertEquals(inside, points.get(p).getBoolean("inside", 0), "inside flag of point " + p);
        }
        List<Group> rows = TestRuns.groups(folder.resolve(TestRuns.FIELDS0));
        assertEquals(6 * 16, rows.size());
        for (Group row : rows) {
            int p = row.getInteger("point", 0);
            boolean inside = points.get(p).getBoolean("inside", 0);
            for (Field f : Field.values()) {
                for (int i = 0; i < 3; i++) {
                    assertEquals(inside ? 1 : 0, row.getFieldRepetitionCount(f.column(i)),
                        f.column(i) + " at point " + p + " must be " + (inside ? "present" : "null"));
                }
            }
        }
        Dataset d = Dataset.open(folder);
        TestRuns.Recorder read = TestRuns.replay(d, 4);
        for (Field f : Field.values()) {
            assertSameSamples(written, read, f);
            double[] one = d.sample(3, f);
            for (int p = 0; p < 16; p++) {
                boolean inside = grid.points().get(p).x() < 0.5;
                for (int i = 0; i < 3; i++) {
                    assertEquals(!inside, Double.isNaN(one[3 * p + i]), f + " point " + p + " NaN exactly outside");
                    assertEquals(!inside, Double.isNaN(read.values.get(f).get(3)[3 * p + i]), f + " replay point " + p);
                }
            }
        }
    }

    @Test
    void aRunWithoutPointsStoresAmplitudesOnly() throws Exception {
        String yaml = TestRuns.yaml("float64", 6, 9);
        yaml = yaml.substring(0, yaml.indexOf("evaluate:")) + yaml.substring(yaml.indexOf("output:"));
        RunSpec spec = TestRuns.spec(dir, yaml);
        assertEquals(0, spec.allPoints().size());
        TestRuns.Recorder written = TestRuns.write(spec);
        Dataset d = Dataset.open(spec.outputFolder());
        assertEquals(0, d.pointCount());
        TestRuns.Recorder read = TestRuns.replay(d, 4);
        assertSameAmplitudes(written, read);
        assertEquals(0, d.sample(8, Field.E).length);
        assertEquals(List.of(), Dataset.problems(spec.outputFolder()));
    }

    @Test
    void readerRejectsBadArguments() throws Exception {
        RunSpec spec = TestRuns.spec(dir, TestRuns.yaml("float64", 1, 3).replace("fields: [A, E, B]", "fields: [E]"));
        TestRuns.write(spec);
        Dataset d = Dataset.open(spec.outputFolder());
        IllegalArgumentException field = assertThrows(IllegalArgumentException.class, () -> d.sample(0, Field.B));
        assertTrue(field.getMessage().contains("B"), field.getMessage());
        IllegalArgumentException range = assertThrows(IllegalArgumentException.class, () -> d.sample(3, Field.E));
        assertTrue(range.getMessage().contains("[0, 3)"), range.getMessage());
        assertThrows(IllegalArgumentException.class, () -> d.replay(new TestRuns.Recorder(), 0));
        assertThrows(IllegalArgumentException.class, () -> d.footer("manifest.json"));
        assertEquals(3 * 18, d.sample(2, Field.E).length);
    }
}
