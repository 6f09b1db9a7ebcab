package org.stillfield.sampler.spec;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Table of broken run specs: each must fail with one {@link SpecException} whose setting() is the
 * dotted path of the offending setting and whose message says what is allowed. Every case is the
 * valid base spec below with one change, so the change alone is what the reader rejects.
 */
class SpecReaderBadSpecTest {
    static final String BASE = String.join("\n",
        "name: table-base",
        "cavity:",
        "  shape: box",
        "  a_m: 0.03",
        "  b_m: 0.02",
        "  d_m: 0.04",
        "  eps_r: 1.0",
        "state:",
        "  kind: vacuum",
        "fields: [E, B]",
        "window:",
        "  kind: gauss",
        "  cutoff_GHz: 20",
        "  tolerance: 1.0e-6",
        "samples: 100",
        "seed: 7",
        "evaluate:",
        "  points:",
        "    - name: antenna",
        "      at: [0.015, 0.010, 0.008]",
        "  lines:",
        "    - name: axis",
        "      from: [0.015, 0.010, 0.0]",
        "      to: [0.015, 0.010, 0.040]",
        "      n: 5",
        "  grids:",
        "    - name: plane",
        "      n: [2, 1, 2]",
        "output:",
        "  folder: out/base",
        "  precision: float64",
        "analysis:",
        "  pairs:",
        "    - [\"axis[2]\", \"axis\"]",
        "  false_alarm: 0.01",
        "limits:",
        "  max_modes: 1000",
        "threads: 1",
        "");

    /** The base with one exact line replaced (the line must occur exactly once). */
    static String with(String line, String replacement) {
        String text = "\n" + BASE;
        String target = "\n" + line + "\n";
        int at = text.indexOf(target);
        if (at < 0 || text.indexOf(target, at + 1) >= 0) {
            throw new IllegalArgumentException("line must occur once in the base spec: " + line);
        }
        return text.substring(1, at + 1) + replacement + (replacement.isEmpty() ? "" : "\n")
            + text.substring(at + target.length());
    }

    static String without(String line) {
        return with(line, "");
    }

    static Arguments bad(String what, String yaml, String setting, String... says) {
        return Arguments.of(what, yaml, setting, List.of(says));
    }

