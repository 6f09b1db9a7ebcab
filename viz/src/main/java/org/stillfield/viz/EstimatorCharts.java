package org.stillfield.viz;

import java.awt.Color;
import java.awt.Shape;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Line2D;
import java.awt.geom.Rectangle2D;
import java.awt.Graphics2D;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.jfree.chart.LegendItem;
import org.jfree.chart.annotations.XYTextAnnotation;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberTick;
import org.jfree.chart.axis.TickType;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.TextAnchor;

/** Building blocks shared by the estimator charts, in the house style of {@link ChartStyle}. */
final class EstimatorCharts {
    /** Colour of references that are not the exact mode sum (free space, images, fits). */
    static final Color REFERENCE = new Color(0x5C, 0x63, 0x70);
    /** Colour of a fitted line. */
    static final Color FIT = new Color(0xC0, 0x39, 0x2B);

    private EstimatorCharts() {
    }

    /**
     * A base-10 logarithmic axis whose major ticks sit at 1, 2 and 5 × 10^k when the range spans
     * fewer than three decades (at the decades otherwise), labelled as plain numbers between 0.001
     * and 10⁴ and as m×10ⁿ beyond: LogAxis's own ticks step evenly in the exponent, which gives
     * labels such as 10^18.2.
     */
    static final class NiceLogAxis extends LogAxis {
        private static final long serialVersionUID = 1L;

        NiceLogAxis(String label) {
            super(label);
            setBase(10);
            setSmallestValue(1e-300);
            setMinorTickMarksVisible(false);
        }

        @Override
        protected List<NumberTick> refreshTicksHorizontal(Graphics2D g2, Rectangle2D dataArea, RectangleEdge edge) {
            return ticks(TextAnchor.TOP_CENTER);
        }

        @Override
        protected List<NumberTick> refreshTicksVertical(Graphics2D g2, Rectangle2D dataArea, RectangleEdge edge) {
            return ticks(TextAnchor.CENTER_RIGHT);
        }

        private List<NumberTick> ticks(TextAnchor anchor) {
            double lo = getLowerBound();
            double hi = getUpperBound();
            List<NumberTick> out = new ArrayList<>();
            if (!(lo > 0) || !(hi > lo)) {
                return out;
            }
            double decades = Math.log10(hi / lo);
            double[] mult = decades < 1.2 ? new double[] {1, 1.5, 2, 3, 5, 7} : decades < 3.5 ? new double[] {1, 2, 5}
                : new double[] {1};
            int step = decades > 12 ? 2 : 1;
            for (int k = (int) Math.floor(Math.log10(lo)); k <= (int) Math.ceil(Math.log10(hi)); k++) {
                if (mult.length == 1 && Math.floorMod(k, step) != 0) {
                    continue;
                }
                for (double m : mult) {
                    double v = m * Math.pow(10, k);
                    if (v >= lo && v <= hi) {
                        out.add(new NumberTick(TickType.MAJOR, v, label(m, k), anchor, TextAnchor.CENTER, 0.0));
                    }
                }
            }
            return out;
        }

        private static String label(double m, int k) {
            String mant = ChartStyle.trimZeros(String.format(Locale.ROOT, "%.1f", m));
            if (k >= -3 && k <= 3) {
                return ChartStyle.trimZeros(new java.math.BigDecimal(m).scaleByPowerOfTen(k).stripTrailingZeros()
                    .toPlainString());
            }
            String exp = superscript(k);
            return m == 1 ? "10" + exp : mant + "×10" + exp;
        }

        private static String superscript(int k) {
            String digits = "⁰¹²³⁴⁵⁶⁷⁸⁹";
            StringBuilder b = new StringBuilder(k < 0 ? "⁻" : "");
            for (char c : Integer.toString(Math.abs(k)).toCharArray()) {
                b.append(digits.charAt(c - '0'));
            }
            return b.toString();
        }
    }

    /** A log axis with the house look. */
    static LogAxis logAxis(String label) {
        NiceLogAxis a = new NiceLogAxis(label);
        ChartStyle.styleAxis(a);
        return a;
    }

    /** A log axis over [lo, hi] with a small margin in the exponent. */
    static LogAxis logAxis(String label, double lo, double hi) {
        LogAxis a = logAxis(label);
        if (lo > 0 && hi > lo) {
            double l = Math.log10(lo);
            double h = Math.log10(hi);
            double pad = Math.max(0.03, 0.05 * (h - l));
            a.setRange(Math.pow(10, l - pad), Math.pow(10, h + pad));
        }
        return a;
    }

    /** Error bars with markers only. */
    static XYErrorRenderer errorBars() {
        XYErrorRenderer bars = new XYErrorRenderer();
        bars.setDrawXError(false);
        bars.setDefaultLinesVisible(false);
        bars.setDefaultShapesVisible(true);
        bars.setCapLength(5);
        bars.setErrorStroke(ChartStyle.line(1.3f));
        return bars;
    }

    static Shape circle(double size) {
        double h = size / 2;
        return new Ellipse2D.Double(-h, -h, size, size);
    }

    static Shape square(double size) {
        double h = size / 2;
        return new Rectangle2D.Double(-h, -h, size, size);
    }

    /** A legend entry drawn as a line (solid or dashed). */
    static LegendItem lineItem(String label, Color colour, java.awt.Stroke stroke) {
        return new LegendItem(label, null, null, null, false, circle(1), false, colour, false, colour, stroke, true,
            new Line2D.Double(-12, 0, 12, 0), stroke, colour);
    }

    /** A legend entry drawn as a marker. */
    static LegendItem markerItem(String label, Color colour, Shape shape) {
        return new LegendItem(label, null, null, null, true, shape, true, colour, false, colour, ChartStyle.line(1f),
            false, new Line2D.Double(-12, 0, 12, 0), ChartStyle.line(1f), colour);
    }

    /** A note in the plot's upper right corner (data coordinates of that corner). */
    static void note(XYPlot plot, String text, double x, double y, TextAnchor anchor) {
        XYTextAnnotation a = new XYTextAnnotation(text, x, y);
        a.setFont(ChartStyle.NOTE);
        a.setPaint(ChartStyle.INK);
        a.setTextAnchor(anchor);
        a.setBackgroundPaint(new Color(255, 255, 255, 220));
        plot.addAnnotation(a);
    }

    /** Fixed-point with three significant digits, or scientific for extreme values. */
    static String num(double v) {
        if (!Double.isFinite(v)) {
            return String.valueOf(v);
        }
        double a = Math.abs(v);
        if (a != 0 && (a < 1e-3 || a >= 1e5)) {
            return String.format(Locale.ROOT, "%.3g", v);
        }
        return ChartStyle.trimZeros(String.format(Locale.ROOT, "%.4g", v));
    }
}
