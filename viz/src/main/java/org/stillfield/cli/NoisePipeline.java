package org.stillfield.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.commons.math3.distribution.TDistribution;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.analysis.spectra.Detrend;
import org.stillfield.analysis.spectra.NoiseTemperature;
import org.stillfield.analysis.spectra.ProbeNoiseModel;
import org.stillfield.analysis.spectra.ProbeSpectra;
import org.stillfield.analysis.spectra.PsdEstimate;
import org.stillfield.analysis.spectra.TwoTimeCorrelation;
import org.stillfield.analysis.spectra.WelchPsd;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.io.TimeSeriesWriter;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecException;
import org.stillfield.sampler.timeseries.AliasReport;
import org.stillfield.sampler.timeseries.ModeDamping;
import org.stillfield.sampler.timeseries.Probe;
import org.stillfield.sampler.timeseries.ProbeCoefficients;
import org.stillfield.sampler.timeseries.SeriesAssembler;
import org.stillfield.sampler.timeseries.TimeSeriesBlock;
import org.stillfield.sampler.timeseries.TimeSeriesRunner;
import org.stillfield.sampler.timeseries.TimeSeriesSink;
import org.stillfield.sampler.timeseries.TimeSeriesSpec;
import org.stillfield.viz.NoiseReport;
import org.stillfield.viz.RunReport;

/**
 * The noise step of a run: noise time series of the spec's probes ({@code timeseries:} and
 * {@code probes:}), written as Parquet, their spectra and two-time correlations against the analytic
 * probe noise model, noise temperatures, the noise verdict and the noise report page.
 *
 * <p>Verdict: for each probe the stationary variance, estimated as the mean over trajectories of each
 * trajectory's time average of x², against the analytic variance Σ_l σ_l²(a_l² + b_l²/ω_l²). The
 * trajectories are independent, so the standard error is the spread of the per-trajectory averages over
 * √S and z = (estimate − analytic)/SE follows Student's t with S − 1 degrees of freedom (approximately:
 * each average is a sum over many correlation times and modes, hence close to normal). The ensemble
 * fails when any |z| exceeds t_{S−1}(1 − α/(2P)): Bonferroni over the P probes at the spec's
 * false-alarm rate α, two-sided.
 */
final class NoisePipeline {
    /** Steps of sample 0 kept for the trace figure. */
    static final int TRACE_STEPS = 4096;
    /** Half-width of a noise-temperature band, in linewidths (FWHM) of its mode. */
    static final double BAND_LINEWIDTHS = 3.0;
    /** Smallest half-width of a band, in frequency bins of the Welch estimate. */
    static final int BAND_MIN_BINS = 3;
    /** A mode gets a noise-temperature band when it carries at least this share of a probe's variance. */
    static final double BAND_MIN_SHARE = 0.01;
    /** At most this many bands per probe (the strongest). */
    static final int MAX_BANDS = 10;
    /** Memory budget of the runner's block buffers when whole trajectories are handed over, bytes. */
    static final long WHOLE_TRAJECTORY_BYTES = 256L << 20;

    private NoisePipeline() {
    }

    /**
     * A frequency band around one mode (or several degenerate or overlapping ones) of one probe.
     *
     * @param probe probe index
     * @param label mode labels, joined with " + "
     * @param modes mode indices
     * @param centreHz power-weighted centre frequency, Hz
     * @param loHz lower edge, Hz
     * @param hiHz upper edge, Hz
     */
    record Band(int probe, String label, int[] modes, double centreHz, double loHz, double hiHz) {
    }

    /**
     * Everything fixed before the trajectories are drawn.
     *
     * @param spec the run
     * @param ts its time-series sections
     * @param table modes
     * @param damping losses
     * @param aliasing modes at or above the Nyquist frequency
     * @param coefficients probe coefficients in probe order
     * @param models models[i][j]: analytic model of probes i and j
     * @param bands noise-temperature bands of every probe
     */
    record Setup(RunSpec spec, TimeSeriesSpec ts, ModeTable table, ModeDamping damping, AliasReport aliasing,
                 List<ProbeCoefficients> coefficients, ProbeNoiseModel[][] models, List<Band> bands) {
        int probes() {
            return coefficients.size();
        }

        List<String> names() {
            List<String> n = new ArrayList<>();
            ts.probes().forEach(p -> n.add(p.name()));
            return n;
        }
    }

    /**
     * One probe's variance check.
     *
     * @param probe name
     * @param unit signal unit
     * @param estimate mean over trajectories of the time average of x², unit²
     * @param standardError its standard error, unit²
     * @param analytic the model's variance, unit²
     * @param z (estimate − analytic)/standard error
     */
    record VarianceCheck(String probe, String unit, double estimate, double standardError, double analytic, double z) {
    }

