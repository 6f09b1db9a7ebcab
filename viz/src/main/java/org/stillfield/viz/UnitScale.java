package org.stillfield.viz;

/**
 * An SI prefix for a field unit chosen so that plotted numbers have one to three digits before
 * the point: a correlation of 1.4e-6 (V/m)² is shown as 1.4 (mV/m)², a field of 3e-12 T as 3 pT.
 *
 * @param factor multiply a value in base units by this to get the plotted number
 * @param label unit label, e.g. {@code mV/m} or {@code (mV/m)²}
 */
record UnitScale(double factor, String label) {
    private static final String[] PREFIX = {"y", "z", "a", "f", "p", "n", "µ", "m", "", "k", "M", "G", "T"};
    private static final int ZERO = 8;

    /**
     * Prefix for field values whose typical magnitude is {@code magnitude}.
     *
     * @param unit base unit, e.g. {@code V/m}
     * @param magnitude a typical |value| in base units; 0, NaN or infinite gives no prefix
     */
    static UnitScale forField(String unit, double magnitude) {
        int p = prefixIndex(magnitude);
        return new UnitScale(Math.pow(10, -3 * (p - ZERO)), PREFIX[p] + ChartStyle.prettyUnit(unit));
    }

    /**
     * Prefix for a two-point correlation (unit squared), plotted in (prefix·unit)². Squaring
     * makes neighbouring prefixes a factor 10⁶ apart, so the prefix is the one that puts
     * {@code magnitude} in [0.001, 1000): 9.4e-7 (V/m)² becomes 0.94 (mV/m)².
     *
     * @param unit base field unit
     * @param magnitude a typical |C| in (unit)²
     */
    static UnitScale forCorrelation(String unit, double magnitude) {
        int p = ZERO;
        if (magnitude > 0 && Double.isFinite(magnitude)) {
            int e = (int) Math.floor((Math.log10(magnitude) - 3) / 6 + 1e-9) + 1;
            p = Math.max(0, Math.min(PREFIX.length - 1, ZERO + e));
        }
        double f = Math.pow(10, -6 * (p - ZERO));
        String u = PREFIX[p] + ChartStyle.prettyUnit(unit);
        // A bare unprefixed symbol squares without brackets (T²); anything else keeps them so that
        // (pT)² and (mV/m)² cannot be misread.
        boolean bare = p == ZERO && u.chars().noneMatch(ch -> ch == '/' || ch == '·');
        return new UnitScale(f, bare ? u + "²" : "(" + u + ")²");
    }

    private static int prefixIndex(double magnitude) {
        if (!(magnitude > 0) || !Double.isFinite(magnitude)) {
            return ZERO;
        }
        int e3 = (int) Math.floor(Math.log10(magnitude) / 3.0 + 1e-9);
        return Math.max(0, Math.min(PREFIX.length - 1, ZERO + e3));
    }

    /** @return the value in plotted units */
    double apply(double v) {
        return v * factor;
    }
}
