package org.stillfield.sampler.engine;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.function.Predicate;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.TensorGridSum;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * The box's tensor-grid sum on mirror-symmetric, odd, off-centre and partial grids must equal the
 * direct mode sum Σ a_l u_l(r) (or Σ a_l k_l h_l(r)) built from the cavity's per-point mode
 * functions, an independent code path, to rounding: max |difference| ≤ 1e-12 of the field's RMS.
 */
class TensorGridFoldTest {
    private static final double A = 1.0;
    private static final double B = 1.3;
    private static final double D = 1.7;
    private static final RectangularCavity BOX = RectangularCavity.of(A, B, D, Medium.VACUUM);
    // Hard cutoff at k = 25 rad/m: about 1150 modes, l ≤ 7, m ≤ 10, n ≤ 13.
    private static final List<Mode> MODES = ModeTable.of(BOX,
        new Window(Window.Kind.HARD, 25 * Medium.VACUUM.waveSpeed(), Window.DEFAULT_TOLERANCE),
        ThermalState.VACUUM, 100_000).modes();

    @ParameterizedTest
    @ValueSource(booleans = {false, true})
    void evenCellCentredGridOverTheBox(boolean curl) {
        assertCovers(MODES);
        check(BOX, MODES, cells(0, A, 8), cells(0, B, 6), cells(0, D, 10), curl, 1L);
        // nz a multiple of 4: each folded half is mirror-symmetric about its own centre, too.
        check(BOX, MODES, cells(0, A, 6), cells(0, B, 4), cells(0, D, 12), curl, 11L);
    }

    @ParameterizedTest
    @ValueSource(booleans = {false, true})
    void oddCellCentredGridOverTheBox(boolean curl) {
        check(BOX, MODES, cells(0, A, 7), cells(0, B, 5), cells(0, D, 9), curl, 2L);
    }

    @ParameterizedTest
    @ValueSource(booleans = {false, true})
    void vertexGridsIncludingTheWalls(boolean curl) {
        check(BOX, MODES, vertices(0, A, 9), vertices(0, B, 6), vertices(0, D, 11), curl, 3L);
        check(BOX, MODES, vertices(0, A, 4), vertices(0, B, 7), vertices(0, D, 2), curl, 4L);
    }

    @ParameterizedTest
    @ValueSource(booleans = {false, true})
    void singlePointAxisAtTheCentre(boolean curl) {
        // n = 1 at the centre is mirror-symmetric with only the middle point.
        check(BOX, MODES, new double[] {A / 2}, cells(0, B, 6), new double[] {D / 2}, curl, 5L);
    }

    @ParameterizedTest
    @ValueSource(booleans = {false, true})
    void offCentreAndPartialGrids(boolean curl) {
        // Each axis on its own: x off-centre, y symmetric, z covering part of the box.
        check(BOX, MODES, cells(0.05, 0.85, 8), cells(0, B, 6), cells(0, 1.2, 9), curl, 6L);
        // Symmetric x and z with a shifted y; then nothing symmetric.
        check(BOX, MODES, cells(0, A, 7), cells(0.1, B, 6), vertices(0, D, 10), curl, 7L);
        check(BOX, MODES, cells(0.3, 0.9, 5), vertices(0.2, 1.0, 8), cells(0.4, 1.6, 6), curl, 8L);
    }

    @ParameterizedTest
    @ValueSource(booleans = {false, true})
    void flatBoxWithUnequalIndexRanges(boolean curl) {
        RectangularCavity flat = RectangularCavity.of(2.1, 0.45, 1.0, Medium.VACUUM);
        List<Mode> modes = ModeTable.of(flat,
            new Window(Window.Kind.HARD, 22 * Medium.VACUUM.waveSpeed(), Window.DEFAULT_TOLERANCE),
            ThermalState.VACUUM, 100_000).modes();
        assertCovers(modes);
        check(flat, modes, cells(0, 2.1, 12), cells(0, 0.45, 3), cells(0, 1.0, 6), curl, 9L);
        check(flat, modes, vertices(0, 2.1, 11), cells(0, 0.45, 4), cells(0.1, 1.0, 7), curl, 10L);
    }

    /**
     * Modes of one index parity per axis only. With only odd (or only even) indices along an axis,
     * the value at a mirror point is ±(the value at its partner) with the sign of the sine or
     * cosine rule, so a wrong parity sign or a swapped even/odd half cannot cancel out.
     */
    @ParameterizedTest
    @ValueSource(booleans = {false, true})
    void singleParityModeSets(boolean curl) {
        for (int pattern = 0; pattern < 8; pattern++) {
            int pl = pattern & 1;
            int pm = (pattern >> 1) & 1;
            int pn = (pattern >> 2) & 1;
            List<Mode> subset = filter(m -> m.i1() % 2 == pl && m.i2() % 2 == pm && m.i3() % 2 == pn);
            assertTrue(subset.size() > 10, "pattern " + pattern + " has " + subset.size() + " modes");
            check(BOX, subset, cells(0, A, 8), cells(0, B, 7), cells(0, D, 6), curl, 20L + pattern);
            check(BOX, subset, vertices(0, A, 5), cells(0, B, 4), cells(0, D, 9), curl, 40L + pattern);
            check(BOX, subset, cells(0, A, 6), vertices(0, B, 5), cells(0, D, 8), curl, 60L + pattern);
        }
    }

