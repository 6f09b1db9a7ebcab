package org.stillfield.sampler.api;

/**
 * The fields Stillfield synthesises (PHYSICS.md §2): A = Σ q u, E = Σ e u, B = Σ k q h.
 */
public enum Field {
    /** Vector potential in Coulomb gauge, V·s/m. */
    A("V*s/m", "vector potential (Coulomb gauge)"),
    /** Electric field, V/m. */
    E("V/m", "electric field"),
    /** Magnetic flux density, T. */
    B("T", "magnetic flux density");

    private final String unit;
    private final String description;

    Field(String unit, String description) {
        this.unit = unit;
        this.description = description;
    }

    /** @return SI unit of the field's components */
    public String unit() {
        return unit;
    }

    /** @return unit of a two-point correlation of this field */
    public String correlationUnit() {
        return "(" + unit + ")^2";
    }

    /** @return human-readable name */
    public String description() {
        return description;
    }

    /** @return column name of component {@code i} (0..2), e.g. {@code E_x} */
    public String column(int i) {
        return name() + "_" + "xyz".charAt(i);
    }
}
