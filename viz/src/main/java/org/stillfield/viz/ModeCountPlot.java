package org.stillfield.viz;

import java.awt.Color;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.annotations.XYDrawableAnnotation;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.CombinedDomainXYPlot;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.renderer.xy.XYStepRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.ModeTable;

/**
 * The mode-count staircase N(k) = #{modes with k_l ≤ k} of a run's mode table against the
 * cavity's smooth estimate {@link Cavity#weylCount(double)}, with the residual N − estimate in
 * a small panel underneath. A missing or doubled family shows up as a residual that drifts
 * away from zero instead of scattering about it.
 *
 * <p>Immutable; {@code with...} methods return modified copies.
 */
public final class ModeCountPlot {
    /** Default PNG width, pixels. */
    public static final int WIDTH = 960;
    /** Default PNG height, pixels. */
    public static final int HEIGHT = 680;

    /** What the horizontal axis shows. */
    public enum Scale {
        /** Wave number k in the filling, rad/m. */
        WAVE_NUMBER,
        /** Resonance frequency f = c_m k / 2π, GHz. */
        FREQUENCY_GHZ
    }

    private static final Color STAIR = new Color(0x1F, 0x5A, 0xA6);
    private static final Color SMOOTH = new Color(0xD9, 0x6C, 0x12);
    private static final Color RESIDUAL = new Color(0x3A, 0x40, 0x4C);

    private final ModeTable table;
    private final Scale scale;
    private final String title;

    private ModeCountPlot(ModeTable table, Scale scale, String title) {
        this.table = table;
        this.scale = scale;
        this.title = title;
    }

    /** @return the plot of a mode table, frequency axis in GHz */
    public static ModeCountPlot of(ModeTable table) {
        Objects.requireNonNull(table, "table");
        if (table.size() == 0) {
            throw new IllegalArgumentException("table must hold at least one mode: 0");
        }
        return new ModeCountPlot(table, Scale.FREQUENCY_GHZ, "Mode count against the smooth (Weyl) estimate");
    }

    /** @return a copy using the given horizontal axis */
    public ModeCountPlot withScale(Scale s) {
        return new ModeCountPlot(table, Objects.requireNonNull(s, "scale"), title);
    }

    /** @return a copy with another title */
    public ModeCountPlot withTitle(String t) {
        return new ModeCountPlot(table, scale, Objects.requireNonNull(t, "title"));
    }

    /** @return horizontal positions of the modes in the chosen scale, sorted ascending */
    public double[] sortedPositions() {
        double[] x = new double[table.size()];
        for (int l = 0; l < x.length; l++) {
            x[l] = toX(table.modes().get(l).k());
        }
        Arrays.sort(x);
        return x;
    }

    private double toX(double k) {
        double c = table.cavity().medium().waveSpeed();
        return scale == Scale.WAVE_NUMBER ? k : c * k / (2 * Math.PI) / 1e9;
    }

    private double toK(double x) {
        double c = table.cavity().medium().waveSpeed();
        return scale == Scale.WAVE_NUMBER ? x : 2 * Math.PI * x * 1e9 / c;
    }

    /** @return the end of the horizontal axis: the truncation frequency of the window */
    double xMax() {
        double kTrunc = table.window().truncationOmega() / table.cavity().medium().waveSpeed();
        return Math.max(toX(kTrunc), sortedPositions()[table.size() - 1]);
    }

    /**
     * The staircase as drawn: (0, 0), then (x_q, N(x_q)) at each distinct mode position x_q, then
     * (xMax, M). A step renderer joins them with a horizontal then a vertical segment, so the
     * value just right of x_q is N(x_q), counting every mode with x_l ≤ x_q.
     */
    XYSeries staircase() {
        double[] x = sortedPositions();
        XYSeries s = new XYSeries("modes enumerated, N", false, true);
        s.add(0.0, 0.0);
        for (int q = 0; q < x.length; q++) {
            // Degenerate modes share x: one step of the full height.
            if (q + 1 < x.length && x[q + 1] == x[q]) {
                continue;
            }
            s.add(x[q], q + 1);
        }
        s.add(xMax(), x.length);
        return s;
    }

