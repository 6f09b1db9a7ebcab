package org.stillfield.sampler.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.Shard;

/**
 * Parts, shards and resume. The reference for every comparison is an independent uninterrupted,
 * unsharded run of the same spec: per-sample random streams (SampleStreams) make each sample's
 * values independent of which process, batch or part drew it, so the union of shards, or an
 * interrupted run completed later, must equal it value for value (exact equality of doubles).
 */
class PartsAndShardsTest {
    @TempDir
    Path dir;

    private static final ObjectMapper JSON = new ObjectMapper();

    /** 23 samples in parts of 4: six parts, the last holding 3 samples. */
    private RunSpec spec(String folder) throws Exception {
        return TestRuns.spec(dir, TestRuns.yaml("float64", 777, 23, 4)).withOutputFolder(dir.resolve(folder));
    }

    private static void assertSameValues(TestRuns.Recorder a, TestRuns.Recorder b, String what) {
        assertEquals(a.q.size(), b.q.size(), what + ": samples");
        for (int s = 0; s < a.q.size(); s++) {
            assertArrayEquals(a.q.get(s), b.q.get(s), what + ": q of sample " + s);
            assertArrayEquals(a.e.get(s), b.e.get(s), what + ": e of sample " + s);
            for (Field f : a.values.keySet()) {
                assertArrayEquals(a.values.get(f).get(s), b.values.get(f).get(s), what + ": " + f + " of sample " + s);
            }
        }
    }

    private static List<String> files(Path folder) throws IOException {
        try (Stream<Path> s = Files.walk(folder)) {
            return s.filter(Files::isRegularFile).map(p -> folder.relativize(p).toString()).sorted()
                .collect(Collectors.toList());
        }
    }

    @Test
    void partsAreWrittenAsADirectoryOfPartFilesAndReadBackInSampleOrder() throws Exception {
        RunSpec spec = spec("whole");
        TestRuns.Recorder written = TestRuns.write(spec);
        Dataset d = Dataset.open(spec.outputFolder());
        assertEquals(6, d.partCount());
        assertEquals(4, d.partSamples());
        assertTrue(files(spec.outputFolder()).containsAll(List.of("amplitudes/part-00005.parquet", "fields/part-00005.parquet")));
        // Batches of 5 straddle the parts of 4.
        assertSameValues(written, TestRuns.replay(d, 5), "replay");
        for (long s : new long[] {0, 3, 4, 21, 22}) {
            assertArrayEquals(written.values.get(Field.E).get((int) s), d.sample(s, Field.E), "sample " + s);
        }
        JsonNode m = JSON.readTree(spec.outputFolder().resolve(Layout.MANIFEST).toFile());
        assertEquals(4, m.get("part_samples").asInt());
        assertEquals(6, m.get("part_count").asInt());
        assertEquals(2 + 2 * 6, m.get("files").size());
        Map<String, String> footer = d.footer("fields/part-00005.parquet");
        assertEquals("5", footer.get(Layout.KEY_PART));
        assertEquals("20", footer.get(Layout.KEY_FIRST_SAMPLE));
        assertEquals("3", footer.get(Layout.KEY_SAMPLES_IN_PART));
        assertEquals(List.of(), Dataset.problems(d.folder()));
    }

    @Test
    void shardsCoverEveryPartOnceInContiguousBlocks() {
        for (int parts = 1; parts <= 40; parts++) {
            for (int n = 1; n <= 12; n++) {
                int expect = 0;
                for (int i = 0; i < n; i++) {
                    Shard s = new Shard(i, n);
                    assertEquals(expect, s.firstPart(parts), s + " of " + parts + " parts starts where the last ended");
                    int size = s.endPart(parts) - s.firstPart(parts);
                    assertTrue(size == parts / n || size == parts / n + 1, s + " of " + parts + ": block of " + size);
                    expect = s.endPart(parts);
                }
                assertEquals(parts, expect, n + " shards of " + parts + " parts end at the last part");
            }
        }
        assertEquals(new Shard(3, 8), Shard.parse(" 3 / 8 "));
        for (String bad : new String[] {"8/8", "1/0", "-1/4", "a/b", "3", "", "1/2/3"}) {
            assertThrows(IllegalArgumentException.class, () -> Shard.parse(bad), bad);
        }
    }

