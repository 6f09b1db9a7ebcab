package org.stillfield.sampler.timeseries;

import java.util.Objects;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.Vec3;

/**
 * A detector element that reads a linear functional of the field. Each kind reduces to
 * per-mode coefficients ({@link #coefficients}) so a signal is Σ a_l e_l + b_l q_l:
 * <ul>
 *   <li>{@link ElectricDipole}: V = ℓ n̂·E(r₀), a short antenna of effective length ℓ (V);</li>
 *   <li>{@link SmearedDipole}: the same with E averaged over an isotropic Gaussian of width w (V);</li>
 *   <li>{@link MagneticLoop}: a loop small compared with the wavelength, flux Φ = A n̂·B(r₀) (Wb) or its
 *       EMF −dΦ/dt = A n̂·(∇×E)(r₀) (V);</li>
 *   <li>{@link FieldProbe}: one Cartesian component of A, E or B at a point.</li>
 * </ul>
 * With E = Σ e u, B = Σ k q h (PHYSICS.md §2) and ∇×E = Σ e k h.
 */
public sealed interface Probe permits Probe.ElectricDipole, Probe.SmearedDipole, Probe.MagneticLoop,
    Probe.FieldProbe {

    /** @return channel name */
    String name();

    /** @return SI unit of the signal */
    String unit();

    /**
     * @param table the modes
     * @return the probe's coefficients on the table's modes
     * @throws IllegalArgumentException if the probe does not lie inside the cavity
     */
    ProbeCoefficients coefficients(ModeTable table);

    /** Output of a {@link MagneticLoop}. */
    enum LoopOutput {
        /** Φ = A n̂·B, Wb: couples to q. */
        FLUX,
        /** EMF = −dΦ/dt = A n̂·∇×E, V, circulating right-handed about n̂: couples to e. */
        EMF
    }

    /**
     * Point electric dipole: V = ℓ n̂·E(r₀).
     *
     * @param name channel name
     * @param position r₀, metres, inside the cavity
     * @param direction orientation; any non-zero finite vector, stored normalised
     * @param lengthMetres effective length ℓ, m, positive and finite (1 gives n̂·E in V/m)
     */
    record ElectricDipole(String name, Vec3 position, Vec3 direction, double lengthMetres) implements Probe {
        /** Validates and normalises the direction. */
        public ElectricDipole {
            name = checkName(name);
            checkPoint(position, name);
            direction = normalised(direction, name + ".direction");
            positive(lengthMetres, name + ".length_m");
        }

        @Override
        public String unit() {
            return "V";
        }

        @Override
        public ProbeCoefficients coefficients(ModeTable table) {
            double[] u = basisU(table, position, name);
            int m = table.size();
            double[] a = new double[m];
            for (int l = 0; l < m; l++) {
                a[l] = lengthMetres * dot(direction, u, 3 * l);
            }
            return new ProbeCoefficients(name, unit(), a, new double[m]);
        }
    }

    /**
     * Electric dipole reading E averaged with the weight (2πw²)^{−3/2} exp(−|r − r₀|²/2w²). For a
     * box the average of each mode is exact and analytic, e^{−k²w²/2} u(r₀); other shapes use
     * Gauss–Hermite quadrature ({@link GaussianSmearing}).
     *
     * @param name channel name
     * @param position r₀, metres, inside the cavity
     * @param direction orientation, stored normalised
     * @param lengthMetres effective length ℓ, m
     * @param widthMetres Gaussian standard deviation w per axis, m, positive and finite
     */
    record SmearedDipole(String name, Vec3 position, Vec3 direction, double lengthMetres, double widthMetres)
        implements Probe {
        /** Validates and normalises the direction. */
        public SmearedDipole {
            name = checkName(name);
            checkPoint(position, name);
            direction = normalised(direction, name + ".direction");
            positive(lengthMetres, name + ".length_m");
            positive(widthMetres, name + ".width_m");
        }

        @Override
        public String unit() {
            return "V";
        }

        @Override
        public ProbeCoefficients coefficients(ModeTable table) {
            inside(table.cavity(), position, name);
            double[] u = GaussianSmearing.smearedU(table, position, widthMetres, name);
            int m = table.size();
            double[] a = new double[m];
            for (int l = 0; l < m; l++) {
                a[l] = lengthMetres * dot(direction, u, 3 * l);
            }
            return new ProbeCoefficients(name, unit(), a, new double[m]);
        }
    }

    /**
     * Small loop: flux Φ = A n̂·B(r₀) or EMF = −dΦ/dt, valid when the loop is small compared with
     * the wavelength of every mode (B uniform over it).
     *
     * @param name channel name
     * @param centre r₀, metres, inside the cavity
     * @param normal loop normal n̂, stored normalised
     * @param areaSquareMetres area A, m², positive and finite
     * @param output flux or EMF
     */
    record MagneticLoop(String name, Vec3 centre, Vec3 normal, double areaSquareMetres, LoopOutput output)
        implements Probe {
        /** Validates and normalises the normal. */
        public MagneticLoop {
            name = checkName(name);
            checkPoint(centre, name);
            normal = normalised(normal, name + ".normal");
            positive(areaSquareMetres, name + ".area_m2");
            Objects.requireNonNull(output, "output");
        }

        @Override
        public String unit() {
            return output == LoopOutput.FLUX ? "Wb" : "V";
        }

        @Override
        public ProbeCoefficients coefficients(ModeTable table) {
            double[] h = basisH(table, centre, name);
            int m = table.size();
            double[] c = new double[m];
            for (int l = 0; l < m; l++) {
                c[l] = areaSquareMetres * table.modes().get(l).k() * dot(normal, h, 3 * l);
            }
            return output == LoopOutput.FLUX
                ? new ProbeCoefficients(name, unit(), new double[m], c)
                : new ProbeCoefficients(name, unit(), c, new double[m]);
        }
    }

    /**
     * One Cartesian component of A, E or B at a point.
     *
     * @param name channel name
     * @param field A, E or B
     * @param position the point, metres, inside the cavity
     * @param component 0, 1 or 2 for x, y, z
     */
    record FieldProbe(String name, Field field, Vec3 position, int component) implements Probe {
        /** Validates. */
        public FieldProbe {
            name = checkName(name);
            Objects.requireNonNull(field, "field");
            checkPoint(position, name);
            if (component < 0 || component > 2) {
                throw new IllegalArgumentException(name + ".component must be 0, 1 or 2: " + component);
            }
        }

        @Override
        public String unit() {
            return field.unit();
        }

        @Override
        public ProbeCoefficients coefficients(ModeTable table) {
            int m = table.size();
            double[] a = new double[m];
            double[] b = new double[m];
            if (field == Field.B) {
                double[] h = basisH(table, position, name);
                for (int l = 0; l < m; l++) {
                    b[l] = table.modes().get(l).k() * h[3 * l + component];
                }
            } else {
                double[] u = basisU(table, position, name);
                double[] target = field == Field.E ? a : b;
                for (int l = 0; l < m; l++) {
                    target[l] = u[3 * l + component];
                }
            }
            return new ProbeCoefficients(name, unit(), a, b);
        }
    }

    private static String checkName(String name) {
        if (name == null || name.isBlank()) {
            throw new IllegalArgumentException("probe name must be non-empty: " + name);
        }
        return name;
    }

    private static void checkPoint(Vec3 r, String name) {
        Objects.requireNonNull(r, name + " position");
        if (!r.isFinite()) {
            throw new IllegalArgumentException(name + " position must be finite: " + r);
        }
    }

    private static Vec3 normalised(Vec3 v, String what) {
        Objects.requireNonNull(v, what);
        double n = v.norm();
        if (!(n > 0) || !Double.isFinite(n)) {
            throw new IllegalArgumentException(what + " must be a non-zero finite vector: " + v);
        }
        return new Vec3(v.x() / n, v.y() / n, v.z() / n);
    }

    private static void positive(double v, String what) {
        if (!(v > 0) || !Double.isFinite(v)) {
            throw new IllegalArgumentException(what + " must be positive and finite: " + v);
        }
    }

    private static void inside(Cavity cavity, Vec3 r, String name) {
        if (!cavity.contains(r)) {
            throw new IllegalArgumentException("probe " + name + " position " + r + " m lies outside the cavity");
        }
    }

    private static double[] basisU(ModeTable table, Vec3 r, String name) {
        inside(table.cavity(), r, name);
        ModeFunctions f = table.cavity().modeFunctions(table.modes());
        double[] u = new double[3 * table.size()];
        f.evaluate(r.x(), r.y(), r.z(), u, null);
        return u;
    }

    private static double[] basisH(ModeTable table, Vec3 r, String name) {
        inside(table.cavity(), r, name);
        ModeFunctions f = table.cavity().modeFunctions(table.modes());
        double[] h = new double[3 * table.size()];
        f.evaluate(r.x(), r.y(), r.z(), null, h);
        return h;
    }

    private static double dot(Vec3 n, double[] v, int off) {
        return n.x() * v[off] + n.y() * v[off + 1] + n.z() * v[off + 2];
    }
}
