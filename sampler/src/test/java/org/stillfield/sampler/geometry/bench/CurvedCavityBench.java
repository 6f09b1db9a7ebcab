package org.stillfield.sampler.geometry.bench;

import java.util.List;
import java.util.Locale;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.geometry.CylindricalCavity;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.geometry.SphericalCavity;

/**
 * Rough throughput of mode enumeration and mode-function evaluation for about 10⁵ modes of the
 * curved cavities. Not a test (surefire ignores *Bench); run by hand:
 *
 * <pre>
 *   mvn -o -q -pl sampler test-compile
 *   java -cp sampler/target/classes:sampler/target/test-classes:$HOME/.m2/repository/org/apache/commons/commons-math3/3.6.1/commons-math3-3.6.1.jar \
 *       org.stillfield.sampler.geometry.bench.CurvedCavityBench
 * </pre>
 *
 * Single thread; a few warm-up rounds, then the median of timed rounds. Numbers are indicative only.
 */
public final class CurvedCavityBench {
    private CurvedCavityBench() {
    }

    /**
     * @param args ignored
     */
    public static void main(String[] args) {
        Cavity cylinder = CylindricalCavity.of(0.05, 0.10, Medium.VACUUM);
        Cavity sphere = SphericalCavity.of(0.10, Medium.VACUUM);
        run("cylinder R=5cm d=10cm", cylinder, kFor(cylinder, 1e5));
        run("sphere R=10cm", sphere, kFor(sphere, 1e5));
        // The box, for comparison: separable trigonometric factors only.
        Cavity box = RectangularCavity.of(0.05, 0.07, 0.09, Medium.VACUUM);
        run("box 5x7x9 cm", box, kFor(box, 1e5));
    }

    /** Wave number whose Weyl estimate is the wanted count (bisection on the monotone estimate). */
    private static double kFor(Cavity c, double count) {
        double lo = c.lowestK();
        double hi = lo;
        while (c.weylCount(hi) < count) {
            hi *= 2;
        }
        for (int i = 0; i < 60; i++) {
            double mid = 0.5 * (lo + hi);
            if (c.weylCount(mid) < count) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return hi;
    }

    private static void run(String name, Cavity c, double kMax) {
        List<Mode> modes = null;
        double[] enumSeconds = new double[5];
        for (int round = 0; round < 2 + enumSeconds.length; round++) {
            long t0 = System.nanoTime();
            modes = c.modesUpTo(kMax);
            long t1 = System.nanoTime();
            if (round >= 2) {
                enumSeconds[round - 2] = (t1 - t0) * 1e-9;
            }
        }
        int m = modes.size();
        long t2 = System.nanoTime();
        ModeFunctions f = c.modeFunctions(modes);
        double setup = (System.nanoTime() - t2) * 1e-9;
        double[] u = new double[3 * m];
        double[] h = new double[3 * m];
        double[] lo = {c.bounds()[0].x(), c.bounds()[0].y(), c.bounds()[0].z()};
        double[] hi = {c.bounds()[1].x(), c.bounds()[1].y(), c.bounds()[1].z()};
        int points = 200;
        double[] evalSeconds = new double[5];
        double checksum = 0;
        for (int round = 0; round < 2 + evalSeconds.length; round++) {
            long t0 = System.nanoTime();
            for (int p = 0; p < points; p++) {
                // Points on a diagonal through the interior, away from the centre.
                double s = 0.2 + 0.6 * (p + 0.5) / points;
                f.evaluate(lo[0] + s * (hi[0] - lo[0]), lo[1] + (1 - s) * (hi[1] - lo[1]), lo[2] + 0.37 * (hi[2] - lo[2]), u, h);
                checksum += u[3 * (p % m)] + h[3 * (p % m) + 1];
            }
            long t1 = System.nanoTime();
            if (round >= 2) {
                evalSeconds[round - 2] = (t1 - t0) * 1e-9;
            }
        }
        double enumMedian = median(enumSeconds);
        double evalMedian = median(evalSeconds) / points;
        System.out.printf(Locale.ROOT, "%s: kMax = %.1f rad/m, %d modes%n", name, kMax, m);
        System.out.printf(Locale.ROOT, "  enumeration      %.3f s  (%.2e modes/s)%n", enumMedian, m / enumMedian);
        System.out.printf(Locale.ROOT, "  evaluator set-up %.3f s%n", setup);
        System.out.printf(Locale.ROOT, "  evaluation       %.3f ms/point, u and h  (%.2e mode-evaluations/s)  [checksum %.3g]%n",
            evalMedian * 1e3, m / evalMedian, checksum);
    }

    private static double median(double[] v) {
        double[] s = v.clone();
        java.util.Arrays.sort(s);
        return s[s.length / 2];
    }
}
