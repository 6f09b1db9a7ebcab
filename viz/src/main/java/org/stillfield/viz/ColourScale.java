package org.stillfield.viz;

import java.awt.Color;
import java.awt.Paint;
import org.jfree.chart.renderer.PaintScale;

/**
 * Piecewise-linear colour ramps for heat maps, with a neutral grey for NaN (cells outside the
 * cavity). Two ramps: a diverging one for signed components, white at zero and centred so that
 * ±v get equally strong colours, and a sequential dark-to-light one for magnitudes.
 */
final class ColourScale implements PaintScale {
    /** Deep blue through warm white to deep red; the middle stop is the zero of a signed field. */
    private static final int[] DIVERGING = {
        0x1D3A7A, 0x3F68B0, 0x8FAFD9, 0xD5E0EF, 0xF7F5F0, 0xF1D3C2, 0xDE8E6E, 0xB5493A, 0x7A1F1A};
    /** Night blue through teal to pale sand: brightness rises monotonically. */
    private static final int[] SEQUENTIAL = {
        0x101830, 0x22306A, 0x2A5690, 0x2F8090, 0x4FA57E, 0x9DC46E, 0xE0D77A, 0xFBF3C8};

    private final double lower;
    private final double upper;
    private final Color[] stops;

    private ColourScale(double lower, double upper, int[] rgb) {
        if (!(upper > lower) || !Double.isFinite(lower) || !Double.isFinite(upper)) {
            throw new IllegalArgumentException("colour scale bounds must be finite with upper > lower: [" + lower + ", "
                + upper + "]");
        }
        this.lower = lower;
        this.upper = upper;
        stops = new Color[rgb.length];
        for (int i = 0; i < rgb.length; i++) {
            stops[i] = new Color(rgb[i]);
        }
    }

    /** @return diverging scale on [−bound, bound] */
    static ColourScale diverging(double bound) {
        return new ColourScale(-bound, bound, DIVERGING);
    }

    /** @return sequential scale on [lower, upper] */
    static ColourScale sequential(double lower, double upper) {
        return new ColourScale(lower, upper, SEQUENTIAL);
    }

    @Override
    public double getLowerBound() {
        return lower;
    }

    @Override
    public double getUpperBound() {
        return upper;
    }

    @Override
    public Paint getPaint(double value) {
        return colour(value);
    }

    /** @return the colour of a value; values beyond the bounds take the end colours */
    Color colour(double value) {
        if (Double.isNaN(value)) {
            return ChartStyle.NO_DATA;
        }
        double t = (value - lower) / (upper - lower);
        t = Math.max(0.0, Math.min(1.0, t));
        double pos = t * (stops.length - 1);
        int k = Math.min(stops.length - 2, (int) Math.floor(pos));
        double f = pos - k;
        Color a = stops[k];
        Color b = stops[k + 1];
        return new Color(mix(a.getRed(), b.getRed(), f), mix(a.getGreen(), b.getGreen(), f),
            mix(a.getBlue(), b.getBlue(), f));
    }

    private static int mix(int a, int b, double f) {
        return (int) Math.round(a + (b - a) * f);
    }
}
