package org.stillfield.viz;

import java.awt.Color;
import java.awt.Font;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Line2D;
import java.awt.geom.Rectangle2D;
import java.awt.Shape;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import java.util.Set;
import java.util.TreeSet;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItem;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.CombinedDomainXYPlot;
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
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Vec3;

/**
 * Sampled against analytic two-point correlation C_ij(r, r′) of one field, with r fixed and r′
 * running along a line of evaluation points.
 *
 * <p>Upper panel: the ensemble estimate at each point of the line as a marker with a ±1
 * standard-error bar, the analytic mode sum as a line of the same colour. Lower panel: the
 * deviation (estimate − mode sum)/standard error at each point, with the verdict's critical
 * |z| as dashed lines when it is known. The horizontal axis is the coordinate that varies along
 * the line when only one does (e.g. z for a line parallel to the z axis), otherwise the distance
 * from the line's first point; metres in both cases.
 *
 * <p>Immutable; {@code with...} methods return modified copies.
 */
public final class CorrelationLinePlot {
    /** Default PNG width, pixels. */
    public static final int WIDTH = 960;
    /** Default PNG height, pixels. */
    public static final int HEIGHT = 700;

    private final Field field;
    private final List<Vec3> points;
    private final int offset;
    private final int reference;
    private final List<CorrelationRow> rows;
    private final List<TensorComponent> components;
    private final String title;
    private final String referenceLabel;
    private final double threshold;

    private CorrelationLinePlot(Field field, List<Vec3> points, int offset, int reference, List<CorrelationRow> rows,
                                List<TensorComponent> components, String title, String referenceLabel,
                                double threshold) {
        this.field = field;
        this.points = points;
        this.offset = offset;
        this.reference = reference;
        this.rows = rows;
        this.components = components;
        this.title = title;
        this.referenceLabel = referenceLabel;
        this.threshold = threshold;
    }

