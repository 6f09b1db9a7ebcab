package org.stillfield.sampler.geometry;

/** Argument checks shared by the geometries. */
final class Checks {
    private Checks() {
    }

    /**
     * @param v a length in metres
     * @param name the spec setting it came from, e.g. {@code cavity.a_m}
     * @throws IllegalArgumentException unless v is positive and finite (NaN is rejected)
     */
    static void positiveLength(double v, String name) {
        if (!(v > 0) || !Double.isFinite(v)) {
            throw new IllegalArgumentException(name + " must be positive and finite (metres): " + v);
        }
    }
}
