package org.stillfield.viz;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import javax.imageio.ImageIO;
import org.jfree.chart.ChartRenderingInfo;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.plot.CombinedDomainXYPlot;
import org.jfree.chart.plot.XYPlot;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;

class CorrelationLinePlotTest {
    @TempDir
    Path tmp;

    /** 11 points along z at x = 0.01, y = 0.02, offset 3 in the run, r = point 5 of the line. */
    private static final PointSet LINE = PointSet.line("l", new Vec3(0.01, 0.02, 0.0), new Vec3(0.01, 0.02, 0.05), 11);
    private static final int OFFSET = 3;

    /**
     * Fabricated rows (rendering test only): mode sum C_xx = 2.5e-6 cos(60 z) (V/m)², estimate
     * 0.5e-6 above it so marker and line are apart, C_zz = −1e-6; standard errors 1e-8.
     */
    private static List<CorrelationRow> rows(boolean withZz) {
        List<CorrelationRow> out = new ArrayList<>();
        for (int k = 0; k < LINE.size(); k++) {
            double z = LINE.points().get(k).z();
            double c = 2.5e-6 * Math.cos(60 * z);
            out.add(new CorrelationRow(Field.E, OFFSET + 5, OFFSET + k, 0, 0, c + 0.5e-6, 1e-8, c, 50.0));
            if (withZz) {
                out.add(new CorrelationRow(Field.E, OFFSET + 5, OFFSET + k, 2, 2, -1e-6, 1e-8, -1e-6, 0.0));
            }
        }
        // A row of another field and one off the line: both must be ignored.
        out.add(new CorrelationRow(Field.B, OFFSET + 5, OFFSET + 2, 0, 0, 1, 1, 1, 0));
        out.add(new CorrelationRow(Field.E, OFFSET + 5, 0, 0, 0, 9, 1, 9, 0));
        return out;
    }

    @Test
    void writesPngOfRequestedSizeWithVisibleSeries() throws Exception {
        CorrelationLinePlot plot = CorrelationLinePlot.of(Field.E, LINE.points(), OFFSET, rows(true)).withThreshold(3.5);
        Path png = plot.writePng(tmp.resolve("c.png"), 900, 620);
        BufferedImage img = ImageIO.read(png.toFile());
        assertEquals(900, img.getWidth(), "png width");
        assertEquals(620, img.getHeight(), "png height");
        assertTrue(Pixels.distinctColours(img) > 50, "image looks uniform: " + Pixels.distinctColours(img) + " colours");
        int xx = ChartStyle.componentColour(0, 0).getRGB();
        int zz = ChartStyle.componentColour(2, 2).getRGB();
        assertTrue(Pixels.count(img, xx, 0) > 200, "C_xx colour barely present: " + Pixels.count(img, xx, 0) + " px");
        assertTrue(Pixels.count(img, zz, 0) > 200, "C_zz colour barely present: " + Pixels.count(img, zz, 0) + " px");
    }

    @Test
    void markerIsDrawnWhereTheDataSays() {
        CorrelationLinePlot plot = CorrelationLinePlot.of(Field.E, LINE.points(), OFFSET, rows(false));
        JFreeChart chart = plot.chart();
        ChartRenderingInfo info = new ChartRenderingInfo();
        BufferedImage img = ChartStyle.render(chart, 900, 620, info);
        CombinedDomainXYPlot combined = (CombinedDomainXYPlot) chart.getXYPlot();
        XYPlot top = combined.getSubplots().get(0);
        Rectangle2D area = info.getPlotInfo().getSubplotInfo(0).getDataArea();
        // 2.5e-6 (V/m)² is 2.5 (mV/m)²: the axis unit and the plotted numbers must agree.
        assertTrue(top.getRangeAxis().getLabel().contains("(mV/m)²"), top.getRangeAxis().getLabel());
        int xx = ChartStyle.componentColour(0, 0).getRGB();
        for (int k : new int[] {0, 3, 8}) {
            double z = LINE.points().get(k).z();
            double sum = 1e6 * 2.5e-6 * Math.cos(60 * z);
            double px = combined.getDomainAxis().valueToJava2D(z, area, combined.getDomainAxisEdge());
            double pMarker = top.getRangeAxis().valueToJava2D(sum + 0.5, area, top.getRangeAxisEdge());
            double pLine = top.getRangeAxis().valueToJava2D(sum, area, top.getRangeAxisEdge());
            assertTrue(Pixels.near(img, px, pMarker, 1, xx, 0), "no C_xx marker at point " + k + " (z = " + z
                + " m) near pixel (" + px + ", " + pMarker + "); found " + Pixels.hex(img.getRGB((int) px, (int) pMarker)));
            assertTrue(Pixels.near(img, px, pLine, 1, xx, 0), "no C_xx line at point " + k + " near pixel (" + px + ", "
                + pLine + ")");
            // Halfway between line and marker there is neither.
            double pMid = 0.5 * (pMarker + pLine);
            assertTrue(!Pixels.near(img, px, pMid, 1, xx, 0), "C_xx colour between line and marker at point " + k);
        }
    }

