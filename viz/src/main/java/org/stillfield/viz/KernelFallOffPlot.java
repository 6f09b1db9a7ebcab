package org.stillfield.viz;

import java.awt.Color;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;
import org.stillfield.analysis.EstimatorTables;
import org.stillfield.analysis.api.KernelPoint;
import org.stillfield.analysis.api.PowerLawFit;
import org.stillfield.sampler.api.Field;

/**
 * The kernel's fall-off with separation on log–log axes: K_∥ (and −K_⊥ where it is positive, the
 * A kernel's negative part across the separation) from the sampled per-mode variances (markers ±
 * 1 standard error), the mode sum with the exact variances (solid), the free-space kernel with the
 * same regulator and band (dashed) and the unregularised free-space power law (dotted, slope −2 for
 * E, −4 for A). The fitted exponents are printed in the plot.
 */
public final class KernelFallOffPlot {
    /** PNG width, pixels. */
    public static final int WIDTH = 960;
    /** PNG height, pixels. */
    public static final int HEIGHT = 640;

    private static final Color PAR = ChartStyle.componentColour(2, 2);
    private static final Color PERP = ChartStyle.componentColour(0, 0);

    private final List<KernelPoint> points;
    private final List<PowerLawFit> fits;
    private final String title;
    private final String subtitle;

    private KernelFallOffPlot(List<KernelPoint> points, List<PowerLawFit> fits, String title, String subtitle) {
        this.points = points;
        this.fits = fits;
        this.title = title;
        this.subtitle = subtitle;
    }

    /**
     * @param points the kernel of one field at increasing separations, at least 2
     * @param fits power-law fits to show in the note (may be empty)
     * @param title chart title
     * @param subtitle grey line under the title
     * @return the plot
     */
    public static KernelFallOffPlot of(List<KernelPoint> points, List<PowerLawFit> fits, String title, String subtitle) {
        Objects.requireNonNull(points, "points");
        Objects.requireNonNull(fits, "fits");
        if (points.size() < 2) {
            throw new IllegalArgumentException("points must hold at least 2 separations: " + points.size());
        }
        return new KernelFallOffPlot(List.copyOf(points), List.copyOf(fits), Objects.requireNonNull(title, "title"),
            Objects.requireNonNull(subtitle, "subtitle"));
    }

