package org.stillfield.sampler.timeseries;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.spec.SpecException;
import org.stillfield.sampler.spec.SpecNode;

/**
 * The {@code timeseries:} and {@code probes:} sections of a run spec, validated. Read by
 * {@link #read}, which the spec reader calls with the two nodes; every error names the dotted
 * setting. Keys:
 * <pre>
 * timeseries:
 *   dt_s: 2.0e-11              # step (or sample_rate_Hz / sample_rate_GHz: exactly one of the three)
 *   steps: 65536               # sampling times per trajectory
 *   samples: 64                # trajectories (default: the top-level samples)
 *   loss:                      # any of these; several add as rates 1/Q = Σ 1/Q_i; none = lossless
 *     q: 1.0e4                 #   same Q for every mode
 *     wall_sigma_S_per_m: 5.8e7  # wall conductivity (box only), direct wall-loss integration
 *     tan_delta: 1.0e-4        #   dielectric loss of the filling
 *   record: [probes]           # what each step stores: probes (always), amplitudes (q_l, e_l) if listed
 *   aliasing: warn             # warn | fail when modes lie at or above the Nyquist frequency
 *   spectra:
 *     segment: 4096            # Welch segment length (power of two, ≤ steps)
 *     detrend: none            # none | mean
 *     confidence: 0.95         # level of the χ² band
 *     correlation_lags: 256    # two-time correlation up to this lag (steps)
 *     origins: all             # first | all
 * probes:
 *   - {name: pin,  kind: dipole, at: [x, y, z], direction: [0, 1, 0], length_m: 0.002}
 *   - {name: blob, kind: smeared_dipole, at: [...], direction: [...], length_m: 0.002, width_m: 5.0e-4}
 *   - {name: coil, kind: loop, at: [...], normal: [1, 0, 0], area_m2: 1.0e-6, output: flux}   # flux | emf
 *   - {name: ez,   kind: field, field: E, component: z, at: [...]}
 * </pre>
 *
 * @param grid sampling times
 * @param samples number of trajectories
 * @param loss loss model of the modes
 * @param probes the channels
 * @param amplitudes also output mode amplitudes
 * @param failOnAliasing refuse to run when any mode aliases (else warn)
 * @param spectra analysis settings
 */
