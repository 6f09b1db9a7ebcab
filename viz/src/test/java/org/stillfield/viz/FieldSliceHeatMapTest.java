package org.stillfield.viz;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.Color;
import java.awt.geom.Point2D;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.nio.file.Path;
import java.util.List;
import javax.imageio.ImageIO;
import org.jfree.chart.ChartRenderingInfo;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.plot.XYPlot;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.api.Field;

class FieldSliceHeatMapTest {
    @TempDir
    Path tmp;

    /** 6 × 8 cells of 5 mm over x ∈ [0, 0.03], z ∈ [0, 0.04], f = (x − 2z)·1e-3 V/m, one NaN cell. */
    private static GridSlice slice(String component) {
        double[] xc = new double[6];
        double[] zc = new double[8];
        for (int i = 0; i < 6; i++) {
            xc[i] = 0.005 * (i + 0.5);
        }
        for (int k = 0; k < 8; k++) {
            zc[k] = 0.005 * (k + 0.5);
        }
        double[][] v = new double[8][6];
        for (int k = 0; k < 8; k++) {
            for (int i = 0; i < 6; i++) {
                double f = (xc[i] - 2 * zc[k]) * 1e-3;
                v[k][i] = "magnitude".equals(component) ? Math.abs(f) : f;
            }
        }
        v[7][5] = Double.NaN;
        return new GridSlice("test slice", Field.E, component, "x", "z", xc, zc, v, "V/m");
    }

    @Test
    void cellsHaveTheColourOfTheirValue() {
        FieldSliceHeatMap map = FieldSliceHeatMap.of(slice("x"));
        JFreeChart chart = map.chart();
        ChartRenderingInfo info = new ChartRenderingInfo();
        BufferedImage img = ChartStyle.render(chart, 700, 800, info);
        XYPlot plot = chart.getXYPlot();
        Rectangle2D area = info.getPlotInfo().getDataArea();
        ColourScale scale = map.colourScale();
        // Largest |f| is 0.0725e-3 V/m at cell (0, 7): plotted in µV/m, the scale runs over ±72.5.
        assertEquals("µV/m", map.unitScale().label());
        assertEquals(-72.5, scale.getLowerBound(), 1e-9);
        assertEquals(72.5, scale.getUpperBound(), 1e-9);
        int[][] cells = {{0, 0}, {5, 0}, {2, 3}, {0, 7}, {4, 6}};
        for (int[] c : cells) {
            double x = 0.005 * (c[0] + 0.5);
            double z = 0.005 * (c[1] + 0.5);
            double plotted = (x - 2 * z) * 1e3;
            int px = (int) Math.round(plot.getDomainAxis().valueToJava2D(x, area, plot.getDomainAxisEdge()));
            int py = (int) Math.round(plot.getRangeAxis().valueToJava2D(z, area, plot.getRangeAxisEdge()));
            Color want = scale.colour(plotted);
            assertTrue(Pixels.close(img.getRGB(px, py), want.getRGB(), 1), "cell (" + c[0] + ", " + c[1] + ") value "
                + plotted + " µV/m: pixel " + Pixels.hex(img.getRGB(px, py)) + ", expected " + Pixels.hex(want.getRGB()));
        }
        int px = (int) Math.round(plot.getDomainAxis().valueToJava2D(0.0275, area, plot.getDomainAxisEdge()));
        int py = (int) Math.round(plot.getRangeAxis().valueToJava2D(0.0375, area, plot.getRangeAxisEdge()));
        assertTrue(Pixels.close(img.getRGB(px, py), ChartStyle.NO_DATA.getRGB(), 0), "NaN cell should be grey: "
            + Pixels.hex(img.getRGB(px, py)));
    }

    @Test
    void divergingScaleIsWhiteAtZeroAndSequentialStartsAtZero() {
        ColourScale d = FieldSliceHeatMap.of(slice("x")).colourScale();
        Color zero = d.colour(0);
        assertTrue(zero.getRed() > 240 && zero.getGreen() > 240 && zero.getBlue() > 235, "zero is not near white: " + zero);
        // Symmetry in strength: ±v are equally far from the centre colour.
        Color plus = d.colour(40);
        Color minus = d.colour(-40);
        int dp = Math.abs(plus.getRed() - zero.getRed()) + Math.abs(plus.getGreen() - zero.getGreen())
            + Math.abs(plus.getBlue() - zero.getBlue());
        int dm = Math.abs(minus.getRed() - zero.getRed()) + Math.abs(minus.getGreen() - zero.getGreen())
            + Math.abs(minus.getBlue() - zero.getBlue());
        assertTrue(Math.abs(dp - dm) < 0.25 * Math.max(dp, dm), "±40 differ in strength: " + dp + " vs " + dm);
        assertTrue(plus.getRed() > plus.getBlue() && minus.getBlue() > minus.getRed(), "positive red, negative blue");

        ColourScale s = FieldSliceHeatMap.of(slice("magnitude")).colourScale();
        assertEquals(0.0, s.getLowerBound());
        assertEquals(72.5, s.getUpperBound(), 1e-9);
        // Brightness (sum of channels) rises monotonically along the sequential ramp.
        int last = -1;
        for (int q = 0; q <= 50; q++) {
            Color c = s.colour(72.5 * q / 50);
            int b = c.getRed() + c.getGreen() + c.getBlue();
            assertTrue(b >= last, "sequential ramp darkens at step " + q);
            last = b;
        }
    }

    @Test
    void writesPngWithEqualScalesOnBothAxes() throws Exception {
        FieldSliceHeatMap map = FieldSliceHeatMap.of(slice("x"))
            .withOutline(List.of(List.of(new Point2D.Double(0, 0), new Point2D.Double(0.03, 0),
                new Point2D.Double(0.03, 0.04), new Point2D.Double(0, 0.04), new Point2D.Double(0, 0))));
        Path png = map.writePng(tmp.resolve("h.png"));
        BufferedImage img = ImageIO.read(png.toFile());
        assertEquals(FieldSliceHeatMap.WIDTH, img.getWidth());
        int h = map.suggestedHeight(FieldSliceHeatMap.WIDTH);
        assertEquals(h, img.getHeight());
        assertTrue(Pixels.distinctColours(img) > 40, "image looks uniform");

        JFreeChart chart = map.chart();
        ChartRenderingInfo info = new ChartRenderingInfo();
        ChartStyle.render(chart, FieldSliceHeatMap.WIDTH, h, info);
        Rectangle2D area = info.getPlotInfo().getDataArea();
        XYPlot plot = chart.getXYPlot();
        double sx = area.getWidth() / plot.getDomainAxis().getRange().getLength();
        double sy = area.getHeight() / plot.getRangeAxis().getRange().getLength();
        assertEquals(1.0, sy / sx, 0.01, "pixels per metre: x " + sx + ", y " + sy);
        // The outline is drawn in ink over the cells.
        assertTrue(Pixels.count(img, ChartStyle.INK.getRGB(), 8) > 400, "outline missing");
    }
}
