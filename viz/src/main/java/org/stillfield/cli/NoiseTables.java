package org.stillfield.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.BufferedWriter;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import org.stillfield.analysis.CorrelationTables;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.analysis.spectra.CsdEstimate;
import org.stillfield.analysis.spectra.NoiseTemperature;
import org.stillfield.analysis.spectra.ProbeNoiseModel;
import org.stillfield.analysis.spectra.ProbeSpectra;
import org.stillfield.analysis.spectra.PsdEstimate;
import org.stillfield.analysis.spectra.TwoTimeCorrelation;
import org.stillfield.sampler.api.PhysicalConstants;
import org.stillfield.sampler.api.Version;
import org.stillfield.sampler.timeseries.ModeDamping;
import org.stillfield.sampler.timeseries.TimeSeriesSpec;

/**
 * The noise step's tables, in {@code analysis/}{@value #FOLDER} of the run's output folder. CSV files
 * have one header line, comma-separated cells, numbers in Java's shortest round-trip decimal form
 * ({@code inf} and {@code nan} where a value is infinite or undefined), SI units; every file has a
 * {@code unit} column for its values:
 * <ul>
 *   <li>{@value #PSD}: probe, f_Hz, psd, lower, upper (the χ² band at the spec's confidence), dof,
 *       analytic (the one-sided spectrum of the lossy modes sampled at dt, with its aliases; lines of
 *       lossless modes are listed in {@value #LINES}), unit;</li>
 *   <li>{@value #CSD}: probe_x, probe_y (x before y in probe order), f_Hz, re, im, coherence, dof,
 *       analytic_re, analytic_im, unit; G_xy is the transform of ⟨x(t) y(t+τ)⟩;</li>
 *   <li>{@value #CORRELATION}: probe_x, probe_y, tau_s, estimate, se, analytic, z, unit; the estimate of
 *       ⟨x(t+τ) y(t)⟩, which for Wigner-sampled linear dynamics is the symmetrised correlation;</li>
 *   <li>{@value #LINES}: probe, mode, label, f_Hz, Q, linewidth_Hz, power (the variance the mode gives the
 *       probe), share (of the probe's variance), lossless, aliased, unit;</li>
 *   <li>{@value #TEMPERATURE}: probe, modes, f_Hz (band centre), band_lo_Hz, band_hi_Hz, T_quantum_K
 *       (ħω/2k_B), T_thermal_K (ħω n̄/k_B), T_eq_K (their sum), analytic_band_T_eq_K (T_Q times the model's
 *       band power over its vacuum band power), measured_T_eq_K (T_Q times the measured band power over the
 *       model's vacuum band power), measured_se_K, physical_T_K (the temperature whose coth factor gives the
 *       measured ratio; 0 at or below the vacuum), measured_power (Σ Ĝ_k Δf over the bins in the band, mean
 *       over trajectories), measured_power_se, analytic_power and vacuum_power (the model's integral over the
 *       frequencies those bins cover, at T and at T = 0), unit;</li>
 *   <li>{@value #VARIANCE}: probe, estimate, se, analytic, z, critical_z, unit: the verdict's statistics;</li>
 *   <li>{@value #SUMMARY}: settings, the verdict and the file list; {@value #VERDICT}: the verdict alone.</li>
 * </ul>
 * Everything is written to a hidden staging folder and renamed into place, replacing an older set.
 */
final class NoiseTables {
    static final String FOLDER = "noise";
    static final String PSD = "psd.csv";
    static final String CSD = "csd.csv";
    static final String CORRELATION = "correlation.csv";
    static final String LINES = "lines.csv";
    static final String TEMPERATURE = "noise_temperature.csv";
    static final String VARIANCE = "variance.csv";
    static final String SUMMARY = "noise.json";
    static final String VERDICT = "verdict.json";
    /** Name and revision of the summary layout. */
    static final String FORMAT = "stillfield-noise/1";