    /** @return number of modes at position ≤ x (binary search of the sorted positions) */
    static int countAtOrBelow(double[] sorted, double x) {
        int lo = 0;
        int hi = sorted.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] <= x) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    /** @return the chart */
    public JFreeChart chart() {
        ChartStyle.headless();
        Cavity cavity = table.cavity();
        double[] x = sortedPositions();
        double xEnd = xMax();

        XYSeriesCollection stairs = new XYSeriesCollection(staircase());
        XYSeries smooth = new XYSeries("smooth estimate (Weyl's law)", false, true);
        int samples = 600;
        for (int q = 0; q <= samples; q++) {
            double xq = xEnd * q / samples;
            smooth.add(xq, cavity.weylCount(toK(xq)));
        }
        XYSeriesCollection weyl = new XYSeriesCollection(smooth);

        // Residual: smooth between modes, jumping at each mode; sampled on a fine grid plus
        // the two sides of every jump so the sawtooth is drawn exactly.
        List<double[]> pts = new ArrayList<>();
        int grid = 1200;
        int q = 0;
        for (int g = 0; g <= grid; g++) {
            double xg = xEnd * g / grid;
            while (q < x.length && x[q] <= xg) {
                int before = countAtOrBelow(x, Math.nextDown(x[q]));
                int after = countAtOrBelow(x, x[q]);
                double w = cavity.weylCount(toK(x[q]));
                pts.add(new double[] {x[q], before - w});
                pts.add(new double[] {x[q], after - w});
                q = after;
            }
            pts.add(new double[] {xg, countAtOrBelow(x, xg) - cavity.weylCount(toK(xg))});
        }
        XYSeries res = new XYSeries("N − estimate", false, true);
        for (double[] p : pts) {
            res.add(p[0], p[1]);
        }
        XYSeriesCollection residual = new XYSeriesCollection(res);

        String unit = scale == Scale.WAVE_NUMBER ? "k  (rad/m)" : "f  (GHz)";
        NumberAxis xAxis = ChartStyle.axis(unit);
        xAxis.setRange(0, xEnd);
        ChartStyle.ticks(xAxis, 0, xEnd, 10);
        NumberAxis nAxis = ChartStyle.axis(scale == Scale.WAVE_NUMBER ? "modes with k_l ≤ k" : "modes with f_l ≤ f");
        nAxis.setAutoRangeIncludesZero(true);
        NumberAxis rAxis = ChartStyle.axis("N − estimate");
        rAxis.setAutoRangeIncludesZero(true);

        XYStepRenderer step = new XYStepRenderer();
        step.setSeriesPaint(0, STAIR);
        step.setSeriesStroke(0, ChartStyle.line(2.0f));
        XYLineAndShapeRenderer smoothR = new XYLineAndShapeRenderer(true, false);
        smoothR.setSeriesPaint(0, SMOOTH);
        smoothR.setSeriesStroke(0, ChartStyle.dashed(2.0f));

        XYPlot top = new XYPlot(stairs, null, nAxis, step);
        top.setDataset(1, weyl);
        top.setRenderer(1, smoothR);
        // The dashed estimate is drawn over the staircase so both stay visible where they agree.
        top.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.ticks(nAxis, 0, x.length, 6);
        ChartStyle.stylePlot(top);

        XYLineAndShapeRenderer resR = new XYLineAndShapeRenderer(true, false);
        resR.setSeriesPaint(0, RESIDUAL);
        resR.setSeriesStroke(0, ChartStyle.line(1.0f));
        resR.setDefaultSeriesVisibleInLegend(false);
        XYPlot bottom = new XYPlot(residual, null, rAxis, resR);
        ChartStyle.stylePlot(bottom);
        bottom.addRangeMarker(new ValueMarker(0, ChartStyle.FRAME, ChartStyle.line(1f)));

        double fcX = toX(table.window().omegaC() / cavity.medium().waveSpeed());
        if (fcX < xEnd * 0.999) {
            String name = scale == Scale.WAVE_NUMBER ? "k_c" : "f_c";
            ValueMarker m = new ValueMarker(fcX, ChartStyle.MUTED, ChartStyle.dashed(1f));
            ChartStyle.label(m, String.format(Locale.ROOT, " window %s = %s %s", name, ChartStyle.metres(fcX),
                scale == Scale.WAVE_NUMBER ? "rad/m" : "GHz"), ChartStyle.MUTED, RectangleAnchor.TOP_RIGHT,
                TextAnchor.TOP_LEFT);
            top.addDomainMarker(m);
            bottom.addDomainMarker(new ValueMarker(fcX, ChartStyle.MUTED, ChartStyle.dashed(1f)));
        }

        top.addAnnotation(inset(x, cavity, xEnd, x.length));

        CombinedDomainXYPlot plot = new CombinedDomainXYPlot(xAxis);
        plot.setGap(14);
        plot.add(top, 5);
        plot.add(bottom, 2);

        JFreeChart chart = ChartStyle.chart(title, plot, true);
        String params = ChartStyle.parameters(cavity.parameters());
        String lowest = scale == Scale.WAVE_NUMBER
            ? String.format(Locale.ROOT, "%.4g rad/m", x[0])
            : String.format(Locale.ROOT, "%.4g GHz", x[0]);
        ChartStyle.subtitle(chart, String.format(Locale.ROOT, "%s (%s); %d modes up to %.4g %s; lowest at %s",
            cavity.shape(), params, table.size(), xEnd, scale == Scale.WAVE_NUMBER ? "rad/m" : "GHz", lowest));
        return chart;
    }

    /** Modes shown one by one in the inset. */
    static final int INSET_MODES = 60;

    /**
     * The first modes, where single steps and the window matter, drawn small in the empty
     * upper-left corner of the count panel: at full scale they are a flat line near zero.
     */
    private XYDrawableAnnotation inset(double[] x, Cavity cavity, double xEnd, int total) {
        int shown = Math.min(total, INSET_MODES);
        double xi = Math.min(xEnd, x[shown - 1] * 1.06);
        XYSeries s = new XYSeries("N", false, true);
        s.add(0.0, 0.0);
        int inRange = countAtOrBelow(x, xi);
        for (int q = 0; q < inRange; q++) {
            if (q + 1 < x.length && x[q + 1] == x[q]) {
                continue;
            }
            s.add(x[q], q + 1);
        }
        s.add(xi, inRange);
        XYSeries w = new XYSeries("Weyl", false, true);
        for (int q = 0; q <= 200; q++) {
            double xq = xi * q / 200;
            w.add(xq, cavity.weylCount(toK(xq)));
        }
        NumberAxis ix = new NumberAxis();
        NumberAxis iy = new NumberAxis();
        for (NumberAxis a : new NumberAxis[] {ix, iy}) {
            ChartStyle.styleAxis(a);
            a.setTickLabelFont(ChartStyle.NOTE);
        }
        ix.setRange(0, xi);
        ChartStyle.ticks(ix, 0, xi, 5);
        iy.setAutoRangeIncludesZero(true);
        ChartStyle.ticks(iy, 0, inRange, 4);
        XYStepRenderer step = new XYStepRenderer();
        step.setSeriesPaint(0, STAIR);
        step.setSeriesStroke(0, ChartStyle.line(1.6f));
        XYLineAndShapeRenderer smooth = new XYLineAndShapeRenderer(true, false);
        smooth.setSeriesPaint(0, SMOOTH);
        smooth.setSeriesStroke(0, ChartStyle.dashed(1.6f));
        XYPlot p = new XYPlot(new XYSeriesCollection(s), ix, iy, step);
        p.setDataset(1, new XYSeriesCollection(w));
        p.setRenderer(1, smooth);
        p.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.stylePlot(p);
        double fcX = toX(table.window().omegaC() / cavity.medium().waveSpeed());
        if (fcX < xi) {
            p.addDomainMarker(new ValueMarker(fcX, ChartStyle.MUTED, ChartStyle.dashed(1f)));
        }
        JFreeChart c = new JFreeChart(null, ChartStyle.NOTE, p, false);
        c.setBackgroundPaint(ChartStyle.PAPER);
        c.setBorderVisible(true);
        c.setBorderPaint(ChartStyle.FRAME);
        c.setPadding(new org.jfree.chart.ui.RectangleInsets(4, 4, 4, 8));
        TextTitle t = new TextTitle("close-up: the first " + inRange + " modes", ChartStyle.NOTE);
        t.setPaint(ChartStyle.MUTED);
        c.setTitle(t);
        // Centre in data coordinates of the count panel, whose vertical range is about [0, M].
        return new XYDrawableAnnotation(0.27 * xEnd, 0.68 * total, 380, 185, c);
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
