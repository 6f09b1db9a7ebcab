package org.stillfield.viz;

import java.io.IOException;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.annotations.XYLineAnnotation;
import org.jfree.chart.axis.AxisLocation;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.block.BlockBorder;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYBlockRenderer;
import org.jfree.chart.title.PaintScaleLegend;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.data.xy.DefaultXYZDataset;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Vec3;

/**
 * The correlation matrix of one component over all pairs of a line's points as a heat map: the
 * normalised correlation ρ(r, r′) = C_cc(r, r′)/√(C_cc(r, r) C_cc(r′, r′)), normalised by the mode
 * sum's variances, with the ensemble's estimate below the diagonal and the analytic mode sum above
 * it, so the two halves mirror each other when the ensemble is right. Diverging colour scale on
 * [−1, 1]; grey where the component vanishes identically (a wall point).
 */
public final class CorrelationMatrixMap {
    /** PNG width, pixels. */
    public static final int WIDTH = 820;
    /** PNG height, pixels. */
    public static final int HEIGHT = 720;

    private final Field field;
    private final int component;
    private final List<Vec3> line;
    private final int offset;
    private final List<CorrelationRow> rows;
    private final String title;
    private final long samples;

    private CorrelationMatrixMap(Field field, int component, List<Vec3> line, int offset, List<CorrelationRow> rows,
                                 String title, long samples) {
        this.field = field;
        this.component = component;
        this.line = line;
        this.offset = offset;
        this.rows = rows;
        this.title = title;
        this.samples = samples;
    }

