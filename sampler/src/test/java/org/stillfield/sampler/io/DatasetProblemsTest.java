package org.stillfield.sampler.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.io.RandomAccessFile;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.security.MessageDigest;
import java.util.HexFormat;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.spec.RunSpec;

/** {@link Dataset#problems(Path)} finds damage; {@link Dataset#open(Path)} refuses the obvious kinds. */
class DatasetProblemsTest {
    @TempDir
    Path dir;

    private static final ObjectMapper JSON = new ObjectMapper();

    private Path written(String name) throws Exception {
        RunSpec spec = TestRuns.spec(dir, TestRuns.yaml("float64", 4, 10)).withOutputFolder(dir.resolve(name));
        TestRuns.write(spec);
        assertEquals(List.of(), Dataset.problems(spec.outputFolder()), "fresh dataset");
        return spec.outputFolder();
    }

    private static boolean mentions(List<String> problems, String... words) {
        return problems.stream().anyMatch(p -> {
            for (String w : words) {
                if (!p.contains(w)) {
                    return false;
                }
            }
            return true;
        });
    }

    @Test
    void findsATruncatedFile() throws Exception {
        Path folder = written("a");
        Path f = folder.resolve(TestRuns.FIELDS0);
        long size = Files.size(f);
        try (RandomAccessFile raf = new RandomAccessFile(f.toFile(), "rw")) {
            raf.setLength(size - 10);
        }
        List<String> problems = Dataset.problems(folder);
        assertTrue(mentions(problems, "fields/part-00000.parquet", "bytes"), problems.toString());
        assertTrue(mentions(problems, "fields/part-00000.parquet", "SHA-256"), problems.toString());
        assertTrue(mentions(problems, "fields/part-00000.parquet", "Parquet"), problems.toString());
        IOException ex = assertThrows(IOException.class, () -> Dataset.open(folder));
        assertTrue(ex.getMessage().contains("fields/part-00000.parquet"), ex.getMessage());
    }

    @Test
    void findsAChangedByteOfTheSameSize() throws Exception {
        Path folder = written("b");
        Path f = folder.resolve(TestRuns.AMPLITUDES0);
        try (RandomAccessFile raf = new RandomAccessFile(f.toFile(), "rw")) {
            raf.seek(Files.size(f) / 3);
            int b = raf.read();
            raf.seek(Files.size(f) / 3);
            raf.write(b ^ 0x40);
        }
        List<String> problems = Dataset.problems(folder);
        assertEquals(1, problems.size(), problems.toString());
        assertTrue(mentions(problems, "amplitudes/part-00000.parquet", "SHA-256"), problems.toString());
    }

    @Test
    void findsMissingFilesAndWrongRowCounts() throws Exception {
        Path folder = written("c");
        Files.delete(folder.resolve(Layout.POINTS));
        ObjectNode m = (ObjectNode) JSON.readTree(folder.resolve(Layout.MANIFEST).toFile());
        ((ObjectNode) m.get("files").get(2)).put("rows", 7);
        JSON.writeValue(folder.resolve(Layout.MANIFEST).toFile(), m);
        List<String> problems = Dataset.problems(folder);
        assertTrue(mentions(problems, "points.parquet: missing"), problems.toString());
        assertTrue(mentions(problems, "amplitudes/part-00000.parquet", "rows", "says 7"), problems.toString());
        assertThrows(IOException.class, () -> Dataset.open(folder));

        Files.delete(folder.resolve(Layout.MANIFEST));
        assertEquals(1, Dataset.problems(folder).size());
        assertThrows(IOException.class, () -> Dataset.open(folder));
    }

    @Test
    void findsFootersThatDisagreeAboutTheSpec() throws Exception {
        Path a = written("d");
        // Same modes and samples, another analysis setting: the mode table's data are the same, its
        // footer holds a spec of another run key.
        RunSpec other = TestRuns.spec(dir, TestRuns.yaml("float64", 4, 10) + "analysis: {false_alarm: 0.02}\n")
            .withOutputFolder(dir.resolve("e"));
        TestRuns.write(other);
        Path modes = a.resolve(Layout.MODES);
        Files.copy(other.outputFolder().resolve(Layout.MODES), modes, StandardCopyOption.REPLACE_EXISTING);
        ObjectNode m = (ObjectNode) JSON.readTree(a.resolve(Layout.MANIFEST).toFile());
        ObjectNode entry = (ObjectNode) m.get("files").get(0);
        assertEquals(Layout.MODES, entry.get("name").asText());
        entry.put("bytes", Files.size(modes));
        entry.put("sha256", HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(Files.readAllBytes(modes))));
        JSON.writeValue(a.resolve(Layout.MANIFEST).toFile(), m);
        List<String> problems = Dataset.problems(a);
        assertEquals(2, problems.size(), problems.toString());
        assertTrue(problems.stream().allMatch(p -> p.startsWith("modes.parquet: footer")), problems.toString());
        assertTrue(mentions(problems, "another spec"), problems.toString());
        assertTrue(mentions(problems, "stillfield.run_key"), problems.toString());
    }

    @Test
    void aCommentInTheSpecIsNoOtherRun() throws Exception {
        // The run key covers the spec's settings, not its comments or layout (Layout.runKey).
        String yaml = TestRuns.yaml("float64", 4, 10);
        assertEquals(Layout.runKey(yaml, 10, 10), Layout.runKey("# edited\n" + yaml.replace("threads: 1", "threads: 2"), 10, 10));
        assertNotEquals(Layout.runKey(yaml, 10, 10), Layout.runKey(yaml.replace("seed: 4", "seed: 5"), 10, 10));
        assertNotEquals(Layout.runKey(yaml, 10, 10), Layout.runKey(yaml, 11, 10), "sample count overridden");
        assertNotEquals(Layout.runKey(yaml, 10, 10), Layout.runKey(yaml, 10, 5), "part size");
        assertEquals(Layout.runKey(yaml, 10, 10), Layout.runKey(yaml.replace("folder: out/t", "folder: elsewhere, shard: '1/4'"),
            10, 10), "folder and shard say where, not what");
    }

    @Test
    void refusesManifestEntriesOutsideTheFolder() throws Exception {
        Path folder = written("g");
        ObjectNode m = (ObjectNode) JSON.readTree(folder.resolve(Layout.MANIFEST).toFile());
        ((com.fasterxml.jackson.databind.node.ArrayNode) m.get("files")).addObject().put("name", "../a/manifest.json")
            .put("rows", 0).put("bytes", 1).put("sha256", "0");
        JSON.writeValue(folder.resolve(Layout.MANIFEST).toFile(), m);
        IOException ex = assertThrows(IOException.class, () -> Dataset.open(folder));
        assertTrue(ex.getMessage().contains("outside the folder"), ex.getMessage());
        List<String> problems = Dataset.problems(folder);
        assertEquals(1, problems.size(), problems.toString());
        assertTrue(mentions(problems, "invalid file name"), problems.toString());
    }

    @Test
    void ignoresFilesTheManifestDoesNotList() throws Exception {
        Path folder = written("f");
        Files.writeString(folder.resolve("README.txt"), "notes");
        assertEquals(List.of(), Dataset.problems(folder));
        assertEquals(10, Dataset.open(folder).samples());
    }
}
