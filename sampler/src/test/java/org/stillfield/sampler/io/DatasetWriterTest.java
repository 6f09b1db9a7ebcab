package org.stillfield.sampler.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
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

/** Output-folder rules: refuse, replace only when complete, leave nothing after a failure. */
class DatasetWriterTest {
    @TempDir
    Path dir;

    private static List<String> names(Path folder) throws IOException {
        try (Stream<Path> s = Files.list(folder)) {
            return s.map(p -> p.getFileName().toString()).sorted().collect(Collectors.toList());
        }
    }

    @Test
    void refusesAnExistingNonEmptyFolderWithoutOverwrite() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        Files.createDirectories(spec.outputFolder());
        Files.writeString(spec.outputFolder().resolve("notes.txt"), "keep me");
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> DatasetWriter.create(spec, TestRuns.table(spec), false));
        assertEquals("output.folder already exists: " + spec.outputFolder()
            + "; choose another folder or pass --overwrite", ex.getMessage());
        // Not a dataset, so not replaced even with overwrite.
        IllegalArgumentException notDataset = assertThrows(IllegalArgumentException.class,
            () -> DatasetWriter.create(spec, TestRuns.table(spec), true));
        assertTrue(notDataset.getMessage().startsWith("output.folder"), notDataset.getMessage());
        assertEquals(List.of("notes.txt"), names(spec.outputFolder()));
        assertEquals(List.of("t"), names(spec.outputFolder().getParent()), "no staging folder left behind");
    }

    @Test
    void writesIntoAnExistingEmptyFolder() throws Exception {
        RunSpec spec = TestRuns.spec(dir, TestRuns.yaml("float64", 3, 4));
        Files.createDirectories(spec.outputFolder());
        TestRuns.write(spec);
        assertEquals(List.of(), Dataset.problems(spec.outputFolder()));
    }

    @Test
    void overwriteReplacesADatasetOnlyOnceTheNewOneIsComplete() throws Exception {
        RunSpec first = TestRuns.spec(dir, TestRuns.yaml("float64", 1, 4));
        RunSpec second = TestRuns.spec(dir, TestRuns.yaml("float64", 2, 4));
        TestRuns.Recorder old = TestRuns.write(first);
        ModeTable table = TestRuns.table(second);
        assertThrows(IllegalArgumentException.class, () -> DatasetWriter.create(second, table, false));

        // A failed overwrite leaves the old dataset untouched.
        try (DatasetWriter w = DatasetWriter.create(second, table, true)) {
            assertThrows(IllegalStateException.class,
                () -> EnsembleRunner.run(TestRuns.plan(second, table), new FailAfterFirstBatch(w), null));
        }
        TestRuns.Recorder kept = TestRuns.replay(Dataset.open(first.outputFolder()), 10);
        assertEquals(old.q.get(0)[0], kept.q.get(0)[0], 0.0, "old dataset still in place after a failed overwrite");

        TestRuns.Recorder fresh = TestRuns.write(second, table, true);
        Dataset d = Dataset.open(second.outputFolder());
        assertEquals("2", d.footer(Layout.MODES).get(Layout.KEY_SEED));
        assertEquals(fresh.q.get(0)[0], TestRuns.replay(d, 10).q.get(0)[0], 0.0);
        assertEquals(List.of("t"), names(dir.resolve("out")), "no staging or old folder left behind");
    }

    /** Forwards the first batch, then fails as a run would on e.g. a full disk. */
    private static final class FailAfterFirstBatch implements EnsembleSink {
        private final EnsembleSink inner;

        FailAfterFirstBatch(EnsembleSink inner) {
            this.inner = inner;
        }

        @Override
        public void accept(SampleBatch batch) throws IOException {
            inner.accept(batch);
            throw new IllegalStateException("simulated failure after sample " + batch.firstSample());
        }

        @Override
        public void finish() throws IOException {
            inner.finish();
        }
    }

    @Test
    void aFailedRunLeavesNeitherTargetNorStagingFolder() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        ModeTable table = TestRuns.table(spec);
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            assertThrows(IllegalStateException.class,
                () -> EnsembleRunner.run(TestRuns.plan(spec, table), new FailAfterFirstBatch(w), null));
        }
        assertFalse(Files.exists(spec.outputFolder()));
        assertEquals(List.of(), names(dir.resolve("out")), "staging folder removed");
    }

    @Test
    void closingWithoutFinishOrWithTooFewSamplesLeavesNothing() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        ModeTable table = TestRuns.table(spec);
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            // Staging exists while writing, hidden from the target's name.
            assertEquals(1, names(dir.resolve("out")).size());
            assertTrue(names(dir.resolve("out")).get(0).startsWith(".t.partial-"), names(dir.resolve("out")).toString());
        }
        assertEquals(List.of(), names(dir.resolve("out")));

        RunSpec fewer = spec.withSamples(10);
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            // The engine delivers 10 samples, the writer's spec asks for 50.
            IllegalStateException ex = assertThrows(IllegalStateException.class,
                () -> EnsembleRunner.run(TestRuns.plan(fewer, table), w, null));
            assertTrue(ex.getMessage().contains("samples = 50"), ex.getMessage());
        }
        assertEquals(List.of(), names(dir.resolve("out")));
    }

    @Test
    void rejectsBatchesOutOfOrder() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        ModeTable table = TestRuns.table(spec);
        int m = table.size();
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            SampleBatch late = new SampleBatch(5, new double[1][m], new double[1][m],
                Map.of(Field.A, new double[1][54], Field.E, new double[1][54], Field.B, new double[1][54]));
            IllegalStateException ex = assertThrows(IllegalStateException.class, () -> w.accept(late));
            assertTrue(ex.getMessage().contains("expected 0"), ex.getMessage());
            assertThrows(IllegalStateException.class, w::finish, "a failed writer cannot be finished");
        }
        assertEquals(List.of(), names(dir.resolve("out")));
    }

    @Test
    void refusesAnOutputFolderUnderAFile() throws Exception {
        Files.writeString(dir.resolve("out"), "a file where a folder should be");
        RunSpec spec = TestRuns.spec(dir);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> DatasetWriter.create(spec, TestRuns.table(spec), false));
        assertTrue(ex.getMessage().startsWith("output.folder"), ex.getMessage());
    }

    @Test
    void writingAndReadingPrintNothing() throws Exception {
        RunSpec spec = TestRuns.spec(dir, TestRuns.yaml("float32", 8, 5));
        PrintStream out = System.out;
        PrintStream err = System.err;
        ByteArrayOutputStream captured = new ByteArrayOutputStream();
        PrintStream sink = new PrintStream(captured, true, StandardCharsets.UTF_8);
        try {
            System.setOut(sink);
            System.setErr(sink);
            TestRuns.write(spec);
            Dataset d = Dataset.open(spec.outputFolder());
            TestRuns.replay(d, 2);
            d.sample(4, Field.B);
            d.footer(Layout.FIELDS);
            Dataset.problems(spec.outputFolder());
        } finally {
            System.setOut(out);
            System.setErr(err);
        }
        assertEquals("", captured.toString(StandardCharsets.UTF_8), "Parquet/Hadoop/SLF4J output during I/O");
    }
}
