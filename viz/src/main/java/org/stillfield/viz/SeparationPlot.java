package org.stillfield.viz;

import java.awt.Color;
import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.CombinedDomainXYPlot;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.Range;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;
import org.stillfield.analysis.api.SeparationBin;
import org.stillfield.sampler.api.Field;

/**
 * Translation-averaged correlation against separation: the components along (C_∥) and across (C_⊥)
 * the separation, averaged over the point pairs of each bin. Upper panel: ensemble estimates ± 1
 * standard error (markers), the mode sum averaged over the same pairs (solid), free space with the
 * same window (dashed) and free space plus the nearest wall's image (dotted). Lower panel: the
 * deviation from the mode sum in standard errors.
 */
public final class SeparationPlot {
    /** PNG width, pixels. */
    public static final int WIDTH = 960;
    /** PNG height, pixels. */
    public static final int HEIGHT = 700;

    private static final Color PAR = ChartStyle.componentColour(2, 2);
    private static final Color PERP = ChartStyle.componentColour(0, 0);

    private final List<SeparationBin> bins;
    private final String title;
    private final String subtitle;

    private SeparationPlot(List<SeparationBin> bins, String title, String subtitle) {
        this.bins = bins;
        this.title = title;
        this.subtitle = subtitle;
    }

    /**
     * @param bins the bins of one field, at least one
     * @param title chart title
     * @param subtitle grey line under the title
     * @return the plot
     */
    public static SeparationPlot of(List<SeparationBin> bins, String title, String subtitle) {
        Objects.requireNonNull(bins, "bins");
        if (bins.isEmpty()) {
            throw new IllegalArgumentException("bins must hold at least one bin");
        }
        return new SeparationPlot(List.copyOf(bins), Objects.requireNonNull(title, "title"),
            Objects.requireNonNull(subtitle, "subtitle"));
    }

