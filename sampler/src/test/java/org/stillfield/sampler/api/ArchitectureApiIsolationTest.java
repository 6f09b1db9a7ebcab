package org.stillfield.sampler.api;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * Package rule (STYLE.md, "let the layout show the architecture"): the api package is the seam
 * everything else depends on, so it never refers to the engine, geometry, spec or io packages.
 * Checked on the sources and, as a second path, on the compiled class files.
 */
class ArchitectureApiIsolationTest {
    private static final Path API_SOURCES = Path.of("src/main/java/org/stillfield/sampler/api");
    private static final Path API_CLASSES = Path.of("target/classes/org/stillfield/sampler/api");
    private static final Pattern FORBIDDEN = Pattern.compile("\\borg\\.stillfield\\.sampler\\.(engine|geometry|spec|io)\\b");
    private static final Pattern COMMENTS = Pattern.compile("/\\*.*?\\*/|//[^\\n]*", Pattern.DOTALL);

    /** Forbidden references in one source text, comments removed (prose may name packages). */
    static List<String> violations(String source) {
        String code = COMMENTS.matcher(source).replaceAll(" ");
        List<String> out = new ArrayList<>();
        Matcher m = FORBIDDEN.matcher(code);
        while (m.find()) {
            int end = code.indexOf('\n', m.start());
            out.add(code.substring(m.start(), end < 0 ? code.length() : end).trim());
        }
        return out;
    }

    @Test
    void detectorFindsImportsAndQualifiedNamesButNotComments() {
        assertEquals(1, violations("import org.stillfield.sampler.engine.EnsembleRunner;\n").size());
        assertEquals(1, violations("import static org.stillfield.sampler.spec.SpecReader.parse;\n").size());
        assertEquals(1, violations("import org.stillfield.sampler.io.*;\n").size());
        assertEquals(1, violations("Object c = org.stillfield.sampler.geometry.RectangularCavity.of(1, 1, 1, m);\n").size());
        assertEquals(0, violations("import org.stillfield.sampler.api.Vec3;\n// see org.stillfield.sampler.engine\n").size());
        assertEquals(0, violations("/** {@code org.stillfield.sampler.spec} reads specs. */\n").size());
        assertEquals(0, violations("import org.stillfield.sampler.engineering.X;\n").size());
    }

    @Test
    void apiSourcesReferToNoImplementationPackage() throws IOException {
        List<Path> files;
        try (Stream<Path> s = Files.list(API_SOURCES)) {
            files = s.filter(p -> p.toString().endsWith(".java")).sorted().toList();
        }
        assertTrue(files.size() >= 10, "api sources found under " + API_SOURCES.toAbsolutePath() + ": " + files.size());
        List<String> bad = new ArrayList<>();
        for (Path f : files) {
            String text = Files.readString(f, StandardCharsets.UTF_8);
            assertTrue(text.contains("package org.stillfield.sampler.api;"), "package declaration of " + f);
            for (String v : violations(text)) {
                bad.add(f.getFileName() + ": " + v);
            }
        }
        assertEquals(List.of(), bad, "api must not depend on engine, geometry, spec or io");
    }

    @Test
    void apiClassFilesReferToNoImplementationPackage() throws IOException {
        // Constant pools hold every referenced class name as org/stillfield/sampler/<pkg>/...
        List<Path> files;
        try (Stream<Path> s = Files.list(API_CLASSES)) {
            files = s.filter(p -> p.toString().endsWith(".class")).sorted().toList();
        }
        assertTrue(files.size() >= 10, "api classes found under " + API_CLASSES.toAbsolutePath() + ": " + files.size());
        List<String> bad = new ArrayList<>();
        for (Path f : files) {
            String bytes = new String(Files.readAllBytes(f), StandardCharsets.ISO_8859_1);
            for (String pkg : List.of("engine", "geometry", "spec", "io")) {
                if (bytes.contains("org/stillfield/sampler/" + pkg + "/")) {
                    bad.add(f.getFileName() + " -> " + pkg);
                }
            }
        }
        assertEquals(List.of(), bad, "compiled api classes must not reference engine, geometry, spec or io");
    }
}