    static final String PSD_HEADER = "probe,f_Hz,psd,lower,upper,dof,analytic,unit";
    static final String CSD_HEADER = "probe_x,probe_y,f_Hz,re,im,coherence,dof,analytic_re,analytic_im,unit";
    static final String CORRELATION_HEADER = "probe_x,probe_y,tau_s,estimate,se,analytic,z,unit";
    static final String LINES_HEADER = "probe,mode,label,f_Hz,Q,linewidth_Hz,power,share,lossless,aliased,unit";
    static final String TEMPERATURE_HEADER = "probe,modes,f_Hz,band_lo_Hz,band_hi_Hz,T_quantum_K,T_thermal_K,T_eq_K,"
        + "analytic_band_T_eq_K,measured_T_eq_K,measured_se_K,physical_T_K,measured_power,measured_power_se,"
        + "analytic_power,vacuum_power,unit";
    static final String VARIANCE_HEADER = "probe,estimate,se,analytic,z,critical_z,unit";

    private static final ObjectMapper JSON = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    private NoiseTables() {
    }

    static void write(Path folder, NoisePipeline.Setup s, ProbeSpectra spectra,
                      List<NoisePipeline.VarianceCheck> checks, double threshold, Verdict verdict,
                      List<NoisePipeline.BandPower> bands, Path seriesFolder) throws IOException {
        Path parent = folder.toAbsolutePath().normalize().getParent();
        Files.createDirectories(parent);
        // A plain folder (not a temporary one, which would be private to the user) so the result keeps default permissions.
        Path staging = parent.resolve("." + FOLDER + ".partial-" + ProcessHandle.current().pid() + "-" + System.nanoTime());
        Files.createDirectory(staging);
        try {
            writeAll(staging, s, spectra, checks, threshold, verdict, bands, seriesFolder);
            replace(staging, folder);
        } finally {
            deleteTree(staging);
        }
    }