    /** @return the chart */
    public JFreeChart chart() {
        Field field = bins.get(0).field();
        double mag = 0;
        for (SeparationBin b : bins) {
            mag = Math.max(mag, Math.max(Math.abs(b.parallel()) + b.parallelSe(), Math.abs(b.modeSumParallel())));
            mag = Math.max(mag, Math.abs(b.perpendicular()) + b.perpendicularSe());
        }
        UnitScale us = UnitScale.forCorrelation(field.unit(), mag);
        YIntervalSeriesCollection est = new YIntervalSeriesCollection();
        XYSeriesCollection ms = new XYSeriesCollection();
        XYSeriesCollection free = new XYSeriesCollection();
        XYSeriesCollection image = new XYSeriesCollection();
        XYSeriesCollection dev = new XYSeriesCollection();
        String[] names = {"C∥", "C⊥"};
        boolean hasFree = false;
        boolean hasImage = false;
        for (int c = 0; c < 2; c++) {
            YIntervalSeries e = new YIntervalSeries(names[c] + " ensemble", false, true);
            XYSeries m = new XYSeries(names[c] + " mode sum", true, true);
            XYSeries f = new XYSeries(names[c] + " free", true, true);
            XYSeries im = new XYSeries(names[c] + " image", true, true);
            XYSeries z = new XYSeries(names[c] + " z", true, true);
            for (SeparationBin b : bins) {
                double x = b.meanM();
                double v = c == 0 ? b.parallel() : b.perpendicular();
                double se = c == 0 ? b.parallelSe() : b.perpendicularSe();
                e.add(x, us.apply(v), us.apply(v - se), us.apply(v + se));
                m.add(x, us.apply(c == 0 ? b.modeSumParallel() : b.modeSumPerpendicular()));
                double fv = c == 0 ? b.freeParallel() : b.freePerpendicular();
                if (Double.isFinite(fv)) {
                    f.add(x, us.apply(fv));
                    hasFree = true;
                }
                double iv = c == 0 ? b.imageParallel() : b.imagePerpendicular();
                if (Double.isFinite(iv)) {
                    im.add(x, us.apply(iv));
                    hasImage = true;
                }
                z.add(x, c == 0 ? b.zParallel() : b.zPerpendicular());
            }
            est.addSeries(e);
            ms.addSeries(m);
            free.addSeries(f);
            image.addSeries(im);
            dev.addSeries(z);
        }
        NumberAxis x = ChartStyle.axis("separation |r′ − r|, mean over the bin  (m)");
        NumberAxis y = ChartStyle.axis("C   [" + us.label() + "]");
        XYPlot top = new XYPlot(ms, null, y, lines(2.2f, false));
        top.setDataset(1, free);
        top.setRenderer(1, lines(1.6f, true));
        top.setDataset(2, image);
        XYLineAndShapeRenderer dotted = new XYLineAndShapeRenderer(true, false);
        for (int s = 0; s < 2; s++) {
            dotted.setSeriesPaint(s, s == 0 ? PAR : PERP);
            dotted.setSeriesStroke(s, new java.awt.BasicStroke(1.4f, java.awt.BasicStroke.CAP_ROUND,
                java.awt.BasicStroke.JOIN_ROUND, 1f, new float[] {1.5f, 3.5f}, 0f));
        }
        top.setRenderer(2, dotted);
        top.setDataset(3, est);
        XYErrorRenderer bars = EstimatorCharts.errorBars();
        bars.setSeriesPaint(0, PAR);
        bars.setSeriesPaint(1, PERP);
        bars.setSeriesShape(0, EstimatorCharts.circle(7.5));
        bars.setSeriesShape(1, EstimatorCharts.square(7));
        top.setRenderer(3, bars);
        top.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.stylePlot(top);
        top.addRangeMarker(new ValueMarker(0, ChartStyle.FRAME, ChartStyle.line(1f)));

        NumberAxis zAxis = ChartStyle.axis("deviation / s.e.");
        XYLineAndShapeRenderer dots = new XYLineAndShapeRenderer(false, true);
        dots.setSeriesPaint(0, PAR);
        dots.setSeriesPaint(1, PERP);
        dots.setSeriesShape(0, EstimatorCharts.circle(6.5));
        dots.setSeriesShape(1, EstimatorCharts.square(6));
        XYPlot bottom = new XYPlot(dev, null, zAxis, dots);
        ChartStyle.stylePlot(bottom);
        bottom.addRangeMarker(new ValueMarker(0, ChartStyle.FRAME, ChartStyle.line(1f)));
        double zMax = 0;
        for (SeparationBin b : bins) {
            zMax = Math.max(zMax, Math.max(Math.abs(b.zParallel()), Math.abs(b.zPerpendicular())));
        }
        double zr = Math.max(3.5, Math.ceil(zMax * 1.15 + 0.2));
        zAxis.setRange(new Range(-zr, zr));
        ChartStyle.ticks(zAxis, -zr, zr, 4);

        CombinedDomainXYPlot plot = new CombinedDomainXYPlot(x);
        plot.setGap(14);
        plot.add(top, 3);
        plot.add(bottom, 1);
        LegendItemCollection legend = new LegendItemCollection();
        legend.add(EstimatorCharts.markerItem("C∥ ensemble ± 1 s.e.", PAR, EstimatorCharts.circle(7.5)));
        legend.add(EstimatorCharts.markerItem("C⊥ ensemble ± 1 s.e.", PERP, EstimatorCharts.square(7)));
        legend.add(EstimatorCharts.lineItem("mode sum", ChartStyle.INK, ChartStyle.line(2.2f)));
        if (hasFree) {
            legend.add(EstimatorCharts.lineItem("free space", ChartStyle.INK, ChartStyle.dashed(1.6f)));
        }
        if (hasImage) {
            legend.add(EstimatorCharts.lineItem("free space + nearest wall's image", ChartStyle.INK, dotted.getSeriesStroke(0)));
        }
        plot.setFixedLegendItems(legend);
        JFreeChart chart = ChartStyle.chart(title, plot, true);
        ChartStyle.subtitle(chart, subtitle);
        return chart;
    }

    private static XYLineAndShapeRenderer lines(float width, boolean dashed) {
        XYLineAndShapeRenderer r = new XYLineAndShapeRenderer(true, false);
        r.setSeriesPaint(0, PAR);
        r.setSeriesPaint(1, PERP);
        for (int s = 0; s < 2; s++) {
            r.setSeriesStroke(s, dashed ? ChartStyle.dashed(width) : ChartStyle.line(width));
        }
        return r;
    }

    /** Writes the PNG at the default size. */
    public Path writePng(Path file) throws IOException {
        return ChartStyle.writePng(chart(), file, WIDTH, HEIGHT);
    }

    static String describe(List<SeparationBin> bins) {
        int pairs = bins.stream().mapToInt(SeparationBin::pairs).sum();
        return String.format(Locale.ROOT, "%d bins, %d point pairs", bins.size(), pairs);
    }
}
