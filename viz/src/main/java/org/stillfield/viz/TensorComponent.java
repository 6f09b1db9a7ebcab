package org.stillfield.viz;

import java.util.List;
import java.util.Locale;
import org.stillfield.sampler.api.Field;

/**
 * One Cartesian component (i, j) of a two-point correlation tensor C_ij(r, r′).
 *
 * @param i component at r: 0 = x, 1 = y, 2 = z
 * @param j component at r′: 0 = x, 1 = y, 2 = z
 */
public record TensorComponent(int i, int j) {
    /** C_xx. */
    public static final TensorComponent XX = new TensorComponent(0, 0);
    /** C_yy. */
    public static final TensorComponent YY = new TensorComponent(1, 1);
    /** C_zz. */
    public static final TensorComponent ZZ = new TensorComponent(2, 2);
    /** The three diagonal components. */
    public static final List<TensorComponent> DIAGONAL = List.of(XX, YY, ZZ);

    /** Validates the indices. */
    public TensorComponent {
        if (i < 0 || i > 2) {
            throw new IllegalArgumentException("component index i must be 0, 1 or 2: " + i);
        }
        if (j < 0 || j > 2) {
            throw new IllegalArgumentException("component index j must be 0, 1 or 2: " + j);
        }
    }

    /**
     * @param name two letters from x, y, z, e.g. {@code "xz"}
     * @return the component
     */
    public static TensorComponent of(String name) {
        String s = name == null ? "" : name.trim().toLowerCase(Locale.ROOT);
        if (s.length() != 2 || "xyz".indexOf(s.charAt(0)) < 0 || "xyz".indexOf(s.charAt(1)) < 0) {
            throw new IllegalArgumentException("component name must be two letters from x, y, z (e.g. xx, xz): " + name);
        }
        return new TensorComponent("xyz".indexOf(s.charAt(0)), "xyz".indexOf(s.charAt(1)));
    }

    /** @return the two letters, e.g. {@code xz} */
    public String letters() {
        return "" + "xyz".charAt(i) + "xyz".charAt(j);
    }

    /** @return plain-text symbol, e.g. {@code C_xz} */
    public String symbol() {
        return "C_" + letters();
    }

    /** @return symbol naming the field, e.g. {@code ⟨E_x E_z⟩} */
    public String symbol(Field field) {
        return "⟨" + field.column(i) + "(r) " + field.column(j) + "(r′)⟩";
    }
}
