package org.stillfield.sampler.geometry;

/**
 * Bessel functions of the first kind for the curved cavities: cylinder J_n(x) and spherical
 * j_n(x) of integer order n ≥ 0 and real argument x ≥ 0, each returned with its neighbours so
 * that derivatives and the axis/centre limits need no division by x.
 *
 * <p>Method: Miller's backward recurrence (Abramowitz &amp; Stegun §9.12; equation numbers here
 * are from memory, the values are checked in the tests against Commons Math; the normalising
 * sums are A&amp;S 9.1.76, J_0² + 2ΣJ_k² = 1, and A&amp;S 10.1.50, Σ(2k+1)j_k² = 1). Squares are
 * used because their sum has no cancellation; the sign comes from J_0 + 2ΣJ_{2k} = 1 (A&amp;S 9.1.46)
 * or from the closed forms of j_0, j_1 (A&amp;S 10.1.11). The recurrence starts above both n and the
 * turning point x, by a margin that covers the Airy-like decay of J_k(x) for k &gt; x (about
 * 13·x^{1/3} orders reduce it by 1e-17), and is rescaled whenever it grows past 1e140 (so its squares stay finite), so small
 * arguments cannot overflow. For x ≤ 1 the power series (A&amp;S 9.1.10, 10.1.2) is used instead:
 * its terms fall at least fourfold per step there.
 */
final class BesselFunctions {
    private static final double BIG = 1e140;
    private static final double SMALL = 1e-140;

    private BesselFunctions() {
    }

    /** First order at which the backward recurrence starts for (order n, argument x). */
    private static int start(int n, double x) {
        return Math.max(n, (int) Math.ceil(x)) + 24 + (int) Math.ceil(13.0 * Math.cbrt(x));
    }

    /**
     * Writes J_{n−1}(x), J_n(x), J_{n+1}(x) into out[0..2]; for n = 0, out[0] = J_{−1} = −J_1.
     *
     * @param n order, ≥ 0
     * @param x argument, ≥ 0 and finite
     * @param out length ≥ 3
     */
    static void cylinder(int n, double x, double[] out) {
        if (x <= 1.0) {
            out[1] = seriesJ(n, x);
            out[2] = seriesJ(n + 1, x);
            out[0] = n == 0 ? -out[2] : seriesJ(n - 1, x);
            return;
        }
        int top = start(n + 1, x);
        double next = 0.0;
        double cur = SMALL;
        double sumSq = 0.0;
        double sumEven = 0.0;
        double jm1 = 0.0;
        double j0 = 0.0;
        double jp1 = 0.0;
        // cur holds J_k (unnormalised) as k runs from top down to 0.
        for (int k = top; k >= 0; k--) {
            if (k == n + 1) {
                jp1 = cur;
            } else if (k == n) {
                j0 = cur;
            } else if (k == n - 1) {
                jm1 = cur;
            }
            if (k > 0) {
                sumSq += 2.0 * cur * cur;
                if ((k & 1) == 0) {
                    sumEven += 2.0 * cur;
                }
            } else {
                sumSq += cur * cur;
                sumEven += cur;
            }
            if (k > 0) {
                double prev = (2.0 * k / x) * cur - next;
                next = cur;
                cur = prev;
                if (Math.abs(cur) > BIG) {
                    // Rescale everything already accumulated; the values far above n that
                    // underflow here are below 1e-280 of J_n and do not matter.
                    cur *= SMALL;
                    next *= SMALL;
                    jm1 *= SMALL;
                    j0 *= SMALL;
                    jp1 *= SMALL;
                    sumSq *= SMALL * SMALL;
                    sumEven *= SMALL;
                }
            }
        }
        double scale = Math.copySign(1.0 / Math.sqrt(sumSq), sumEven);
        out[0] = n == 0 ? -jp1 * scale : jm1 * scale;
        out[1] = j0 * scale;
        out[2] = jp1 * scale;
    }

    /** @return J_n(x) for order n ≥ 0 and x ≥ 0 */
    static double j(int n, double x) {
        double[] t = new double[3];
        cylinder(n, x, t);
        return t[1];
    }

    /** Power series, A&amp;S 9.1.10: J_n(x) = (x/2)^n Σ (−x²/4)^k / (k!(n+k)!). */
    private static double seriesJ(int n, double x) {
        if (x == 0.0) {
            return n == 0 ? 1.0 : 0.0;
        }
        double lead = halfPowerOverFactorial(n, 0.5 * x);
        if (lead == 0.0) {
            return 0.0;
        }
        double q = -0.25 * x * x;
        double term = 1.0;
        double sum = 1.0;
        for (int k = 1; k < 60; k++) {
            term *= q / (k * (double) (n + k));
            sum += term;
            if (Math.abs(term) < 1e-17 * Math.abs(sum)) {
                break;
            }
        }
        return lead * sum;
    }