    private static void writeAll(Path dir, NoisePipeline.Setup s, ProbeSpectra spectra,
                                 List<NoisePipeline.VarianceCheck> checks, double threshold, Verdict verdict,
                                 List<NoisePipeline.BandPower> bands, Path seriesFolder) throws IOException {
        TimeSeriesSpec ts = s.ts();
        List<String> names = s.names();
        int p = names.size();
        double dt = ts.grid().dtSeconds();
        double level = ts.spectra().confidence();
        csv(dir.resolve(PSD), PSD_HEADER, w -> {
            for (int i = 0; i < p; i++) {
                PsdEstimate e = spectra.psd(i);
                ProbeNoiseModel m = s.models()[i][i];
                String unit = unit(s, i) + "^2/Hz";
                for (int k = 0; k < e.size(); k++) {
                    double[] band = e.confidence(k, level);
                    double f = e.frequency(k);
                    row(w, cell(names.get(i)), num(f), num(e.value(k)), num(band[0]), num(band[1]), num(e.dof(k)),
                        num(m.sampledSpectrum(f, dt)[0]), cell(unit));
                }
            }
        });
        csv(dir.resolve(CSD), CSD_HEADER, w -> {
            for (int i = 0; i < p; i++) {
                for (int j = i + 1; j < p; j++) {
                    CsdEstimate e = spectra.csd(i, j);
                    ProbeNoiseModel m = s.models()[i][j];
                    String unit = product(s, i, j) + "/Hz";
                    for (int k = 0; k < e.size(); k++) {
                        double f = e.frequency(k);
                        double[] g = m.sampledSpectrum(f, dt);
                        row(w, cell(names.get(i)), cell(names.get(j)), num(f), num(e.real(k)), num(e.imaginary(k)),
                            num(e.coherence(k)), num(e.dof(k)), num(g[0]), num(g[1]), cell(unit));
                    }
                }
            }
        });
        csv(dir.resolve(CORRELATION), CORRELATION_HEADER, w -> {
            for (int i = 0; i < p; i++) {
                for (int j = 0; j < p; j++) {
                    TwoTimeCorrelation c = spectra.correlation(i, j);
                    double[] tau = c.lags();
                    double[] est = c.mean();
                    double[] se = c.standardError();
                    ProbeNoiseModel m = s.models()[i][j];
                    String unit = product(s, i, j);
                    for (int k = 0; k < tau.length; k++) {
                        double a = m.correlation(tau[k]);
                        row(w, cell(names.get(i)), cell(names.get(j)), num(tau[k]), num(est[k]), num(se[k]), num(a),
                            num(se[k] > 0 ? (est[k] - a) / se[k] : Double.NaN), cell(unit));
                    }
                }
            }
        });
        ModeDamping d = s.damping();
        boolean[] aliased = new boolean[s.table().size()];
        s.aliasing().modes().forEach(l -> aliased[l] = true);
        csv(dir.resolve(LINES), LINES_HEADER, w -> {
            for (int i = 0; i < p; i++) {
                double[] power = NoisePipeline.modePowers(s.table(), s.coefficients().get(i));
                double total = s.models()[i][i].covariance();
                for (int l = 0; l < power.length; l++) {
                    if (power[l] == 0) {
                        continue;
                    }
                    row(w, cell(names.get(i)), Integer.toString(l), cell(s.table().modes().get(l).label()),
                        num(s.table().frequency(l)), num(d.qualityFactor(l)), num(d.linewidthHz(l)), num(power[l]),
                        num(total > 0 ? power[l] / total : Double.NaN), Boolean.toString(!d.lossy(l)),
                        Boolean.toString(aliased[l]), cell(unit(s, i) + "^2"));
                }
            }
        });
        double temperature = s.table().state().temperatureKelvin();
        csv(dir.resolve(TEMPERATURE), TEMPERATURE_HEADER, w -> {
            for (NoisePipeline.BandPower b : bands) {
                NoisePipeline.Band band = b.band();
                double omega = b.omega();
                double ratio = b.measuredPower() / b.vacuumPower();
                row(w, cell(names.get(band.probe())), cell(band.label()), num(band.centreHz()), num(band.loHz()),
                    num(band.hiHz()), num(NoiseTemperature.quantumLimit(omega)),
                    num(NoiseTemperature.thermalPart(omega, temperature)),
                    num(NoiseTemperature.equivalent(omega, temperature)), num(b.analyticTemperature()),
                    num(b.measuredTemperature()), num(b.measuredTemperatureSe()),
                    num(NoiseTemperature.physicalTemperature(omega, Math.max(0, ratio))), num(b.measuredPower()),
                    num(b.measuredSe()), num(b.analyticPower()), num(b.vacuumPower()),
                    cell(unit(s, band.probe()) + "^2"));
            }
        });
        csv(dir.resolve(VARIANCE), VARIANCE_HEADER, w -> {
            for (NoisePipeline.VarianceCheck c : checks) {
                row(w, cell(c.probe()), num(c.estimate()), num(c.standardError()), num(c.analytic()), num(c.z()),
                    num(threshold), cell(c.unit() + "^2"));
            }
        });
        CorrelationTables.writeVerdict(verdict, List.of(), dir.resolve(VERDICT));
        Files.writeString(dir.resolve(SUMMARY), JSON.writeValueAsString(summary(s, checks, threshold, verdict,
            seriesFolder)) + "\n", StandardCharsets.UTF_8);
    }

