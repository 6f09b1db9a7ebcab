package org.stillfield.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Faults of the machine and of the numbers: an output folder that cannot be created or written,
 * a full disk, a non-finite variance. Each gives one line on stderr naming the folder or the mode,
 * exit 2 (detected before the run) or 3 (during it), and no manifest.
 *
 * <p>Tests run as root, which ignores permission bits, so "unwritable" is made two ways that bind
 * root too: a path under a regular file, and a read-only tmpfs. The tmpfs tests need mount(8) and
 * the right to use it; without them they are skipped with the reason.
 */
class FaultsTest {
    private static final String SPEC = "name: faults\n"
        + "cavity: {shape: box, a_m: 0.03, b_m: 0.02, d_m: 0.04}\n"
        + "fields: [E, B]\n"
        + "window: {kind: hard, cutoff_GHz: 30}\n"
        + "samples: 400\nseed: 3\n"
        + "evaluate:\n"
        + "  grids:\n    - {name: xs, n: [12, 1, 16]}\n"
        + "output: {part_samples: 100}\n"
        + "threads: 1\n";

    private record Result(int code, String out, String err) {
    }

    private static Result cli(String... args) {
        StringWriter o = new StringWriter();
        StringWriter e = new StringWriter();
        int code = Main.execute(new PrintWriter(o, true), new PrintWriter(e, true), args);
        return new Result(code, o.toString(), e.toString());
    }

    private static Path spec(Path dir, String text) throws IOException {
        Path p = dir.resolve("faults.yaml");
        Files.writeString(p, text, StandardCharsets.UTF_8);
        return p;
    }

    private static void oneLine(Result r, int code, String... words) {
        String err = r.err().strip();
        assertEquals(code, r.code(), "exit code; stderr: " + err);
        assertEquals(1, err.lines().count(), "one line: " + err);
        assertTrue(err.startsWith("stillfield: ") && !err.contains("\tat "), err);
        for (String w : words) {
            assertTrue(err.contains(w), "names '" + w + "': " + err);
        }
    }

    private static List<String> files(Path folder) throws IOException {
        if (!Files.exists(folder)) {
            return List.of();
        }
        try (Stream<Path> s = Files.walk(folder)) {
            return s.filter(Files::isRegularFile).map(p -> folder.relativize(p).toString()).sorted().collect(Collectors.toList());
        }
    }

    private static int sh(String... cmd) throws IOException, InterruptedException {
        Process p = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        if (!p.waitFor(30, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            return -1;
        }
        return p.exitValue();
    }

    /** Mounts a tmpfs of the given size, or skips the test saying why it cannot. */
    private static void mountTmpfs(Path at, String size) throws Exception {
        Assumptions.assumeTrue(System.getProperty("os.name").startsWith("Linux"), "tmpfs needs Linux");
        Assumptions.assumeTrue("root".equals(System.getProperty("user.name")), "mounting a tmpfs needs root");
        Files.createDirectories(at);
        int rc;
        try {
            rc = sh("mount", "-t", "tmpfs", "-o", "size=" + size, "tmpfs", at.toString());
        } catch (IOException ex) {
            rc = -1;
        }
        Assumptions.assumeTrue(rc == 0, "mount -t tmpfs failed here (exit " + rc + "): no permission to mount");
    }

    @Test
    void anOutputFolderUnderARegularFileIsRefused(@TempDir Path tmp) throws IOException {
        Path file = tmp.resolve("a-file");
        Files.writeString(file, "not a folder");
        Result r = cli("sample", spec(tmp, SPEC).toString(), "--output", file.resolve("out").toString());
        oneLine(r, 2, "output.folder", file.toString());
        assertEquals("not a folder", Files.readString(file));
    }

    @Test
    void aReadOnlyFileSystemIsRefusedNamingTheFolder(@TempDir Path tmp) throws Exception {
        Path mnt = tmp.resolve("ro");
        mountTmpfs(mnt, "4m");
        try {
            assertEquals(0, sh("mount", "-o", "remount,ro", mnt.toString()), "remount read-only");
            Result r = cli("sample", spec(tmp, SPEC).toString(), "--output", mnt.resolve("out").toString());
            oneLine(r, 2, "output.folder", mnt.toString());
            assertEquals(List.of(), files(mnt));
        } finally {
            sh("umount", mnt.toString());
        }
    }

    @Test
    void aFullDiskStopsTheRunWithExitThreeAndNoManifest(@TempDir Path tmp) throws Exception {
        Path mnt = tmp.resolve("small");
        // 400 samples x (184 modes x 28 + 192 points x 60) raw bytes ≈ 6.7 MB do not fit in 1 MB.
        mountTmpfs(mnt, "1m");
        try {
            Path out = mnt.resolve("out");
            Result guarded = cli("sample", spec(tmp, SPEC).toString(), "--output", out.toString());
            oneLine(guarded, 2, "output.folder", "free");
            assertFalse(Files.exists(out), "the estimate refuses before anything is written");

            Result full = cli("sample", spec(tmp, SPEC).toString(), "--output", out.toString(), "--no-space-check");
            oneLine(full, 3, "no space left", out.toString());
            List<String> left = files(out);
            assertFalse(left.contains("manifest.json"), left.toString());
            assertTrue(left.stream().noneMatch(f -> f.endsWith(".tmp")), "no temporary file left: " + left);
            Result verify = cli("verify", out.toString());
            assertEquals(2, verify.code());
            assertTrue(verify.err().contains("incomplete run"), verify.err());
        } finally {
            sh("umount", mnt.toString());
        }
    }

    @Test
    void aNonFiniteVarianceStopsTheRunNamingTheMode(@TempDir Path tmp) throws IOException {
        // At 1e308 K, x = ħω/2kT ≈ 1e-310 for these 6-30 GHz modes: coth x ≈ 1/x overflows to +∞.
        Path out = tmp.resolve("out");
        Result r = cli("sample", spec(tmp, SPEC.replace("fields:", "state: {kind: thermal, temperature_K: 1.0e308}\nfields:"))
            .toString(), "--output", out.toString());
        oneLine(r, 3, "mode TE_1,0,1", "variance");
        assertFalse(Files.exists(out));
    }
}
