package org.stillfield.sampler.spec;

import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.geometry.CylindricalCavity;
import org.stillfield.sampler.geometry.PeriodicBox;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.geometry.SphericalCavity;

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
        SHAPES.put("cylinder", new Entry(List.of("radius_m", "length_m"),
            (n, m) -> CylindricalCavity.of(n.positive("radius_m", "metres"), n.positive("length_m", "metres"), m)));
        SHAPES.put("sphere", new Entry(List.of("radius_m"),
            (n, m) -> SphericalCavity.of(n.positive("radius_m", "metres"), m)));
        SHAPES.put("periodic", new Entry(List.of("lx_m", "ly_m", "lz_m"),
            (n, m) -> PeriodicBox.of(n.positive("lx_m", "metres"), n.positive("ly_m", "metres"),
                n.positive("lz_m", "metres"), m)));
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
