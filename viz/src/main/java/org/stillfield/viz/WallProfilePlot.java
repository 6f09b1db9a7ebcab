package org.stillfield.viz;

import java.awt.Color;
import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;
import org.stillfield.analysis.api.WallProfileRow;
import org.stillfield.sampler.api.Field;

/**
 * Mean-square field against the distance from a wall: ⟨F²⟩ and its three components from the
 * ensemble (markers ± 1 standard error), the mode sum (solid lines), free space plus the wall's
 * image with the same window (dashed; near that wall it must meet the mode sum) and free space
 * alone (dotted level of ⟨F²⟩).
 */
public final class WallProfilePlot {
    /** PNG width, pixels. */
    public static final int WIDTH = 960;
    /** PNG height, pixels. */
    public static final int HEIGHT = 640;

    private static final Color SUM = ChartStyle.INK;

    private final List<WallProfileRow> rows;
    private final String title;
    private final String subtitle;

    private WallProfilePlot(List<WallProfileRow> rows, String title, String subtitle) {
        this.rows = rows;
        this.title = title;
        this.subtitle = subtitle;
    }

    /**
     * @param rows the profile of one field (four rows per point)
     * @param title chart title
     * @param subtitle grey line under the title
     * @return the plot
     */
    public static WallProfilePlot of(List<WallProfileRow> rows, String title, String subtitle) {
        Objects.requireNonNull(rows, "rows");
        if (rows.isEmpty()) {
            throw new IllegalArgumentException("rows must not be empty");
        }
        return new WallProfilePlot(List.copyOf(rows), Objects.requireNonNull(title, "title"),
            Objects.requireNonNull(subtitle, "subtitle"));
    }

    private static Color colour(int component) {
        return component == 3 ? SUM : ChartStyle.componentColour(component, component);
    }

    /** @return the chart */
    public JFreeChart chart() {
        Field field = rows.get(0).field();
        double mag = 0;
        for (WallProfileRow r : rows) {
            mag = Math.max(mag, Math.max(r.estimate() + r.standardError(), r.modeSum()));
        }
        UnitScale us = UnitScale.forCorrelation(field.unit(), mag);
        YIntervalSeriesCollection est = new YIntervalSeriesCollection();
        XYSeriesCollection ms = new XYSeriesCollection();
        XYSeriesCollection img = new XYSeriesCollection();
        int[] order = {3, 0, 1, 2};
        double freeLevel = Double.NaN;
        for (int c : order) {
            String name = c == 3 ? "⟨" + field.name() + "²⟩" : "⟨" + field.column(c) + "²⟩";
            YIntervalSeries e = new YIntervalSeries(name, true, true);
            XYSeries m = new XYSeries(name + " mode sum", true, true);
            XYSeries im = new XYSeries(name + " image", true, true);
            for (WallProfileRow r : rows) {
                if (r.component() != c) {
                    continue;
                }
                double x = r.distanceM();
                e.add(x, us.apply(r.estimate()), us.apply(r.estimate() - r.standardError()),
                    us.apply(r.estimate() + r.standardError()));
                m.add(x, us.apply(r.modeSum()));
                if (Double.isFinite(r.planeImage())) {
                    im.add(x, us.apply(r.planeImage()));
                }
                if (c == 3 && Double.isFinite(r.freeSpace())) {
                    freeLevel = us.apply(r.freeSpace());
                }
            }
            est.addSeries(e);
            ms.addSeries(m);
            img.addSeries(im);
        }
        NumberAxis x = ChartStyle.axis("distance from the wall  (m)");
        NumberAxis y = ChartStyle.axis("mean square   [" + us.label() + "]");
        XYLineAndShapeRenderer solid = new XYLineAndShapeRenderer(true, false);
        XYLineAndShapeRenderer dashed = new XYLineAndShapeRenderer(true, false);
        XYErrorRenderer bars = EstimatorCharts.errorBars();
        for (int s = 0; s < order.length; s++) {
            Color col = colour(order[s]);
            solid.setSeriesPaint(s, col);
            solid.setSeriesStroke(s, ChartStyle.line(s == 0 ? 2.4f : 1.8f));
            dashed.setSeriesPaint(s, col);
            dashed.setSeriesStroke(s, ChartStyle.dashed(1.4f));
            bars.setSeriesPaint(s, col);
            bars.setSeriesShape(s, s == 0 ? EstimatorCharts.circle(7.5) : EstimatorCharts.square(5.5));
        }
        XYPlot plot = new XYPlot(ms, x, y, solid);
        plot.setDataset(1, img);
        plot.setRenderer(1, dashed);
        plot.setDataset(2, est);
        plot.setRenderer(2, bars);
        plot.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.stylePlot(plot);
        y.setAutoRangeIncludesZero(true);
        if (Double.isFinite(freeLevel)) {
            ValueMarker m = new ValueMarker(freeLevel, EstimatorCharts.REFERENCE, new java.awt.BasicStroke(1.4f,
                java.awt.BasicStroke.CAP_ROUND, java.awt.BasicStroke.JOIN_ROUND, 1f, new float[] {1.5f, 3.5f}, 0f));
            ChartStyle.label(m, "free space ⟨" + field.name() + "²⟩ ", EstimatorCharts.REFERENCE,
                org.jfree.chart.ui.RectangleAnchor.TOP_RIGHT, org.jfree.chart.ui.TextAnchor.BOTTOM_RIGHT);
            plot.addRangeMarker(m);
        }
        LegendItemCollection legend = new LegendItemCollection();
        for (int c : order) {
            String name = c == 3 ? "⟨" + field.name() + "²⟩" : "⟨" + field.column(c) + "²⟩";
            legend.add(EstimatorCharts.markerItem(name, colour(c), c == 3 ? EstimatorCharts.circle(7.5)
                : EstimatorCharts.square(5.5)));
        }
        legend.add(EstimatorCharts.lineItem("mode sum", SUM, ChartStyle.line(2f)));
        legend.add(EstimatorCharts.lineItem("free space + wall image", SUM, ChartStyle.dashed(1.4f)));
        plot.setFixedLegendItems(legend);
        JFreeChart chart = ChartStyle.chart(title, plot, true);
        ChartStyle.subtitle(chart, subtitle);
        return chart;
    }

    /** Writes the PNG at the default size. */
    public Path writePng(Path file) throws IOException {
        return ChartStyle.writePng(chart(), file, WIDTH, HEIGHT);
    }
}
