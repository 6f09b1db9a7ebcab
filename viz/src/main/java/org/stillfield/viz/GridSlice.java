package org.stillfield.viz;

import java.util.Locale;
import java.util.Objects;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;

/**
 * One field component (or the magnitude) on a plane of grid cells, ready to draw as a heat map.
 *
 * @param title chart title
 * @param field the field
 * @param component {@code "x"}, {@code "y"}, {@code "z"} or {@code "magnitude"} (|F|)
 * @param xAxis name of the horizontal in-plane coordinate, {@code "x"}, {@code "y"} or {@code "z"}
 * @param yAxis name of the vertical in-plane coordinate
 * @param xCentres cell centres along the horizontal axis, metres, strictly increasing
 * @param yCentres cell centres along the vertical axis, metres, strictly increasing
 * @param values values[iy][ix] in the field's unit; NaN where the field is undefined
 * @param unit the values' unit, e.g. {@code V/m}
 */
public record GridSlice(String title, Field field, String component, String xAxis, String yAxis,
                        double[] xCentres, double[] yCentres, double[][] values, String unit) {
    /** Component name for |F|. */
    public static final String MAGNITUDE = "magnitude";

    /** Validates shapes and copies the arrays. */
    public GridSlice {
        Objects.requireNonNull(title, "title");
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(unit, "unit");
        if (!(MAGNITUDE.equals(component) || "x".equals(component) || "y".equals(component)
            || "z".equals(component))) {
            throw new IllegalArgumentException("component must be x, y, z or magnitude: " + component);
        }
        axisIndex("xAxis", xAxis);
        axisIndex("yAxis", yAxis);
        if (xAxis.equals(yAxis)) {
            throw new IllegalArgumentException("xAxis and yAxis must differ: both " + xAxis);
        }
        xCentres = increasing("xCentres", xCentres);
        yCentres = increasing("yCentres", yCentres);
        if (values == null || values.length != yCentres.length) {
            throw new IllegalArgumentException("values must have one row per y centre (" + yCentres.length + "): "
                + (values == null ? "null" : values.length));
        }
        double[][] copy = new double[values.length][];
        for (int iy = 0; iy < values.length; iy++) {
            if (values[iy] == null || values[iy].length != xCentres.length) {
                throw new IllegalArgumentException("values[" + iy + "] must have one entry per x centre ("
                    + xCentres.length + "): " + (values[iy] == null ? "null" : values[iy].length));
            }
            copy[iy] = values[iy].clone();
        }
        values = copy;
    }

    /** @return a copy of the horizontal cell centres, metres */
    @Override
    public double[] xCentres() {
        return xCentres.clone();
    }

    /** @return a copy of the vertical cell centres, metres */
    @Override
    public double[] yCentres() {
        return yCentres.clone();
    }

    /** @return a copy of values[iy][ix] */
    @Override
    public double[][] values() {
        double[][] out = new double[values.length][];
        for (int i = 0; i < values.length; i++) {
            out[i] = values[i].clone();
        }
        return out;
    }

    /** @return values[iy][ix] without copying the whole table */
    public double value(int ix, int iy) {
        return values[iy][ix];
    }

    /** @return the same slice with another title */
    public GridSlice withTitle(String newTitle) {
        return new GridSlice(newTitle, field, component, xAxis, yAxis, xCentres, yCentres, values, unit);
    }

    /** @return true for |F| (drawn on a sequential scale), false for a signed component */
    public boolean isMagnitude() {
        return MAGNITUDE.equals(component);
    }

    /** @return symbol of what is drawn, e.g. {@code E_x} or {@code |E|} */
    public String symbol() {
        return isMagnitude() ? "|" + field.name() + "|" : field.name() + "_" + component;
    }

    /**
     * Which plane of a grid is drawn.
     *
     * @param uAxis horizontal in-plane axis (0 = x, 1 = y, 2 = z)
     * @param vAxis vertical in-plane axis, greater than uAxis
     * @param fixedAxis the axis across the plane
     * @param fixedIndex grid index along fixedAxis of the drawn layer
     * @param fixedCoordinate coordinate of that layer's cell centres along fixedAxis, metres
     */
    public record Plane(int uAxis, int vAxis, int fixedAxis, int fixedIndex, double fixedCoordinate) {
        /** @return e.g. {@code y = 0.01 m} */
        public String describe() {
            return "xyz".charAt(fixedAxis) + " = " + ChartStyle.metres(fixedCoordinate) + " m";
        }
    }

    /**
     * Chooses the plane to draw from a grid: the axis with the fewest cells is held fixed (a
     * dimension of 1 makes the grid a slice already), and the other two span the plane in the
     * order x, y, z. When several axes tie for fewest, the last of them is fixed, so a cube shows
     * its x–y mid-plane. The layer drawn is the middle one, index n/2.
     *
     * @param grid a point set of kind GRID
     * @return the plane
     */
    public static Plane planeOf(PointSet grid) {
        Objects.requireNonNull(grid, "grid");
        if (grid.kind() != PointSet.Kind.GRID) {
            throw new IllegalArgumentException("grid must be a point set of kind GRID: '" + grid.name() + "' is "
                + grid.kind());
        }
        int[] n = grid.dims();
        int fixed = 2;
        for (int a = 2; a >= 0; a--) {
            if (n[a] < n[fixed]) {
                fixed = a;
            }
        }
        int u = fixed == 0 ? 1 : 0;
        int v = fixed == 2 ? 1 : 2;
        int k = n[fixed] / 2;
        int[] idx = new int[3];
        idx[fixed] = k;
        Vec3 p = grid.points().get(index(n, idx[0], idx[1], idx[2]));
        return new Plane(u, v, fixed, k, p.get(fixed));
    }

    /**
     * Cuts one sample's values on a grid down to a plane (see {@link #planeOf(PointSet)}).
     *
     * @param grid a point set of kind GRID (x index fastest)
     * @param gridOffset global index of the grid's first point in the run, ≥ 0
     * @param field the field the values belong to
     * @param component {@code "x"}, {@code "y"}, {@code "z"} or {@code "magnitude"}
     * @param runValues values of every point of the run, runValues[3p + i] for component i at
     *     global point p, in the field's unit
     * @return the slice, titled e.g. "E_x on y = 0.01 m"
     */
    public static GridSlice fromGrid(PointSet grid, int gridOffset, Field field, String component,
                                     double[] runValues) {
        Objects.requireNonNull(field, "field");
        Objects.requireNonNull(runValues, "runValues");
        Plane plane = planeOf(grid);
        if (gridOffset < 0) {
            throw new IllegalArgumentException("gridOffset must be >= 0: " + gridOffset);
        }
        long needed = 3L * ((long) gridOffset + grid.size());
        if (runValues.length < needed) {
            throw new IllegalArgumentException("runValues must hold 3 values per point up to the grid's end (" + needed
                + "): " + runValues.length);
        }
        int comp = MAGNITUDE.equals(component) ? -1 : axisIndex("component", component);
        int[] n = grid.dims();
        int nu = n[plane.uAxis()];
        int nv = n[plane.vAxis()];
        double[] uc = new double[nu];
        double[] vc = new double[nv];
        double[][] vals = new double[nv][nu];
        int[] idx = new int[3];
        idx[plane.fixedAxis()] = plane.fixedIndex();
        for (int iv = 0; iv < nv; iv++) {
            idx[plane.vAxis()] = iv;
            for (int iu = 0; iu < nu; iu++) {
                idx[plane.uAxis()] = iu;
                int local = index(n, idx[0], idx[1], idx[2]);
                Vec3 p = grid.points().get(local);
                uc[iu] = p.get(plane.uAxis());
                vc[iv] = p.get(plane.vAxis());
                int base = 3 * (gridOffset + local);
                if (comp >= 0) {
                    vals[iv][iu] = runValues[base + comp];
                } else {
                    double x = runValues[base];
                    double y = runValues[base + 1];
                    double z = runValues[base + 2];
                    vals[iv][iu] = Math.sqrt(x * x + y * y + z * z);
                }
            }
        }
        String symbol = comp >= 0 ? field.column(comp) : "|" + field.name() + "|";
        String title = String.format(Locale.ROOT, "%s on %s", symbol, plane.describe());
        return new GridSlice(title, field, comp >= 0 ? component : MAGNITUDE, String.valueOf("xyz".charAt(plane.uAxis())),
            String.valueOf("xyz".charAt(plane.vAxis())), uc, vc, vals, field.unit());
    }

    private static int index(int[] n, int i, int j, int k) {
        return i + n[0] * (j + n[1] * k);
    }

    static int axisIndex(String name, String axis) {
        int i = axis == null || axis.length() != 1 ? -1 : "xyz".indexOf(axis.charAt(0));
        if (i < 0) {
            throw new IllegalArgumentException(name + " must be x, y or z: " + axis);
        }
        return i;
    }

    private static double[] increasing(String name, double[] c) {
        if (c == null || c.length == 0) {
            throw new IllegalArgumentException(name + " must hold at least one centre: " + (c == null ? "null" : "[]"));
        }
        for (int i = 0; i < c.length; i++) {
            if (!Double.isFinite(c[i]) || (i > 0 && !(c[i] > c[i - 1]))) {
                throw new IllegalArgumentException(name + " must be finite and strictly increasing: " + name + "["
                    + i + "] = " + c[i]);
            }
        }
        return c.clone();
    }
}
