package org.stillfield.viz;

import java.awt.geom.Path2D;
import java.awt.geom.Point2D;
import java.awt.geom.Rectangle2D;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.jfree.chart.ChartRenderingInfo;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.annotations.XYShapeAnnotation;
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

/**
 * One sample's field on a plane as a heat map: a block per grid cell, a colour bar with the unit,
 * axes in metres along the plane's two coordinates, and optionally the cavity's outline.
 *
 * <p>A signed component is drawn on a diverging scale symmetric about zero (white = 0), the
 * magnitude |F| on a sequential scale from zero; cells where the field is NaN (outside the
 * cavity) are grey. Values are shown with an SI prefix chosen from their size (mV/m, pT, ...).
 * {@link #writePng(Path)} picks the image height so that one metre has the same length on both
 * axes, as a physicist expects of a map of space.
 *
 * <p>Immutable; {@code with...} methods return modified copies.
 */
public final class FieldSliceHeatMap {
    /** Default PNG width, pixels. */
    public static final int WIDTH = 820;

    private final GridSlice slice;
    private final List<List<Point2D>> outline;
    private final String subtitle;

    private FieldSliceHeatMap(GridSlice slice, List<List<Point2D>> outline, String subtitle) {
        this.slice = slice;
        this.outline = outline;
        this.subtitle = subtitle;
    }

    /** @return a heat map of the slice, no outline */
    public static FieldSliceHeatMap of(GridSlice slice) {
        return new FieldSliceHeatMap(Objects.requireNonNull(slice, "slice"), List.of(), "");
    }

    /**
     * @param polylines cavity outline in the slice's (horizontal, vertical) coordinates, metres;
     *     each polyline needs at least 2 finite points (see {@link CavityOutline})
     * @return a copy that draws the outline
     */
    public FieldSliceHeatMap withOutline(List<List<Point2D>> polylines) {
        Objects.requireNonNull(polylines, "polylines");
        List<List<Point2D>> copy = new ArrayList<>();
        for (int k = 0; k < polylines.size(); k++) {
            List<Point2D> line = polylines.get(k);
            if (line == null || line.size() < 2) {
                throw new IllegalArgumentException("polylines[" + k + "] must hold at least 2 points: "
                    + (line == null ? "null" : line.size()));
            }
            for (Point2D p : line) {
                if (!Double.isFinite(p.getX()) || !Double.isFinite(p.getY())) {
                    throw new IllegalArgumentException("polylines[" + k + "] must hold finite points: " + p);
                }
            }
            List<Point2D> pts = new ArrayList<>();
            line.forEach(p -> pts.add(new Point2D.Double(p.getX(), p.getY())));
            copy.add(List.copyOf(pts));
        }
        return new FieldSliceHeatMap(slice, List.copyOf(copy), subtitle);
    }

    /** @return a copy with a grey line of text under the title (empty for none) */
    public FieldSliceHeatMap withSubtitle(String text) {
        return new FieldSliceHeatMap(slice, outline, Objects.requireNonNull(text, "subtitle"));
    }

    /** @return the slice drawn */
    public GridSlice slice() {
        return slice;
    }

    /** SI-prefixed unit of the colour bar. */
    UnitScale unitScale() {
        return UnitScale.forField(slice.unit(), maxAbs());
    }

    /** The colour scale in plotted (prefixed) units. */
    ColourScale colourScale() {
        double m = unitScale().apply(maxAbs());
        if (!(m > 0)) {
            // An all-zero or all-NaN slice still gets a valid scale.
            m = 1.0;
        }
        return slice.isMagnitude() ? ColourScale.sequential(0, m) : ColourScale.diverging(m);
    }

    private double maxAbs() {
        double m = 0;
        double[][] v = slice.values();
        for (double[] row : v) {
            for (double x : row) {
                if (Double.isFinite(x)) {
                    m = Math.max(m, Math.abs(x));
                }
            }
        }
        return m;
    }

    private static double spacing(double[] c, double fallback) {
        return c.length > 1 ? (c[c.length - 1] - c[0]) / (c.length - 1) : fallback;
    }

