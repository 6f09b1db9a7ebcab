package org.stillfield.sampler.api;

/**
 * One electromagnetic eigenmode of a cavity.
 *
 * <p>The label is geometry-neutral: a family (TE or TM for the closed cavities), three integer
 * indices whose meaning the cavity documents (l, m, n for a box; n, m, p for a cylinder), and an
 * orientation index that separates degenerate partners (cos/sin, or the 2n+1 members of a
 * sphere multiplet). Two modes of one cavity never share the whole label.
 *
 * @param family mode family, e.g. "TE" or "TM"
 * @param i1 first index
 * @param i2 second index
 * @param i3 third index
 * @param orientation degenerate-partner index, 0 when there is none
 * @param k wave number in the filling, rad/m (ω = k·c/√(ε_r μ_r))
 */
public record Mode(String family, int i1, int i2, int i3, int orientation, double k) {
    /** Validates the label and wave number. */
    public Mode {
        if (family == null || family.isEmpty()) {
            throw new IllegalArgumentException("family must be non-empty");
        }
        if (!(k > 0) || !Double.isFinite(k)) {
            throw new IllegalArgumentException("k must be positive and finite: " + k);
        }
    }

    /** @return label such as {@code TE_101} or {@code TM_110/1} */
    public String label() {
        String base = family + "_" + i1 + "," + i2 + "," + i3;
        return orientation == 0 ? base : base + "/" + orientation;
    }
}
