package org.stillfield.sampler.api;

/**
 * A point or vector in metres (or the unit of whatever it holds), Cartesian components.
 *
 * @param x x component
 * @param y y component
 * @param z z component
 */
public record Vec3(double x, double y, double z) {
    /** The origin. */
    public static final Vec3 ZERO = new Vec3(0, 0, 0);

    /** @return component {@code i} (0 = x, 1 = y, 2 = z) */
    public double get(int i) {
        switch (i) {
            case 0: return x;
            case 1: return y;
            case 2: return z;
            default: throw new IllegalArgumentException("component index must be 0, 1 or 2: " + i);
        }
    }

    /** @return this + s·v */
    public Vec3 plusScaled(Vec3 v, double s) {
        return new Vec3(x + s * v.x, y + s * v.y, z + s * v.z);
    }

    /** @return this − v */
    public Vec3 minus(Vec3 v) {
        return new Vec3(x - v.x, y - v.y, z - v.z);
    }

    /** @return Euclidean length */
    public double norm() {
        return Math.sqrt(x * x + y * y + z * z);
    }

    /** @return true when all components are finite */
    public boolean isFinite() {
        return Double.isFinite(x) && Double.isFinite(y) && Double.isFinite(z);
    }
}