    /** @return the chart */
    public JFreeChart chart() {
        ChartStyle.headless();
        double[] xc = slice.xCentres();
        double[] yc = slice.yCentres();
        double[][] v = slice.values();
        UnitScale us = unitScale();
        ColourScale scale = colourScale();

        int n = xc.length * yc.length;
        double[][] data = new double[3][n];
        int k = 0;
        for (int iy = 0; iy < yc.length; iy++) {
            for (int ix = 0; ix < xc.length; ix++) {
                data[0][k] = xc[ix];
                data[1][k] = yc[iy];
                data[2][k] = us.apply(v[iy][ix]);
                k++;
            }
        }
        DefaultXYZDataset ds = new DefaultXYZDataset();
        ds.addSeries(slice.symbol(), data);

        double bw = spacing(xc, spacing(yc, 1e-3));
        double bh = spacing(yc, bw);
        XYBlockRenderer r = new XYBlockRenderer();
        r.setBlockWidth(bw);
        r.setBlockHeight(bh);
        r.setBlockAnchor(RectangleAnchor.CENTER);
        r.setPaintScale(scale);

        double[] xr = {xc[0] - bw / 2, xc[xc.length - 1] + bw / 2};
        double[] yr = {yc[0] - bh / 2, yc[yc.length - 1] + bh / 2};
        for (List<Point2D> line : outline) {
            for (Point2D p : line) {
                xr[0] = Math.min(xr[0], p.getX());
                xr[1] = Math.max(xr[1], p.getX());
                yr[0] = Math.min(yr[0], p.getY());
                yr[1] = Math.max(yr[1], p.getY());
            }
        }
        // A thin frame of paper around the cells keeps the outline from merging with the axes.
        double px = 0.025 * (xr[1] - xr[0]);
        double py = 0.025 * (yr[1] - yr[0]);
        NumberAxis xAxis = ChartStyle.axis(slice.xAxis() + "  (m)");
        NumberAxis yAxis = ChartStyle.axis(slice.yAxis() + "  (m)");
        xAxis.setRange(xr[0] - px, xr[1] + px);
        yAxis.setRange(yr[0] - py, yr[1] + py);
        ChartStyle.ticks(xAxis, xr[0], xr[1], 6);
        ChartStyle.ticks(yAxis, yr[0], yr[1], 6);

        XYPlot plot = new XYPlot(ds, xAxis, yAxis, r);
        ChartStyle.stylePlot(plot);
        plot.setDomainGridlinesVisible(false);
        plot.setRangeGridlinesVisible(false);
        plot.setAxisOffset(RectangleInsets.ZERO_INSETS);
        plot.setOutlinePaint(ChartStyle.FRAME);

        if (!outline.isEmpty()) {
            Path2D.Double path = new Path2D.Double();
            for (List<Point2D> line : outline) {
                path.moveTo(line.get(0).getX(), line.get(0).getY());
                for (int q = 1; q < line.size(); q++) {
                    path.lineTo(line.get(q).getX(), line.get(q).getY());
                }
            }
            plot.addAnnotation(new XYShapeAnnotation(path, ChartStyle.line(2.2f), ChartStyle.INK));
        }

        NumberAxis barAxis = new NumberAxis(slice.symbol() + "  (" + us.label() + ")");
        ChartStyle.styleAxis(barAxis);
        barAxis.setRange(scale.getLowerBound(), scale.getUpperBound());
        ChartStyle.ticks(barAxis, scale.getLowerBound(), scale.getUpperBound(), 8);
        PaintScaleLegend bar = new PaintScaleLegend(scale, barAxis);
        bar.setPosition(RectangleEdge.RIGHT);
        bar.setAxisLocation(AxisLocation.BOTTOM_OR_RIGHT);
        bar.setStripWidth(16);
        bar.setStripOutlineVisible(true);
        bar.setStripOutlinePaint(ChartStyle.FRAME);
        bar.setSubdivisionCount(256);
        bar.setAxisOffset(4);
        // Top and bottom insets line the strip up roughly with the data area (the x axis below it).
        bar.setMargin(new RectangleInsets(4, 14, 52, 0));
        bar.setFrame(BlockBorder.NONE);
        bar.setBackgroundPaint(ChartStyle.PAPER);

        JFreeChart chart = ChartStyle.chart(slice.title(), plot, false);
        StringBuilder sub = new StringBuilder(subtitle);
        if (hasNaN(v)) {
            sub.append(sub.length() > 0 ? "; " : "").append("grey cells: outside the cavity");
        }
        if (sub.length() > 0) {
            ChartStyle.subtitle(chart, sub.toString());
        }
        chart.addSubtitle(bar);
        return chart;
    }

    private static boolean hasNaN(double[][] v) {
        for (double[] row : v) {
            for (double x : row) {
                if (Double.isNaN(x)) {
                    return true;
                }
            }
        }
        return false;
    }

    /**
     * Image height at which the data area shows both axes at the same scale, found by laying
     * the chart out once and correcting for the measured data area.
     *
     * @param width image width, pixels
     * @return height, pixels, clamped to [320, 2400]
     */
    public int suggestedHeight(int width) {
        JFreeChart chart = chart();
        XYPlot plot = chart.getXYPlot();
        double xSpan = plot.getDomainAxis().getRange().getLength();
        double ySpan = plot.getRangeAxis().getRange().getLength();
        int h = (int) Math.round(width * ySpan / xSpan);
        h = Math.max(320, Math.min(2400, h));
        for (int pass = 0; pass < 2; pass++) {
            ChartRenderingInfo info = new ChartRenderingInfo();
            ChartStyle.render(chart, width, h, info);
            Rectangle2D area = info.getPlotInfo().getDataArea();
            double want = area.getWidth() * ySpan / xSpan;
            h = (int) Math.round(h + (want - area.getHeight()));
            h = Math.max(320, Math.min(2400, h));
        }
        return h;
    }

    /** Writes a PNG {@link #WIDTH} pixels wide with equal scales on both axes. */
    public Path writePng(Path file) throws IOException {
        return writePng(file, WIDTH, suggestedHeight(WIDTH));
    }

    /** Writes a PNG of the given size, pixels. */
    public Path writePng(Path file, int width, int height) throws IOException {
        return ChartStyle.writePng(chart(), file, width, height);
    }
}
