package org.stillfield.viz;

import java.awt.BasicStroke;
import java.awt.Color;
import java.io.IOException;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTickUnit;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.DeviationRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.Range;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;

/**
 * One probe's power spectral density: the Welch estimate as a line inside its shaded χ² confidence
 * band, the analytic spectrum as a dashed line on top, on a logarithmic vertical axis; frequency in
 * GHz. Lines of lossless modes (delta functions, not drawn by a density) are marked by dotted
 * verticals, and the Nyquist frequency by a dashed one. Bins where the estimate or the analytic value
 * is not positive are left out (a log axis cannot show them).
 *
 * <p>Immutable; {@code with...} methods return modified copies.
 */
public final class NoiseSpectrumPlot {
    /** Default PNG width, pixels. */
    public static final int WIDTH = 960;
    /** Default PNG height, pixels. */
    public static final int HEIGHT = 560;

    static final Color ESTIMATE = new Color(0x1F, 0x5A, 0xA6);
    static final Color BAND = new Color(0x1F, 0x5A, 0xA6, 0x48);
    static final Color ANALYTIC = new Color(0xD9, 0x6C, 0x12);

    private final String probe;
    private final String unit;
    private final double[] f;
    private final double[] psd;
    private final double[] lower;
    private final double[] upper;
    private final double[] analytic;
    private final double[] lines;
    private final double nyquistHz;
    private final double confidence;
    private final double loHz;
    private final double hiHz;
    private final String title;
    private final String subtitle;

    private NoiseSpectrumPlot(String probe, String unit, double[] f, double[] psd, double[] lower, double[] upper,
                              double[] analytic, double[] lines, double nyquistHz, double confidence, double loHz,
                              double hiHz, String title, String subtitle) {
        this.probe = probe;
        this.unit = unit;
        this.f = f;
        this.psd = psd;
        this.lower = lower;
        this.upper = upper;
        this.analytic = analytic;
        this.lines = lines;
        this.nyquistHz = nyquistHz;
        this.confidence = confidence;
        this.loHz = loHz;
        this.hiHz = hiHz;
        this.title = title;
        this.subtitle = subtitle;
    }

    /**
     * @param probe probe name
     * @param unit signal unit, e.g. {@code V}
     * @param f bin frequencies, Hz, increasing
     * @param psd estimate per bin, unit²/Hz
     * @param lower lower confidence limit per bin
     * @param upper upper confidence limit per bin
     * @param analytic analytic density per bin (same length)
     * @param lineFrequenciesHz frequencies of lossless lines to mark (may be empty)
     * @param nyquistHz Nyquist frequency, Hz, positive
     * @param confidence level of the band in (0, 1)
     * @return the plot over the whole band
     */
    public static NoiseSpectrumPlot of(String probe, String unit, double[] f, double[] psd, double[] lower,
                                       double[] upper, double[] analytic, double[] lineFrequenciesHz, double nyquistHz,
                                       double confidence) {
        Objects.requireNonNull(probe, "probe");
        Objects.requireNonNull(unit, "unit");
        int n = f.length;
        if (n < 2 || psd.length != n || lower.length != n || upper.length != n || analytic.length != n) {
            throw new IllegalArgumentException("f, psd, lower, upper and analytic must have one equal length >= 2: "
                + n + ", " + psd.length + ", " + lower.length + ", " + upper.length + ", " + analytic.length);
        }
        if (!(nyquistHz > 0) || !Double.isFinite(nyquistHz)) {
            throw new IllegalArgumentException("nyquistHz must be positive and finite: " + nyquistHz);
        }
        if (!(confidence > 0 && confidence < 1)) {
            throw new IllegalArgumentException("confidence must lie in (0, 1): " + confidence);
        }
        return new NoiseSpectrumPlot(probe, unit, f.clone(), psd.clone(), lower.clone(), upper.clone(),
            analytic.clone(), lineFrequenciesHz.clone(), nyquistHz, confidence, f[0], f[n - 1],
            "Power spectral density of '" + probe + "'", null);
    }

    /**
     * @param fLoHz lower edge, Hz
     * @param fHiHz upper edge, Hz, above fLoHz
     * @return a copy showing only [fLo, fHi]
     */
    public NoiseSpectrumPlot withRange(double fLoHz, double fHiHz) {
        if (!(fHiHz > fLoHz) || !Double.isFinite(fLoHz) || !Double.isFinite(fHiHz)) {
            throw new IllegalArgumentException("range must satisfy fLo < fHi, both finite (Hz): [" + fLoHz + ", "
                + fHiHz + "]");
        }
        return new NoiseSpectrumPlot(probe, unit, f, psd, lower, upper, analytic, lines, nyquistHz, confidence, fLoHz,
            fHiHz, title, subtitle);
    }

    /** @return a copy with another title */
    public NoiseSpectrumPlot withTitle(String t) {
        return new NoiseSpectrumPlot(probe, unit, f, psd, lower, upper, analytic, lines, nyquistHz, confidence, loHz,
            hiHz, Objects.requireNonNull(t, "title"), subtitle);
    }

    /** @return a copy with a first subtitle line (e.g. the estimator's settings) */
    public NoiseSpectrumPlot withSubtitle(String s) {
        return new NoiseSpectrumPlot(probe, unit, f, psd, lower, upper, analytic, lines, nyquistHz, confidence, loHz,
            hiHz, title, Objects.requireNonNull(s, "subtitle"));
    }

