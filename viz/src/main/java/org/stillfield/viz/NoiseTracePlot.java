package org.stillfield.viz;

import java.awt.Color;
import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.CombinedDomainXYPlot;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.HorizontalAlignment;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.data.Range;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;

/**
 * The start of one trajectory of every probe, one panel per probe over a shared time axis (ns),
 * each in its own SI-prefixed unit, with dashed lines at ±σ of the analytic stationary variance so
 * the reader can judge the spread by eye. Samples are joined by straight lines: the step is the
 * simulation's, and nothing between samples is drawn.
 *
 * <p>Immutable; {@code with...} methods return modified copies.
 */
public final class NoiseTracePlot {
    /** Default PNG width, pixels. */
    public static final int WIDTH = 960;
    /** Height per probe panel, pixels (plus room for titles). */
    public static final int PANEL_HEIGHT = 220;

    private final List<String> names;
    private final List<String> units;
    private final double[][] traces;
    private final double[] sigma;
    private final double dt;
    private final int shown;
    private final String title;

    private NoiseTracePlot(List<String> names, List<String> units, double[][] traces, double[] sigma, double dt,
                           int shown, String title) {
        this.names = names;
        this.units = units;
        this.traces = traces;
        this.sigma = sigma;
        this.dt = dt;
        this.shown = shown;
        this.title = title;
    }

    /**
     * @param names probe names
     * @param units their units
     * @param traces traces[p][n], probe p at step n (equal lengths ≥ 2)
     * @param sigma analytic standard deviation of each probe, same unit
     * @param dtSeconds step, s
     * @return the plot of every step given
     */
    public static NoiseTracePlot of(List<String> names, List<String> units, double[][] traces, double[] sigma,
                                    double dtSeconds) {
        Objects.requireNonNull(names, "names");
        Objects.requireNonNull(units, "units");
        int p = names.size();
        if (p == 0 || units.size() != p || traces.length != p || sigma.length != p) {
            throw new IllegalArgumentException("names, units, traces and sigma must describe the same probes (at least"
                + " one): " + p + ", " + units.size() + ", " + traces.length + ", " + sigma.length);
        }
        int n = traces[0].length;
        for (double[] t : traces) {
            if (t.length != n || n < 2) {
                throw new IllegalArgumentException("traces must have one equal length >= 2: " + t.length);
            }
        }
        if (!(dtSeconds > 0) || !Double.isFinite(dtSeconds)) {
            throw new IllegalArgumentException("dtSeconds must be positive and finite: " + dtSeconds);
        }
        double[][] copy = new double[p][];
        for (int i = 0; i < p; i++) {
            copy[i] = traces[i].clone();
        }
        return new NoiseTracePlot(List.copyOf(names), List.copyOf(units), copy, sigma.clone(), dtSeconds, n,
            "Probe signals, trajectory 0");
    }

    /**
     * @param steps number of leading steps to draw, in [2, trace length]
     * @return a copy drawing only those
     */
    public NoiseTracePlot withSteps(int steps) {
        if (steps < 2 || steps > traces[0].length) {
            throw new IllegalArgumentException("steps must lie in [2, " + traces[0].length + "]: " + steps);
        }
        return new NoiseTracePlot(names, units, traces, sigma, dt, steps, title);
    }

    /** @return a copy with another title */
    public NoiseTracePlot withTitle(String t) {
        return new NoiseTracePlot(names, units, traces, sigma, dt, shown, Objects.requireNonNull(t, "title"));
    }

    /** @return the number of steps drawn */
    public int steps() {
        return shown;
    }

    /** @return the chart */
    public JFreeChart chart() {
        ChartStyle.headless();
        NumberAxis time = ChartStyle.axis("time t  (ns)");
        CombinedDomainXYPlot plot = new CombinedDomainXYPlot(time);
        plot.setGap(12);
        for (int p = 0; p < names.size(); p++) {
            double big = sigma[p];
            for (int n = 0; n < shown; n++) {
                big = Math.max(big, Math.abs(traces[p][n]));
            }
            UnitScale us = UnitScale.forField(units.get(p), Math.max(sigma[p], big / 3));
            XYSeries s = new XYSeries(names.get(p), false, false);
            for (int n = 0; n < shown; n++) {
                s.add(n * dt * 1e9, us.apply(traces[p][n]));
            }
            Color col = colour(p);
            XYLineAndShapeRenderer r = new XYLineAndShapeRenderer(true, false);
            r.setSeriesPaint(0, col);
            r.setSeriesStroke(0, ChartStyle.line(1.3f));
            NumberAxis y = ChartStyle.axis(names.get(p) + "  [" + us.label() + "]");
            XYPlot sub = new XYPlot(new XYSeriesCollection(s), null, y, r);
            ChartStyle.stylePlot(sub);
            sub.addRangeMarker(new ValueMarker(0, ChartStyle.FRAME, ChartStyle.line(1f)));
            for (double v : new double[] {-sigma[p], sigma[p]}) {
                sub.addRangeMarker(new ValueMarker(us.apply(v), ChartStyle.MUTED, ChartStyle.dashed(1.1f)));
            }
            double lim = us.apply(big) * 1.08;
            y.setRange(new Range(-lim, lim));
            ChartStyle.ticks(y, -lim, lim, 4);
            plot.add(sub, 1);
        }
        time.setRange(new Range(0, (shown - 1) * dt * 1e9));
        JFreeChart chart = ChartStyle.chart(title, plot, false);
        ChartStyle.subtitle(chart, String.format(Locale.ROOT, "first %d steps of dt = %s ps; dashed: ±1σ of the"
            + " analytic stationary variance", shown, ChartStyle.trimZeros(String.format(Locale.ROOT, "%.4g", dt * 1e12))));
        TextTitle spacer = new TextTitle(" ", ChartStyle.NOTE);
        spacer.setPosition(RectangleEdge.BOTTOM);
        spacer.setHorizontalAlignment(HorizontalAlignment.LEFT);
        chart.addSubtitle(spacer);
        return chart;
    }

    /** @return the colour of probe p, shared by every noise figure */
    static Color colour(int p) {
        int k = p % 6;
        return k < 3 ? ChartStyle.componentColour(k, k) : ChartStyle.componentColour(k - 3, (k - 3 + 1) % 3);
    }

    /** Writes the chart as a PNG of the default size. */
    public Path writePng(Path file) throws IOException {
        return writePng(file, WIDTH, 120 + PANEL_HEIGHT * names.size());
    }

    /** Writes the chart as a PNG of the given size, pixels. */
    public Path writePng(Path file, int width, int height) throws IOException {
        return ChartStyle.writePng(chart(), file, width, height);
    }
}
