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
        assertTrue(ex.getMessage().startsWith("output.folder already exists and is not a dataset"), ex.getMessage());
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
    void anotherSpecIsRefusedAndOverwriteReplacesTheDataset() throws Exception {
        RunSpec first = TestRuns.spec(dir, TestRuns.yaml("float64", 1, 4));
        RunSpec second = TestRuns.spec(dir, TestRuns.yaml("float64", 2, 4, 2));
        TestRuns.write(first);
        ModeTable table = TestRuns.table(second);
        IllegalArgumentException other = assertThrows(IllegalArgumentException.class,
            () -> DatasetWriter.create(second, table, false));
        assertTrue(other.getMessage().startsWith("output.folder") && other.getMessage().contains("another spec")
            && other.getMessage().contains("--overwrite"), other.getMessage());

        // A failed overwrite has removed the old manifest first: the folder is no dataset, never half of one.
        try (DatasetWriter w = DatasetWriter.create(second, table, true)) {
            assertThrows(IllegalStateException.class,
                () -> EnsembleRunner.run(TestRuns.plan(second, table), new FailAfterFirstBatch(w, 3), null));
        }
        assertThrows(IOException.class, () -> Dataset.open(first.outputFolder()));
        assertEquals(List.of("part-00000.parquet"), names(second.outputFolder().resolve(Layout.AMPLITUDES)),
            "part 0 finished, part 1 (sample 2 written) removed");

        // The same spec again, without overwrite, continues where the failed run stopped.
        TestRuns.Recorder fresh = TestRuns.write(second, table, false);
        Dataset d = Dataset.open(second.outputFolder());
        assertEquals("2", d.footer(Layout.MODES).get(Layout.KEY_SEED));
        assertEquals(2, fresh.first, "only the missing part was drawn");
        assertEquals(fresh.q.get(0)[0], TestRuns.replay(d, 10).q.get(2)[0], 0.0);
        assertEquals(List.of("t"), names(dir.resolve("out")), "nothing left beside the dataset");
        assertEquals(List.of(), Dataset.problems(d.folder()));
    }

    /** Forwards the first samples of the first batch, then fails as a run would on e.g. a full disk. */
    private static final class FailAfterFirstBatch implements EnsembleSink {
        private final EnsembleSink inner;
        private final int samples;

        FailAfterFirstBatch(EnsembleSink inner) {
            this(inner, Integer.MAX_VALUE);
        }

        FailAfterFirstBatch(EnsembleSink inner, int samples) {
            this.inner = inner;
            this.samples = samples;
        }

        @Override
        public void accept(SampleBatch batch) throws IOException {
            inner.accept(TestRuns.head(batch, Math.min(samples, batch.size())));
            throw new IllegalStateException("simulated failure after sample " + batch.firstSample());
        }

        @Override
        public void finish() throws IOException {
            inner.finish();
        }
    }

    /** @return every file under a folder whose name marks it temporary or complete, relative */
    private static List<String> files(Path folder) throws IOException {
        try (Stream<Path> s = Files.walk(folder)) {
            return s.filter(Files::isRegularFile).map(p -> folder.relativize(p).toString()).sorted()
                .collect(Collectors.toList());
        }
    }

    @Test
    void aFailedRunLeavesNoManifestAndNoTemporaryFile() throws Exception {
        RunSpec spec = TestRuns.spec(dir, TestRuns.yaml("float64", 12345, 50, 10));
        ModeTable table = TestRuns.table(spec);
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            assertThrows(IllegalStateException.class,
                () -> EnsembleRunner.run(TestRuns.plan(spec, table), new FailAfterFirstBatch(w, 15), null));
        }
        assertEquals(List.of(".stillfield/parts/part-00000.json", ".stillfield/run.json", "amplitudes/part-00000.parquet",
            "fields/part-00000.parquet", "modes.parquet", "points.parquet"), files(spec.outputFolder()));
        IOException ex = assertThrows(IOException.class, () -> Dataset.open(spec.outputFolder()));
        assertTrue(ex.getMessage().contains("not a dataset"), ex.getMessage());
        List<String> problems = Dataset.problems(spec.outputFolder());
        assertTrue(problems.size() == 1 && problems.get(0).contains("1 of 5 parts present, missing part 1-4"),
            problems.toString());
    }

    @Test
    void closingWithoutFinishOrWithTooFewSamplesLeavesNoManifest() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        ModeTable table = TestRuns.table(spec);
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            assertEquals(List.of(0), w.plan().pendingParts());
        }
        assertFalse(Files.exists(spec.outputFolder().resolve(Layout.MANIFEST)));

        RunSpec fewer = spec.withSamples(10);
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            // The engine delivers 10 samples, the writer's part 0 holds 50.
            IllegalStateException ex = assertThrows(IllegalStateException.class,
                () -> EnsembleRunner.run(TestRuns.plan(fewer, table), w, null));
            assertTrue(ex.getMessage().contains("part 0"), ex.getMessage());
        }
        assertEquals(List.of(".stillfield/run.json", "modes.parquet", "points.parquet"), files(spec.outputFolder()));
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
        assertFalse(Files.exists(spec.outputFolder().resolve(Layout.MANIFEST)));
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
            d.footer(TestRuns.FIELDS0);
            Dataset.problems(spec.outputFolder());
        } finally {
            System.setOut(out);
            System.setErr(err);
        }
        assertEquals("", captured.toString(StandardCharsets.UTF_8), "Parquet/Hadoop/SLF4J output during I/O");
    }
}
