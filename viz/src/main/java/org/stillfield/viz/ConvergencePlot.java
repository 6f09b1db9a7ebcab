package org.stillfield.viz;

import java.io.IOException;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.stillfield.analysis.api.ConvergencePoint;
import org.stillfield.analysis.api.ConvergenceResult;

/**
 * Error of the correlation estimates against the number of samples on log–log axes: the root mean
 * square over the table's rows of (estimate − mode sum)/s₁ for the first N samples (markers), and
 * the expected 1/√N (dashed). A correct ensemble follows the line; a bias bends the markers up at
 * large N.
 */
public final class ConvergencePlot {
    /** PNG width, pixels. */
    public static final int WIDTH = 820;
    /** PNG height, pixels. */
    public static final int HEIGHT = 600;

    private final ConvergenceResult result;
    private final String title;

    private ConvergencePlot(ConvergenceResult result, String title) {
        this.result = result;
        this.title = title;
    }

    /**
     * @param result the convergence of one run, at least two points
     * @param title chart title
     * @return the plot
     */
    public static ConvergencePlot of(ConvergenceResult result, String title) {
        Objects.requireNonNull(result, "result");
        if (result.points().size() < 2) {
            throw new IllegalArgumentException("result must hold at least 2 points: " + result.points().size());
        }
        return new ConvergencePlot(result, Objects.requireNonNull(title, "title"));
    }

    /** @return the chart */
    public JFreeChart chart() {
        XYSeries rms = new XYSeries("rms", true, true);
        XYSeries line = new XYSeries("1/sqrt(N)", true, true);
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        for (ConvergencePoint p : result.points()) {
            rms.add(p.samples(), p.rmsError());
            line.add(p.samples(), p.expected());
            lo = Math.min(lo, Math.min(p.rmsError(), p.expected()));
            hi = Math.max(hi, Math.max(p.rmsError(), p.expected()));
        }
        long n0 = result.points().get(0).samples();
        long n1 = result.points().get(result.points().size() - 1).samples();
        LogAxis x = EstimatorCharts.logAxis("samples N", n0, n1);
        LogAxis y = EstimatorCharts.logAxis("rms of (estimate − mode sum) / s₁", lo, hi);
        XYLineAndShapeRenderer dashed = new XYLineAndShapeRenderer(true, false);
        dashed.setSeriesPaint(0, EstimatorCharts.REFERENCE);
        dashed.setSeriesStroke(0, ChartStyle.dashed(1.8f));
        XYLineAndShapeRenderer dots = new XYLineAndShapeRenderer(true, true);
        dots.setSeriesPaint(0, ChartStyle.componentColour(0, 0));
        dots.setSeriesStroke(0, ChartStyle.line(1.2f));
        dots.setSeriesShape(0, EstimatorCharts.circle(9));
        XYPlot plot = new XYPlot(new XYSeriesCollection(line), x, y, dashed);
        plot.setDataset(1, new XYSeriesCollection(rms));
        plot.setRenderer(1, dots);
        plot.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.stylePlot(plot);
        EstimatorCharts.note(plot, String.format(Locale.ROOT, "slope %.3f%s (expected −0.5)", result.slope(),
            Double.isFinite(result.slopeSe()) ? String.format(Locale.ROOT, " ± %.3f", result.slopeSe()) : ""),
            Math.sqrt((double) n0 * n1), y.getRange().getUpperBound() * 0.85, TextAnchor.TOP_CENTER);
        LegendItemCollection legend = new LegendItemCollection();
        legend.add(EstimatorCharts.markerItem("ensemble prefixes", ChartStyle.componentColour(0, 0),
            EstimatorCharts.circle(9)));
        legend.add(EstimatorCharts.lineItem("1/√N", EstimatorCharts.REFERENCE, ChartStyle.dashed(1.8f)));
        plot.setFixedLegendItems(legend);
        JFreeChart chart = ChartStyle.chart(title, plot, true);
        ChartStyle.subtitle(chart, String.format(Locale.ROOT, "%d rows of the correlation table; s₁ = √(C_ii C_jj + C_ij²),"
            + " the single-sample standard deviation", result.points().get(0).rows()));
        return chart;
    }

    /** Writes the PNG at the default size. */
    public Path writePng(Path file) throws IOException {
        return ChartStyle.writePng(chart(), file, WIDTH, HEIGHT);
    }
}
