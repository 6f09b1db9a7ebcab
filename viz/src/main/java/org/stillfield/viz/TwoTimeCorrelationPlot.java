package org.stillfield.viz;

import java.awt.Color;
import java.awt.geom.Ellipse2D;
import java.io.IOException;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Objects;
import java.util.function.DoubleUnaryOperator;
import org.jfree.chart.JFreeChart;
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

/**
 * Two-time correlation C_xy(τ) = ⟨x(t+τ) y(t)⟩ of two probes: the ensemble estimate at each lag as a
 * marker with a ±1 standard-error bar, the analytic correlation as a continuous line (evaluated
 * between the lags too, so the oscillation the samples are taken from is visible), and underneath
 * the deviation (estimate − analytic)/SE with guide lines at ±2. The lags of one estimate are
 * correlated, so the deviations wander together; the guide lines are not a test.
 *
 * <p>Immutable; {@code with...} methods return modified copies.
 */
public final class TwoTimeCorrelationPlot {
    /** Default PNG width, pixels. */
    public static final int WIDTH = 960;
    /** Default PNG height, pixels. */
    public static final int HEIGHT = 640;
    /** Analytic points drawn per lag step. */
    static final int OVERSAMPLE = 8;

    private static final Color MARK = new Color(0x1F, 0x5A, 0xA6);
    private static final Color LINE = new Color(0xD9, 0x6C, 0x12);

    private final String x;
    private final String y;
    private final String unit;
    private final double[] tau;
    private final double[] estimate;
    private final double[] se;
    private final DoubleUnaryOperator analytic;
    private final int shown;
    private final String title;
    private final String note;

    private TwoTimeCorrelationPlot(String x, String y, String unit, double[] tau, double[] estimate, double[] se,
                                   DoubleUnaryOperator analytic, int shown, String title, String note) {
        this.x = x;
        this.y = y;
        this.unit = unit;
        this.tau = tau;
        this.estimate = estimate;
        this.se = se;
        this.analytic = analytic;
        this.shown = shown;
        this.title = title;
        this.note = note;
    }

    /**
     * @param x name of the later factor's probe
     * @param y name of the earlier factor's probe
     * @param unit unit of the correlation, e.g. {@code V^2} or {@code V*Wb}
     * @param tau lags, s, increasing from 0 (at least two)
     * @param estimate estimate per lag
     * @param se standard error per lag
     * @param analytic the analytic correlation as a function of τ in seconds
     * @return the plot of every lag given
     */
    public static TwoTimeCorrelationPlot of(String x, String y, String unit, double[] tau, double[] estimate,
                                            double[] se, DoubleUnaryOperator analytic) {
        Objects.requireNonNull(x, "x");
        Objects.requireNonNull(y, "y");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(analytic, "analytic");
        if (tau.length < 2 || estimate.length != tau.length || se.length != tau.length) {
            throw new IllegalArgumentException("tau, estimate and se must have one equal length >= 2: " + tau.length
                + ", " + estimate.length + ", " + se.length);
        }
        String t = x.equals(y) ? "Autocorrelation of '" + x + "'" : "Cross-correlation of '" + x + "' and '" + y + "'";
        return new TwoTimeCorrelationPlot(x, y, unit, tau.clone(), estimate.clone(), se.clone(), analytic, tau.length,
            t, null);
    }

    /**
     * @param lags number of leading lags to draw, in [2, all]
     * @return a copy drawing only those
     */
    public TwoTimeCorrelationPlot withLags(int lags) {
        if (lags < 2 || lags > tau.length) {
            throw new IllegalArgumentException("lags must lie in [2, " + tau.length + "]: " + lags);
        }
        return new TwoTimeCorrelationPlot(x, y, unit, tau, estimate, se, analytic, lags, title, note);
    }

    /** @return a copy with another title */
    public TwoTimeCorrelationPlot withTitle(String t) {
        return new TwoTimeCorrelationPlot(x, y, unit, tau, estimate, se, analytic, shown,
            Objects.requireNonNull(t, "title"), note);
    }

    /** @return a copy with a subtitle line describing the estimate (ensemble size, origins) */
    public TwoTimeCorrelationPlot withNote(String n) {
        return new TwoTimeCorrelationPlot(x, y, unit, tau, estimate, se, analytic, shown, title,
            Objects.requireNonNull(n, "note"));
    }