    /** @return true when the shown span is narrow enough for MHz on the frequency axis */
    boolean megahertz() {
        return hiHz - loHz < 0.5e9;
    }

    /** @return the chart */
    public JFreeChart chart() {
        ChartStyle.headless();
        boolean mhz = megahertz();
        double xScale = mhz ? 1e-6 : 1e-9;
        // Narrow views are drawn relative to their centre so tick labels stay short.
        double xOffset = mhz ? 0.5 * (loHz + hiHz) : 0;
        double peak = 0;
        for (int k = 0; k < f.length; k++) {
            if (f[k] >= loHz && f[k] <= hiHz) {
                peak = Math.max(peak, Math.max(finite(upper[k]), finite(analytic[k])));
            }
        }
        UnitScale us = UnitScale.forCorrelation(unit, peak);
        String yUnit = us.label() + "/Hz";

        YIntervalSeries band = new YIntervalSeries("estimate, " + percent(confidence) + " band", false, false);
        XYSeries model = new XYSeries("analytic", false, false);
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        for (int k = 0; k < f.length; k++) {
            if (f[k] < loHz || f[k] > hiHz) {
                continue;
            }
            double x = (f[k] - xOffset) * xScale;
            if (psd[k] > 0 && lower[k] > 0 && upper[k] > 0) {
                band.add(x, us.apply(psd[k]), us.apply(lower[k]), us.apply(upper[k]));
                lo = Math.min(lo, us.apply(lower[k]));
                hi = Math.max(hi, us.apply(upper[k]));
            }
            if (analytic[k] > 0) {
                model.add(x, us.apply(analytic[k]));
                lo = Math.min(lo, us.apply(analytic[k]));
                hi = Math.max(hi, us.apply(analytic[k]));
            }
        }
        YIntervalSeriesCollection bands = new YIntervalSeriesCollection();
        bands.addSeries(band);
        XYSeriesCollection models = new XYSeriesCollection(model);

        NumberAxis xAxis = ChartStyle.axis(mhz
            ? String.format(Locale.ROOT, "f − %s GHz  (MHz)", ChartStyle.trimZeros(String.format(Locale.ROOT, "%.6f",
                xOffset * 1e-9)))
            : "frequency f  (GHz)");
        LogAxis yAxis = new LogAxis("PSD  [" + yUnit + "]");
        ChartStyle.styleAxis(yAxis);
        yAxis.setBase(10);
        yAxis.setSmallestValue(1e-300);
        // One labelled tick per decade, printed as powers of ten.
        yAxis.setAutoTickUnitSelection(false);
        yAxis.setTickUnit(new NumberTickUnit(1.0));
        yAxis.setMinorTickMarksVisible(true);
        if (hi > 0 && Double.isFinite(lo)) {
            // At most about nine decades: the floor far from every mode says little and squeezes the peaks.
            double floor = Math.max(lo / 2, hi * 1e-9);
            yAxis.setRange(new Range(floor, hi * 3));
        }

        DeviationRenderer dev = new DeviationRenderer(true, false);
        dev.setSeriesPaint(0, ESTIMATE);
        dev.setSeriesFillPaint(0, BAND);
        dev.setSeriesStroke(0, ChartStyle.line(1.2f));
        dev.setAlpha(1f);
        XYLineAndShapeRenderer dashed = new XYLineAndShapeRenderer(true, false);
        dashed.setSeriesPaint(0, ANALYTIC);
        dashed.setSeriesStroke(0, ChartStyle.dashed(1.8f));

        XYPlot plot = new XYPlot(bands, xAxis, yAxis, dev);
        plot.setDataset(1, models);
        plot.setRenderer(1, dashed);
        // The analytic line goes on top of the estimate: where they agree it stays visible.
        plot.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.stylePlot(plot);
        xAxis.setRange(new Range((loHz - xOffset) * xScale, (hiHz - xOffset) * xScale));
        xAxis.setAutoRangeIncludesZero(false);

        for (double line : lines) {
            if (line >= loHz && line <= hiHz) {
                ValueMarker m = new ValueMarker((line - xOffset) * xScale, ChartStyle.MUTED,
                    new BasicStroke(1f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_ROUND, 1f, new float[] {2f, 3f}, 0f));
                plot.addDomainMarker(m);
            }
        }
        if (nyquistHz >= loHz && nyquistHz <= hiHz) {
            ValueMarker m = new ValueMarker((nyquistHz - xOffset) * xScale, ChartStyle.ALERT, ChartStyle.dashed(1.2f));
            ChartStyle.label(m, "Nyquist ", ChartStyle.ALERT, RectangleAnchor.TOP_LEFT, TextAnchor.TOP_RIGHT);
            plot.addDomainMarker(m);
        }

        JFreeChart chart = ChartStyle.chart(title, plot, true);
        if (subtitle != null) {
            ChartStyle.subtitle(chart, subtitle);
        }
        ChartStyle.subtitle(chart, "solid line and shaded band: Welch estimate with its " + percent(confidence)
            + " χ² interval;  dashed: analytic spectrum" + (lines.length > 0 ? ";  dotted: lines of lossless modes" : ""));
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

    private static double finite(double v) {
        return Double.isFinite(v) ? v : 0;
    }

    static String percent(double level) {
        return ChartStyle.trimZeros(String.format(Locale.ROOT, "%.3g", 100 * level)) + " %";
    }
}
