package org.stillfield.analysis;

import java.util.Objects;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Vec3;

/**
 * The six walls of a rectangular PEC cavity, for the single-plane image references: which wall is
 * nearest to a point or a pair of points. Only a box ("box" shape) has plane walls at its bounds;
 * other shapes have none here.
 */
public final class BoxWalls {
    private final Vec3 low;
    private final Vec3 high;

    private BoxWalls(Vec3 low, Vec3 high) {
        this.low = low;
        this.high = high;
    }

    /**
     * A plane wall x_axis = position.
     *
     * @param axis normal axis 0..2
     * @param position the wall's coordinate, metres
     * @param distanceM distance of the point (or pair midpoint) asked about, metres
     */
    public record Wall(int axis, double position, double distanceM) {
    }

    /**
     * @param cavity any cavity
     * @return the walls, or null when the cavity is not a box
     */
    public static BoxWalls of(Cavity cavity) {
        Objects.requireNonNull(cavity, "cavity");
        if (!"box".equals(cavity.shape())) {
            return null;
        }
        Vec3[] b = cavity.bounds();
        return new BoxWalls(b[0], b[1]);
    }

    /**
     * @param r a point inside the box, metres
     * @return the nearest of the six walls and the distance to it (ties: lowest axis, low side first)
     */
    public Wall nearest(Vec3 r) {
        Objects.requireNonNull(r, "r");
        Wall best = null;
        for (int axis = 0; axis < 3; axis++) {
            double lo = r.get(axis) - low.get(axis);
            double hi = high.get(axis) - r.get(axis);
            if (best == null || lo < best.distanceM()) {
                best = new Wall(axis, low.get(axis), lo);
            }
            if (hi < best.distanceM()) {
                best = new Wall(axis, high.get(axis), hi);
            }
        }
        return best;
    }

    /**
     * @param r first point, metres
     * @param r2 second point, metres
     * @return the wall nearest to the midpoint of the two points
     */
    public Wall nearest(Vec3 r, Vec3 r2) {
        return nearest(new Vec3(0.5 * (r.x() + r2.x()), 0.5 * (r.y() + r2.y()), 0.5 * (r.z() + r2.z())));
    }
}
