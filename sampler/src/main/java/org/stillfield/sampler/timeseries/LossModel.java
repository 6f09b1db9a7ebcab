package org.stillfield.sampler.timeseries;

import java.util.List;
import java.util.Objects;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * How each mode loses energy: its quality factor Q_l, so that the stored energy decays at
 * κ_l = ω_l/Q_l and the resonance has a Lorentzian line of full width κ_l (rad/s), i.e. f_l/Q_l
 * in Hz (Pozar, Microwave Engineering, cavity resonator sections; REFERENCE-VALUES.md §3).
 *
 * <p>Loss channels add as rates: 1/Q = Σ_i 1/Q_i ({@link Combined}), e.g. conductor and
 * dielectric, 1/Q = 1/Q_c + 1/Q_d.
 */
public sealed interface LossModel permits LossModel.Lossless, LossModel.ConstantQ, LossModel.WallConductivity,
    LossModel.DielectricLoss, LossModel.Combined {

    /**
     * @param table the modes
     * @return Q_l for every mode in table order; {@link Double#POSITIVE_INFINITY} for no loss
     */
    double[] qualityFactors(ModeTable table);

    /** @return short description for footers and reports, e.g. "wall sigma = 5.8e7 S/m" */
    String describe();

    /** @return no loss: every mode keeps its energy (Q = ∞) */
    static LossModel lossless() {
        return new Lossless();
    }

    /**
     * @param q quality factor shared by every mode, positive and finite
     * @return the model
     */
    static LossModel constant(double q) {
        return new ConstantQ(q);
    }

    /**
     * @param sigmaSiemensPerMetre wall conductivity, S/m, positive and finite (copper: 5.8e7, common practice)
     * @return conductor losses of the walls, by direct integration (box only)
     */
    static LossModel wallConductivity(double sigmaSiemensPerMetre) {
        return new WallConductivity(sigmaSiemensPerMetre);
    }

    /**
     * @param tanDelta loss tangent of the filling, positive and finite
     * @return dielectric loss, Q_d = 1/tanδ for every mode
     */
    static LossModel dielectric(double tanDelta) {
        return new DielectricLoss(tanDelta);
    }

    /**
     * @param parts loss channels, at least one
     * @return their sum as rates, 1/Q = Σ 1/Q_i
     */
    static LossModel combined(LossModel... parts) {
        return new Combined(List.of(parts));
    }

    /** No loss. */
    record Lossless() implements LossModel {
        @Override
        public double[] qualityFactors(ModeTable table) {
            double[] q = new double[table.size()];
            java.util.Arrays.fill(q, Double.POSITIVE_INFINITY);
            return q;
        }

        @Override
        public String describe() {
            return "lossless";
        }
    }

    /**
     * The same Q for every mode.
     *
     * @param q quality factor, positive and finite
     */
    record ConstantQ(double q) implements LossModel {
        /** Validates. */
        public ConstantQ {
            if (!(q > 0) || !Double.isFinite(q)) {
                throw new IllegalArgumentException("loss.q must be positive and finite: " + q);
            }
        }

        @Override
        public double[] qualityFactors(ModeTable table) {
            double[] out = new double[table.size()];
            java.util.Arrays.fill(out, q);
            return out;
        }

        @Override
        public String describe() {
            return "constant Q = " + q;
        }
    }

    /**
     * Conductor loss of the walls for a rectangular box, Q_c = ω W / P_loss, with the wall
     * losses integrated directly over the six faces from the cavity's own mode functions
     * ({@link BoxWallLoss}).
     *
     * @param sigmaSiemensPerMetre wall conductivity, S/m, positive and finite
     */
    record WallConductivity(double sigmaSiemensPerMetre) implements LossModel {
        /** Validates. */
        public WallConductivity {
            if (!(sigmaSiemensPerMetre > 0) || !Double.isFinite(sigmaSiemensPerMetre)) {
                throw new IllegalArgumentException(
                    "loss.wall_sigma_S_per_m must be positive and finite (S/m): " + sigmaSiemensPerMetre);
            }
        }

        @Override
        public double[] qualityFactors(ModeTable table) {
            if (!(table.cavity() instanceof RectangularCavity)) {
                throw new IllegalArgumentException("loss.wall_sigma_S_per_m is implemented for cavity shape box only,"
                    + " got shape " + table.cavity().shape() + "; give loss.q instead");
            }
            return BoxWallLoss.conductorQ((RectangularCavity) table.cavity(), table.modes(), table.omegas(),
                sigmaSiemensPerMetre);
        }

        @Override
        public String describe() {
            return "wall sigma = " + sigmaSiemensPerMetre + " S/m";
        }
    }

    /**
     * Dielectric loss of the filling, Q_d = 1/tanδ (Pozar, dielectric-filled cavity; REFERENCE-VALUES.md §3).
     *
     * @param tanDelta loss tangent, positive and finite
     */
    record DielectricLoss(double tanDelta) implements LossModel {
        /** Validates. */
        public DielectricLoss {
            if (!(tanDelta > 0) || !Double.isFinite(tanDelta)) {
                throw new IllegalArgumentException("loss.tan_delta must be positive and finite: " + tanDelta);
            }
        }

        @Override
        public double[] qualityFactors(ModeTable table) {
            double[] out = new double[table.size()];
            java.util.Arrays.fill(out, 1.0 / tanDelta);
            return out;
        }

        @Override
        public String describe() {
            return "tan delta = " + tanDelta;
        }
    }

    /**
     * Several loss channels: 1/Q = Σ 1/Q_i.
     *
     * @param parts the channels, at least one
     */
    record Combined(List<LossModel> parts) implements LossModel {
        /** Copies and validates. */
        public Combined {
            parts = List.copyOf(Objects.requireNonNull(parts, "parts"));
            if (parts.isEmpty()) {
                throw new IllegalArgumentException("combined loss model needs at least one part");
            }
        }

        @Override
        public double[] qualityFactors(ModeTable table) {
            double[] rate = new double[table.size()];
            for (LossModel part : parts) {
                double[] q = part.qualityFactors(table);
                for (int l = 0; l < rate.length; l++) {
                    rate[l] += 1.0 / q[l];
                }
            }
            for (int l = 0; l < rate.length; l++) {
                rate[l] = 1.0 / rate[l];
            }
            return rate;
        }

        @Override
        public String describe() {
            StringBuilder sb = new StringBuilder();
            for (LossModel p : parts) {
                sb.append(sb.length() == 0 ? "" : " + ").append(p.describe());
            }
            return sb.toString();
        }
    }
}