    /**
     * Collects the rows of one field whose second point r′ lies on the line. All of them must
     * share one first point r (filter the rows first when a line was paired with several).
     *
     * <p>Components default to C_xx and C_zz where the rows hold them, else every diagonal
     * component present, else every component present.
     *
     * @param field the field F
     * @param linePoints the line's points in order, metres (at least 2)
     * @param lineOffset global index of the line's first point, ≥ 0
     * @param rows correlation rows (any fields and points; the matching ones are used)
     * @return the plot
     * @throws IllegalArgumentException when no row matches or the matching rows have several r
     */
    public static CorrelationLinePlot of(Field field, List<Vec3> linePoints, int lineOffset,
                                         List<CorrelationRow> rows) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(linePoints, "linePoints");
        Objects.requireNonNull(rows, "rows");
        if (linePoints.size() < 2) {
            throw new IllegalArgumentException("linePoints must hold at least 2 points: " + linePoints.size());
        }
        if (lineOffset < 0) {
            throw new IllegalArgumentException("lineOffset must be >= 0: " + lineOffset);
        }
        List<CorrelationRow> mine = new ArrayList<>();
        Set<Integer> firsts = new TreeSet<>();
        for (CorrelationRow r : rows) {
            if (r.field() == field && r.second() >= lineOffset && r.second() < lineOffset + linePoints.size()) {
                mine.add(r);
                firsts.add(r.first());
            }
        }
        if (mine.isEmpty()) {
            throw new IllegalArgumentException("rows must hold at least one " + field + " row with r′ on the line (global "
                + lineOffset + " to " + (lineOffset + linePoints.size() - 1) + "): none found");
        }
        if (firsts.size() != 1) {
            throw new IllegalArgumentException("rows on the line must share one reference point r; found first = " + firsts);
        }
        // Row-major order xx, xy, ..., zz so the default choice does not depend on row order.
        Set<Integer> keys = new TreeSet<>();
        mine.forEach(r -> keys.add(3 * r.i() + r.j()));
        List<TensorComponent> present = keys.stream().map(k -> new TensorComponent(k / 3, k % 3)).toList();
        List<TensorComponent> chosen = new ArrayList<>();
        for (TensorComponent c : List.of(TensorComponent.XX, TensorComponent.ZZ)) {
            if (present.contains(c)) {
                chosen.add(c);
            }
        }
        if (chosen.isEmpty()) {
            present.stream().filter(c -> c.i() == c.j()).forEach(chosen::add);
        }
        if (chosen.isEmpty()) {
            chosen.addAll(present);
        }
        int ref = firsts.iterator().next();
        String refLabel = "point #" + ref;
        String t = capitalise(field.description()) + " correlation along a line";
        return new CorrelationLinePlot(field, List.copyOf(linePoints), lineOffset, ref, List.copyOf(mine),
            List.copyOf(chosen), t, refLabel, Double.NaN);
    }

    /**
     * @param list components to draw, each present in the rows
     * @return a copy drawing these components
     */
    public CorrelationLinePlot withComponents(List<TensorComponent> list) {
        Objects.requireNonNull(list, "components");
        if (list.isEmpty()) {
            throw new IllegalArgumentException("components must name at least one component: []");
        }
        for (TensorComponent c : list) {
            boolean found = rows.stream().anyMatch(r -> r.i() == c.i() && r.j() == c.j());
            if (!found) {
                throw new IllegalArgumentException("components: " + c.symbol() + " has no " + field + " rows on this line");
            }
        }
        return new CorrelationLinePlot(field, points, offset, reference, rows, List.copyOf(new LinkedHashSet<>(list)),
            title, referenceLabel, threshold);
    }

    /** @return a copy with another chart title */
    public CorrelationLinePlot withTitle(String newTitle) {
        return new CorrelationLinePlot(field, points, offset, reference, rows, components,
            Objects.requireNonNull(newTitle, "title"), referenceLabel, threshold);
    }

    /** @return a copy naming the reference point r this way (e.g. {@code axis[20]}) */
    public CorrelationLinePlot withReferenceLabel(String label) {
        return new CorrelationLinePlot(field, points, offset, reference, rows, components, title,
            Objects.requireNonNull(label, "referenceLabel"), threshold);
    }

    /**
     * @param criticalZ the verdict's critical |z|, positive; NaN draws no threshold lines
     * @return a copy drawing ±criticalZ in the deviation panel
     */
    public CorrelationLinePlot withThreshold(double criticalZ) {
        if (!Double.isNaN(criticalZ) && !(criticalZ > 0 && Double.isFinite(criticalZ))) {
            throw new IllegalArgumentException("criticalZ must be positive and finite, or NaN for none: " + criticalZ);
        }
        return new CorrelationLinePlot(field, points, offset, reference, rows, components, title, referenceLabel,
            criticalZ);
    }

    /** @return the field */
    public Field field() {
        return field;
    }

    /** @return global index of the reference point r */
    public int reference() {
        return reference;
    }

    /** @return components drawn */
    public List<TensorComponent> components() {
        return components;
    }

    /** @return the rows this plot draws from (field matches, r′ on the line) */
    public List<CorrelationRow> rows() {
        return rows;
    }

    /**
     * Index of the single coordinate that varies along the line, or −1 when more than one does.
     * A coordinate counts as fixed when it changes by less than 1e-9 of the line's length.
     */
    int varyingAxis() {
        Vec3 d = points.get(points.size() - 1).minus(points.get(0));
        double len = d.norm();
        int axis = -1;
        for (int c = 0; c < 3; c++) {
            if (Math.abs(d.get(c)) > 1e-9 * len) {
                if (axis >= 0) {
                    return -1;
                }
                axis = c;
            }
        }
        return axis;
    }

    /**
     * @param k index of a point on the line (0-based)
     * @return its horizontal position, metres: the varying coordinate, or the distance from point 0
     */
    public double position(int k) {
        int axis = varyingAxis();
        Vec3 p = points.get(k);
        return axis >= 0 ? p.get(axis) : p.minus(points.get(0)).norm();
    }

    /** @return horizontal axis label with unit */
    public String positionLabel() {
        int axis = varyingAxis();
        return axis >= 0 ? "xyz".charAt(axis) + "  (m)" : "distance from the line's first point  (m)";
    }

    /** @return the chart */
    public JFreeChart chart() {
        ChartStyle.headless();
        double magnitude = 0;
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (CorrelationRow r : rows) {
            if (isDrawn(r)) {
                double se = finiteOrZero(r.standardError());
                magnitude = Math.max(magnitude, Math.max(Math.abs(r.estimate()) + se, Math.abs(r.analytic())));
                lo = Math.min(lo, Math.min(r.estimate() - se, r.analytic()));
                hi = Math.max(hi, Math.max(r.estimate() + se, r.analytic()));
            }
        }
        UnitScale scale = UnitScale.forCorrelation(field.unit(), magnitude);
        lo = scale.apply(lo);
        hi = scale.apply(hi);

        XYSeriesCollection analytic = new XYSeriesCollection();
        YIntervalSeriesCollection sampled = new YIntervalSeriesCollection();
        XYSeriesCollection deviation = new XYSeriesCollection();
        for (TensorComponent c : components) {
            XYSeries a = new XYSeries(c.symbol() + "  mode sum", true, true);
            YIntervalSeries s = new YIntervalSeries(c.symbol() + "  sampled ± 1 s.e.", true, true);
            XYSeries z = new XYSeries(c.symbol() + "  deviation", true, true);
            for (CorrelationRow r : rows) {
                if (r.i() != c.i() || r.j() != c.j()) {
                    continue;
                }
                double x = position(r.second() - offset);
                double se = finiteOrZero(r.standardError());
                a.add(x, scale.apply(r.analytic()));
                s.add(x, scale.apply(r.estimate()), scale.apply(r.estimate() - se), scale.apply(r.estimate() + se));
                if (Double.isFinite(r.z())) {
                    z.add(x, r.z());
                }
            }
            analytic.addSeries(a);
            sampled.addSeries(s);
            deviation.addSeries(z);
        }

        NumberAxis xAxis = ChartStyle.axis(positionLabel());
        NumberAxis yAxis = ChartStyle.axis("C(r, r′)   [" + scale.label() + "]");
        NumberAxis zAxis = ChartStyle.axis("deviation / s.e.");

        XYLineAndShapeRenderer lines = new XYLineAndShapeRenderer(true, false);
        XYErrorRenderer bars = new XYErrorRenderer();
        bars.setDrawXError(false);
        bars.setDefaultLinesVisible(false);
        bars.setDefaultShapesVisible(true);
        bars.setCapLength(5);
        bars.setErrorStroke(ChartStyle.line(1.3f));
        XYLineAndShapeRenderer dots = new XYLineAndShapeRenderer(false, true);
        dots.setDefaultSeriesVisibleInLegend(false);
        for (int s = 0; s < components.size(); s++) {
            TensorComponent c = components.get(s);
            Color col = ChartStyle.componentColour(c.i(), c.j());
            lines.setSeriesPaint(s, col);
            lines.setSeriesStroke(s, ChartStyle.line(2.2f));
            bars.setSeriesPaint(s, col);
            bars.setSeriesShape(s, marker(s, 7.5));
            dots.setSeriesPaint(s, col);
            dots.setSeriesShape(s, marker(s, 6.5));
        }

        XYPlot top = new XYPlot(analytic, null, yAxis, lines);
        top.setDataset(1, sampled);
        top.setRenderer(1, bars);
        // Markers drawn after the lines so the error bars stay visible where they overlap.
        top.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        ChartStyle.stylePlot(top);
        ValueMarker zeroC = new ValueMarker(0, ChartStyle.FRAME, ChartStyle.line(1f));
        top.addRangeMarker(zeroC);

        XYPlot bottom = new XYPlot(deviation, null, zAxis, dots);
        ChartStyle.stylePlot(bottom);
        bottom.addRangeMarker(new ValueMarker(0, ChartStyle.FRAME, ChartStyle.line(1f)));
        double zMax = 0;
        for (CorrelationRow r : rows) {
            if (isDrawn(r) && Double.isFinite(r.z())) {
                zMax = Math.max(zMax, Math.abs(r.z()));
            }
        }
        if (Double.isFinite(threshold)) {
            for (double v : new double[] {-threshold, threshold}) {
                ValueMarker m = new ValueMarker(v, ChartStyle.ALERT, ChartStyle.dashed(1.3f));
                bottom.addRangeMarker(m);
            }
            ValueMarker label = new ValueMarker(threshold, new Color(0, 0, 0, 0), ChartStyle.line(0.1f));
            ChartStyle.label(label, String.format(Locale.ROOT, "critical |z| = %.2f", threshold), ChartStyle.ALERT,
                RectangleAnchor.TOP_RIGHT, TextAnchor.BOTTOM_RIGHT);
            bottom.addRangeMarker(label);
            zMax = Math.max(zMax, threshold);
        }
        double zr = Math.max(2.5, Math.ceil(zMax * 1.15 + 0.2));
        zAxis.setRange(new Range(-zr, zr));
        ChartStyle.ticks(zAxis, -zr, zr, 4);
        ChartStyle.ticks(yAxis, lo, hi, 8);

        int refIndex = reference - offset;
        if (refIndex >= 0 && refIndex < points.size()) {
            double xr = position(refIndex);
            ValueMarker m = new ValueMarker(xr, ChartStyle.MUTED, ChartStyle.dashed(1f));
            ChartStyle.label(m, " r", ChartStyle.MUTED, RectangleAnchor.TOP_RIGHT, TextAnchor.TOP_LEFT);
            m.setLabelFont(new Font(ChartStyle.FAMILY, Font.ITALIC, 15));
            top.addDomainMarker(m);
            bottom.addDomainMarker(new ValueMarker(xr, ChartStyle.MUTED, ChartStyle.dashed(1f)));
        }

        CombinedDomainXYPlot plot = new CombinedDomainXYPlot(xAxis);
        plot.setGap(14);
        plot.add(top, 3);
        plot.add(bottom, 1);
        xAxis.setLowerMargin(0.02);
        xAxis.setUpperMargin(0.02);
        // One legend entry per component showing both its marker and its line.
        LegendItemCollection legend = new LegendItemCollection();
        for (int s = 0; s < components.size(); s++) {
            TensorComponent c = components.get(s);
            Color col = ChartStyle.componentColour(c.i(), c.j());
            legend.add(new LegendItem(c.symbol(), null, null, null, true, marker(s, 7.5), true, col, false, col,
                ChartStyle.line(1f), true, new Line2D.Double(-11, 0, 11, 0), ChartStyle.line(2.2f), col));
        }
        plot.setFixedLegendItems(legend);

        JFreeChart chart = ChartStyle.chart(title, plot, true);
        StringBuilder sub = new StringBuilder();
        sub.append(field.name()).append(" field, r = ").append(referenceLabel);
        if (refIndex >= 0 && refIndex < points.size()) {
            sub.append(" ").append(ChartStyle.point(points.get(refIndex)));
        }
        sub.append(", r′ along the line");
        int axis = varyingAxis();
        if (axis >= 0) {
            Vec3 p0 = points.get(0);
            List<String> fixed = new ArrayList<>();
            for (int k = 0; k < 3; k++) {
                if (k != axis) {
                    fixed.add("xyz".charAt(k) + " = " + ChartStyle.metres(p0.get(k)));
                }
            }
            sub.append(" (").append(String.join(", ", fixed)).append(" m)");
        }
        ChartStyle.subtitle(chart, sub.toString());
        ChartStyle.subtitle(chart, "markers: ensemble estimate ± 1 standard error;  lines: analytic mode sum");
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

    private boolean isDrawn(CorrelationRow r) {
        for (TensorComponent c : components) {
            if (r.i() == c.i() && r.j() == c.j()) {
                return true;
            }
        }
        return false;
    }

    private static double finiteOrZero(double v) {
        return Double.isFinite(v) ? v : 0.0;
    }

    /** Distinct marker per series: circle, square, diamond, then circles again. */
    private static Shape marker(int series, double size) {
        double h = size / 2;
        switch (series % 3) {
            case 0:
                return new Ellipse2D.Double(-h, -h, size, size);
            case 1:
                return new Rectangle2D.Double(-h * 0.9, -h * 0.9, size * 0.9, size * 0.9);
            default: {
                java.awt.geom.Path2D.Double p = new java.awt.geom.Path2D.Double();
                p.moveTo(0, -h * 1.2);
                p.lineTo(h * 1.2, 0);
                p.lineTo(0, h * 1.2);
                p.lineTo(-h * 1.2, 0);
                p.closePath();
                return p;
            }
        }
    }

    static String capitalise(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }
}