    @Test
    void theUnionOfShardsEqualsTheUnshardedRunAndTheLastShardWritesTheManifest() throws Exception {
        TestRuns.Recorder whole = TestRuns.write(spec("whole"));
        RunSpec sharded = spec("sharded");
        ModeTable table = TestRuns.table(sharded);
        List<DatasetWriter.Outcome> outcomes = new ArrayList<>();
        int[] order = {2, 0, 3, 1};
        for (int i : order) {
            RunSpec s = sharded.withShard(new Shard(i, 4));
            try (DatasetWriter w = DatasetWriter.create(s, table, false)) {
                assertEquals(new Shard(i, 4).firstPart(6), w.plan().firstPart());
                for (DatasetWriter.Range r : w.plan().pending()) {
                    EnsembleRunner.run(new EnsembleRunner.Plan(table, s.allPoints(), s.fields(), s.seed(), r.firstSample(),
                        r.sampleCount(), 1), w.batches(), null);
                }
                w.finish();
                outcomes.add(w.outcome());
            }
            assertEquals(i == 1, Files.exists(sharded.outputFolder().resolve(Layout.MANIFEST)), "manifest after shard " + i);
        }
        assertEquals(List.of(DatasetWriter.Outcome.WAITING, DatasetWriter.Outcome.WAITING, DatasetWriter.Outcome.WAITING,
            DatasetWriter.Outcome.COMPLETED), outcomes);
        Dataset d = Dataset.open(sharded.outputFolder());
        assertSameValues(whole, TestRuns.replay(d, 7), "4 shards vs unsharded");
        assertEquals(List.of(), Dataset.problems(d.folder()));
        JsonNode a = JSON.readTree(dir.resolve("whole").resolve(Layout.MANIFEST).toFile());
        JsonNode b = JSON.readTree(d.folder().resolve(Layout.MANIFEST).toFile());
        assertEquals(a.get("run_key"), b.get("run_key"));
        for (int f = 0; f < a.get("files").size(); f++) {
            assertEquals(a.get("files").get(f).get("name"), b.get("files").get(f).get("name"));
            assertEquals(a.get("files").get(f).get("rows"), b.get("files").get(f).get("rows"));
        }
        // Every footer key-value pair equal, file by file (the spec text is the same: the shard came from outside it).
        Dataset w = Dataset.open(dir.resolve("whole"));
        for (String name : Dataset.requiredFiles(6)) {
            assertEquals(w.footer(name), d.footer(name), name);
        }
    }

    @Test
    void anInterruptedRunResumesWithTheMissingPartsOnly() throws Exception {
        TestRuns.Recorder whole = TestRuns.write(spec("whole"));
        RunSpec spec = spec("resumed");
        ModeTable table = TestRuns.table(spec);
        // Fail in the middle of part 2 (samples 8..11): parts 0 and 1 are finished.
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            EnsembleSink failing = new EnsembleSink() {
                @Override
                public void accept(SampleBatch batch) throws IOException {
                    w.accept(TestRuns.head(batch, 10));
                    throw new IllegalStateException("simulated crash at sample 10");
                }

                @Override
                public void finish() {
                }
            };
            assertThrows(IllegalStateException.class, () -> EnsembleRunner.run(TestRuns.plan(spec, table), failing, null));
        }
        assertFalse(Files.exists(spec.outputFolder().resolve(Layout.MANIFEST)));
        assertTrue(files(spec.outputFolder()).stream().noneMatch(f -> f.endsWith(".tmp")), "temporary files removed");
        // A temporary file of a killed process (no close) is left behind; the resume removes it.
        Path stale = spec.outputFolder().resolve("fields/.part-00002.parquet.99999-1-1.tmp");
        Files.writeString(stale, "half a part");

