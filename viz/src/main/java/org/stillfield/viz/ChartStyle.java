package org.stillfield.viz;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.RenderingHints;
import java.awt.Stroke;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.Locale;
import java.util.Map;
import org.jfree.chart.ChartRenderingInfo;
import org.jfree.chart.ChartUtils;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTickUnit;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.block.BlockBorder;
import org.jfree.chart.plot.Marker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.HorizontalAlignment;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.chart.ui.TextAnchor;

/**
 * The house look of every Stillfield chart: white paper, faint grid, one sans-serif family,
 * consistent colours per tensor component, and PNG output without a display.
 */
final class ChartStyle {
    static {
        // Charts are drawn in batch jobs and CI containers: never ask for a display.
        System.setProperty("java.awt.headless", "true");
    }

    /** Font family: the JDK's logical sans-serif maps to an installed font on every platform. */
    static final String FAMILY = Font.SANS_SERIF;
    static final Font TITLE = new Font(FAMILY, Font.BOLD, 19);
    static final Font SUBTITLE = new Font(FAMILY, Font.PLAIN, 13);
    static final Font AXIS_LABEL = new Font(FAMILY, Font.PLAIN, 15);
    static final Font TICK_LABEL = new Font(FAMILY, Font.PLAIN, 13);
    static final Font LEGEND = new Font(FAMILY, Font.PLAIN, 13);
    static final Font NOTE = new Font(FAMILY, Font.PLAIN, 12);

    static final Color INK = new Color(0x22, 0x26, 0x2E);
    static final Color MUTED = new Color(0x5C, 0x63, 0x70);
    static final Color GRID = new Color(0xE4, 0xE7, 0xEC);
    static final Color FRAME = new Color(0x9A, 0xA1, 0xAC);
    static final Color PAPER = Color.WHITE;
    /** Threshold lines and failed checks. */
    static final Color ALERT = new Color(0xC0, 0x39, 0x2B);
    /** Cells where the field is undefined (outside the cavity). */
    static final Color NO_DATA = new Color(0xB8, 0xBC, 0xC4);

    /** Colours of the diagonal components xx, yy, zz, then the off-diagonal ones. */
    private static final Color[] DIAGONAL = {
        new Color(0x1F, 0x5A, 0xA6), new Color(0x2C, 0x8C, 0x5A), new Color(0xD9, 0x6C, 0x12)};
    private static final Color[] OFF_DIAGONAL = {
        new Color(0x7B, 0x4B, 0xB0), new Color(0x8A, 0x5A, 0x3B), new Color(0xB0, 0x3A, 0x7A)};

    private ChartStyle() {
    }

    /** Forces headless mode; call before the first chart is built. */
    static void headless() {
        // Repeated here so a caller that reaches a chart before this class is loaded is covered too.
        System.setProperty("java.awt.headless", "true");
    }

    /** @return a fixed colour for tensor component (i, j) so every figure agrees */
    static Color componentColour(int i, int j) {
        if (i == j) {
            return DIAGONAL[i];
        }
        int a = Math.min(i, j);
        int b = Math.max(i, j);
        // xy, xz, yz (the transposes share a hue)
        int idx = a == 0 ? (b == 1 ? 0 : 1) : 2;
        return OFF_DIAGONAL[idx];
    }

    static Stroke line(float width) {
        return new BasicStroke(width, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND);
    }

    static Stroke dashed(float width) {
        return new BasicStroke(width, BasicStroke.CAP_BUTT, BasicStroke.JOIN_ROUND, 1f, new float[] {6f, 4f}, 0f);
    }

    /** Builds a chart with the house title, no default legend, and the given plot. */
    static JFreeChart chart(String title, org.jfree.chart.plot.Plot plot, boolean legend) {
        headless();
        JFreeChart chart = new JFreeChart(title, TITLE, plot, legend);
        chart.setBackgroundPaint(PAPER);
        chart.setAntiAlias(true);
        chart.setTextAntiAlias(true);
        chart.getRenderingHints().put(RenderingHints.KEY_STROKE_CONTROL, RenderingHints.VALUE_STROKE_PURE);
        chart.setPadding(new RectangleInsets(10, 12, 10, 16));
        TextTitle t = chart.getTitle();
        t.setPaint(INK);
        t.setHorizontalAlignment(HorizontalAlignment.LEFT);
        t.setMargin(new RectangleInsets(2, 4, 2, 4));
        LegendTitle lt = chart.getLegend();
        if (lt != null) {
            styleLegend(lt);
        }
        return chart;
    }

