package org.stillfield.viz;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.ToDoubleFunction;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;

/**
 * Geometry bookkeeping of grid slices, checked against analytic functions placed on the grid:
 * component x holds f(r) = x − 2z, y holds g(r) = 5y + 1, z holds h(r) = 3x + z. Cell centres
 * are computed here independently as from + (i + ½)·(to − from)/n.
 */
class GridSliceTest {
    private static final Vec3 FROM = new Vec3(0.002, 0.001, 0.004);
    private static final Vec3 TO = new Vec3(0.032, 0.021, 0.044);
    /** Points before the grid in the run, so the global offset is exercised. */
    private static final int OFFSET = 7;

    private static double f(Vec3 r) {
        return r.x() - 2 * r.z();
    }

    private static double g(Vec3 r) {
        return 5 * r.y() + 1;
    }

    private static double h(Vec3 r) {
        return 3 * r.x() + r.z();
    }

    /** Run values: 7 junk points (NaN), then the grid with f, g, h, then 2 junk points. */
    private static double[] runValues(PointSet grid) {
        double[] v = new double[3 * (OFFSET + grid.size() + 2)];
        java.util.Arrays.fill(v, Double.NaN);
        for (int p = 0; p < grid.size(); p++) {
            Vec3 r = grid.points().get(p);
            v[3 * (OFFSET + p)] = f(r);
            v[3 * (OFFSET + p) + 1] = g(r);
            v[3 * (OFFSET + p) + 2] = h(r);
        }
        return v;
    }

    private static double centre(int axis, int i, int n) {
        return FROM.get(axis) + (i + 0.5) * (TO.get(axis) - FROM.get(axis)) / n;
    }

    private static void check(int nx, int ny, int nz, String u, String v, int fixedAxis, int fixedIndex) {
        PointSet grid = PointSet.grid("g", FROM, TO, nx, ny, nz);
        int[] n = {nx, ny, nz};
        int ua = "xyz".indexOf(u);
        int va = "xyz".indexOf(v);
        GridSlice.Plane plane = GridSlice.planeOf(grid);
        assertEquals(ua, plane.uAxis(), "u axis for " + nx + "x" + ny + "x" + nz);
        assertEquals(va, plane.vAxis(), "v axis for " + nx + "x" + ny + "x" + nz);
        assertEquals(fixedAxis, plane.fixedAxis(), "fixed axis for " + nx + "x" + ny + "x" + nz);
        assertEquals(fixedIndex, plane.fixedIndex(), "fixed index for " + nx + "x" + ny + "x" + nz);
        double w = centre(fixedAxis, fixedIndex, n[fixedAxis]);
        assertEquals(w, plane.fixedCoordinate(), 1e-15, "fixed coordinate");

        double[] run = runValues(grid);
        String[] comps = {"x", "y", "z"};
        @SuppressWarnings("unchecked")
        ToDoubleFunction<Vec3>[] fns = new ToDoubleFunction[] {
            (ToDoubleFunction<Vec3>) GridSliceTest::f, (ToDoubleFunction<Vec3>) GridSliceTest::g,
            (ToDoubleFunction<Vec3>) GridSliceTest::h};
        for (int c = 0; c < 3; c++) {
            GridSlice s = GridSlice.fromGrid(grid, OFFSET, Field.E, comps[c], run);
            assertEquals(u, s.xAxis());
            assertEquals(v, s.yAxis());
            assertEquals("V/m", s.unit());
            assertEquals(n[ua], s.xCentres().length);
            assertEquals(n[va], s.yCentres().length);
            for (int i = 0; i < n[ua]; i++) {
                assertEquals(centre(ua, i, n[ua]), s.xCentres()[i], 1e-15, "x centre " + i);
            }
            for (int j = 0; j < n[va]; j++) {
                assertEquals(centre(va, j, n[va]), s.yCentres()[j], 1e-15, "y centre " + j);
            }
            for (int j = 0; j < n[va]; j++) {
                for (int i = 0; i < n[ua]; i++) {
                    double[] r = new double[3];
                    r[ua] = centre(ua, i, n[ua]);
                    r[va] = centre(va, j, n[va]);
                    r[fixedAxis] = w;
                    double want = fns[c].applyAsDouble(new Vec3(r[0], r[1], r[2]));
                    assertEquals(want, s.value(i, j), 1e-14, comps[c] + " at cell (" + i + ", " + j + ")");
                }
            }
        }
        GridSlice mag = GridSlice.fromGrid(grid, OFFSET, Field.E, GridSlice.MAGNITUDE, run);
        double[] r = new double[3];
        r[ua] = centre(ua, 1, n[ua]);
        r[va] = centre(va, 0, n[va]);
        r[fixedAxis] = w;
        Vec3 p = new Vec3(r[0], r[1], r[2]);
        assertEquals(Math.sqrt(f(p) * f(p) + g(p) * g(p) + h(p) * h(p)), mag.value(1, 0), 1e-14, "|F| at (1, 0)");
        assertTrue(mag.isMagnitude());
    }