    /**
     * @param field the field
     * @param component c, 0..2
     * @param line the line's points in order, metres
     * @param offset global index of the line's first point
     * @param rows the full-covariance rows of the line (any components; cc rows are used)
     * @param samples N, for the subtitle
     * @param title the chart title
     * @return the map
     */
    public static CorrelationMatrixMap of(Field field, int component, List<Vec3> line, int offset,
                                          List<CorrelationRow> rows, long samples, String title) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(line, "line");
        Objects.requireNonNull(rows, "rows");
        Objects.requireNonNull(title, "title");
        if (component < 0 || component > 2) {
            throw new IllegalArgumentException("component must lie in 0..2: " + component);
        }
        if (line.size() < 2) {
            throw new IllegalArgumentException("line must hold at least 2 points: " + line.size());
        }
        return new CorrelationMatrixMap(field, component, List.copyOf(line), offset, List.copyOf(rows), title, samples);
    }

    /** @return the chart */
    public JFreeChart chart() {
        int n = line.size();
        double[][] est = new double[n][n];
        double[][] ms = new double[n][n];
        for (double[] r : est) {
            java.util.Arrays.fill(r, Double.NaN);
        }
        for (double[] r : ms) {
            java.util.Arrays.fill(r, Double.NaN);
        }
        Map<Integer, Double> var = new HashMap<>();
        for (CorrelationRow r : rows) {
            if (r.field() == field && r.i() == component && r.j() == component && r.first() == r.second()) {
                var.put(r.first(), r.analytic());
            }
        }
        for (CorrelationRow r : rows) {
            if (r.field() != field || r.i() != component || r.j() != component) {
                continue;
            }
            int a = r.first() - offset;
            int b = r.second() - offset;
            if (a < 0 || b < 0 || a >= n || b >= n) {
                continue;
            }
            double va = var.getOrDefault(r.first(), 0.0);
            double vb = var.getOrDefault(r.second(), 0.0);
            if (!(va > 0 && vb > 0) || !r.tested()) {
                continue;
            }
            double norm = Math.sqrt(va * vb);
            est[a][b] = r.estimate() / norm;
            est[b][a] = est[a][b];
            ms[a][b] = r.analytic() / norm;
            ms[b][a] = ms[a][b];
        }
        int axis = varyingAxis();
        double[] pos = new double[n];
        for (int k = 0; k < n; k++) {
            pos[k] = axis >= 0 ? line.get(k).get(axis) : line.get(k).minus(line.get(0)).norm();
        }
        double step = (pos[n - 1] - pos[0]) / (n - 1);
        double[][] data = new double[3][n * n];
        int k = 0;
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                data[0][k] = pos[a];
                data[1][k] = pos[b];
                // Above the diagonal (r′ > r): mode sum; below: ensemble; the diagonal is 1 in both.
                data[2][k] = b > a ? ms[a][b] : est[a][b];
                k++;
            }
        }
        DefaultXYZDataset ds = new DefaultXYZDataset();
        ds.addSeries("rho", data);
        ColourScale scale = ColourScale.diverging(1.0);
        XYBlockRenderer r = new XYBlockRenderer();
        r.setBlockWidth(Math.abs(step));
        r.setBlockHeight(Math.abs(step));
        r.setBlockAnchor(RectangleAnchor.CENTER);
        r.setPaintScale(scale);
        String coord = axis >= 0 ? String.valueOf("xyz".charAt(axis)) : "distance along the line";
        NumberAxis x = ChartStyle.axis(coord + " of r  (m)");
        NumberAxis y = ChartStyle.axis(coord + " of r′  (m)");
        double lo = Math.min(pos[0], pos[n - 1]) - Math.abs(step) / 2;
        double hi = Math.max(pos[0], pos[n - 1]) + Math.abs(step) / 2;
        x.setRange(lo, hi);
        y.setRange(lo, hi);
        ChartStyle.ticks(x, lo, hi, 6);
        ChartStyle.ticks(y, lo, hi, 6);
        XYPlot plot = new XYPlot(ds, x, y, r);
        ChartStyle.stylePlot(plot);
        plot.setDomainGridlinesVisible(false);
        plot.setRangeGridlinesVisible(false);
        plot.setAxisOffset(RectangleInsets.ZERO_INSETS);
        plot.addAnnotation(new XYLineAnnotation(lo, lo, hi, hi, ChartStyle.line(1.2f), ChartStyle.INK));

        NumberAxis barAxis = new NumberAxis("ρ = C(r, r′) / √(C(r, r) C(r′, r′))");
        ChartStyle.styleAxis(barAxis);
        barAxis.setRange(-1, 1);
        ChartStyle.ticks(barAxis, -1, 1, 8);
        PaintScaleLegend bar = new PaintScaleLegend(scale, barAxis);
        bar.setPosition(RectangleEdge.RIGHT);
        bar.setAxisLocation(AxisLocation.BOTTOM_OR_RIGHT);
        bar.setStripWidth(16);
        bar.setStripOutlineVisible(true);
        bar.setStripOutlinePaint(ChartStyle.FRAME);
        bar.setSubdivisionCount(256);
        bar.setAxisOffset(4);
        bar.setMargin(new RectangleInsets(4, 14, 52, 0));
        bar.setFrame(BlockBorder.NONE);
        bar.setBackgroundPaint(ChartStyle.PAPER);
        JFreeChart chart = ChartStyle.chart(title, plot, false);
        ChartStyle.subtitle(chart, String.format(Locale.ROOT,
            "%s: above the diagonal the mode sum, below it the ensemble (N = %d); grey: component vanishes",
            field.column(component), samples));
        chart.addSubtitle(bar);
        return chart;
    }

    private int varyingAxis() {
        Vec3 d = line.get(line.size() - 1).minus(line.get(0));
        int axis = -1;
        for (int c = 0; c < 3; c++) {
            if (Math.abs(d.get(c)) > 1e-9 * d.norm()) {
                if (axis >= 0) {
                    return -1;
                }
                axis = c;
            }
        }
        return axis;
    }

    /** Writes the PNG at the default size. */
    public Path writePng(Path file) throws IOException {
        return ChartStyle.writePng(chart(), file, WIDTH, HEIGHT);
    }
}