    private static ObjectNode summary(NoisePipeline.Setup s, List<NoisePipeline.VarianceCheck> checks,
                                      double threshold, Verdict verdict, Path seriesFolder) {
        TimeSeriesSpec ts = s.ts();
        ObjectNode o = JSON.createObjectNode();
        o.put("format", FORMAT);
        o.put("tool_version", Version.VERSION);
        o.put("constants", PhysicalConstants.SET);
        o.put("name", s.spec().name());
        o.put("series", seriesFolder.toString());
        o.put("trajectories", ts.samples());
        o.put("steps", ts.grid().steps());
        o.put("dt_s", ts.grid().dtSeconds());
        o.put("nyquist_Hz", ts.grid().nyquistHz());
        o.put("temperature_K", s.table().state().temperatureKelvin());
        o.put("loss", s.damping().description());
        o.put("modes", s.table().size());
        o.put("aliased_modes", s.aliasing().count());
        ObjectNode sp = o.putObject("spectra");
        sp.put("estimator", "Welch: periodic Hann window, 50 % overlap, one-sided, averaged over segments and"
            + " trajectories; integrates to the variance");
        sp.put("segment", ts.spectra().segment());
        sp.put("resolution_Hz", 1.0 / (ts.spectra().segment() * ts.grid().dtSeconds()));
        sp.put("detrend", ts.spectra().removeMean() ? "mean" : "none");
        sp.put("confidence", ts.spectra().confidence());
        sp.put("correlation_lags", ts.spectra().correlationLags());
        sp.put("origins", ts.spectra().allOrigins() ? "all" : "first");
        ObjectNode v = o.putObject("verdict");
        v.put("passed", verdict.passed());
        v.put("false_alarm", verdict.falseAlarm());
        v.put("tests", verdict.tests());
        v.put("threshold", verdict.threshold());
        v.put("worst", verdict.worst());
        v.put("method", verdict.method());
        ArrayNode rows = o.putArray("variance");
        for (NoisePipeline.VarianceCheck c : checks) {
            ObjectNode r = rows.addObject();
            r.put("probe", c.probe());
            r.put("unit", c.unit() + "^2");
            r.put("estimate", c.estimate());
            r.put("se", c.standardError());
            r.put("analytic", c.analytic());
            r.put("z", c.z());
            r.put("critical_z", threshold);
        }
        ArrayNode files = o.putArray("files");
        for (String f : List.of(PSD, CSD, CORRELATION, LINES, TEMPERATURE, VARIANCE, VERDICT)) {
            files.add(f);
        }
        o.put("note", "Model noise of an idealised cavity for design studies; not a measurement of a real detector.");
        return o;
    }

    private static String unit(NoisePipeline.Setup s, int i) {
        return s.ts().probes().get(i).unit();
    }

    private static String product(NoisePipeline.Setup s, int i, int j) {
        String a = unit(s, i);
        String b = unit(s, j);
        return a.equals(b) ? a + "^2" : a + "*" + b;
    }

    private interface Body {
        void write(Writer w) throws IOException;
    }

    private static void csv(Path file, String header, Body body) throws IOException {
        try (BufferedWriter w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            w.write(header);
            w.write('\n');
            body.write(w);
        }
    }

    private static void row(Writer w, String... cells) throws IOException {
        w.write(String.join(",", cells));
        w.write('\n');
    }

    /** Shortest round-trip decimal; {@code inf}, {@code -inf}, {@code nan} for the rest (read as such by pandas). */
    static String num(double v) {
        if (Double.isNaN(v)) {
            return "nan";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "inf" : "-inf";
        }
        return Double.toString(v);
    }

    /** Quotes a cell holding a comma, quote or line break (RFC 4180). */
    static String cell(String s) {
        if (s.indexOf(',') < 0 && s.indexOf('"') < 0 && s.indexOf('\n') < 0 && s.indexOf('\r') < 0) {
            return s;
        }
        return '"' + s.replace("\"", "\"\"") + '"';
    }

    /** Moves the finished staging folder onto the target, replacing an older set only once the new one is complete. */
    private static void replace(Path staging, Path target) throws IOException {
        if (Files.exists(target, LinkOption.NOFOLLOW_LINKS)) {
            if (!Files.isRegularFile(target.resolve(SUMMARY))) {
                throw new IOException("analysis folder " + target + " exists and holds no " + SUMMARY
                    + "; it is not replaced");
            }
            Path old = target.getParent().resolve("." + FOLDER + ".old-" + ProcessHandle.current().pid() + "-"
                + System.nanoTime());
            Files.move(target, old, StandardCopyOption.ATOMIC_MOVE);
            try {
                Files.move(staging, target, StandardCopyOption.ATOMIC_MOVE);
            } catch (IOException ex) {
                Files.move(old, target, StandardCopyOption.ATOMIC_MOVE);
                throw ex;
            }
            deleteTree(old);
        } else {
            Files.move(staging, target, StandardCopyOption.ATOMIC_MOVE);
        }
    }

    private static void deleteTree(Path root) throws IOException {
        if (!Files.exists(root, LinkOption.NOFOLLOW_LINKS)) {
            return;
        }
        List<Path> all = new ArrayList<>();
        try (var walk = Files.walk(root)) {
            walk.forEach(all::add);
        }
        for (int i = all.size() - 1; i >= 0; i--) {
            Files.deleteIfExists(all.get(i));
        }
    }
}
