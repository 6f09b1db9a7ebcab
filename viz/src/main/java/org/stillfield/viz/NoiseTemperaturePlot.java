package org.stillfield.viz;

import java.awt.Color;
import java.awt.Shape;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Line2D;
import java.awt.geom.Rectangle2D;
import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItem;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.Range;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;
import org.stillfield.analysis.spectra.NoiseTemperature;

/**
 * Noise temperatures against frequency: the equivalent temperature T_eq = (ħω/2k_B) coth(ħω/2k_BT)
 * of the state (solid), the quantum limit ħω/2k_B it approaches when k_BT ≪ ħω (grey), the physical
 * temperature T (dashed), and the temperatures measured from the probes' band powers as markers with
 * ±1 standard-error bars, one colour per probe. Temperatures in mK, frequency in GHz.
 *
 * <p>Immutable; {@code with...} methods return modified copies.
 */
public final class NoiseTemperaturePlot {
    /** Default PNG width, pixels. */
    public static final int WIDTH = 960;
    /** Default PNG height, pixels. */
    public static final int HEIGHT = 560;

    private static final Color EQUIVALENT = new Color(0x22, 0x26, 0x2E);
    private static final Color QUANTUM = new Color(0x9A, 0xA1, 0xAC);
    /** Sideways offset between the markers of neighbouring probes, as a fraction of the frequency axis. */
    static final double OFFSET = 0.008;

    /**
     * One measured band.
     *
     * @param probe probe index into the names
     * @param frequencyHz band centre, Hz
     * @param kelvin measured T_eq, K
     * @param seKelvin its standard error, K
     */
    public record Point(int probe, double frequencyHz, double kelvin, double seKelvin) {
    }

    private final List<String> probes;
    private final List<Point> points;
    private final double temperature;
    private final double fMaxHz;
    private final String title;

    private NoiseTemperaturePlot(List<String> probes, List<Point> points, double temperature, double fMaxHz,
                                 String title) {
        this.probes = probes;
        this.points = points;
        this.temperature = temperature;
        this.fMaxHz = fMaxHz;
        this.title = title;
    }

    /**
     * @param probes probe names
     * @param points measured bands
     * @param temperatureKelvin physical temperature of the state, K, ≥ 0
     * @param fMaxHz right end of the frequency axis, Hz, positive
     * @return the plot
     */
    public static NoiseTemperaturePlot of(List<String> probes, List<Point> points, double temperatureKelvin,
                                          double fMaxHz) {
        Objects.requireNonNull(probes, "probes");
        Objects.requireNonNull(points, "points");
        if (!(temperatureKelvin >= 0) || !Double.isFinite(temperatureKelvin)) {
            throw new IllegalArgumentException("temperatureKelvin must be finite and >= 0: " + temperatureKelvin);
        }
        if (!(fMaxHz > 0) || !Double.isFinite(fMaxHz)) {
            throw new IllegalArgumentException("fMaxHz must be positive and finite: " + fMaxHz);
        }
        for (Point p : points) {
            if (p.probe() < 0 || p.probe() >= probes.size()) {
                throw new IllegalArgumentException("point probe index " + p.probe() + " outside [0, " + probes.size() + ")");
            }
        }
        return new NoiseTemperaturePlot(List.copyOf(probes), List.copyOf(points), temperatureKelvin, fMaxHz,
            "Noise temperature of the probe bands");
    }

    /** @return a copy with another title */
    public NoiseTemperaturePlot withTitle(String t) {
        return new NoiseTemperaturePlot(probes, points, temperature, fMaxHz, Objects.requireNonNull(t, "title"));
    }

