package org.stillfield.viz;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.TreeMap;
import javax.imageio.ImageIO;
import org.jfree.data.xy.XYSeries;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;

class ModeCountPlotTest {
    @TempDir
    Path tmp;

    private static final double A = 0.030;
    private static final double B = 0.020;
    private static final double D = 0.040;

    private static ModeTable table() {
        Window w = new Window(Window.Kind.HARD, 2 * Math.PI * 30e9, Window.DEFAULT_TOLERANCE);
        return ModeTable.of(RectangularCavity.of(A, B, D, Medium.VACUUM), w, ThermalState.VACUUM, 100_000);
    }

    /**
     * Independent count of box modes by resonance frequency: f = (c/2)√((l/a)² + (m/b)² + (n/d)²)
     * with integers ≥ 0, at most one zero; two polarisations when all are positive, one when one
     * index is zero (Pozar, Microwave Engineering, rectangular cavity section). Returns
     * frequency (GHz) → multiplicity.
     */
    private static TreeMap<Double, Integer> boxModes(double fMaxGhz) {
        TreeMap<Double, Integer> out = new TreeMap<>();
        double c = PhysicalConstants.C;
        for (int l = 0; l < 40; l++) {
            for (int m = 0; m < 40; m++) {
                for (int n = 0; n < 40; n++) {
                    int zeros = (l == 0 ? 1 : 0) + (m == 0 ? 1 : 0) + (n == 0 ? 1 : 0);
                    if (zeros >= 2) {
                        continue;
                    }
                    double f = c / 2 * Math.sqrt(Math.pow(l / A, 2) + Math.pow(m / B, 2) + Math.pow(n / D, 2)) / 1e9;
                    if (f <= fMaxGhz) {
                        out.merge(f, zeros == 0 ? 2 : 1, Integer::sum);
                    }
                }
            }
        }
        return out;
    }

    /** Value a right-continuous step drawn through the series' points takes at x. */
    private static double stepValue(XYSeries s, double x) {
        double y = Double.NaN;
        for (int i = 0; i < s.getItemCount(); i++) {
            if (s.getX(i).doubleValue() <= x) {
                y = s.getY(i).doubleValue();
            }
        }
        return y;
    }

    @Test
    void staircaseCountsModesAtOrBelowEachFrequency() {
        ModeCountPlot plot = ModeCountPlot.of(table());
        XYSeries stairs = plot.staircase();
        TreeMap<Double, Integer> modes = boxModes(30.0);
        List<Double> f = new ArrayList<>(modes.keySet());
        // Midpoints between neighbouring distinct resonances, well away from rounding at a step.
        List<Double> probes = new ArrayList<>(List.of(3.0, 0.5 * (f.get(0) + f.get(1)), 0.5 * (f.get(9) + f.get(10)),
            0.5 * (f.get(40) + f.get(41)), 0.5 * (f.get(f.size() - 2) + f.get(f.size() - 1)), 30.0));
        double[] sorted = plot.sortedPositions();
        for (double x : probes) {
            int want = modes.headMap(x, true).values().stream().mapToInt(Integer::intValue).sum();
            assertEquals(want, stepValue(stairs, x), 0.0, "staircase at " + x + " GHz");
            assertEquals(want, ModeCountPlot.countAtOrBelow(sorted, x), "count at " + x + " GHz");
        }
        int total = modes.values().stream().mapToInt(Integer::intValue).sum();
        assertEquals(total, table().size(), "mode table size against the independent count");
        // Lowest resonance of this box: TE_101, f = (c/2)√(1/a² + 1/d²) = 6.2457 GHz.
        assertEquals(PhysicalConstants.C / 2 * Math.sqrt(1 / (A * A) + 1 / (D * D)) / 1e9, sorted[0], 1e-9);
    }

    @Test
    void waveNumberScaleUsesKDirectly() {
        ModeCountPlot plot = ModeCountPlot.of(table()).withScale(ModeCountPlot.Scale.WAVE_NUMBER);
        // k of TE_101 = π√(1/a² + 1/d²) rad/m.
        assertEquals(Math.PI * Math.sqrt(1 / (A * A) + 1 / (D * D)), plot.sortedPositions()[0], 1e-9);
        // k = 2πf/c: the same independent count, probed between resonances.
        TreeMap<Double, Integer> modes = boxModes(30.0);
        List<Double> f = new ArrayList<>(modes.keySet());
        XYSeries stairs = plot.staircase();
        for (int q : new int[] {0, 5, 25, f.size() - 2}) {
            double fMid = 0.5 * (f.get(q) + f.get(q + 1));
            double k = 2 * Math.PI * fMid * 1e9 / PhysicalConstants.C;
            int want = modes.headMap(fMid, true).values().stream().mapToInt(Integer::intValue).sum();
            assertEquals(want, stepValue(stairs, k), 0.0, "staircase at k = " + k + " rad/m");
        }
    }

    @Test
    void writesPngOfRequestedSize() throws Exception {
        Path png = ModeCountPlot.of(table()).writePng(tmp.resolve("m.png"), 800, 560);
        BufferedImage img = ImageIO.read(png.toFile());
        assertEquals(800, img.getWidth());
        assertEquals(560, img.getHeight());
        assertTrue(Pixels.distinctColours(img) > 50, "image looks uniform");
        // Staircase blue and estimate orange both visible.
        assertTrue(Pixels.count(img, 0x1F5AA6, 10) > 100, "staircase missing");
        assertTrue(Pixels.count(img, 0xD96C12, 10) > 50, "smooth estimate missing");
    }
}