    /**
     * One band's noise temperature.
     *
     * @param band the band
     * @param measuredPower mean band power over trajectories, unit²
     * @param measuredSe its standard error, unit²
     * @param analyticPower the model's band power on the same bins, unit²
     * @param vacuumPower the model's band power at T = 0, unit²
     */
    record BandPower(Band band, double measuredPower, double measuredSe, double analyticPower, double vacuumPower) {
        double omega() {
            return 2 * Math.PI * band.centreHz();
        }

        /** @return T_Q = ħω/2k_B at the band centre, K */
        double quantumLimit() {
            return NoiseTemperature.quantumLimit(omega());
        }

        /** @return measured T_eq = T_Q · P/P_vacuum, K */
        double measuredTemperature() {
            return quantumLimit() * measuredPower / vacuumPower;
        }

        /** @return standard error of the measured T_eq, K */
        double measuredTemperatureSe() {
            return quantumLimit() * measuredSe / vacuumPower;
        }

        /** @return the model's T_eq on the same bins, K */
        double analyticTemperature() {
            return quantumLimit() * analyticPower / vacuumPower;
        }
    }

    /**
     * What the noise step produced.
     *
     * @param setup the set-up
     * @param seriesFolder where the time series went
     * @param analysisFolder where the tables went
     * @param report the noise report page
     * @param checks per-probe variance checks
     * @param threshold critical |z|
     * @param verdict the noise verdict
     * @param rows rows of the probe table
     * @param seconds time to draw and write the series and accumulate the spectra, s
     */
    record Result(Setup setup, Path seriesFolder, Path analysisFolder, Path report, List<VarianceCheck> checks,
                  double threshold, Verdict verdict, long rows, double seconds) {
    }