    static void styleLegend(LegendTitle lt) {
        lt.setItemFont(LEGEND);
        lt.setItemPaint(INK);
        lt.setFrame(BlockBorder.NONE);
        lt.setBackgroundPaint(PAPER);
        lt.setPosition(RectangleEdge.BOTTOM);
        lt.setHorizontalAlignment(HorizontalAlignment.CENTER);
        lt.setItemLabelPadding(new RectangleInsets(2, 4, 2, 14));
        lt.setMargin(new RectangleInsets(6, 0, 0, 0));
    }

    /** Adds a grey, left-aligned subtitle line under the title. */
    static void subtitle(JFreeChart chart, String text) {
        TextTitle s = new TextTitle(text, SUBTITLE);
        s.setPaint(MUTED);
        s.setHorizontalAlignment(HorizontalAlignment.LEFT);
        s.setMargin(new RectangleInsets(0, 4, 4, 4));
        s.setPosition(RectangleEdge.TOP);
        chart.addSubtitle(s);
    }

    /** Paper background, faint grid, no outline clutter. */
    static void stylePlot(XYPlot plot) {
        plot.setBackgroundPaint(PAPER);
        plot.setDomainGridlinePaint(GRID);
        plot.setRangeGridlinePaint(GRID);
        plot.setDomainGridlineStroke(new BasicStroke(1f));
        plot.setRangeGridlineStroke(new BasicStroke(1f));
        plot.setOutlinePaint(FRAME);
        plot.setOutlineStroke(new BasicStroke(1f));
        plot.setAxisOffset(new RectangleInsets(4, 4, 4, 4));
        if (plot.getDomainAxis() != null) {
            styleAxis(plot.getDomainAxis());
        }
        for (int i = 0; i < plot.getRangeAxisCount(); i++) {
            if (plot.getRangeAxis(i) != null) {
                styleAxis(plot.getRangeAxis(i));
            }
        }
    }

    static void styleAxis(ValueAxis axis) {
        axis.setLabelFont(AXIS_LABEL);
        axis.setLabelPaint(INK);
        axis.setTickLabelFont(TICK_LABEL);
        axis.setTickLabelPaint(INK);
        axis.setAxisLinePaint(FRAME);
        axis.setTickMarkPaint(FRAME);
        axis.setTickMarkOutsideLength(4f);
        axis.setTickMarkInsideLength(0f);
        axis.setLabelInsets(new RectangleInsets(4, 4, 4, 4));
        if (axis instanceof NumberAxis) {
            ((NumberAxis) axis).setAutoRangeIncludesZero(false);
        }
    }

    /** A number axis with the house look. */
    static NumberAxis axis(String label) {
        NumberAxis a = new NumberAxis(label);
        styleAxis(a);
        return a;
    }

    /**
     * Renders the chart into an image of exactly width × height pixels.
     *
     * @param info filled with the layout (data area etc.) when not null
     */
    static BufferedImage render(JFreeChart chart, int width, int height, ChartRenderingInfo info) {
        checkSize(width, height);
        return chart.createBufferedImage(width, height, BufferedImage.TYPE_INT_RGB, info);
    }

    /** Writes the chart as a PNG of exactly width × height pixels, creating parent folders. */
    static Path writePng(JFreeChart chart, Path file, int width, int height) throws IOException {
        BufferedImage img = render(chart, width, height, null);
        Path parent = file.toAbsolutePath().getParent();
        if (parent != null) {
            Files.createDirectories(parent);
        }
        try (OutputStream out = Files.newOutputStream(file)) {
            ChartUtils.writeBufferedImageAsPNG(out, img);
        }
        return file;
    }

    static void checkSize(int width, int height) {
        if (width < 200 || width > 8000) {
            throw new IllegalArgumentException("width must be in [200, 8000] pixels: " + width);
        }
        if (height < 150 || height > 8000) {
            throw new IllegalArgumentException("height must be in [150, 8000] pixels: " + height);
        }
    }

