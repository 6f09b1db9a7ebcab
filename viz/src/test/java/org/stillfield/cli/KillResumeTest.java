package org.stillfield.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.io.Dataset;

/**
 * A real {@code stillfield sample} process killed with SIGKILL once at least one part is on disk,
 * then the same command again: the second run writes only the missing parts, and the dataset
 * equals an uninterrupted run value for value. The reference is that independent run, and the
 * per-sample random streams are why the two must agree exactly.
 */
class KillResumeTest {
    private static final ObjectMapper JSON = new ObjectMapper();

    /** 184 modes, 6 x 1 x 8 grid plus a line: about 60 parts of 10 samples, a few seconds in all. */
    private static final String SPEC = "name: kill\n"
        + "cavity: {shape: box, a_m: 0.03, b_m: 0.02, d_m: 0.04}\n"
        + "fields: [E, B]\n"
        + "window: {kind: hard, cutoff_GHz: 30}\n"
        + "samples: 600\nseed: 5\n"
        + "evaluate:\n"
        + "  lines:\n    - {name: axis, from: [0.015, 0.01, 0.0], to: [0.015, 0.01, 0.04], n: 9}\n"
        + "  grids:\n    - {name: xs, n: [6, 1, 8]}\n"
        + "output: {part_samples: 10}\n"
        + "threads: 1\n";

    private static int cli(String... args) {
        StringWriter o = new StringWriter();
        StringWriter e = new StringWriter();
        return Main.execute(new PrintWriter(o, true), new PrintWriter(e, true), args);
    }

    private static long count(Path dir, String glob) throws IOException {
        if (!Files.isDirectory(dir)) {
            return 0;
        }
        try (Stream<Path> s = Files.list(dir)) {
            return s.filter(p -> dir.getFileSystem().getPathMatcher("glob:" + glob).matches(p.getFileName())).count();
        }
    }

    /** Every sample's q, e and field values, in order. */
    private static List<double[]> values(Path folder) throws IOException {
        List<double[]> out = new ArrayList<>();
        Dataset.open(folder).replay(new EnsembleSink() {
            @Override
            public void accept(SampleBatch b) {
                for (int s = 0; s < b.size(); s++) {
                    out.add(b.q(s).clone());
                    out.add(b.e(s).clone());
                    for (Field f : b.fields()) {
                        out.add(b.values(f, s).clone());
                    }
                }
            }

            @Override
            public void finish() {
            }
        }, 64);
        return out;
    }

    private static Map<String, String> shaByFile(Path folder) throws IOException {
        Map<String, String> m = new HashMap<>();
        for (JsonNode f : JSON.readTree(folder.resolve("manifest.json").toFile()).get("files")) {
            m.put(f.get("name").asText(), f.get("sha256").asText());
        }
        return m;
    }

    @Test
    void aKilledRunResumesToTheUninterruptedResult(@TempDir Path tmp) throws Exception {
        Path spec = tmp.resolve("kill.yaml");
        Files.writeString(spec, SPEC, StandardCharsets.UTF_8);
        Path out = tmp.resolve("killed");
        Path java = Path.of(System.getProperty("java.home"), "bin", "java");
        ProcessBuilder pb = new ProcessBuilder(java.toString(), "-cp", System.getProperty("java.class.path"),
            "org.stillfield.cli.Main", "sample", spec.toString(), "--output", out.toString())
            .redirectErrorStream(true).redirectOutput(tmp.resolve("child.log").toFile());
        Process child = pb.start();
        Path records = out.resolve(".stillfield/parts");
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(120);
        try {
            while (count(records, "part-*.json") < 1 && child.isAlive() && System.nanoTime() < deadline) {
                Thread.sleep(10);
            }
        } finally {
            child.destroyForcibly();
            child.waitFor(30, TimeUnit.SECONDS);
        }
        String log = Files.readString(tmp.resolve("child.log"));
        long done = count(records, "part-*.json");
        assertTrue(done >= 1, "no part finished before the kill; child log: " + log);
        assertFalse(Files.exists(out.resolve("manifest.json")),
            "the child finished all 60 parts before it was killed (" + done + " records); make the run longer. Log: " + log);
        assertEquals(137, child.exitValue(), "killed by SIGKILL (128 + 9)");
        Map<String, String> before = new HashMap<>();
        for (int k = 0; k < done; k++) {
            JsonNode r = JSON.readTree(records.resolve(String.format("part-%05d.json", k)).toFile());
            for (JsonNode f : r.get("files")) {
                before.put(f.get("name").asText(), f.get("sha256").asText());
            }
        }

        assertEquals(0, cli("sample", spec.toString(), "--output", out.toString()), "resume");
        assertEquals(0, count(out.resolve("fields"), ".*.tmp") + count(out.resolve("amplitudes"), ".*.tmp"),
            "temporary files of the killed process removed");
        assertEquals(0, cli("verify", out.toString()));
        Map<String, String> after = shaByFile(out);
        for (Map.Entry<String, String> e : before.entrySet()) {
            assertEquals(e.getValue(), after.get(e.getKey()), e.getKey() + " was finished before the kill and kept as it was");
        }

        Path whole = tmp.resolve("whole");
        assertEquals(0, cli("sample", spec.toString(), "--output", whole.toString()), "uninterrupted run");
        List<double[]> a = values(whole);
        List<double[]> b = values(out);
        assertEquals(a.size(), b.size());
        for (int i = 0; i < a.size(); i++) {
            assertArrayEquals(a.get(i), b.get(i), "array " + i + " (q, e, E, B per sample)");
        }
        assertEquals(JSON.readTree(whole.resolve("manifest.json").toFile()).get("run_key"),
            JSON.readTree(out.resolve("manifest.json").toFile()).get("run_key"));
        Dataset dw = Dataset.open(whole);
        Dataset dk = Dataset.open(out);
        assertEquals(dw.partCount(), dk.partCount());
        for (int k = 0; k < dw.partCount(); k++) {
            for (String f : dw.partFiles(k)) {
                assertEquals(dw.footer(f), dk.footer(f), f + " footer");
            }
        }
    }
}
