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

    /**
     * @param mode a mode of a cylinder or sphere
     * @param shape the cavity's name, for the message
     * @return true for TM, false for TE
     * @throws IllegalArgumentException for any other family
     */
    static boolean isTm(org.stillfield.sampler.api.Mode mode, String shape) {
        if ("TM".equals(mode.family())) {
            return true;
        }
        if ("TE".equals(mode.family())) {
            return false;
        }
        throw new IllegalArgumentException("not a " + shape + " mode (family must be TE or TM): " + mode.label());
    }

    /** Key of one radial function: its order n and its family, for sharing it between modes. */
    static long radialKey(boolean isTm, int n) {
        return ((long) n << 1) | (isTm ? 1L : 0L);
    }
}
