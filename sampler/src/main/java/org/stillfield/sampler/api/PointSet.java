package org.stillfield.sampler.api;

import java.util.List;
import java.util.Objects;

/**
 * A named group of evaluation points: a single point, a line of n equally spaced points, or a
 * regular grid nx×ny×nz (x fastest).
 *
 * @param name unique name, used to refer to points as {@code name[i]}
 * @param kind point, line or grid
 * @param points the points, metres
 * @param dims shape: {1,1,1} for a point, {n,1,1} for a line, {nx,ny,nz} for a grid
 */
public record PointSet(String name, Kind kind, List<Vec3> points, int[] dims) {
    /** How the points were laid out. */
    public enum Kind {
        /** One explicit point. */
        POINT,
        /** Equally spaced points from one end to the other, both included. */
        LINE,
        /** Regular grid, x index fastest. */
        GRID
    }

    /** Copies and validates. */
    public PointSet {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(kind, "kind");
        points = List.copyOf(points);
        dims = dims.clone();
        if (dims.length != 3 || (long) dims[0] * dims[1] * dims[2] != points.size()) {
            throw new IllegalArgumentException("dims must be 3 numbers whose product is the point count: " + name);
        }
    }

    @Override
    public int[] dims() {
        return dims.clone();
    }

    /** @return number of points */
    public int size() {
        return points.size();
    }

    /** @return one point */
    public static PointSet point(String name, Vec3 r) {
        return new PointSet(name, Kind.POINT, List.of(r), new int[] {1, 1, 1});
    }

    /** @return n ≥ 2 equally spaced points from {@code from} to {@code to} inclusive */
    public static PointSet line(String name, Vec3 from, Vec3 to, int n) {
        if (n < 2) {
            throw new IllegalArgumentException("a line needs n >= 2 points: " + n);
        }
        Vec3[] pts = new Vec3[n];
        Vec3 step = to.minus(from);
        for (int i = 0; i < n; i++) {
            pts[i] = from.plusScaled(step, (double) i / (n - 1));
        }
        return new PointSet(name, Kind.LINE, List.of(pts), new int[] {n, 1, 1});
    }

    /**
     * Cell-centred grid over the box [from, to]: point (i,j,k) sits at from + (i + ½)·Δ, so no
     * point lies on a wall where some components vanish identically.
     */
    public static PointSet grid(String name, Vec3 from, Vec3 to, int nx, int ny, int nz) {
        if (nx < 1 || ny < 1 || nz < 1) {
            throw new IllegalArgumentException("grid sizes must be >= 1: " + nx + "x" + ny + "x" + nz);
        }
        // Compared in double: three int sizes can overflow even a long product.
        if ((double) nx * ny * nz > Integer.MAX_VALUE / 4) {
            throw new IllegalArgumentException("grid has too many points: " + nx + "x" + ny + "x" + nz);
        }
        long total = (long) nx * ny * nz;
        Vec3[] pts = new Vec3[(int) total];
        double dx = (to.x() - from.x()) / nx;
        double dy = (to.y() - from.y()) / ny;
        double dz = (to.z() - from.z()) / nz;
        int p = 0;
        for (int k = 0; k < nz; k++) {
            for (int j = 0; j < ny; j++) {
                for (int i = 0; i < nx; i++) {
                    pts[p++] = new Vec3(from.x() + (i + 0.5) * dx, from.y() + (j + 0.5) * dy, from.z() + (k + 0.5) * dz);
                }
            }
        }
        return new PointSet(name, Kind.GRID, List.of(pts), new int[] {nx, ny, nz});
    }
}