    /** h^n / n! for h ≤ ½: every factor h/k is below 1, so the product can only underflow, like the result. */
    private static double halfPowerOverFactorial(int n, double h) {
        double v = 1.0;
        for (int k = 1; k <= n; k++) {
            v *= h / k;
        }
        return v;
    }

    /**
     * Writes j_{n−1}(x), j_n(x), j_{n+1}(x) and j_n(x)/x into out[0..3] (out[0] = 0 for n = 0;
     * out[3] is the finite limit at x = 0: 1/3 for n = 1, 0 for n ≥ 2, and not defined for n = 0).
     *
     * @param n order, ≥ 0
     * @param x argument, ≥ 0 and finite
     * @param out length ≥ 4
     */
    static void spherical(int n, double x, double[] out) {
        if (x <= 1.0) {
            out[1] = seriesSph(n, x);
            out[2] = seriesSph(n + 1, x);
            out[0] = n == 0 ? 0.0 : seriesSph(n - 1, x);
            out[3] = n == 0 ? (x == 0 ? Double.NaN : out[1] / x) : seriesSphOverX(n, x);
            return;
        }
        int top = start(n + 1, x);
        double next = 0.0;
        double cur = SMALL;
        double sumSq = 0.0;
        double jm1 = 0.0;
        double j0 = 0.0;
        double jp1 = 0.0;
        double rec0 = 0.0;
        double rec1 = 0.0;
        for (int k = top; k >= 0; k--) {
            if (k == n + 1) {
                jp1 = cur;
            } else if (k == n) {
                j0 = cur;
            } else if (k == n - 1) {
                jm1 = cur;
            }
            if (k == 1) {
                rec1 = cur;
            }
            sumSq += (2.0 * k + 1.0) * cur * cur;
            if (k > 0) {
                double prev = ((2.0 * k + 1.0) / x) * cur - next;
                next = cur;
                cur = prev;
                if (Math.abs(cur) > BIG) {
                    cur *= SMALL;
                    next *= SMALL;
                    jm1 *= SMALL;
                    j0 *= SMALL;
                    jp1 *= SMALL;
                    rec1 *= SMALL;
                    sumSq *= SMALL * SMALL;
                }
            } else {
                rec0 = cur;
            }
        }
        // The sign comes from whichever closed form is far from its zero: |sin x| and |cos x|
        // are never both below 1/2, and for x > 1 a small sin x makes x cos x dominate j_1.
        double s = Math.sin(x);
        double sign;
        if (Math.abs(s) >= 0.5) {
            sign = Math.signum(s / x) * Math.signum(rec0);
        } else {
            double j1 = (s / x - Math.cos(x)) / x;
            sign = Math.signum(j1) * Math.signum(rec1);
        }
        double scale = sign / Math.sqrt(sumSq);
        out[0] = n == 0 ? 0.0 : jm1 * scale;
        out[1] = j0 * scale;
        out[2] = jp1 * scale;
        out[3] = out[1] / x;
    }

    /** @return j_n(x) for order n ≥ 0 and x ≥ 0 */
    static double sph(int n, double x) {
        double[] t = new double[4];
        spherical(n, x, t);
        return t[1];
    }

    /** A&amp;S 10.1.2: j_n(x) = x^n/(2n+1)!! Σ (−x²/2)^k / (k! (2n+3)(2n+5)…(2n+2k+1)). */
    private static double seriesSph(int n, double x) {
        if (x == 0.0) {
            return n == 0 ? 1.0 : 0.0;
        }
        return powerOverDoubleFactorial(n, x) * seriesSphSum(n, x);
    }

    /** j_n(x)/x for n ≥ 1, x ≤ 1, finite at x = 0. */
    private static double seriesSphOverX(int n, double x) {
        if (x == 0.0) {
            return n == 1 ? 1.0 / 3.0 : 0.0;
        }
        return powerOverDoubleFactorial(n - 1, x) / (2.0 * n + 1.0) * seriesSphSum(n, x);
    }

    private static double seriesSphSum(int n, double x) {
        double q = -0.5 * x * x;
        double term = 1.0;
        double sum = 1.0;
        for (int k = 1; k < 60; k++) {
            term *= q / (k * (2.0 * n + 2.0 * k + 1.0));
            sum += term;
            if (Math.abs(term) < 1e-17 * Math.abs(sum)) {
                break;
            }
        }
        return sum;
    }

    /** x^n / (2n+1)!! for x ≤ 1: every factor is below 1, so the product can only underflow, like the result. */
    private static double powerOverDoubleFactorial(int n, double x) {
        double v = 1.0;
        for (int k = 1; k <= n; k++) {
            v *= x / (2.0 * k + 1.0);
        }
        return v;
    }
}