    /** Compact number with four significant digits and no trailing zeros, e.g. {@code 0.015}. */
    static String metres(double v) {
        return trimZeros(String.format(Locale.ROOT, "%.4g", v));
    }

    /** Removes trailing zeros of the mantissa: {@code 0.01500 → 0.015}, {@code 2.000e-05 → 2e-05}. */
    static String trimZeros(String s) {
        int e = s.indexOf('e');
        String mant = e >= 0 ? s.substring(0, e) : s;
        String exp = e >= 0 ? s.substring(e) : "";
        if (mant.indexOf('.') >= 0) {
            mant = mant.replaceFirst("0+$", "").replaceFirst("\\.$", "");
        }
        return mant + exp;
    }

    /** Spec keys carry their unit ({@code a_m}): the bare name, e.g. {@code a}. */
    static String parameterName(String key) {
        int u = key.lastIndexOf('_');
        return u > 0 ? key.substring(0, u) : key;
    }

    /** The unit a spec key carries, e.g. {@code m} for {@code a_m}; empty when none. */
    static String parameterUnit(String key) {
        int u = key.lastIndexOf('_');
        return u > 0 ? key.substring(u + 1) : "";
    }

    /** Cavity parameters as {@code a = 0.03 m, b = 0.02 m, d = 0.04 m}. */
    static String parameters(Map<String, Double> params) {
        StringBuilder b = new StringBuilder();
        for (Map.Entry<String, Double> e : params.entrySet()) {
            String unit = parameterUnit(e.getKey());
            b.append(b.length() > 0 ? ", " : "").append(parameterName(e.getKey())).append(" = ")
                .append(metres(e.getValue())).append(unit.isEmpty() ? "" : " " + unit);
        }
        return b.toString();
    }

    /**
     * Sets a fixed tick spacing from the 1–2–2.5–5 series giving about {@code target} labelled ticks
     * over [lo, hi], and a number format with just enough decimals for that spacing. JFreeChart's
     * automatic choice packs vertical axes with a tick every label height, which reads as noise.
     */
    static void ticks(NumberAxis axis, double lo, double hi, int target) {
        double span = hi - lo;
        if (!(span > 0) || !Double.isFinite(span)) {
            return;
        }
        double step = niceStep(span / target);
        int decimals = 0;
        while (decimals < 12 && Math.abs(Math.rint(step * Math.pow(10, decimals)) - step * Math.pow(10, decimals))
            > 1e-6) {
            decimals++;
        }
        DecimalFormat f = new DecimalFormat(decimals == 0 ? "0" : "0." + "0".repeat(decimals),
            DecimalFormatSymbols.getInstance(Locale.ROOT));
        f.setGroupingUsed(false);
        axis.setTickUnit(new NumberTickUnit(step, f));
    }

    /** @return the smallest of 1, 2, 2.5, 5 × 10^k that is ≥ raw */
    static double niceStep(double raw) {
        double p = Math.pow(10, Math.floor(Math.log10(raw)));
        for (double m : new double[] {1, 2, 2.5, 5, 10}) {
            if (m * p >= raw * (1 - 1e-12)) {
                return m * p;
            }
        }
        return 10 * p;
    }

    /** A marker label with the note font on a transparent background. */
    static void label(Marker m, String text, Color paint, RectangleAnchor anchor, TextAnchor textAnchor) {
        m.setLabel(text);
        m.setLabelFont(NOTE);
        m.setLabelPaint(paint);
        m.setLabelBackgroundColor(new Color(255, 255, 255, 0));
        m.setLabelAnchor(anchor);
        m.setLabelTextAnchor(textAnchor);
    }

    /** Point coordinates in metres, e.g. {@code (0.0150, 0.0100, 0.0200) m}. */
    static String point(org.stillfield.sampler.api.Vec3 r) {
        return String.format(Locale.ROOT, "(%s, %s, %s) m", metres(r.x()), metres(r.y()), metres(r.z()));
    }

    /** The field unit as printed: a middle dot for products. */
    static String prettyUnit(String unit) {
        return unit.replace("*", "·");
    }
}
