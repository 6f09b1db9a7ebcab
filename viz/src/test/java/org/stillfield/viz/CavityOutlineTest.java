package org.stillfield.viz;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.geom.Point2D;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.geometry.RectangularCavity;

class CavityOutlineTest {
    private static double length(List<Point2D> line) {
        double s = 0;
        for (int k = 1; k < line.size(); k++) {
            s += line.get(k).distance(line.get(k - 1));
        }
        return s;
    }

    @Test
    void boxCutIsItsRectangle() {
        double a = 0.03;
        double b = 0.02;
        double d = 0.04;
        Cavity box = RectangularCavity.of(a, b, d, Medium.VACUUM);
        int res = 200;
        List<List<Point2D>> out = CavityOutline.inPlane(box, 0, 2, b / 2, res);
        assertEquals(1, out.size(), "one closed outline");
        List<Point2D> line = out.get(0);
        assertTrue(line.get(0).distance(line.get(line.size() - 1)) < 1e-15, "outline is closed");
        double h = 1.06 * d / res;
        for (Point2D p : line) {
            // Every point lies on a wall: x = 0, x = a, z = 0 or z = d (bisection to ~1e-17 m).
            double off = Math.min(Math.min(Math.abs(p.getX()), Math.abs(p.getX() - a)),
                Math.min(Math.abs(p.getY()), Math.abs(p.getY() - d)));
            assertTrue(off < 1e-12, "point off the walls by " + off + " m: " + p);
        }
        // Corners are cut by at most one lattice cell: each loses at most (2 − √2)·h of length.
        double perimeter = 2 * (a + d);
        double len = length(line);
        assertTrue(len <= perimeter + 1e-12 && len >= perimeter - 4 * (2 - Math.sqrt(2)) * h,
            "outline length " + len + " m against perimeter " + perimeter + " m");
        // Straight runs are merged: a rectangle needs only a few vertices per side.
        assertTrue(line.size() < 20, "too many vertices: " + line.size());
    }

    @Test
    void planeOutsideTheCavityHasNoOutline() {
        Cavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        assertTrue(CavityOutline.inPlane(box, 0, 2, 0.05, 50).isEmpty());
    }

    /**
     * A sphere of radius R cut at height w is a circle of radius √(R² − w²): every outline point
     * must lie on it. Only contains and bounds are used by the tracer.
     */
    @Test
    void sphereCutIsACircle() {
        double r = 0.01;
        double w = 0.004;
        Cavity sphere = new Cavity() {
            @Override
            public String shape() {
                return "sphere";
            }

            @Override
            public Map<String, Double> parameters() {
                return Map.of("R_m", r);
            }

            @Override
            public Medium medium() {
                return Medium.VACUUM;
            }

            @Override
            public double volume() {
                return 4.0 / 3.0 * Math.PI * r * r * r;
            }

            @Override
            public Vec3[] bounds() {
                return new Vec3[] {new Vec3(-r, -r, -r), new Vec3(r, r, r)};
            }

            @Override
            public boolean contains(Vec3 p) {
                return p.norm() <= r;
            }

            @Override
            public double weylCount(double k) {
                throw new UnsupportedOperationException("not needed by the outline");
            }

            @Override
            public double lowestK() {
                throw new UnsupportedOperationException("not needed by the outline");
            }

            @Override
            public List<Mode> modesUpTo(double kMax) {
                throw new UnsupportedOperationException("not needed by the outline");
            }

            @Override
            public ModeFunctions modeFunctions(List<Mode> modes) {
                throw new UnsupportedOperationException("not needed by the outline");
            }
        };
        List<List<Point2D>> out = CavityOutline.inPlane(sphere, 0, 1, w, 120);
        assertEquals(1, out.size());
        double rho = Math.sqrt(r * r - w * w);
        for (Point2D p : out.get(0)) {
            assertEquals(rho, Math.hypot(p.getX(), p.getY()), 1e-12, "point " + p);
        }
        // Inscribed polygon of a circle: shorter than 2πρ, by under 1 % at this resolution.
        double len = length(out.get(0));
        assertTrue(len < 2 * Math.PI * rho && len > 0.99 * 2 * Math.PI * rho, "length " + len);
    }
}
