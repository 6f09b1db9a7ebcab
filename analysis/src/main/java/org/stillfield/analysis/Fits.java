package org.stillfield.analysis;

import java.util.Locale;

/** Small least-squares fits shared by the estimators. */
final class Fits {
    private Fits() {
    }

    /**
     * Weighted least squares of ln|y_k/c_k| = ln A + p ln r_k over k in [from, to), weights
     * (|y_k|/σ_k)² (the variance of ln|y| to first order is (σ/y)²).
     *
     * @param r positive abscissae
     * @param y values, all of one sign in the range
     * @param sigma standard errors of y, positive
     * @param c known positive factors divided out
     * @param from first index
     * @param to one past the last index
     * @return {p, A·sign, standard error of p from the weights}
     */
    static double[] powerLaw(double[] r, double[] y, double[] sigma, double[] c, int from, int to) {
        double sign = Math.signum(y[from]);
        double sw = 0;
        double sx = 0;
        double sy = 0;
        double sxx = 0;
        double sxy = 0;
        for (int k = from; k < to; k++) {
            if (Math.signum(y[k]) != sign || !(c[k] > 0) || !(sigma[k] > 0)) {
                throw new IllegalStateException(String.format(Locale.ROOT,
                    "power-law fit needs values of one sign and positive errors and factors: y[%d] = %.6g (first %.6g),"
                        + " sigma %.3g, factor %.6g at r = %.6g", k, y[k], y[from], sigma[k], c[k], r[k]));
            }
            double w = Math.pow(y[k] / sigma[k], 2);
            double x = Math.log(r[k]);
            double v = Math.log(Math.abs(y[k]) / c[k]);
            sw += w;
            sx += w * x;
            sy += w * v;
            sxx += w * x * x;
            sxy += w * x * v;
        }
        double det = sw * sxx - sx * sx;
        if (!(det > 0)) {
            throw new IllegalStateException("power-law fit needs at least two distinct separations");
        }
        double p = (sw * sxy - sx * sy) / det;
        double lnA = (sy - p * sx) / sw;
        return new double[] {p, sign * Math.exp(lnA), Math.sqrt(sw / det)};
    }

    /**
     * Ordinary least squares slope of y on x with its standard error from the residuals.
     *
     * @return {slope, intercept, slope standard error (NaN for two points)}
     */
    static double[] line(double[] x, double[] y) {
        int n = x.length;
        double mx = 0;
        double my = 0;
        for (int k = 0; k < n; k++) {
            mx += x[k] / n;
            my += y[k] / n;
        }
        double sxx = 0;
        double sxy = 0;
        for (int k = 0; k < n; k++) {
            sxx += (x[k] - mx) * (x[k] - mx);
            sxy += (x[k] - mx) * (y[k] - my);
        }
        double slope = sxy / sxx;
        double icpt = my - slope * mx;
        double rss = 0;
        for (int k = 0; k < n; k++) {
            double e = y[k] - icpt - slope * x[k];
            rss += e * e;
        }
        double se = n > 2 ? Math.sqrt(rss / (n - 2) / sxx) : Double.NaN;
        return new double[] {slope, icpt, se};
    }
}
