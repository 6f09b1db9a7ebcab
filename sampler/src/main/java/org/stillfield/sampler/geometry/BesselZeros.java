package org.stillfield.sampler.geometry;

import java.util.Arrays;
import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.solvers.BrentSolver;

/**
 * Positive zeros of the radial functions whose roots fix the curved cavities' resonances.
 *
 * <p>Each zero is bracketed by a sign change on a grid of step {@value #STEP} (smaller than the
 * spacing of consecutive zeros of every function here, which is above 1.7 for all orders), then
 * polished with Brent's method to the last bit. The scan starts at x = n (x = 1/2 for n = 0):
 * none of these functions has a positive zero below its order (A&amp;S 9.5.2 for j_{n,1} &gt; n and
 * j′_{n,1} ≥ n; the spherical zeros are those of order n + ½).
 */
final class BesselZeros {
    /** Bracketing step in x. */
    static final double STEP = 0.25;

    /** The radial functions. */
    enum Kind {
        /** J_n(x): cylinder TM, k_ρR = x_nm. */
        J,
        /** J_n′(x), x = 0 not counted (engineering convention, so x′_0m = x_1m): cylinder TE. */
        J_PRIME,
        /** j_n(x): sphere TE. */
        SPHERICAL_J,
        /** d/dx[x j_n(x)] = (n+1) j_n(x) − x j_{n+1}(x): sphere TM. */
        SPHERICAL_RICCATI_PRIME
    }

    private BesselZeros() {
    }

    /**
     * @param kind function
     * @param n order, ≥ 0
     * @param x argument, ≥ 0
     * @return the function value
     */
    static double value(Kind kind, int n, double x) {
        switch (kind) {
            case J:
                return BesselFunctions.j(n, x);
            case J_PRIME: {
                double[] t = new double[3];
                BesselFunctions.cylinder(n, x, t);
                return 0.5 * (t[0] - t[2]);
            }
            case SPHERICAL_J:
                return BesselFunctions.sph(n, x);
            default: {
                double[] t = new double[4];
                BesselFunctions.spherical(n, x, t);
                return (n + 1) * t[1] - x * t[2];
            }
        }
    }

    /**
     * All zeros in (0, xMax], ascending.
     *
     * @param kind function
     * @param n order, ≥ 0 (≥ 1 for the spherical kinds, which have no EM mode at n = 0)
     * @param xMax upper end, finite
     * @return the zeros, possibly none
     */
    static double[] upTo(Kind kind, int n, double xMax) {
        return scan(kind, n, xMax, Integer.MAX_VALUE);
    }

    /**
     * The first {@code count} zeros, ascending.
     *
     * @param kind function
     * @param n order
     * @param count number of zeros, ≥ 0
     * @return the zeros
     */
    static double[] first(Kind kind, int n, int count) {
        return scan(kind, n, Double.POSITIVE_INFINITY, count);
    }

    private static double[] scan(Kind kind, int n, double xMax, int count) {
        if (n < 0) {
            throw new IllegalArgumentException("order n must be >= 0: " + n);
        }
        if (Double.isNaN(xMax)) {
            throw new IllegalArgumentException("xMax must not be NaN");
        }
        if (kind == Kind.J_PRIME && n == 0) {
            // J_0' = −J_1 identically (A&S 9.1.28), so TE_0mp and TM_1mp share their k exactly.
            return scan(Kind.J, 1, xMax, count);
        }
        UnivariateFunction f = x -> value(kind, n, x);
        BrentSolver solver = new BrentSolver(1e-16, 1e-300, 0.0);
        double[] out = new double[8];
        int found = 0;
        double a = n == 0 ? 0.5 : n;
        double fa = f.value(a);
        while (found < count && a < xMax) {
            double b = Math.min(a + STEP, xMax);
            double fb = f.value(b);
            if (fb == 0.0) {
                found = add(out, found, b);
                out = grow(out, found);
            } else if (fa != 0.0 && (fa < 0) != (fb < 0)) {
                double root = solver.solve(200, f, a, b, 0.5 * (a + b));
                found = add(out, found, root);
                out = grow(out, found);
            }
            a = b;
            fa = fb;
        }
        return Arrays.copyOf(out, Math.min(found, count));
    }

    private static int add(double[] out, int found, double x) {
        out[found] = x;
        return found + 1;
    }

    private static double[] grow(double[] out, int found) {
        return found == out.length ? Arrays.copyOf(out, 2 * out.length) : out;
    }
}