    /** @return the chart */
    public JFreeChart chart() {
        Field field = points.get(0).field();
        boolean across = field == Field.A;
        YIntervalSeriesCollection est = new YIntervalSeriesCollection();
        XYSeriesCollection ms = new XYSeriesCollection();
        XYSeriesCollection free = new XYSeriesCollection();
        XYSeriesCollection ideal = new XYSeriesCollection();
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        int comps = across ? 2 : 1;
        for (int c = 0; c < comps; c++) {
            double sign = c == 0 ? 1 : -1;
            String name = c == 0 ? "K∥" : "−K⊥";
            YIntervalSeries e = new YIntervalSeries(name, true, true);
            XYSeries m = new XYSeries(name + " mode sum", true, true);
            XYSeries f = new XYSeries(name + " free", true, true);
            XYSeries id = new XYSeries(name + " ideal", true, true);
            double top = 0;
            for (KernelPoint p : points) {
                top = Math.max(top, sign * (c == 0 ? p.parallel() : p.perpendicular()));
            }
            for (KernelPoint p : points) {
                double v = sign * (c == 0 ? p.parallel() : p.perpendicular());
                if (v < 1e-6 * top) {
                    // A component that (nearly) vanishes, e.g. on a wall, would only stretch the log axis.
                    continue;
                }
                double se = c == 0 ? p.parallelSe() : p.perpendicularSe();
                double r = p.separationM();
                if (v > 0) {
                    // Log axes: clip the lower bar at a tenth of the value when the error exceeds it.
                    e.add(r, v, Math.max(v - se, 0.1 * v), v + se);
                    lo = Math.min(lo, Math.max(v - se, 0.1 * v));
                    hi = Math.max(hi, v + se);
                }
                double mv = sign * (c == 0 ? p.modeSumParallel() : p.modeSumPerpendicular());
                if (mv > 0) {
                    m.add(r, mv);
                }
                double fv = sign * (c == 0 ? p.freeParallel() : p.freePerpendicular());
                if (fv > 0) {
                    f.add(r, fv);
                }
                double iv = sign * (c == 0 ? p.idealParallel() : p.idealPerpendicular());
                if (iv > 0) {
                    id.add(r, iv);
                    lo = Math.min(lo, iv);
                    hi = Math.max(hi, iv);
                }
            }
            est.addSeries(e);
            ms.addSeries(m);
            free.addSeries(f);
            ideal.addSeries(id);
        }
        double rLo = points.get(0).separationM();
        double rHi = points.get(points.size() - 1).separationM();
        LogAxis x = EstimatorCharts.logAxis("separation r  (m)", rLo, rHi);
        LogAxis y = EstimatorCharts.logAxis("kernel   [" + EstimatorTables.kernelUnit(field).replace("^2", "²")
            .replace("m^6", "m⁶").replace("*", "·") + "]", lo, hi);
        XYLineAndShapeRenderer solid = renderer(ChartStyle.line(2.2f));
        XYLineAndShapeRenderer dashed = renderer(ChartStyle.dashed(1.6f));
        XYLineAndShapeRenderer dotted = renderer(new java.awt.BasicStroke(1.6f, java.awt.BasicStroke.CAP_ROUND,
            java.awt.BasicStroke.JOIN_ROUND, 1f, new float[] {1.5f, 3.5f}, 0f));
        XYErrorRenderer bars = EstimatorCharts.errorBars();
        bars.setSeriesPaint(0, PAR);
        bars.setSeriesPaint(1, PERP);
        bars.setSeriesShape(0, EstimatorCharts.circle(7.5));
        bars.setSeriesShape(1, EstimatorCharts.square(7));
        XYPlot plot = new XYPlot(ms, x, y, solid);
        plot.setDataset(1, free);
        plot.setRenderer(1, dashed);
        plot.setDataset(2, ideal);
        plot.setRenderer(2, dotted);
        plot.setDataset(3, est);
        plot.setRenderer(3, bars);
        plot.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.stylePlot(plot);

        List<String> lines = new ArrayList<>();
        for (PowerLawFit f : fits) {
            if (!f.quantity().endsWith("sampled")) {
                continue;
            }
            PowerLawFit exact = fits.stream().filter(g -> g.quantity().equals(f.quantity().replace("sampled", "mode sum")))
                .findFirst().orElse(null);
            String what = f.quantity().contains("parallel - perpendicular") ? "K∥ − K⊥" : "K∥";
            lines.add(String.format(Locale.ROOT, "%s %.2f ± %.2f (samples)%s", what, f.exponent(), f.exponentSe(),
                exact == null ? "" : String.format(Locale.ROOT, ", %.2f (mode sum)", exact.exponent())));
        }
        String fitLine = null;
        if (!lines.isEmpty()) {
            PowerLawFit f0 = fits.get(0);
            fitLine = String.format(Locale.ROOT, "fitted slopes, %s–%s m: %s; free space %.0f",
                EstimatorCharts.num(f0.rMinM()), EstimatorCharts.num(f0.rMaxM()), String.join(";  ", lines), f0.expected());
        }
        LegendItemCollection legend = new LegendItemCollection();
        legend.add(EstimatorCharts.markerItem("K∥ from samples ± 1 s.e.", PAR, EstimatorCharts.circle(7.5)));
        if (across) {
            legend.add(EstimatorCharts.markerItem("−K⊥ from samples", PERP, EstimatorCharts.square(7)));
        }
        legend.add(EstimatorCharts.lineItem("mode sum", ChartStyle.INK, ChartStyle.line(2.2f)));
        legend.add(EstimatorCharts.lineItem("free space, same regulator", ChartStyle.INK, ChartStyle.dashed(1.6f)));
        legend.add(EstimatorCharts.lineItem(field == Field.A ? "free space 2(2r̂r̂ − δ)/π²r⁴" : "free space r̂r̂/π²r²",
            ChartStyle.INK, dotted.getSeriesStroke(0)));
        plot.setFixedLegendItems(legend);
        JFreeChart chart = ChartStyle.chart(title, plot, true);
        ChartStyle.subtitle(chart, subtitle);
        if (fitLine != null) {
            ChartStyle.subtitle(chart, fitLine);
        }
        return chart;
    }

    private static XYLineAndShapeRenderer renderer(java.awt.Stroke stroke) {
        XYLineAndShapeRenderer r = new XYLineAndShapeRenderer(true, false);
        r.setSeriesPaint(0, PAR);
        r.setSeriesPaint(1, PERP);
        r.setSeriesStroke(0, stroke);
        r.setSeriesStroke(1, stroke);
        return r;
    }

    /** Writes the PNG at the default size. */
    public Path writePng(Path file) throws IOException {
        return ChartStyle.writePng(chart(), file, WIDTH, HEIGHT);
    }
}
