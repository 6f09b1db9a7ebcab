package org.stillfield.viz;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The report over a demo-like run with a fabricated correlation table (rendering only). Set
 * -Dstillfield.viz.keep=FOLDER to keep the passing report's files for viewing.
 */
class RunReportTest {
    private static DemoRun passing;
    private static DemoRun failing;

    @TempDir
    Path tmp;

    @BeforeAll
    static void build() throws Exception {
        passing = DemoRun.build(7, 0.0);
        // Every estimate shifted by 8 standard errors: the fabricated verdict must fail.
        failing = DemoRun.build(7, 8.0);
    }

    private Path folder(String name) {
        String keep = System.getProperty("stillfield.viz.keep");
        return keep != null && !keep.isBlank() ? Path.of(keep) : tmp.resolve(name);
    }

    @Test
    void htmlShowsVerdictSettingsAndEveryFigure() throws Exception {
        Path out = folder("pass");
        List<Figure> figs = RunReport.figuresFor(out.resolve("figures"), passing.spec, passing.table, passing.result,
            passing.sample0::get);
        // Correlation plots for E and B on the line, two heat maps, the mode count.
        assertEquals(5, figs.size(), "figures: " + figs);
        Map<String, String> facts = new LinkedHashMap<>();
        facts.put("dataset", "out/kl7-demo/data");
        facts.put("wall time", "3.2 s");
        Path html = RunReport.write(out, passing.spec, passing.table, passing.result, facts, figs);
        String page = Files.readString(html, StandardCharsets.UTF_8);
        String md = Files.readString(out.resolve(RunReport.MARKDOWN), StandardCharsets.UTF_8);

        assertTrue(passing.result.verdict().passed(), "fixture should pass");
        assertTrue(page.contains("class=\"verdict pass\""), "verdict banner");
        assertTrue(page.contains(">PASS<"), "verdict word");
        assertTrue(md.contains("**PASS**"), "markdown verdict");
        String crit = String.format(Locale.ROOT, "%.3g", passing.result.verdict().threshold());
        String worst = String.format(Locale.ROOT, "%.3g", passing.result.verdict().worst());
        assertTrue(page.contains(crit) && page.contains(worst), "threshold " + crit + " and worst " + worst);
        assertTrue(page.contains("1 %"), "false-alarm rate");
        assertTrue(page.contains(passing.result.verdict().method()), "method");
        for (Figure f : figs) {
            String rel = "figures/" + f.png().getFileName();
            assertTrue(page.contains("<img src=\"" + rel + "\""), "html lacks " + rel);
            assertTrue(md.contains("](" + rel + ")"), "markdown lacks " + rel);
            assertTrue(Files.exists(out.resolve(rel)), "missing file " + rel);
            BufferedImage img = ImageIO.read(out.resolve(rel).toFile());
            assertTrue(Pixels.distinctColours(img) > 50, rel + " looks uniform");
        }
        for (String s : List.of("box", "20 GHz", "20261201", "3044", "TE_1,0,1", "6.24568 GHz", "Gaussian",
            "out/kl7-demo/data", "3.2 s", "axis[20]", "calibration of its detector")) {
            assertTrue(page.contains(s), "html lacks '" + s + "'");
            assertTrue(md.contains(s), "markdown lacks '" + s + "'");
        }
        // Self-contained: no scripts, no remote resources, no web fonts.
        for (String s : List.of("<script", "http://", "https://", "@import", "@font-face", "<link")) {
            assertFalse(page.contains(s), "html contains " + s);
        }
        int rows = page.split("<tr><td class=\"l\">", -1).length - 1;
        assertEquals(RunReport.WORST_ROWS, rows, "rows in the table of largest deviations");
    }

    @Test
    void failingVerdictIsShownAsFail() throws Exception {
        Path out = tmp.resolve("fail");
        Path html = RunReport.write(out, failing.spec, failing.table, failing.result, Map.of(), List.of());
        String page = Files.readString(html, StandardCharsets.UTF_8);
        assertFalse(failing.result.verdict().passed(), "fixture should fail");
        assertTrue(page.contains("class=\"verdict fail\"") && page.contains(">FAIL<"), "fail banner");
        assertTrue(page.contains("<td class=\"hot\">"), "rows beyond the threshold are marked");
        assertTrue(Files.readString(out.resolve(RunReport.MARKDOWN)).contains("**FAIL**"));
    }

    @Test
    void factsAreEscaped() throws Exception {
        Path out = tmp.resolve("esc");
        Path html = RunReport.write(out, passing.spec, passing.table, passing.result,
            Map.of("note <b>", "a & b < c \"q\""), List.of());
        String page = Files.readString(html, StandardCharsets.UTF_8);
        assertTrue(page.contains("note &lt;b&gt;"), "key escaped");
        assertTrue(page.contains("a &amp; b &lt; c &quot;q&quot;"), "value escaped");
        assertFalse(page.contains("<b>"), "raw tag leaked");
    }

    @Test
    void noSampleValuesMeansNoHeatMaps() throws Exception {
        List<Figure> figs = RunReport.figuresFor(tmp.resolve("f"), passing.spec, passing.table, passing.result, null);
        assertEquals(3, figs.size(), "figures: " + figs);
        assertTrue(figs.stream().noneMatch(f -> f.png().getFileName().toString().startsWith("slice-")));
    }
}
