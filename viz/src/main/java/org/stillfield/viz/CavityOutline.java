package org.stillfield.viz;

import java.awt.geom.Point2D;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Vec3;

/**
 * Where a plane cuts a cavity's wall, as polylines in the plane's two coordinates, found from
 * {@link Cavity#contains(Vec3)} alone so that it works for any shape.
 *
 * <p>Method: inside/outside is sampled on a square lattice a little larger than the cavity's
 * bounding box; every lattice edge whose ends differ holds a wall crossing, which is located by
 * bisection to near machine precision (so a flat wall comes out straight, not stepped); the
 * crossings of each lattice cell are joined as in the marching-squares contouring algorithm
 * (Lorensen &amp; Cline 1987 in 2-D form), and the pieces are chained into polylines. Corners
 * are cut by at most one lattice cell.
 */
public final class CavityOutline {
    /** Default lattice cells along the longer in-plane side. */
    public static final int DEFAULT_RESOLUTION = 240;

    private CavityOutline() {
    }

    /**
     * @param cavity the cavity
     * @param plane the plane (its two in-plane axes and the fixed coordinate)
     * @return outline polylines in (u, v) = the plane's (horizontal, vertical) coordinates, metres
     */
    public static List<List<Point2D>> inPlane(Cavity cavity, GridSlice.Plane plane) {
        return inPlane(cavity, plane.uAxis(), plane.vAxis(), plane.fixedCoordinate(), DEFAULT_RESOLUTION);
    }

    /**
     * @param cavity the cavity
     * @param uAxis horizontal in-plane axis, 0..2
     * @param vAxis vertical in-plane axis, 0..2, not uAxis
     * @param fixedCoordinate coordinate of the plane along the third axis, metres
     * @param resolution lattice cells along the longer side, in [8, 4000]
     * @return polylines in (u, v), metres; empty when the plane misses the cavity
     */
    public static List<List<Point2D>> inPlane(Cavity cavity, int uAxis, int vAxis, double fixedCoordinate,
                                              int resolution) {
        Objects.requireNonNull(cavity, "cavity");
        if (uAxis < 0 || uAxis > 2 || vAxis < 0 || vAxis > 2 || uAxis == vAxis) {
            throw new IllegalArgumentException("uAxis and vAxis must be two different axes in 0..2: " + uAxis + ", " + vAxis);
        }
        if (!Double.isFinite(fixedCoordinate)) {
            throw new IllegalArgumentException("fixedCoordinate must be finite: " + fixedCoordinate);
        }
        if (resolution < 8 || resolution > 4000) {
            throw new IllegalArgumentException("resolution must be in [8, 4000]: " + resolution);
        }
        int wAxis = 3 - uAxis - vAxis;
        Vec3[] b = cavity.bounds();
        double u0 = b[0].get(uAxis);
        double u1 = b[1].get(uAxis);
        double v0 = b[0].get(vAxis);
        double v1 = b[1].get(vAxis);
        double span = Math.max(u1 - u0, v1 - v0);
        // A margin outside the bounding box puts lattice nodes beyond every wall, so walls that
        // coincide with the bounding box are crossed too.
        double pad = 0.03 * span;
        double h = (span + 2 * pad) / resolution;
        int nu = (int) Math.ceil((u1 - u0 + 2 * pad) / h);
        int nv = (int) Math.ceil((v1 - v0 + 2 * pad) / h);
        double ou = u0 - pad;
        double ov = v0 - pad;
        Tracer t = new Tracer(cavity, uAxis, vAxis, wAxis, fixedCoordinate);
        boolean[][] in = new boolean[nu + 1][nv + 1];
        for (int i = 0; i <= nu; i++) {
            for (int j = 0; j <= nv; j++) {
                in[i][j] = t.inside(ou + i * h, ov + j * h);
            }
        }
        Map<Long, Point2D> crossings = new HashMap<>();
        List<long[]> segments = new ArrayList<>();
        for (int i = 0; i < nu; i++) {
            for (int j = 0; j < nv; j++) {
                boolean c00 = in[i][j];
                boolean c10 = in[i + 1][j];
                boolean c11 = in[i + 1][j + 1];
                boolean c01 = in[i][j + 1];
                // Edge ids: horizontal edge from node (i,j) → 2·node, vertical → 2·node + 1.
                long bottom = c00 != c10 ? edge(i, j, true, nv) : -1;
                long top = c01 != c11 ? edge(i, j + 1, true, nv) : -1;
                long left = c00 != c01 ? edge(i, j, false, nv) : -1;
                long right = c10 != c11 ? edge(i + 1, j, false, nv) : -1;
                List<Long> hit = new ArrayList<>(4);
                for (long e : new long[] {bottom, right, top, left}) {
                    if (e >= 0) {
                        hit.add(e);
                        crossings.computeIfAbsent(e, id -> t.crossing(id, ou, ov, h, nv, in));
                    }
                }
                if (hit.size() == 2) {
                    segments.add(new long[] {hit.get(0), hit.get(1)});
                } else if (hit.size() == 4) {
                    // Saddle: the cell centre decides which diagonal pair of corners is connected.
                    boolean centre = t.inside(ou + (i + 0.5) * h, ov + (j + 0.5) * h);
                    if (centre == c00) {
                        segments.add(new long[] {bottom, right});
                        segments.add(new long[] {top, left});
                    } else {
                        segments.add(new long[] {left, bottom});
                        segments.add(new long[] {right, top});
                    }
                }
            }
        }
        return chain(segments, crossings, h);
    }