    @Test
    void flatGridKeepsItsTwoVaryingAxes() {
        check(6, 1, 8, "x", "z", 1, 0);
        check(5, 7, 1, "x", "y", 2, 0);
        check(1, 4, 6, "y", "z", 0, 0);
    }

    @Test
    void fullGridIsCutThroughTheMiddleOfItsSmallestDimension() {
        check(4, 6, 3, "x", "y", 2, 1);
        check(4, 3, 6, "x", "z", 1, 1);
        check(2, 5, 4, "y", "z", 0, 1);
        // Ties: the last of the smallest axes is held fixed, so a cube shows an x-y plane.
        check(4, 4, 4, "x", "y", 2, 2);
    }

    @Test
    void titleNamesComponentAndPlane() {
        PointSet grid = PointSet.grid("g", FROM, TO, 3, 1, 2);
        GridSlice s = GridSlice.fromGrid(grid, OFFSET, Field.B, "y", runValues(grid));
        assertEquals("B_y on y = 0.011 m", s.title());
        assertEquals("T", s.unit());
        assertEquals("B_y", s.symbol());
        assertEquals("other", s.withTitle("other").title());
    }

    @Test
    void rejectsWrongInput() {
        PointSet grid = PointSet.grid("g", FROM, TO, 3, 1, 2);
        PointSet line = PointSet.line("l", FROM, TO, 3);
        double[] run = runValues(grid);
        assertThrows(IllegalArgumentException.class, () -> GridSlice.planeOf(line));
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> GridSlice.fromGrid(grid, OFFSET + 3, Field.E, "x", run));
        assertTrue(ex.getMessage().contains("runValues"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> GridSlice.fromGrid(grid, OFFSET, Field.E, "w", run));
        assertThrows(IllegalArgumentException.class, () -> new GridSlice("t", Field.E, "x", "x", "x",
            new double[] {1}, new double[] {1}, new double[][] {{1}}, "V/m"));
        assertThrows(IllegalArgumentException.class, () -> new GridSlice("t", Field.E, "x", "x", "z",
            new double[] {1, 1}, new double[] {1}, new double[][] {{1, 2}}, "V/m"));
        ex = assertThrows(IllegalArgumentException.class, () -> new GridSlice("t", Field.E, "x", "x", "z",
            new double[] {1, 2}, new double[] {1}, new double[][] {{1}}, "V/m"));
        assertTrue(ex.getMessage().contains("values[0]"), ex.getMessage());
    }

    @Test
    void arraysAreCopied() {
        double[] xc = {1, 2};
        double[][] vals = {{3, 4}};
        GridSlice s = new GridSlice("t", Field.E, "x", "x", "z", xc, new double[] {0}, vals, "V/m");
        xc[0] = 99;
        vals[0][1] = 99;
        assertArrayEquals(new double[] {1, 2}, s.xCentres());
        assertEquals(4, s.value(1, 0));
        s.values()[0][0] = 99;
        assertEquals(3, s.value(0, 0));
    }
}