    /**
     * Checks the time-series settings against the run's modes: losses, aliasing (a warning on
     * {@code err}, or a spec error with {@code aliasing: fail}), probe coefficients.
     *
     * @param spec the run
     * @param ts its time-series sections
     * @param err where the aliasing warning goes
     * @return the set-up
     * @throws SpecException when the settings cannot be used with these modes
     */
    static Setup prepare(RunSpec spec, TimeSeriesSpec ts, PrintWriter err) throws SpecException {
        ModeTable table = Pipeline.modes(spec);
        ModeDamping damping;
        try {
            damping = ModeDamping.of(table, ts.loss());
        } catch (IllegalArgumentException ex) {
            throw new SpecException("timeseries.loss", ex.getMessage());
        }
        AliasReport aliasing = ts.grid().aliasing(table);
        if (!aliasing.clean()) {
            if (ts.failOnAliasing()) {
                throw new SpecException("timeseries.dt_s", aliasMessage(aliasing) + "; timeseries.aliasing = fail");
            }
            err.println("stillfield: warning: timeseries.dt_s: " + aliasMessage(aliasing));
            err.flush();
        }
        List<ProbeCoefficients> coefficients = new ArrayList<>();
        for (int p = 0; p < ts.probes().size(); p++) {
            Probe probe = ts.probes().get(p);
            if (TimeSeriesWriter.RESERVED.contains(probe.name())) {
                throw new SpecException("probes[" + p + "].name", "'" + probe.name() + "' is reserved for a column of"
                    + " the time-series table; reserved: " + String.join(", ", TimeSeriesWriter.RESERVED));
            }
            try {
                coefficients.add(probe.coefficients(table));
            } catch (IllegalArgumentException ex) {
                throw new SpecException("probes[" + p + "]", ex.getMessage());
            }
        }
        int n = coefficients.size();
        ProbeNoiseModel[][] models = new ProbeNoiseModel[n][n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                models[i][j] = ProbeNoiseModel.of(table, damping, coefficients.get(i), coefficients.get(j));
            }
        }
        List<Band> bands = new ArrayList<>();
        for (int p = 0; p < n; p++) {
            bands.addAll(bands(p, table, damping, aliasing, coefficients.get(p), ts));
        }
        return new Setup(spec, ts, table, damping, aliasing, coefficients, models, bands);
    }

    /** The warning text, naming the spec's setting (the library's own text names its internal one). */
    static String aliasMessage(AliasReport a) {
        StringBuilder sb = new StringBuilder();
        int shown = Math.min(3, a.count());
        for (int i = 0; i < shown; i++) {
            sb.append(i > 0 ? ", " : "").append(a.labels().get(i)).append(" at ").append(num(a.frequenciesHz().get(i) / 1e9))
                .append(" GHz");
        }
        if (a.count() > shown) {
            sb.append(", ...");
        }
        return String.format(Locale.ROOT, "dt = %s s puts the Nyquist frequency at %s GHz; %d of %d modes lie at or"
                + " above it (%s) and appear at folded frequencies in the spectra; use dt < %s s (sample rate above"
                + " %s GHz) or a lower window cutoff", num(a.dtSeconds()), num(a.nyquistHz() / 1e9), a.count(),
            a.modeCount(), sb, num(a.largestCleanDt()), num(2 * a.highestHz() / 1e9));
    }

    /** Power a probe draws from each mode: σ_l²(a_l² + b_l²/ω_l²), window and thermal factor included. */
    static double[] modePowers(ModeTable table, ProbeCoefficients c) {
        double[] p = new double[table.size()];
        for (int l = 0; l < p.length; l++) {
            double w = table.omega(l);
            p[l] = table.variance(Field.E, l) * (c.onE(l) * c.onE(l) + c.onQ(l) * c.onQ(l) / (w * w));
        }
        return p;
    }

    private static List<Band> bands(int probe, ModeTable table, ModeDamping damping, AliasReport aliasing,
                                    ProbeCoefficients c, TimeSeriesSpec ts) {
        double[] power = modePowers(table, c);
        double total = 0;
        for (double v : power) {
            total += v;
        }
        boolean[] aliased = new boolean[table.size()];
        aliasing.modes().forEach(l -> aliased[l] = true);
        double bin = 1.0 / (ts.spectra().segment() * ts.grid().dtSeconds());
        double nyquist = ts.grid().nyquistHz();
        List<Integer> chosen = new ArrayList<>();
        for (int l = 0; l < power.length; l++) {
            if (!aliased[l] && total > 0 && power[l] >= BAND_MIN_SHARE * total) {
                chosen.add(l);
            }
        }
        chosen.sort((x, y) -> Double.compare(power[y], power[x]));
        if (chosen.size() > MAX_BANDS) {
            chosen = new ArrayList<>(chosen.subList(0, MAX_BANDS));
        }
        chosen.sort((x, y) -> Double.compare(table.frequency(x), table.frequency(y)));
        // Merge modes whose bands overlap (degenerate pairs, close lines) into one band.
        List<Band> out = new ArrayList<>();
        List<Integer> group = new ArrayList<>();
        double lo = 0;
        double hi = 0;
        for (int l : chosen) {
            double half = Math.max(BAND_LINEWIDTHS * damping.linewidthHz(l), BAND_MIN_BINS * bin);
            double a = Math.max(bin, table.frequency(l) - half);
            double b = Math.min(nyquist - bin, table.frequency(l) + half);
            if (!group.isEmpty() && a <= hi) {
                group.add(l);
                hi = Math.max(hi, b);
            } else {
                if (!group.isEmpty()) {
                    out.add(band(probe, group, lo, hi, table, power));
                }
                group = new ArrayList<>(List.of(l));
                lo = a;
                hi = b;
            }
        }
        if (!group.isEmpty()) {
            out.add(band(probe, group, lo, hi, table, power));
        }
        return out;
    }

    private static Band band(int probe, List<Integer> modes, double lo, double hi, ModeTable table, double[] power) {
        double wsum = 0;
        double fsum = 0;
        List<String> labels = new ArrayList<>();
        int[] idx = new int[modes.size()];
        for (int k = 0; k < idx.length; k++) {
            int l = modes.get(k);
            idx[k] = l;
            labels.add(table.modes().get(l).label());
            wsum += power[l];
            fsum += power[l] * table.frequency(l);
        }
        return new Band(probe, String.join(" + ", labels), idx, fsum / wsum, lo, hi);
    }

    /** Runner blocking: whole trajectories per block when they fit, so files come out sorted and sinks stay small. */
    static TimeSeriesRunner.Plan plan(Setup s) {
        TimeSeriesSpec ts = s.ts();
        int threads = s.spec().threads();
        long width = s.probes() + (ts.amplitudes() ? 2L * s.table().size() : 0L);
        long perTrajectory = 8L * ts.grid().steps() * width;
        long budget = Math.min(WHOLE_TRAJECTORY_BYTES, Runtime.getRuntime().maxMemory() / 8);
        int group = (int) Math.min(TimeSeriesRunner.DEFAULT_GROUP, ts.samples());
        int chunk = 0;
        if (!ts.amplitudes()) {
            long fit = budget / Math.max(1, perTrajectory);
            if (fit >= Math.min(group, threads)) {
                group = (int) Math.max(1, Math.min(group, fit));
                chunk = ts.grid().steps();
            }
        }
        return new TimeSeriesRunner.Plan(s.table(), s.damping(), ts.grid(), ts.probes(), s.spec().seed(), 0,
            ts.samples(), threads, ts.amplitudes(), group, chunk);
    }

    /**
     * Draws the trajectories, writes them, accumulates spectra and checks, writes the tables and the
     * report page.
     *
     * @param s the set-up
     * @param overwrite replace an existing time series in the output folder
     * @param out where the summary lines go
     * @param indexFollows the run report's index page will be written beside the noise page (link to it)
     * @return what was produced, with the verdict
     * @throws IOException when writing fails
     */
    static Result run(Setup s, boolean overwrite, PrintWriter out, boolean indexFollows) throws IOException {
        TimeSeriesSpec ts = s.ts();
        int p = s.probes();
        describe(s, out);
        out.flush();
        TimeSeriesRunner.Plan plan = plan(s);
        ProbeSpectra spectra = ProbeSpectra.of(s.names(), ts.grid().steps(), ts.grid().dtSeconds(),
            ts.spectra().segment(), detrend(ts), ts.spectra().correlationLags(), origins(ts));
        Trajectories stats = new Trajectories(s);
        int[] all = new int[p];
        for (int i = 0; i < p; i++) {
            all[i] = i;
        }
        SeriesAssembler assembler = new SeriesAssembler(all, ts.grid().steps(), stats);
        long t0 = System.nanoTime();
        Path folder;
        try (TimeSeriesWriter writer = TimeSeriesWriter.create(s.spec(), ts, s.table(), s.damping(), s.coefficients(),
            s.aliasing(), overwrite); Pipeline.Progress progress = Pipeline.Progress.of(ts.samples())) {
            // The writer publishes its folder in finish(): last, so only after every other sink completed.
            TimeSeriesRunner.run(plan, tee(spectra, assembler, writer), progress);
            folder = writer.folder();
        }
        double seconds = (System.nanoTime() - t0) * 1e-9;
        long rows = ts.samples() * (long) ts.grid().steps();
        out.printf(Locale.ROOT, "series   %s (%d trajectories, %d rows, %.2f s)%n", folder, ts.samples(), rows, seconds);

        List<VarianceCheck> checks = new ArrayList<>();
        for (int i = 0; i < p; i++) {
            double est = stats.variance[i].mean()[0];
            double se = stats.variance[i].standardError()[0];
            double analytic = s.models()[i][i].covariance();
            double z = se > 0 ? (est - analytic) / se : 0;
            checks.add(new VarianceCheck(s.names().get(i), ts.probes().get(i).unit(), est, se, analytic, z));
        }
        double alpha = s.spec().falseAlarm();
        double threshold = criticalT(ts.samples() - 1, alpha, p);
        Verdict verdict = verdict(checks, threshold, alpha, ts.samples());

        List<BandPower> bands = bandPowers(s, spectra, stats);
        Path analysis = s.spec().outputFolder().resolve("analysis").resolve(NoiseTables.FOLDER);
        NoiseTables.write(analysis, s, spectra, checks, threshold, verdict, bands, folder);
        Path report = report(s.spec().outputFolder().resolve("report"), s, spectra, stats.trace, checks, threshold,
            verdict, bands, folder, analysis, seconds, indexFollows);
        return new Result(s, folder, analysis, report, checks, threshold, verdict, rows, seconds);
    }

    /** Prints where the outputs went and the noise verdict with one line per probe. */
    static void print(Result r, PrintWriter out) {
        out.println("noise analysis: " + r.analysisFolder());
        out.println("noise report:   " + r.report());
        Verdict v = r.verdict();
        out.printf(Locale.ROOT, "noise verdict  %s: %s%n", v.passed() ? "PASS" : "FAIL", v.method());
        for (VarianceCheck c : r.checks()) {
            out.printf(Locale.ROOT, "  %-12s variance %.6g %s^2, analytic %.6g, s.e. %.3g, z = %+.2f (%s)%n", c.probe(),
                c.estimate(), c.unit(), c.analytic(), c.standardError(), c.z(),
                Math.abs(c.z()) <= r.threshold() ? "pass" : "FAIL");
        }
    }

    private static void describe(Setup s, PrintWriter out) {
        TimeSeriesSpec ts = s.ts();
        double dt = ts.grid().dtSeconds();
        double qMin = s.damping().minQualityFactor();
        double qMax = 0;
        for (int l = 0; l < s.damping().size(); l++) {
            qMax = Math.max(qMax, s.damping().qualityFactor(l));
        }
        out.printf(Locale.ROOT, "noise    %d trajectories x %d steps, dt = %.6g s (%.6g GHz, Nyquist %.6g GHz), span %.6g s%n",
            ts.samples(), ts.grid().steps(), dt, 1e-9 / dt, ts.grid().nyquistHz() / 1e9, ts.grid().span());
        out.printf(Locale.ROOT, "losses   %s: %d of %d modes lossy, Q %s%n", s.damping().description(),
            s.damping().lossyCount(), s.damping().size(), Double.isInfinite(qMin) ? "infinite"
                : String.format(Locale.ROOT, "%.4g to %s", qMin, Double.isInfinite(qMax) ? "infinite"
                : String.format(Locale.ROOT, "%.4g", qMax)));
        List<String> probes = new ArrayList<>();
        for (Probe p : ts.probes()) {
            probes.add(p.name() + " (" + kind(p) + ", " + p.unit() + ")");
        }
        out.printf(Locale.ROOT, "probes   %s%n", String.join(", ", probes));
    }

    /** @return the probe's kind in words */
    static String kind(Probe p) {
        if (p instanceof Probe.ElectricDipole) {
            return "dipole";
        }
        if (p instanceof Probe.SmearedDipole) {
            return "smeared dipole";
        }
        if (p instanceof Probe.MagneticLoop) {
            return ((Probe.MagneticLoop) p).output() == Probe.LoopOutput.FLUX ? "loop flux" : "loop EMF";
        }
        Probe.FieldProbe f = (Probe.FieldProbe) p;
        return f.field().column(f.component());
    }

    static Detrend detrend(TimeSeriesSpec ts) {
        return ts.spectra().removeMean() ? Detrend.MEAN : Detrend.NONE;
    }

    static TwoTimeCorrelation.Origins origins(TimeSeriesSpec ts) {
        return ts.spectra().allOrigins() ? TwoTimeCorrelation.Origins.ALL : TwoTimeCorrelation.Origins.FIRST;
    }

    /**
     * Two-sided Bonferroni critical value of Student's t.
     *
     * @param dof degrees of freedom, ≥ 1
     * @param alpha family false-alarm rate
     * @param tests number of tests
     * @return t with P(|T| &gt; t) = α/tests
     */
    static double criticalT(long dof, double alpha, int tests) {
        return new TDistribution(null, dof).inverseCumulativeProbability(1 - alpha / (2.0 * tests));
    }

    static Verdict verdict(List<VarianceCheck> checks, double threshold, double alpha, long samples) {
        double worst = 0;
        boolean passed = true;
        for (VarianceCheck c : checks) {
            worst = Math.max(worst, Math.abs(c.z()));
            passed &= Math.abs(c.z()) <= threshold;
        }
        String method = String.format(Locale.ROOT, "stationary variance of each of %d probes against the analytic mode"
                + " sum: z = (estimate - analytic)/SE, SE from the spread of %d per-trajectory time averages;"
                + " critical |z| = Student t with %d degrees of freedom at 1 - alpha/(2 x %d), alpha = %.3g (Bonferroni)",
            checks.size(), samples, samples - 1, checks.size(), alpha);
        return new Verdict(passed, alpha, checks.size(), threshold, worst, method);
    }

    private static List<BandPower> bandPowers(Setup s, ProbeSpectra spectra, Trajectories stats) {
        List<BandPower> out = new ArrayList<>();
        for (int b = 0; b < s.bands().size(); b++) {
            Band band = s.bands().get(b);
            PsdEstimate psd = spectra.psd(band.probe());
            ProbeNoiseModel model = s.models()[band.probe()][band.probe()];
            Welford w = stats.bands[b];
            out.add(new BandPower(band, w.mean, w.standardError(), bandSum(model, psd, band),
                bandSum(model.withTemperature(0), psd, band)));
        }
        return out;
    }

    /**
     * The model's power on the frequencies the estimate's in-band bins cover: the band sum Σ Ĝ_k Δf of a
     * Welch estimate is, in expectation, the integral of the spectrum smoothed by the window, i.e. (up to
     * leakage across the edges) the integral from (k_lo − ½)Δf to (k_hi + ½)Δf. That integral is taken
     * analytically (Lorentzian arctangents and the lines inside); a sum of the spectrum at the bins instead
     * would misjudge a line only a few bins wide by several per cent.
     */
    static double bandSum(ProbeNoiseModel model, PsdEstimate psd, Band band) {
        int lo = -1;
        int hi = -1;
        for (int k = 0; k < psd.size(); k++) {
            double f = psd.frequency(k);
            if (f >= band.loHz() && f <= band.hiHz()) {
                lo = lo < 0 ? k : lo;
                hi = k;
            }
        }
        if (lo < 0) {
            return 0;
        }
        double df = psd.resolutionHz();
        return model.bandPower(Math.max(0, psd.frequency(lo) - 0.5 * df), psd.frequency(hi) + 0.5 * df);
    }

    private static Path report(Path folder, Setup s, ProbeSpectra spectra, double[][] trace,
                               List<VarianceCheck> checks, double threshold, Verdict verdict, List<BandPower> bands,
                               Path seriesFolder, Path analysisFolder, double seconds, boolean indexFollows)
        throws IOException {
        TimeSeriesSpec ts = s.ts();
        double dt = ts.grid().dtSeconds();
        int p = s.probes();
        List<String> names = s.names();
        Map<String, Map<String, String>> sections = new LinkedHashMap<>();
        Map<String, String> grid = new LinkedHashMap<>();
        grid.put("step dt", num(dt * 1e12) + " ps (sample rate " + num(1e-9 / dt) + " GHz)");
        grid.put("Nyquist frequency", num(ts.grid().nyquistHz() / 1e9) + " GHz");
        grid.put("steps", ts.grid().steps() + " per trajectory (span " + num(ts.grid().span() * 1e6) + " µs)");
        grid.put("trajectories", Long.toString(ts.samples()));
        grid.put("aliasing", s.aliasing().clean() ? "none: every mode lies below the Nyquist frequency"
            : s.aliasing().count() + " of " + s.table().size() + " modes at or above the Nyquist frequency ("
                + (ts.failOnAliasing() ? "fail" : "warn") + ")");
        grid.put("seed", Long.toString(s.spec().seed()));
        sections.put("Time grid", grid);
        Map<String, String> loss = new LinkedHashMap<>();
        loss.put("model", s.damping().description());
        loss.put("lossy modes", s.damping().lossyCount() + " of " + s.table().size());
        double qMin = Double.POSITIVE_INFINITY;
        double qMax = 0;
        double wMin = Double.POSITIVE_INFINITY;
        double wMax = 0;
        for (int l = 0; l < s.damping().size(); l++) {
            if (s.damping().lossy(l)) {
                qMin = Math.min(qMin, s.damping().qualityFactor(l));
                qMax = Math.max(qMax, s.damping().qualityFactor(l));
                wMin = Math.min(wMin, s.damping().linewidthHz(l));
                wMax = Math.max(wMax, s.damping().linewidthHz(l));
            }
        }
        if (qMax > 0) {
            loss.put("Q", num(qMin) + " to " + num(qMax));
            loss.put("linewidth f/Q", num(wMin / 1e6) + " to " + num(wMax / 1e6) + " MHz");
        }
        double temperature = s.table().state().temperatureKelvin();
        loss.put("state", temperature == 0 ? "vacuum (T = 0)" : "thermal, T = " + num(temperature * 1e3) + " mK");
        loss.put("modes", s.table().size() + ", " + s.spec().window().kind().name().toLowerCase(Locale.ROOT)
            + " window, f_c = " + num(s.spec().window().omegaC() / (2e9 * Math.PI)) + " GHz");
        sections.put("Losses and state", loss);
        Map<String, String> probes = new LinkedHashMap<>();
        for (int i = 0; i < p; i++) {
            probes.put(names.get(i), describe(ts.probes().get(i)));
        }
        sections.put("Probes", probes);
        Map<String, String> sp = new LinkedHashMap<>();
        double res = 1.0 / (ts.spectra().segment() * dt);
        sp.put("Welch segment", ts.spectra().segment() + " steps (resolution " + hertz(res) + ", Hann window,"
            + " 50 % overlap)");
        sp.put("detrend", ts.spectra().removeMean() ? "segment mean removed" : "none");
        sp.put("confidence band", num(100 * ts.spectra().confidence()) + " %");
        sp.put("correlation lags", ts.spectra().correlationLags() + " (" + num(ts.spectra().correlationLags() * dt * 1e9)
            + " ns), " + (ts.spectra().allOrigins() ? "averaged over all time origins" : "from t = 0 only"));
        sections.put("Spectra", sp);
        Map<String, String> outs = new LinkedHashMap<>();
        outs.put("time series", seriesFolder.toString());
        outs.put("tables", analysisFolder.toString());
        outs.put("time", String.format(Locale.ROOT, "%.2f s to draw and write the series and accumulate the spectra", seconds));
        sections.put("Outputs", outs);

        List<NoiseReport.Channel> channels = new ArrayList<>();
        for (int i = 0; i < p; i++) {
            PsdEstimate e = spectra.psd(i);
            ProbeNoiseModel m = s.models()[i][i];
            int n = e.size();
            double[] f = e.frequencies();
            double[] lo = new double[n];
            double[] hi = new double[n];
            double[] an = new double[n];
            for (int k = 0; k < n; k++) {
                double[] c = e.confidence(k, ts.spectra().confidence());
                lo[k] = c[0];
                hi[k] = c[1];
                an[k] = m.sampledSpectrum(f[k], dt)[0];
            }
            List<ProbeNoiseModel.Line> lines = m.lines();
            double[] lf = new double[lines.size()];
            for (int k = 0; k < lf.length; k++) {
                lf[k] = lines.get(k).frequencyHz();
            }
            BandPower strongest = null;
            for (BandPower b : bands) {
                if (b.band().probe() == i && (strongest == null || b.analyticPower() > strongest.analyticPower())) {
                    strongest = b;
                }
            }
            double zLo = Double.NaN;
            double zHi = Double.NaN;
            String zLabel = "";
            if (strongest != null) {
                double width = strongest.band().hiHz() - strongest.band().loHz();
                zLo = Math.max(0, strongest.band().centreHz() - width);
                zHi = Math.min(ts.grid().nyquistHz(), strongest.band().centreHz() + width);
                zLabel = strongest.band().label();
            }
            channels.add(new NoiseReport.Channel(names.get(i), kind(ts.probes().get(i)), ts.probes().get(i).unit(), f,
                e.values(), lo, hi, an, lf, trace[i], Math.sqrt(m.covariance()), zLo, zHi, zLabel));
        }
        List<NoiseReport.Pair> pairs = new ArrayList<>();
        for (int i = 0; i < p; i++) {
            for (int j = i; j < p; j++) {
                TwoTimeCorrelation c = spectra.correlation(i, j);
                ProbeNoiseModel m = s.models()[i][j];
                String ui = ts.probes().get(i).unit();
                String uj = ts.probes().get(j).unit();
                pairs.add(new NoiseReport.Pair(names.get(i), names.get(j), ui.equals(uj) ? ui : ui + "*" + uj, c.lags(),
                    c.mean(), c.standardError(), m::correlation));
            }
        }
        List<NoiseReport.Check> rows = new ArrayList<>();
        for (VarianceCheck c : checks) {
            rows.add(new NoiseReport.Check(c.probe(), c.unit(), c.estimate(), c.standardError(), c.analytic(), c.z()));
        }
        List<NoiseReport.Temperature> temps = new ArrayList<>();
        for (BandPower b : bands) {
            temps.add(new NoiseReport.Temperature(b.band().probe(), b.band().label(), b.band().centreHz(),
                b.quantumLimit(), NoiseTemperature.thermalPart(b.omega(), temperature), b.measuredTemperature(),
                b.measuredTemperatureSe(), b.analyticTemperature()));
        }
        // About 15 periods of the lowest mode: enough to see the beats, few enough to see the waveform.
        double period = 1 / (s.table().frequency(0) * dt);
        int traceSteps = (int) Math.max(32, Math.min(trace[0].length, Math.round(15 * period)));
        int lagsShown = (int) Math.max(32, Math.round(12 * period));
        String headline = String.format(Locale.ROOT, "Noise time series of %d probe%s in a %s cavity: %d trajectories"
                + " of %d steps at %s ps, %s", p, p == 1 ? "" : "s", s.table().cavity().shape(), ts.samples(),
            ts.grid().steps(), num(dt * 1e12), temperature == 0 ? "vacuum" : "T = " + num(temperature * 1e3) + " mK");
        String spectraNote = String.format(Locale.ROOT, "segments of %d steps, Δf = %s, %d trajectories",
            ts.spectra().segment(), hertz(res), ts.samples());
        String corrNote = String.format(Locale.ROOT, "%d trajectories, %s", ts.samples(),
            ts.spectra().allOrigins() ? "all time origins" : "origin t = 0");
        boolean index = indexFollows || java.nio.file.Files.isRegularFile(folder.resolve(RunReport.HTML));
        NoiseReport.Input in = new NoiseReport.Input(s.spec().name(), headline, sections, dt, traceSteps, lagsShown,
            ts.spectra().confidence(), ts.grid().nyquistHz(), temperature, ts.samples(), spectraNote, corrNote,
            channels, pairs, rows, threshold, temps, verdict, index ? RunReport.HTML : null);
        return NoiseReport.write(folder, in);
    }

    /** A probe in words: kind, position, orientation and size. */
    static String describe(Probe p) {
        if (p instanceof Probe.ElectricDipole) {
            Probe.ElectricDipole d = (Probe.ElectricDipole) p;
            return "dipole at " + point(d.position()) + ", along " + vec(d.direction()) + ", length "
                + num(d.lengthMetres() * 1e3) + " mm; V = ℓ n̂·E";
        }
        if (p instanceof Probe.SmearedDipole) {
            Probe.SmearedDipole d = (Probe.SmearedDipole) p;
            return "smeared dipole at " + point(d.position()) + ", along " + vec(d.direction()) + ", length "
                + num(d.lengthMetres() * 1e3) + " mm, Gaussian width " + num(d.widthMetres() * 1e3) + " mm";
        }
        if (p instanceof Probe.MagneticLoop) {
            Probe.MagneticLoop d = (Probe.MagneticLoop) p;
            return "loop at " + point(d.centre()) + ", normal " + vec(d.normal()) + ", area " + num(d.areaSquareMetres() * 1e6)
                + " mm²; " + (d.output() == Probe.LoopOutput.FLUX ? "flux A n̂·B (Wb)" : "EMF −dΦ/dt (V)");
        }
        Probe.FieldProbe d = (Probe.FieldProbe) p;
        return d.field().column(d.component()) + " at " + point(d.position());
    }

    private static String point(org.stillfield.sampler.api.Vec3 r) {
        return "(" + num(r.x() * 1e3) + ", " + num(r.y() * 1e3) + ", " + num(r.z() * 1e3) + ") mm";
    }

    private static String vec(org.stillfield.sampler.api.Vec3 r) {
        return "(" + num(r.x()) + ", " + num(r.y()) + ", " + num(r.z()) + ")";
    }

    /** A frequency with a prefix giving one to three digits before the point, four significant digits. */
    static String hertz(double f) {
        String[] unit = {"Hz", "kHz", "MHz", "GHz", "THz"};
        int k = 0;
        while (k < unit.length - 1 && Math.abs(f) >= 1000) {
            f /= 1000;
            k++;
        }
        return num(Double.parseDouble(String.format(Locale.ROOT, "%.4g", f))) + " " + unit[k];
    }

    /** Six significant digits without trailing zeros. */
    static String num(double v) {
        String t = String.format(Locale.ROOT, "%.6g", v);
        int e = t.indexOf('e');
        String mant = e >= 0 ? t.substring(0, e) : t;
        if (mant.indexOf('.') >= 0) {
            mant = mant.replaceFirst("0+$", "").replaceFirst("\\.$", "");
        }
        return mant + (e >= 0 ? t.substring(e) : "");
    }

    /** Welford's running mean and variance. */
    static final class Welford {
        long n;
        double mean;
        double m2;

        void add(double v) {
            n++;
            double d = v - mean;
            mean += d / n;
            m2 += d * (v - mean);
        }

        double standardError() {
            return n < 2 ? Double.NaN : Math.sqrt(m2 / (n - 1) / n);
        }
    }

    /** Per-trajectory statistics: variance of every probe, band powers, and the start of sample 0. */
    static final class Trajectories implements SeriesAssembler.Consumer {
        final TwoTimeCorrelation[] variance;
        final Welford[] bands;
        final double[][] trace;
        private final Setup setup;

        Trajectories(Setup s) {
            setup = s;
            int p = s.probes();
            variance = new TwoTimeCorrelation[p];
            for (int i = 0; i < p; i++) {
                // Lag 0 over every origin: the trajectory's time average of x², one value per trajectory.
                variance[i] = TwoTimeCorrelation.of(0, s.ts().grid().dtSeconds(), TwoTimeCorrelation.Origins.ALL);
            }
            bands = new Welford[s.bands().size()];
            for (int b = 0; b < bands.length; b++) {
                bands[b] = new Welford();
            }
            trace = new double[p][Math.min(TRACE_STEPS, s.ts().grid().steps())];
        }

        @Override
        public void accept(long sample, double[][] series) {
            TimeSeriesSpec ts = setup.ts();
            PsdEstimate[] psd = new PsdEstimate[series.length];
            for (int i = 0; i < series.length; i++) {
                variance[i].add(series[i], series[i]);
                if (sample == 0) {
                    System.arraycopy(series[i], 0, trace[i], 0, trace[i].length);
                }
            }
            for (int b = 0; b < bands.length; b++) {
                Band band = setup.bands().get(b);
                int i = band.probe();
                if (psd[i] == null) {
                    WelchPsd w = WelchPsd.of(ts.spectra().segment(), ts.grid().dtSeconds(), detrend(ts));
                    w.add(series[i]);
                    psd[i] = w.estimate();
                }
                bands[b].add(psd[i].bandPower(band.loHz(), band.hiHz()));
            }
        }
    }

    /** Hands every block to several sinks, in order; finish and close likewise. */
    static TimeSeriesSink tee(TimeSeriesSink... sinks) {
        return new TimeSeriesSink() {
            @Override
            public void accept(TimeSeriesBlock block) throws IOException {
                for (TimeSeriesSink s : sinks) {
                    s.accept(block);
                }
            }

            @Override
            public void finish() throws IOException {
                for (TimeSeriesSink s : sinks) {
                    s.finish();
                }
            }
        };
    }
}