    @Test
    void positionIsTheVaryingCoordinateOrTheDistanceAlongTheLine() {
        CorrelationLinePlot alongZ = CorrelationLinePlot.of(Field.E, LINE.points(), OFFSET, rows(false));
        for (int k = 0; k < LINE.size(); k++) {
            assertEquals(LINE.points().get(k).z(), alongZ.position(k), 0.0, "position of point " + k);
        }
        assertTrue(alongZ.positionLabel().startsWith("z"), alongZ.positionLabel());

        Vec3 a = new Vec3(0.001, 0.002, 0.003);
        Vec3 b = new Vec3(0.004, 0.006, 0.003);
        PointSet diag = PointSet.line("d", a, b, 6);
        List<CorrelationRow> rows = List.of(new CorrelationRow(Field.E, 0, 0, 0, 0, 1, 0.1, 1, 0),
            new CorrelationRow(Field.E, 0, 5, 0, 0, 1, 0.1, 1, 0));
        CorrelationLinePlot slant = CorrelationLinePlot.of(Field.E, diag.points(), 0, rows);
        // Distance from the start of a 3-4-5 segment of length 5 mm, split into 5 steps of 1 mm.
        for (int k = 0; k < 6; k++) {
            assertEquals(0.001 * k, slant.position(k), 1e-15, "distance of point " + k);
        }
        assertTrue(slant.positionLabel().startsWith("distance"), slant.positionLabel());
    }

    @Test
    void defaultComponentsAreXxAndZzWhenPresent() {
        List<CorrelationRow> rows = new ArrayList<>(rows(true));
        rows.add(new CorrelationRow(Field.E, OFFSET + 5, OFFSET + 1, 1, 1, 1, 1, 1, 0));
        rows.add(new CorrelationRow(Field.E, OFFSET + 5, OFFSET + 1, 0, 2, 1, 1, 1, 0));
        CorrelationLinePlot plot = CorrelationLinePlot.of(Field.E, LINE.points(), OFFSET, rows);
        assertEquals(List.of(TensorComponent.XX, TensorComponent.ZZ), plot.components());
        CorrelationLinePlot asked = plot.withComponents(List.of(TensorComponent.of("xz"), TensorComponent.YY));
        assertEquals(List.of(new TensorComponent(0, 2), TensorComponent.YY), asked.components());
        assertEquals(OFFSET + 5, plot.reference());
        assertEquals(2 * LINE.size() + 2, plot.rows().size(), "rows of E on the line");
    }

    @Test
    void rejectsAmbiguousOrMissingInput() {
        List<CorrelationRow> two = new ArrayList<>(rows(false));
        two.add(new CorrelationRow(Field.E, OFFSET + 1, OFFSET + 2, 0, 0, 1, 1, 1, 0));
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> CorrelationLinePlot.of(Field.E, LINE.points(), OFFSET, two));
        assertTrue(ex.getMessage().contains("reference"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class,
            () -> CorrelationLinePlot.of(Field.A, LINE.points(), OFFSET, rows(false)));
        assertTrue(ex.getMessage().contains("none found"), ex.getMessage());
        CorrelationLinePlot plot = CorrelationLinePlot.of(Field.E, LINE.points(), OFFSET, rows(false));
        ex = assertThrows(IllegalArgumentException.class, () -> plot.withComponents(List.of(TensorComponent.ZZ)));
        assertTrue(ex.getMessage().contains("C_zz"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> plot.withThreshold(-1));
        assertThrows(IllegalArgumentException.class, () -> TensorComponent.of("xw"));
    }
}