    private static long edge(int i, int j, boolean horizontal, int nv) {
        long node = (long) i * (nv + 1) + j;
        return 2 * node + (horizontal ? 0 : 1);
    }

    /** Joins segments that share a crossing into polylines and drops points on straight runs. */
    private static List<List<Point2D>> chain(List<long[]> segments, Map<Long, Point2D> at, double h) {
        Map<Long, List<Integer>> touching = new HashMap<>();
        for (int s = 0; s < segments.size(); s++) {
            for (long e : segments.get(s)) {
                touching.computeIfAbsent(e, k -> new ArrayList<>(2)).add(s);
            }
        }
        boolean[] used = new boolean[segments.size()];
        List<List<Point2D>> out = new ArrayList<>();
        for (int s0 = 0; s0 < segments.size(); s0++) {
            if (used[s0]) {
                continue;
            }
            used[s0] = true;
            List<Long> ids = new ArrayList<>();
            ids.add(segments.get(s0)[0]);
            ids.add(segments.get(s0)[1]);
            extend(ids, segments, touching, used);
            java.util.Collections.reverse(ids);
            extend(ids, segments, touching, used);
            List<Point2D> pts = new ArrayList<>();
            for (long id : ids) {
                pts.add(at.get(id));
            }
            out.add(simplify(pts, 1e-6 * h));
        }
        return out;
    }

    private static void extend(List<Long> ids, List<long[]> segments, Map<Long, List<Integer>> touching,
                               boolean[] used) {
        while (true) {
            long end = ids.get(ids.size() - 1);
            int next = -1;
            for (int s : touching.get(end)) {
                if (!used[s]) {
                    next = s;
                    break;
                }
            }
            if (next < 0) {
                return;
            }
            used[next] = true;
            long[] seg = segments.get(next);
            ids.add(seg[0] == end ? seg[1] : seg[0]);
        }
    }

    /** Removes interior points that lie on the straight line through their neighbours. */
    private static List<Point2D> simplify(List<Point2D> pts, double tol) {
        if (pts.size() < 3) {
            return List.copyOf(pts);
        }
        List<Point2D> out = new ArrayList<>();
        out.add(pts.get(0));
        for (int k = 1; k < pts.size() - 1; k++) {
            Point2D a = out.get(out.size() - 1);
            Point2D b = pts.get(k);
            Point2D c = pts.get(k + 1);
            double cross = (b.getX() - a.getX()) * (c.getY() - a.getY()) - (b.getY() - a.getY()) * (c.getX() - a.getX());
            double len = a.distance(c);
            if (!(Math.abs(cross) <= tol * len)) {
                out.add(b);
            }
        }
        out.add(pts.get(pts.size() - 1));
        return List.copyOf(out);
    }

    /** Evaluates inside/outside in plane coordinates and finds wall crossings on lattice edges. */
    private static final class Tracer {
        private final Cavity cavity;
        private final int uAxis;
        private final int vAxis;
        private final int wAxis;
        private final double w;

        Tracer(Cavity cavity, int uAxis, int vAxis, int wAxis, double w) {
            this.cavity = cavity;
            this.uAxis = uAxis;
            this.vAxis = vAxis;
            this.wAxis = wAxis;
            this.w = w;
        }

        boolean inside(double u, double v) {
            double[] c = new double[3];
            c[uAxis] = u;
            c[vAxis] = v;
            c[wAxis] = w;
            return cavity.contains(new Vec3(c[0], c[1], c[2]));
        }

        Point2D crossing(long id, double ou, double ov, double h, int nv, boolean[][] in) {
            long node = id / 2;
            int i = (int) (node / (nv + 1));
            int j = (int) (node % (nv + 1));
            boolean horizontal = id % 2 == 0;
            double ua = ou + i * h;
            double va = ov + j * h;
            double ub = horizontal ? ua + h : ua;
            double vb = horizontal ? va : va + h;
            boolean aIn = in[i][j];
            // Bisection keeps [a, b] straddling the wall; 60 halvings reach below one ulp of h.
            for (int it = 0; it < 60; it++) {
                double um = 0.5 * (ua + ub);
                double vm = 0.5 * (va + vb);
                if (um == ua && vm == va || um == ub && vm == vb) {
                    break;
                }
                if (inside(um, vm) == aIn) {
                    ua = um;
                    va = vm;
                } else {
                    ub = um;
                    vb = vm;
                }
            }
            return new Point2D.Double(0.5 * (ua + ub), 0.5 * (va + vb));
        }
    }
}
