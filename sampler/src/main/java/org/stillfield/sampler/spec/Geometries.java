package org.stillfield.sampler.spec;

import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * The registry of cavity shapes a spec may name. Adding a geometry means adding one reader
 * here; nothing else in the tool branches on the shape.
 */
public final class Geometries {
    /** Reads one shape's parameters from the {@code cavity} section. */
    @FunctionalInterface
    public interface Reader {
        /**
         * @param node the cavity section (shape, eps_r and mu_r are already read)
         * @param medium the filling
         * @return the cavity
         * @throws SpecException when a parameter is missing or out of range
         */
        Cavity read(SpecNode node, Medium medium) throws SpecException;
    }

    private record Entry(List<String> keys, Reader reader) {
    }

    private static final Map<String, Entry> SHAPES = new TreeMap<>();

    static {
        SHAPES.put("box", new Entry(List.of("a_m", "b_m", "d_m"),
            (n, m) -> RectangularCavity.of(n.positive("a_m", "metres"), n.positive("b_m", "metres"),
                n.positive("d_m", "metres"), m)));
    }

    private Geometries() {
    }

    /** @return shape names a spec may use */
    public static List<String> shapes() {
        return List.copyOf(SHAPES.keySet());
    }

    static List<String> keys(String shape) {
        return SHAPES.get(shape).keys();
    }

    static Cavity read(String shape, SpecNode node, Medium medium) throws SpecException {
        return SHAPES.get(shape).reader().read(node, medium);
    }
}