    /** @return the chart */
    public JFreeChart chart() {
        ChartStyle.headless();
        XYSeries eq = new XYSeries("T_eq", false, false);
        XYSeries q = new XYSeries("quantum limit", false, false);
        int n = 400;
        double top = temperature;
        for (int i = 1; i <= n; i++) {
            double f = fMaxHz * i / n;
            double w = 2 * Math.PI * f;
            eq.add(f * 1e-9, 1e3 * NoiseTemperature.equivalent(w, temperature));
            q.add(f * 1e-9, 1e3 * NoiseTemperature.quantumLimit(w));
            top = Math.max(top, NoiseTemperature.equivalent(w, temperature));
        }
        XYSeriesCollection curves = new XYSeriesCollection();
        curves.addSeries(eq);
        curves.addSeries(q);
        XYLineAndShapeRenderer lines = new XYLineAndShapeRenderer(true, false);
        lines.setSeriesPaint(0, EQUIVALENT);
        lines.setSeriesStroke(0, ChartStyle.line(2f));
        lines.setSeriesPaint(1, QUANTUM);
        lines.setSeriesStroke(1, ChartStyle.line(4f));

        YIntervalSeriesCollection measured = new YIntervalSeriesCollection();
        XYErrorRenderer bars = new XYErrorRenderer();
        bars.setDrawXError(false);
        bars.setDefaultLinesVisible(false);
        bars.setDefaultShapesVisible(true);
        bars.setCapLength(6);
        bars.setErrorStroke(ChartStyle.line(1.4f));
        for (int p = 0; p < probes.size(); p++) {
            YIntervalSeries s = new YIntervalSeries(probes.get(p), false, false);
            // Probes that see the same mode would hide each other: each probe's markers sit a little aside.
            double shift = (p - 0.5 * (probes.size() - 1)) * OFFSET * fMaxHz * 1e-9;
            for (Point pt : points) {
                if (pt.probe() == p) {
                    double se = Double.isFinite(pt.seKelvin()) ? pt.seKelvin() : 0;
                    s.add(pt.frequencyHz() * 1e-9 + shift, 1e3 * pt.kelvin(), 1e3 * (pt.kelvin() - se),
                        1e3 * (pt.kelvin() + se));
                    top = Math.max(top, pt.kelvin() + se);
                }
            }
            measured.addSeries(s);
            bars.setSeriesPaint(p, NoiseTracePlot.colour(p));
            bars.setSeriesShape(p, marker(p));
        }

        NumberAxis xAxis = ChartStyle.axis("frequency f  (GHz)");
        NumberAxis yAxis = ChartStyle.axis("noise temperature  (mK)");
        XYPlot plot = new XYPlot(curves, xAxis, yAxis, lines);
        plot.setDataset(1, measured);
        plot.setRenderer(1, bars);
        plot.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.stylePlot(plot);
        xAxis.setRange(new Range(0, fMaxHz * 1e-9));
        double yTop = 1e3 * top * 1.12;
        yAxis.setRange(new Range(0, yTop));
        ChartStyle.ticks(yAxis, 0, yTop, 6);
        ValueMarker t = new ValueMarker(1e3 * temperature, ChartStyle.ALERT, ChartStyle.dashed(1.3f));
        ChartStyle.label(t, String.format(Locale.ROOT, "physical T = %s mK ", ChartStyle.trimZeros(
            String.format(Locale.ROOT, "%.4g", 1e3 * temperature))), ChartStyle.ALERT, RectangleAnchor.TOP_RIGHT,
            TextAnchor.BOTTOM_RIGHT);
        plot.addRangeMarker(t);

        LegendItemCollection legend = new LegendItemCollection();
        Shape dash = new Line2D.Double(-11, 0, 11, 0);
        legend.add(new LegendItem("T_eq = (hf/2k_B) coth(hf/2k_B T)", null, null, null, dash, ChartStyle.line(2f),
            EQUIVALENT));
        legend.add(new LegendItem("quantum limit hf/2k_B", null, null, null, dash, ChartStyle.line(4f), QUANTUM));
        for (int p = 0; p < probes.size(); p++) {
            Color col = NoiseTracePlot.colour(p);
            legend.add(new LegendItem("measured, " + probes.get(p), null, null, null, marker(p), col));
        }
        plot.setFixedLegendItems(legend);
        JFreeChart chart = ChartStyle.chart(title, plot, true);
        ChartStyle.subtitle(chart, "markers: T_Q × (band power / vacuum band power) from the Welch estimates, ± 1 s.e."
            + " over trajectories" + (probes.size() > 1 ? "; probes drawn slightly apart in f" : ""));
        return chart;
    }

    private static Shape marker(int p) {
        double s = 9;
        return p % 2 == 0 ? new Ellipse2D.Double(-s / 2, -s / 2, s, s)
            : new Rectangle2D.Double(-s * 0.45, -s * 0.45, s * 0.9, s * 0.9);
    }

    /** Writes the chart as a PNG of the default size. */
    public Path writePng(Path file) throws IOException {
        return writePng(file, WIDTH, HEIGHT);
    }

    /** Writes the chart as a PNG of the given size, pixels. */
    public Path writePng(Path file, int width, int height) throws IOException {
        return ChartStyle.writePng(chart(), file, width, height);
    }
}
