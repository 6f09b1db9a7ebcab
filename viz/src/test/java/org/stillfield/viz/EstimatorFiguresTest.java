package org.stillfield.viz;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import javax.imageio.ImageIO;
import org.jfree.chart.axis.NumberTick;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.analysis.CorrelationEstimator;
import org.stillfield.analysis.EstimatorSuite;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecReader;

/**
 * The estimator figures and report sections over a small real run (70-mode box, a wall-to-wall
 * line, a grid, 300 samples): every figure is written at its size and is not blank, and the
 * report carries the extra sections. Rendering checks, not physics checks. Set
 * -Dstillfield.viz.keep=FOLDER to keep the files for viewing.
 */
class EstimatorFiguresTest {
    private static final String YAML = String.join("\n",
        "name: small",
        "cavity: {shape: box, a_m: 1.0, b_m: 1.3, d_m: 1.7}",
        "fields: [E, B]",
        "window: {kind: hard, omega_c_rad_s: 2997924580}",
        "samples: 300",
        "seed: 11",
        "evaluate:",
        "  points:",
        "    - {name: probe, at: [0.31, 0.55, 0.8]}",
        "  lines:",
        "    - {name: across, from: [0.0, 0.55, 0.8], to: [1.0, 0.55, 0.8], n: 21}",
        "  grids:",
        "    - {name: cells, from: [0.0, 0.0, 0.0], to: [1.0, 1.3, 1.7], n: [4, 3, 3]}",
        "analysis:",
        "  pairs:",
        "    - [\"across[10]\", \"across\"]",
        "    - [\"probe\", \"probe\"]",
        "");
    private static RunSpec spec;
    private static ModeTable table;
    private static EstimatorSuite.Result result;

    @TempDir
    Path tmp;

    @BeforeAll
    static void run() throws Exception {
        spec = SpecReader.parse(YAML, Path.of("."), "small");
        table = ModeTable.of(spec.cavity(), spec.window(), spec.state(), spec.maxModes());
        EstimatorSuite suite = EstimatorSuite.forRun(spec, table);
        EnsembleRunner.run(new EnsembleRunner.Plan(table, spec.allPoints(), spec.fields(), spec.seed(), 0,
            spec.samples(), 2), spec.pointSets(), suite.sink(), null);
        result = suite.result(0.01);
    }

    private Path folder() {
        String keep = System.getProperty("stillfield.viz.keep");
        return keep != null && !keep.isBlank() ? Path.of(keep) : tmp;
    }

    @Test
    void everyFigureIsWrittenAndNotBlank() throws Exception {
        List<Figure> figs = EstimatorFigures.figuresFor(folder(), spec, table, result);
        // Matrices 2 (E, B), separations 4 (line and grid, E and B), profiles 2, kernels 2, convergence 1.
        assertEquals(11, figs.size(), figs.toString());
        for (Figure f : figs) {
            BufferedImage img = ImageIO.read(f.png().toFile());
            assertTrue(img.getWidth() >= 800 && img.getHeight() >= 590, f.png() + ": " + img.getWidth() + "x" + img.getHeight());
            assertTrue(Pixels.distinctColours(img) > 30, "blank figure? " + f.png());
            assertTrue(!f.caption().isBlank() && !f.title().isBlank());
        }
        // The matrix shows both halves: its diverging scale has dark red on the diagonal band.
        BufferedImage m = ImageIO.read(figs.get(0).png().toFile());
        assertTrue(Pixels.count(m, 0x7A1F1A, 40) > 200, "strong positive correlation near the diagonal");
    }

    @Test
    void reportCarriesTheEstimatorSections() throws Exception {
        Map<String, Map<String, String>> sections = EstimatorFigures.sections(result);
        assertTrue(sections.containsKey("Gaussianity and independence"), sections.keySet().toString());
        Map<String, String> k = sections.get("Kernel, convergence and pair tables");
        assertTrue(k.keySet().stream().anyMatch(s -> s.startsWith("E kernel, parallel, sampled")), k.toString());
        assertTrue(k.containsKey("error against N"));
        CorrelationEstimator est = new CorrelationEstimator(spec.pairs(), spec.fields(), spec.allPoints().size());
        EnsembleRunner.run(new EnsembleRunner.Plan(table, spec.allPoints(), spec.fields(), spec.seed(), 0, 200, 2),
            spec.pointSets(), est, null);
        Path out = folder().resolve("report");
        Path html = RunReport.write(out, spec, table, est.result(table, spec.allPoints(), 0.01), new LinkedHashMap<>(),
            EstimatorFigures.figuresFor(out, spec, table, result), sections);
        String page = Files.readString(html, StandardCharsets.UTF_8);
        assertTrue(page.contains("Gaussianity and independence") && page.contains("kernel-E.png")
            && page.contains("convergence.png"), "sections and figures in the page");
        String md = Files.readString(out.resolve(RunReport.MARKDOWN), StandardCharsets.UTF_8);
        assertTrue(md.contains("### Kernel, convergence and pair tables"), "markdown section");
    }

    @Test
    void logAxisTicksSitAtOneTwoFiveTimesPowersOfTen() {
        EstimatorCharts.NiceLogAxis a = new EstimatorCharts.NiceLogAxis("r");
        a.setRange(0.0008, 0.021);
        @SuppressWarnings("unchecked")
        List<NumberTick> ticks = a.refreshTicksHorizontal(null, null, null);
        List<String> labels = ticks.stream().map(NumberTick::getText).toList();
        assertEquals(List.of("0.001", "0.002", "0.005", "0.01", "0.02"), labels);
        a.setRange(3e16, 2e20);
        @SuppressWarnings("unchecked")
        List<NumberTick> big = a.refreshTicksVertical(null, null, null);
        assertEquals(List.of("10¹⁷", "10¹⁸", "10¹⁹", "10²⁰"), big.stream().map(NumberTick::getText).toList());
        a.setRange(1.5e17, 9e17);
        @SuppressWarnings("unchecked")
        List<NumberTick> few = a.refreshTicksVertical(null, null, null);
        assertEquals("1.5×10¹⁷", few.get(0).getText());
    }
}