    /**
     * The finiteness proof must not vouch for inputs that can overflow or are not numbers: then the
     * caller checks the values itself (and names the point).
     */
    @ParameterizedTest
    @ValueSource(doubles = {1e305, Double.POSITIVE_INFINITY, Double.NaN})
    void hugeOrNonFiniteAmplitudesAreNotProvenFinite(double bad) {
        double[] xs = cells(0, A, 4);
        double[] ys = cells(0, B, 4);
        double[] zs = cells(0, D, 4);
        TensorGridSum sum = BOX.tensorGridSum(MODES, xs, ys, zs);
        double[] amp = new double[MODES.size()];
        java.util.Arrays.fill(amp, 1e-6);
        double[] out = new double[3 * 64];
        assertTrue(sum.sum(amp, false, out, 0), "moderate amplitudes");
        amp[MODES.size() / 2] = bad;
        org.junit.jupiter.api.Assertions.assertFalse(sum.sum(amp, false, out, 0), "amplitude " + bad);
        org.junit.jupiter.api.Assertions.assertFalse(sum.sum(amp, true, out, 0), "amplitude " + bad + ", curl");
    }

    /** Cell-centred coordinates lo + (i + ½)(hi − lo)/n, as PointSet.grid places them. */
    private static double[] cells(double lo, double hi, int n) {
        double[] x = new double[n];
        double dx = (hi - lo) / n;
        for (int i = 0; i < n; i++) {
            x[i] = lo + (i + 0.5) * dx;
        }
        return x;
    }

    /** Vertex coordinates lo + i(hi − lo)/(n − 1), both ends included. */
    private static double[] vertices(double lo, double hi, int n) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = lo + (hi - lo) * i / (n - 1);
        }
        return x;
    }

    private static List<Mode> filter(Predicate<Mode> keep) {
        return MODES.stream().filter(keep).toList();
    }

    /** The mode list has TE and TM modes and modes with a zero index along each axis. */
    private static void assertCovers(List<Mode> modes) {
        assertTrue(modes.stream().anyMatch(m -> "TE".equals(m.family())), "no TE mode");
        assertTrue(modes.stream().anyMatch(m -> "TM".equals(m.family())), "no TM mode");
        assertTrue(modes.stream().anyMatch(m -> m.i1() == 0), "no l = 0 mode");
        assertTrue(modes.stream().anyMatch(m -> m.i2() == 0), "no m = 0 mode");
        assertTrue(modes.stream().anyMatch(m -> m.i3() == 0), "no n = 0 mode");
    }

    private static void check(RectangularCavity box, List<Mode> modes, double[] xs, double[] ys, double[] zs,
                              boolean curl, long seed) {
        int count = modes.size();
        double[] amp = new double[count];
        UniformRandomProvider rng = RandomSource.L64_X128_MIX.create(seed);
        for (int q = 0; q < count; q++) {
            amp[q] = rng.nextDouble() - 0.5;
        }
        TensorGridSum sum = box.tensorGridSum(modes, xs, ys, zs);
        int points = xs.length * ys.length * zs.length;
        // Offset output: the sum must write only its own range.
        double[] fast = new double[3 * points + 5];
        assertTrue(sum.sum(amp, curl, fast, 2), "moderate amplitudes: the grid is proven finite");

        ModeFunctions f = box.modeFunctions(modes);
        double[] u = new double[3 * count];
        double[] h = new double[3 * count];
        double[] direct = new double[3 * points];
        int p = 0;
        for (double z : zs) {
            for (double y : ys) {
                for (double x : xs) {
                    f.evaluate(x, y, z, u, h);
                    for (int q = 0; q < count; q++) {
                        double w = curl ? amp[q] * modes.get(q).k() : amp[q];
                        double[] v = curl ? h : u;
                        for (int i = 0; i < 3; i++) {
                            direct[3 * p + i] += w * v[3 * q + i];
                        }
                    }
                    p++;
                }
            }
        }
        double ss = 0;
        double diff = 0;
        for (int j = 0; j < 3 * points; j++) {
            ss += direct[j] * direct[j];
            diff = Math.max(diff, Math.abs(direct[j] - fast[2 + j]));
        }
        double rms = Math.sqrt(ss / (3 * points));
        String what = (curl ? "k·h" : "u") + " on " + xs.length + "x" + ys.length + "x" + zs.length
            + " with " + count + " modes";
        assertTrue(rms > 0, what + ": zero field");
        assertTrue(diff <= 1e-12 * rms, what + ": max diff " + diff + " of RMS " + rms);
        assertTrue(fast[0] == 0 && fast[1] == 0 && fast[3 * points + 2] == 0, what + ": wrote outside its range");
    }
}