        DatasetWriter.Plan plan = DatasetWriter.plan(spec, table, false);
        assertTrue(plan.resuming());
        assertEquals(List.of(2, 3, 4, 5), plan.pendingParts());
        assertEquals(List.of(new DatasetWriter.Range(8, 15)), plan.pending());
        TestRuns.Recorder rest = TestRuns.write(spec, table, false);
        assertEquals(8, rest.first);
        assertFalse(Files.exists(stale));
        assertSameValues(whole, TestRuns.replay(Dataset.open(spec.outputFolder()), 23), "resumed vs uninterrupted");
        assertEquals(List.of(), Dataset.problems(spec.outputFolder()));

        // Again: complete, nothing to do.
        DatasetWriter.Plan done = DatasetWriter.plan(spec, table, false);
        assertTrue(done.complete());
        assertEquals(List.of(), done.pending());
    }

    @Test
    void anotherSpecInAnIncompleteFolderIsRefusedNamingTheFolder() throws Exception {
        RunSpec spec = spec("x");
        ModeTable table = TestRuns.table(spec);
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            // Opened and abandoned: the run key is published, no part is done.
        }
        RunSpec other = TestRuns.spec(dir, TestRuns.yaml("float64", 778, 23, 4)).withOutputFolder(dir.resolve("x"));
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> DatasetWriter.plan(other, TestRuns.table(other), false));
        assertTrue(ex.getMessage().startsWith("output.folder") && ex.getMessage().contains("incomplete run of another spec"),
            ex.getMessage());
        RunSpec moreSamples = spec.withSamples(24);
        assertThrows(IllegalArgumentException.class, () -> DatasetWriter.plan(moreSamples, table, false));
        IllegalArgumentException shardOverwrite = assertThrows(IllegalArgumentException.class,
            () -> DatasetWriter.plan(spec.withShard(new Shard(1, 2)), table, true));
        assertTrue(shardOverwrite.getMessage().contains("--overwrite"), shardOverwrite.getMessage());
        assertTrue(DatasetWriter.plan(other, TestRuns.table(other), true).pendingParts().size() == 6, "overwrite replaces it");
    }

    @Test
    void temporaryNamesAreHiddenFromDirectoryReadersAndGlobs() throws Exception {
        RunSpec spec = spec("t");
        ModeTable table = TestRuns.table(spec);
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            EnsembleRunner.run(new EnsembleRunner.Plan(table, spec.allPoints(), spec.fields(), spec.seed(), 0, 2, 1),
                w.batches(), null);
            List<String> open = files(spec.outputFolder().resolve(Layout.FIELDS));
            assertEquals(1, open.size(), open.toString());
            // pyarrow/pandas/Spark skip names starting with '.' (common practice for dataset
            // directories); a *.parquet glob (DuckDB) does not match the .tmp suffix.
            assertTrue(open.get(0).startsWith(".part-00000.parquet.") && open.get(0).endsWith(".tmp"), open.toString());
        }
        assertEquals(List.of(), files(spec.outputFolder().resolve(Layout.FIELDS)), "closed without finishing: removed");
    }

    @Test
    void aNonFiniteAmplitudeStopsTheRunNamingModeAndSample() throws Exception {
        RunSpec spec = spec("nan");
        ModeTable table = TestRuns.table(spec);
        int m = table.size();
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            double[][] q = new double[2][m];
            double[][] e = new double[2][m];
            e[1][3] = Double.POSITIVE_INFINITY;
            Map<Field, double[][]> v = Map.of(Field.A, new double[2][54], Field.E, new double[2][54], Field.B, new double[2][54]);
            IllegalStateException ex = assertThrows(IllegalStateException.class, () -> w.accept(new SampleBatch(0, q, e, v)));
            assertTrue(ex.getMessage().contains("mode " + table.modes().get(3).label()) && ex.getMessage().contains("sample 1"),
                ex.getMessage());
        }
        assertEquals(List.of(), files(spec.outputFolder().resolve(Layout.FIELDS)));
    }

    @Test
    void aModeWithANonFiniteVarianceIsRefusedBeforeAnythingIsWritten() throws Exception {
        // At 1e308 K, x = ħω/2kT ≈ 1e-310 for the 0.3 GHz modes: coth x ≈ 1/x ≈ 1e310 overflows to +∞.
        RunSpec hot = TestRuns.spec(dir, TestRuns.yaml("float64", 1, 3).replace("fields:",
            "state: {kind: thermal, temperature_K: 1.0e308}\nfields:"));
        ModeTable table = TestRuns.table(hot);
        IllegalStateException ex = assertThrows(IllegalStateException.class, () -> DatasetWriter.plan(hot, table, false));
        assertTrue(ex.getMessage().startsWith("mode " + table.modes().get(0).label()), ex.getMessage());
        assertFalse(Files.exists(hot.outputFolder()));
    }

    @Test
    void theDefaultPartKeepsTheLargerTableNearTheTargetSize() throws Exception {
        // 4 x 5 x 50 = 1000 points, fields A, E, B in float64: 12 + 72 = 84 raw bytes a row.
        String yaml = TestRuns.yaml("float64", 1, 1_000_000).replace("n: [3, 2, 2]", "n: [4, 5, 50]");
        RunSpec spec = TestRuns.spec(dir, yaml);
        ModeTable table = TestRuns.table(spec);
        long perSample = Math.max(28L * table.size(), 84L * spec.allPoints().size());
        long part = DatasetWriter.plan(spec, table, false).partSamples();
        assertTrue(part * perSample <= Layout.TARGET_PART_BYTES && (part + 1) * perSample > Layout.TARGET_PART_BYTES,
            "part of " + part + " samples x " + perSample + " bytes");
        // 100-300 MB raw: the size the layout aims at (a common choice for Parquet files of a dataset).
        assertTrue(part * perSample > 100e6 && part * perSample < 300e6);
        RunSpec tiny = TestRuns.spec(dir, TestRuns.yaml("float64", 1, 3));
        assertEquals(3, DatasetWriter.plan(tiny, TestRuns.table(tiny), false).partSamples(), "never more than the run");
    }

    @Test
    void resourceLimitsRefuseARunWithTheEstimateAndWriteNothing() throws Exception {
        RunSpec spec = TestRuns.spec(dir, TestRuns.yaml("float64", 1, 1_000_000) + "limits: {max_output_GB: 0.5}\n");
        ModeTable table = TestRuns.table(spec);
        DatasetWriter.Plan plan = DatasetWriter.plan(spec, table, false);
        // Raw bound: 1e6 samples x (28 x M + 84 x 18) bytes x 1.05, above 0.5 GB for M of about 33.
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> ResourceGuard.check(plan, spec, table, true));
        assertTrue(ex.getMessage().startsWith("limits.max_output_GB = 0.5: the dataset may need up to"), ex.getMessage());
        RunSpec mem = TestRuns.spec(dir, TestRuns.yaml("float64", 1, 10) + "limits: {max_memory_GB: 0.01}\n");
        IllegalArgumentException m = assertThrows(IllegalArgumentException.class,
            () -> ResourceGuard.check(DatasetWriter.plan(mem, table, false), mem, table, true));
        assertTrue(m.getMessage().startsWith("limits.max_memory_GB = 0.01"), m.getMessage());
        RunSpec huge = TestRuns.spec(dir, TestRuns.yaml("float64", 1, 1_000_000_000));
        IllegalArgumentException disk = assertThrows(IllegalArgumentException.class,
            () -> ResourceGuard.check(DatasetWriter.plan(huge, table, false), huge, table, true));
        assertTrue(disk.getMessage().startsWith("output.folder") && disk.getMessage().contains("free"), disk.getMessage());
        assertFalse(Files.exists(spec.outputFolder()));
    }
}