public record TimeSeriesSpec(TimeGrid grid, long samples, LossModel loss, List<Probe> probes, boolean amplitudes,
                             boolean failOnAliasing, Spectra spectra) {
    /** Keys allowed under {@code timeseries:}. */
    public static final List<String> KEYS = List.of("dt_s", "sample_rate_Hz", "sample_rate_GHz", "steps", "samples",
        "loss", "record", "aliasing", "spectra");

    /**
     * Spectral analysis settings.
     *
     * @param segment Welch segment length, power of two, ≤ steps
     * @param removeMean detrend each segment by its mean
     * @param confidence χ² band level in (0, 1)
     * @param correlationLags largest lag of the two-time correlation, steps (&lt; steps)
     * @param allOrigins average the correlation over all time origins (else t = 0 only)
     */
    public record Spectra(int segment, boolean removeMean, double confidence, int correlationLags,
                          boolean allOrigins) {
    }

    /** Copies the probe list. */
    public TimeSeriesSpec {
        probes = List.copyOf(probes);
    }

    /**
     * @param node the {@code timeseries:} mapping
     * @param probes the {@code probes:} list items
     * @param cavity the run's cavity, for position checks
     * @param defaultSamples the top-level sample count
     * @return the validated section
     * @throws SpecException naming the first bad setting
     */
    public static TimeSeriesSpec read(SpecNode node, List<SpecNode> probes, Cavity cavity, long defaultSamples)
        throws SpecException {
        node.rejectUnknown(KEYS);
        int given = (node.has("dt_s") ? 1 : 0) + (node.has("sample_rate_Hz") ? 1 : 0)
            + (node.has("sample_rate_GHz") ? 1 : 0);
        if (given != 1) {
            throw new SpecException(node.at("dt_s"), "give exactly one of dt_s, sample_rate_Hz or sample_rate_GHz, got "
                + given);
        }
        double dt;
        if (node.has("dt_s")) {
            dt = node.positive("dt_s", "seconds");
        } else if (node.has("sample_rate_Hz")) {
            dt = 1 / node.positive("sample_rate_Hz", "Hz");
        } else {
            dt = 1 / (1e9 * node.positive("sample_rate_GHz", "GHz"));
        }
        if (!node.has("steps")) {
            throw new SpecException(node.at("steps"), "is required: a whole number in [1, " + Integer.MAX_VALUE + "]");
        }
        int steps = (int) node.integer("steps", 0, 1, Integer.MAX_VALUE);
        long samples = node.integer("samples", defaultSamples, 1, 1_000_000_000L);
        LossModel loss = loss(node.child("loss"));
        boolean amplitudes = record(node);
        boolean fail = node.choice("aliasing", "warn", List.of("warn", "fail")).equals("fail");
        Spectra spectra = spectra(node.child("spectra"), steps);
        List<Probe> list = new ArrayList<>();
        Set<String> names = new HashSet<>();
        for (SpecNode p : probes) {
            Probe probe = probe(p, cavity);
            if (!names.add(probe.name())) {
                throw new SpecException(p.at("name"), "'" + probe.name() + "' is used twice; probe names must be unique");
            }
            list.add(probe);
        }
        return new TimeSeriesSpec(new TimeGrid(dt, steps), samples, loss, list, amplitudes, fail, spectra);
    }

    /** A list rather than a flag: YAML 1.2 reads true/false as booleans, which SpecNode keeps as such. */
    private static boolean record(SpecNode node) throws SpecException {
        if (!node.has("record")) {
            return false;
        }
        boolean amplitudes = false;
        for (Object o : node.list("record")) {
            String v = String.valueOf(o).trim().toLowerCase(Locale.ROOT);
            if (v.equals("amplitudes")) {
                amplitudes = true;
            } else if (!v.equals("probes")) {
                throw new SpecException(node.at("record"), "items must be probes or amplitudes, got '" + o + "'");
            }
        }
        return amplitudes;
    }

    private static LossModel loss(SpecNode node) throws SpecException {
        node.rejectUnknown(List.of("q", "wall_sigma_S_per_m", "tan_delta"));
        List<LossModel> parts = new ArrayList<>();
        if (node.has("q")) {
            parts.add(LossModel.constant(node.positive("q", "dimensionless")));
        }
        if (node.has("wall_sigma_S_per_m")) {
            parts.add(LossModel.wallConductivity(node.positive("wall_sigma_S_per_m", "S/m")));
        }
        if (node.has("tan_delta")) {
            parts.add(LossModel.dielectric(node.positive("tan_delta", "dimensionless")));
        }
        if (parts.isEmpty()) {
            return LossModel.lossless();
        }
        return parts.size() == 1 ? parts.get(0) : LossModel.combined(parts.toArray(new LossModel[0]));
    }

    private static Spectra spectra(SpecNode node, int steps) throws SpecException {
        node.rejectUnknown(List.of("segment", "detrend", "confidence", "correlation_lags", "origins"));
        int fallback = Integer.highestOneBit(Math.max(4, Math.min(steps, 4096)));
        int segment = (int) node.integer("segment", fallback, 4, 1 << 30);
        if (Integer.bitCount(segment) != 1 || segment > steps) {
            throw new SpecException(node.at("segment"), "must be a power of two between 4 and steps = " + steps
                + ", got " + segment);
        }
        boolean mean = node.choice("detrend", "none", List.of("none", "mean")).equals("mean");
        double level = node.number("confidence", 0.95);
        if (!(level > 0 && level < 1)) {
            throw new SpecException(node.at("confidence"), "must lie in (0, 1), got " + level);
        }
        int lags = (int) node.integer("correlation_lags", Math.min(256, steps - 1), 0, Math.max(0, steps - 1));
        boolean all = node.choice("origins", "all", List.of("first", "all")).equals("all");
        return new Spectra(segment, mean, level, lags, all);
    }

    private static Probe probe(SpecNode p, Cavity cavity) throws SpecException {
        String kind = p.choice("kind", null, List.of("dipole", "smeared_dipole", "loop", "field"));
        List<String> common = List.of("name", "kind", "at");
        List<String> known = new ArrayList<>(common);
        switch (kind) {
            case "dipole": known.addAll(List.of("direction", "length_m")); break;
            case "smeared_dipole": known.addAll(List.of("direction", "length_m", "width_m")); break;
            case "loop": known.addAll(List.of("normal", "area_m2", "output")); break;
            default: known.addAll(List.of("field", "component")); break;
        }
        p.rejectUnknown(known);
        String name = p.string("name");
        if (!name.matches("[A-Za-z0-9_.-]{1,40}")) {
            throw new SpecException(p.at("name"), "must be 1-40 letters, digits, '_', '-' or '.', got '" + name + "'");
        }
        double[] at = p.triple("at");
        Vec3 r = new Vec3(at[0], at[1], at[2]);
        if (!cavity.contains(r)) {
            throw new SpecException(p.at("at"), String.format(Locale.ROOT, "point (%g, %g, %g) m lies outside the cavity",
                r.x(), r.y(), r.z()));
        }
        try {
            switch (kind) {
                case "dipole":
                    return new Probe.ElectricDipole(name, r, vector(p, "direction"), p.positive("length_m", "m"));
                case "smeared_dipole":
                    return new Probe.SmearedDipole(name, r, vector(p, "direction"), p.positive("length_m", "m"),
                        p.positive("width_m", "m"));
                case "loop": {
                    String out = p.choice("output", "flux", List.of("flux", "emf"));
                    return new Probe.MagneticLoop(name, r, vector(p, "normal"), p.positive("area_m2", "m²"),
                        out.equals("flux") ? Probe.LoopOutput.FLUX : Probe.LoopOutput.EMF);
                }
                default: {
                    String f = p.string("field").trim().toUpperCase(Locale.ROOT);
                    Field field;
                    try {
                        field = Field.valueOf(f);
                    } catch (IllegalArgumentException ex) {
                        throw new SpecException(p.at("field"), "must be one of A, E, B, got '" + f + "'");
                    }
                    String c = p.choice("component", null, List.of("x", "y", "z"));
                    return new Probe.FieldProbe(name, field, r, "xyz".indexOf(c));
                }
            }
        } catch (IllegalArgumentException ex) {
            throw new SpecException(p.at(kind), ex.getMessage());
        }
    }

    private static Vec3 vector(SpecNode p, String key) throws SpecException {
        double[] v = p.triple(key);
        Vec3 out = new Vec3(v[0], v[1], v[2]);
        if (!(out.norm() > 0)) {
            throw new SpecException(p.at(key), "must be a non-zero vector, got [0, 0, 0]");
        }
        return out;
    }
}