    /** @return the chart */
    public JFreeChart chart() {
        ChartStyle.headless();
        double big = 0;
        for (int k = 0; k < shown; k++) {
            big = Math.max(big, Math.abs(estimate[k]) + fin(se[k]));
        }
        UnitScale us = UnitScale.forCorrelation(unit, big);
        double step = tau[1] - tau[0];
        XYSeries model = new XYSeries("analytic", false, false);
        int fine = (shown - 1) * OVERSAMPLE;
        for (int i = 0; i <= fine; i++) {
            double t = tau[0] + i * step / OVERSAMPLE;
            model.add(t * 1e9, us.apply(analytic.applyAsDouble(t)));
        }
        YIntervalSeries est = new YIntervalSeries("estimate ± 1 s.e.", false, false);
        XYSeries dev = new XYSeries("deviation", false, false);
        double zMax = 2.5;
        for (int k = 0; k < shown; k++) {
            double e = us.apply(estimate[k]);
            double s = us.apply(fin(se[k]));
            est.add(tau[k] * 1e9, e, e - s, e + s);
            if (se[k] > 0) {
                double z = (estimate[k] - analytic.applyAsDouble(tau[k])) / se[k];
                dev.add(tau[k] * 1e9, z);
                zMax = Math.max(zMax, Math.abs(z));
            }
        }
        XYLineAndShapeRenderer line = new XYLineAndShapeRenderer(true, false);
        line.setSeriesPaint(0, LINE);
        line.setSeriesStroke(0, ChartStyle.line(1.5f));
        XYErrorRenderer bars = new XYErrorRenderer();
        bars.setDrawXError(false);
        bars.setDefaultLinesVisible(false);
        bars.setDefaultShapesVisible(true);
        bars.setCapLength(3);
        bars.setErrorStroke(ChartStyle.line(1f));
        bars.setSeriesPaint(0, MARK);
        double r = shown > 150 ? 3.2 : 5.0;
        bars.setSeriesShape(0, new Ellipse2D.Double(-r / 2, -r / 2, r, r));

        NumberAxis yAxis = ChartStyle.axis("C(τ)  [" + us.label() + "]");
        YIntervalSeriesCollection ests = new YIntervalSeriesCollection();
        ests.addSeries(est);
        XYPlot top = new XYPlot(new XYSeriesCollection(model), null, yAxis, line);
        top.setDataset(1, ests);
        top.setRenderer(1, bars);
        top.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.stylePlot(top);
        top.addRangeMarker(new ValueMarker(0, ChartStyle.FRAME, ChartStyle.line(1f)));

        XYLineAndShapeRenderer dots = new XYLineAndShapeRenderer(false, true);
        dots.setDefaultSeriesVisibleInLegend(false);
        dots.setSeriesPaint(0, ChartStyle.MUTED);
        dots.setSeriesShape(0, new Ellipse2D.Double(-1.6, -1.6, 3.2, 3.2));
        NumberAxis zAxis = ChartStyle.axis("deviation / s.e.");
        XYPlot bottom = new XYPlot(new XYSeriesCollection(dev), null, zAxis, dots);
        ChartStyle.stylePlot(bottom);
        bottom.addRangeMarker(new ValueMarker(0, ChartStyle.FRAME, ChartStyle.line(1f)));
        for (double v : new double[] {-2, 2}) {
            bottom.addRangeMarker(new ValueMarker(v, ChartStyle.MUTED, ChartStyle.dashed(1f)));
        }
        double zr = Math.ceil(zMax * 1.1 + 0.2);
        zAxis.setRange(new Range(-zr, zr));
        ChartStyle.ticks(zAxis, -zr, zr, 4);

        NumberAxis xAxis = ChartStyle.axis("lag τ  (ns)");
        CombinedDomainXYPlot plot = new CombinedDomainXYPlot(xAxis);
        plot.setGap(14);
        plot.add(top, 3);
        plot.add(bottom, 1);
        xAxis.setRange(new Range(tau[0] * 1e9, tau[shown - 1] * 1e9));
        JFreeChart chart = ChartStyle.chart(title, plot, true);
        ChartStyle.subtitle(chart, String.format(Locale.ROOT, "C(τ) = ⟨%s(t+τ) %s(t)⟩, the symmetrised two-time"
            + " correlation%s", x, y, note == null ? "" : ";  " + note));
        ChartStyle.subtitle(chart, "markers: ensemble estimate ± 1 standard error;  line: analytic mode sum;"
            + "  lower panel: dashed guides at ±2");
        return chart;
    }

    /** Writes the chart as a PNG of the default size. */
    public Path writePng(Path file) throws IOException {
        return writePng(file, WIDTH, HEIGHT);
    }

    /** Writes the chart as a PNG of the given size, pixels. */
    public Path writePng(Path file, int width, int height) throws IOException {
        return ChartStyle.writePng(chart(), file, width, height);
    }

    private static double fin(double v) {
        return Double.isFinite(v) ? v : 0;
    }
}