    static Stream<Arguments> cases() {
        List<Arguments> c = new ArrayList<>();
        c.add(bad("zero side", with("  a_m: 0.03", "  a_m: 0"), "cavity.a_m", "positive and finite", "metres"));
        c.add(bad("negative side", with("  b_m: 0.02", "  b_m: -0.02"), "cavity.b_m", "positive and finite"));
        c.add(bad("NaN side", with("  d_m: 0.04", "  d_m: .nan"), "cavity.d_m", "positive and finite", "NaN"));
        c.add(bad("infinite side", with("  a_m: 0.03", "  a_m: .inf"), "cavity.a_m", "positive and finite", "Infinity"));
        c.add(bad("side as text", with("  a_m: 0.03", "  a_m: thirty mm"), "cavity.a_m", "must be a number"));
        c.add(bad("missing side", without("  b_m: 0.02"), "cavity.b_m", "is required"));
        c.add(bad("unknown cavity key", with("  eps_r: 1.0", "  radius_m: 0.1"), "cavity.radius_m",
            "unknown setting", "a_m, b_m, d_m"));
        c.add(bad("misspelt cavity key", with("  eps_r: 1.0", "  esp_r: 1.0"), "cavity.esp_r",
            "unknown setting", "did you mean 'eps_r'"));
        c.add(bad("unknown top-level key with did-you-mean", with("samples: 100", "sampels: 100"), "sampels",
            "unknown setting", "did you mean 'samples'"));
        c.add(bad("missing cavity section", BASE.replaceFirst("cavity:\n  shape: box\n  a_m: 0.03\n  b_m: 0.02\n"
            + "  d_m: 0.04\n  eps_r: 1.0\n", ""), "cavity.shape", "is required", "box"));
        c.add(bad("cavity not a mapping", BASE.replaceFirst("cavity:\n  shape: box\n  a_m: 0.03\n  b_m: 0.02\n"
            + "  d_m: 0.04\n  eps_r: 1.0\n", "cavity: box\n"), "cavity", "must be a mapping"));
        c.add(bad("bad shape", with("  shape: box", "  shape: dodecahedron"), "cavity.shape", "must be one of box"));
        c.add(bad("misspelt shape", with("  shape: box", "  shape: bxo"), "cavity.shape", "did you mean 'box'"));
        c.add(bad("permittivity below one", with("  eps_r: 1.0", "  eps_r: 0.5"), "cavity.eps_r", "at least 1"));
        c.add(bad("zero permeability", with("  eps_r: 1.0", "  mu_r: 0"), "cavity.mu_r", "positive and finite"));
        c.add(bad("zero samples", with("samples: 100", "samples: 0"), "samples", "whole number in [1, 1000000000]"));
        c.add(bad("fractional samples", with("samples: 100", "samples: 2.5"), "samples", "whole number"));
        c.add(bad("samples as text", with("samples: 100", "samples: \"100\""), "samples", "whole number"));
        c.add(bad("missing samples", without("samples: 100"), "samples", "is required", "whole number"));
        c.add(bad("negative temperature", with("  kind: vacuum", "  kind: thermal\n  temperature_K: -1"),
            "state.temperature_K", "positive and finite", "kelvin"));
        c.add(bad("NaN temperature", with("  kind: vacuum", "  kind: thermal\n  temperature_K: .nan"),
            "state.temperature_K", "positive and finite"));
        c.add(bad("thermal without temperature", with("  kind: vacuum", "  kind: thermal"), "state.temperature_K",
            "is required", "kelvin"));
        c.add(bad("vacuum with temperature", with("  kind: vacuum", "  kind: vacuum\n  temperature_K: 4"),
            "state.temperature_K", "only applies to kind: thermal"));
        c.add(bad("unknown state kind", with("  kind: vacuum", "  kind: squeezed"), "state.kind",
            "must be one of vacuum, thermal"));
        c.add(bad("two cutoffs", with("  cutoff_GHz: 20", "  cutoff_GHz: 20\n  cutoff_Hz: 2.0e10"), "window.cutoff_GHz",
            "exactly one of cutoff_Hz, cutoff_GHz", "omega_c_rad_s"));
        c.add(bad("no cutoff", without("  cutoff_GHz: 20"), "window.cutoff_GHz", "exactly one of"));
        c.add(bad("negative cutoff", with("  cutoff_GHz: 20", "  cutoff_GHz: -20"), "window.cutoff_GHz",
            "positive and finite", "GHz"));
        c.add(bad("unknown window kind", with("  kind: gauss", "  kind: lorentz"), "window.kind",
            "must be one of hard, exp, gauss"));
        c.add(bad("tolerance too large", with("  tolerance: 1.0e-6", "  tolerance: 0.7"), "window.tolerance",
            "[1e-300, 0.5)"));
        c.add(bad("misspelt window key", with("  tolerance: 1.0e-6", "  tolerence: 1.0e-6"), "window.tolerence",
            "did you mean 'tolerance'"));
        c.add(bad("unknown field", with("fields: [E, B]", "fields: [E, H]"), "fields", "unknown field 'H'", "A, E, B"));
        c.add(bad("no fields", with("fields: [E, B]", "fields: []"), "fields", "at least one of A, E, B"));
        c.add(bad("point outside the cavity", with("      at: [0.015, 0.010, 0.008]", "      at: [0.015, 0.010, 0.05]"),
            "evaluate.points[0].at", "outside the cavity"));
        c.add(bad("point with two coordinates", with("      at: [0.015, 0.010, 0.008]", "      at: [0.015, 0.010]"),
            "evaluate.points[0].at", "three numbers"));
        c.add(bad("point with a NaN coordinate", with("      at: [0.015, 0.010, 0.008]", "      at: [0.015, .nan, 0.008]"),
            "evaluate.points[0].at[1]", "finite"));
        c.add(bad("line end outside the bounds", with("      to: [0.015, 0.010, 0.040]", "      to: [0.015, 0.010, 0.041]"),
            "evaluate.lines[0].to", "outside the cavity's bounds"));
        c.add(bad("line of one point", with("      n: 5", "      n: 1"), "evaluate.lines[0].n", "whole number in [2,"));
        c.add(bad("duplicate set names", with("    - name: plane", "    - name: axis"), "evaluate.grids[0].name",
            "used twice", "unique"));
        c.add(bad("bad set name", with("    - name: plane", "    - name: mid plane"), "evaluate.grids[0].name",
            "letters, digits"));
        c.add(bad("grid with a zero size", with("      n: [2, 1, 2]", "      n: [2, 0, 2]"), "evaluate.grids[0].n[1]",
            "whole number in [1,"));
        c.add(bad("grid with two sizes", with("      n: [2, 1, 2]", "      n: [2, 2]"), "evaluate.grids[0].n",
            "three whole numbers"));
        c.add(bad("grid too large", with("      n: [2, 1, 2]", "      n: [2000, 2000, 2]"), "evaluate.grids[0].n",
            "exceeds the limit of 4000000"));
        // 3999964·3999396·1153106 = 2^64 + 3585248: a long product wraps to a count under the limit.
        c.add(bad("grid whose point count overflows a long", with("      n: [2, 1, 2]", "      n: [3999964, 3999396, 1153106]"),
            "evaluate.grids[0].n", "exceeds the limit of 4000000"));
        c.add(bad("pair naming an unknown set", with("    - [\"axis[2]\", \"axis\"]", "    - [\"axes[2]\", \"axis\"]"),
            "analysis.pairs[0]", "no point set named 'axes'", "did you mean 'axis'"));
        c.add(bad("pair index out of range", with("    - [\"axis[2]\", \"axis\"]", "    - [\"axis[5]\", \"axis\"]"),
            "analysis.pairs[0]", "out of range", "0 to 4"));
        c.add(bad("pair index too large for a number", with("    - [\"axis[2]\", \"axis\"]",
            "    - [\"axis[99999999999999999999]\", \"axis\"]"), "analysis.pairs[0]", "out of range", "0 to 4"));
        c.add(bad("pair referring to a missing set", with("  grids:", "  grids: []").replace("    - name: plane\n      n: [2, 1, 2]\n", "")
            .replace("[\"axis[2]\", \"axis\"]", "[\"axis[2]\", \"plane\"]"), "analysis.pairs[0]", "no point set named 'plane'"));
        c.add(bad("samples above the limit", with("samples: 100", "samples: 99999999999999999999"), "samples",
            "whole number in [1, 1000000000]"));
        c.add(bad("state not a mapping", with("state:", "state: thermal").replace("  kind: vacuum\n", ""), "state",
            "must be a mapping"));
        c.add(bad("negative zero side", with("  a_m: 0.03", "  a_m: -0.0"), "cavity.a_m", "positive and finite"));
        c.add(bad("two documents", BASE + "---\nsamples: 5\n", "", "not valid YAML"));
        c.add(bad("point coordinate as text", with("      at: [0.015, 0.010, 0.008]", "      at: [0.015, x, 0.008]"),
            "evaluate.points[0].at[1]", "must be a number"));
        c.add(bad("pair starting with a whole set", with("    - [\"axis[2]\", \"axis\"]", "    - [\"axis\", \"antenna\"]"),
            "analysis.pairs[0]", "must be one point"));
        c.add(bad("pair of three", with("    - [\"axis[2]\", \"axis\"]", "    - [\"axis[2]\", \"axis\", \"plane\"]"),
            "analysis.pairs[0]", "must be [first, second]"));
        c.add(bad("false alarm too large", with("  false_alarm: 0.01", "  false_alarm: 0.5"), "analysis.false_alarm",
            "(0, 0.5)"));
        c.add(bad("float32 typo", with("  precision: float64", "  precision: flaot32"), "output.precision",
            "float64, float32", "did you mean 'float32'"));
        c.add(bad("zero max modes", with("  max_modes: 1000", "  max_modes: 0"), "limits.max_modes", "whole number in [1,"));
        c.add(bad("negative threads", with("threads: 1", "threads: -2"), "threads", "whole number in [0, 1024]"));
        c.add(bad("fractional seed", with("seed: 7", "seed: 7.5"), "seed", "whole number"));
        c.add(bad("bad run name", with("name: table-base", "name: my run!"), "name", "letters, digits"));
        c.add(bad("malformed YAML", with("fields: [E, B]", "fields: [E, B"), "", "not valid YAML", "line"));
        c.add(bad("duplicate key", with("seed: 7", "seed: 7\nseed: 8"), "", "not valid YAML", "seed"));
        c.add(bad("tab indentation", with("  kind: vacuum", "\tkind: vacuum"), "", "not valid YAML"));
        c.add(bad("empty document", "# nothing here\n", "", "empty", "cavity"));
        c.add(bad("top level is a list", "- cavity\n- window\n", "", "must be a mapping"));
        return c.stream();
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("cases")
    void badSpecIsRejectedNamingTheSetting(String what, String yaml, String setting, List<String> says) {
        SpecException ex = assertThrows(SpecException.class, () -> SpecReader.parse(yaml, Path.of("."), "t"), what);
        assertEquals(setting, ex.setting(), what + ": setting of \"" + ex.getMessage() + "\"");
        for (String s : says) {
            assertTrue(ex.getMessage().contains(s), what + ": message should contain \"" + s + "\": " + ex.getMessage());
        }
        if (!setting.isEmpty()) {
            assertTrue(ex.getMessage().startsWith(setting + ": "), what + ": message names the setting: " + ex.getMessage());
        }
    }

    @Test
    void tableIsLargeAndTheBaseSpecIsValid() throws SpecException {
        assertTrue(cases().count() >= 30, "cases: " + cases().count());
        RunSpec spec = SpecReader.parse(BASE, Path.of("/tmp/specs"), "t");
        assertEquals("table-base", spec.name());
        assertEquals(1 + 5 + 4, spec.allPoints().size());
        assertEquals(5, spec.pairs().size());
    }

    @Test
    void equivalentCutoffsAndThermalStateAreRead() throws SpecException {
        double hz = SpecReader.parse(with("  cutoff_GHz: 20", "  cutoff_Hz: 2.0e10"), Path.of("."), "t").window().omegaC();
        double ghz = SpecReader.parse(BASE, Path.of("."), "t").window().omegaC();
        double rad = SpecReader.parse(with("  cutoff_GHz: 20", "  omega_c_rad_s: " + 2 * Math.PI * 2e10), Path.of("."), "t")
            .window().omegaC();
        assertEquals(2 * Math.PI * 2e10, ghz, 1e-3);
        assertEquals(ghz, hz, 1e-3);
        assertEquals(ghz, rad, 1e-3);
        RunSpec hot = SpecReader.parse(with("  kind: vacuum", "  kind: thermal\n  temperature_K: 4.2"), Path.of("."), "t");
        assertEquals(4.2, hot.state().temperatureKelvin(), 0.0);
        RunSpec defaults = SpecReader.parse(without("name: table-base").replace("analysis:\n  pairs:\n"
            + "    - [\"axis[2]\", \"axis\"]\n", "analysis:\n"), Path.of("/tmp/specs"), "stem");
        assertEquals("stem", defaults.name(), "name defaults to the file stem");
        // Default pairs: the line's midpoint against the whole line, the lone point with itself.
        assertEquals(List.of(new RunSpec.PointPair(0, 0), new RunSpec.PointPair(3, 1), new RunSpec.PointPair(3, 2),
            new RunSpec.PointPair(3, 3), new RunSpec.PointPair(3, 4), new RunSpec.PointPair(3, 5)), defaults.pairs());
    }

    @Test
    void unreadableFilesAreReportedForTheWholeFile() {
        // A Latin-1 byte (µ as 0xB5) is not UTF-8: the reader must say so, not crash.
        Path latin1 = Path.of("src/test/resources/spec-bad/latin1-comment.yaml");
        assertTrue(java.nio.file.Files.isRegularFile(latin1), "resource present: " + latin1.toAbsolutePath());
        SpecException ex = assertThrows(SpecException.class, () -> SpecReader.read(latin1));
        assertEquals("", ex.setting());
        assertTrue(ex.getMessage().contains("cannot read spec file"), ex.getMessage());
        Path missing = Path.of("src/test/resources/spec-bad/no-such-spec.yaml");
        SpecException gone = assertThrows(SpecException.class, () -> SpecReader.read(missing));
        assertTrue(gone.getMessage().contains("does not exist") && gone.getMessage().contains("no-such-spec.yaml"),
            gone.getMessage());
    }

    @Test
    void everyCaseDiffersFromTheBase() {
        cases().forEach(a -> assertTrue(!BASE.equals(a.get()[1]), "case " + a.get()[0] + " changes the base"));
    }
}
