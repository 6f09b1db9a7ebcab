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
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Every spec in the malformed corpus (src/test/resources/bad-specs, made by make_corpus.py from the
 * demo spec) must give exit code 2, exactly one line on stderr that names the broken setting, no
 * stack trace, and no output folder.
 */
class BadSpecCorpusTest {
    static final Path CORPUS = Path.of("src/test/resources/bad-specs");

    static Stream<Path> corpus() throws IOException {
        try (Stream<Path> files = Files.list(CORPUS)) {
            List<Path> list = files.filter(p -> p.getFileName().toString().endsWith(".yaml")).sorted().collect(Collectors.toList());
            return list.stream();
        }
    }

    @org.junit.jupiter.api.Test
    void corpusHasAtLeastOneHundredCases() throws IOException {
        assertTrue(corpus().count() >= 100, "corpus size");
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("corpus")
    void badSpecGivesOneClearLineAndExitTwo(Path spec, @TempDir Path tmp) throws IOException {
        String first = Files.readAllLines(spec, StandardCharsets.UTF_8).get(0);
        String expect = first.replaceFirst("^# expect:\\s*", "").trim();
        Path out = tmp.resolve("out");
        StringWriter o = new StringWriter();
        StringWriter e = new StringWriter();
        int code = Main.execute(new PrintWriter(o, true), new PrintWriter(e, true), "sample", spec.toString(), "--output",
            out.toString());
        String err = e.toString().strip();
        assertEquals(2, code, spec + ": exit code; stderr: " + err);
        assertEquals(1, err.lines().count(), spec + ": stderr must be one line: " + err);
        assertTrue(err.startsWith("stillfield: "), spec + ": " + err);
        assertFalse(err.contains("Exception") || err.contains("\tat "), spec + ": no stack trace: " + err);
        if (!expect.isEmpty()) {
            assertTrue(err.contains(expect), spec + ": message must name '" + expect + "': " + err);
        }
        assertFalse(Files.exists(out), spec + ": nothing may be written");
        try (Stream<Path> left = Files.list(tmp)) {
            assertEquals(0, left.count(), spec + ": no staging files left");
        }
    }
}
