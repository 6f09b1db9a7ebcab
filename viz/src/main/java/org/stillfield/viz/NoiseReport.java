package org.stillfield.viz;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.function.DoubleUnaryOperator;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.Version;

/**
 * The noise time-series page of a run, {@value #HTML} beside the run report's {@code index.html}
 * (same look, no scripts or remote resources): the noise verdict first, the settings, the per-probe
 * variance checks and noise temperatures, then the figures — a probe trace, each probe's PSD over the
 * whole band and around its strongest mode, the two-time correlations, and the noise temperatures.
 */
public final class NoiseReport {
    /** Name of the page in the report folder. */
    public static final String HTML = "noise.html";

    static final String NOTE = "These are model noise fields of an idealised cavity (perfectly conducting walls with the"
        + " stated loss model, a lossless uniform filling, the chosen spectral window and Gaussian statistics) for"
        + " design studies and for testing analysis code. They are not a substitute for measuring the real detector's"
        + " noise, and they defer to the laboratory's own calibration.";

    private static final String EXTRA_CSS = String.join("\n",
        "nav{margin:0 0 14px;font-size:14px}nav a{color:var(--muted)}",
        ".rows td.l,.rows th.l{text-align:left}",
        ".caption{color:var(--muted);font-size:13px;margin:6px 0 0}");

    private NoiseReport() {
    }

    /**
     * One probe's data for the figures.
     *
     * @param name probe name
     * @param kind kind in words, e.g. {@code dipole}
     * @param unit signal unit
     * @param f PSD bin frequencies, Hz
     * @param psd Welch estimate per bin, unit²/Hz
     * @param lower lower confidence limit per bin
     * @param upper upper confidence limit per bin
     * @param analytic analytic density per bin
     * @param lines frequencies of the lossless lines the probe sees, Hz
     * @param trace the start of trajectory 0
     * @param sigma analytic standard deviation of the signal
     * @param zoomLoHz lower edge of the zoomed PSD view, Hz (NaN for none)
     * @param zoomHiHz upper edge of the zoomed view, Hz
     * @param zoomLabel what the zoomed view centres on, e.g. a mode label
     */
    public record Channel(String name, String kind, String unit, double[] f, double[] psd, double[] lower,
                          double[] upper, double[] analytic, double[] lines, double[] trace, double sigma,
                          double zoomLoHz, double zoomHiHz, String zoomLabel) {
    }

    /**
     * A two-time correlation.
     *
     * @param x later factor's probe
     * @param y earlier factor's probe
     * @param unit correlation unit
     * @param tau lags, s
     * @param estimate estimate per lag
     * @param se standard error per lag
     * @param analytic analytic correlation, τ in s
     */
    public record Pair(String x, String y, String unit, double[] tau, double[] estimate, double[] se,
                       DoubleUnaryOperator analytic) {
    }

    /**
     * A probe's variance check.
     *
     * @param probe name
     * @param unit signal unit
     * @param estimate estimated variance, unit²
     * @param se its standard error
     * @param analytic analytic variance
     * @param z (estimate − analytic)/se
     */
    public record Check(String probe, String unit, double estimate, double se, double analytic, double z) {
    }

    /**
     * A band's noise temperature.
     *
     * @param probe probe index
     * @param modes mode labels
     * @param frequencyHz band centre, Hz
     * @param quantumK ħω/2k_B, K
     * @param thermalK ħω n̄/k_B, K
     * @param measuredK measured T_eq, K
     * @param measuredSeK its standard error, K
     * @param analyticK the model's T_eq on the same bins, K
     */
    public record Temperature(int probe, String modes, double frequencyHz, double quantumK, double thermalK,
                              double measuredK, double measuredSeK, double analyticK) {
    }

    /**
     * Everything on the page.
     *
     * @param name run name
     * @param headline one-line description
     * @param sections titled key–value settings, in order
     * @param dtSeconds time step, s
     * @param traceSteps steps of the trace to draw
     * @param correlationLags lags of the correlations to draw (the tables hold all)
     * @param confidence level of the PSD band
     * @param nyquistHz Nyquist frequency, Hz
     * @param temperatureK physical temperature of the state, K
     * @param trajectories number of trajectories
     * @param spectraNote the estimator's settings in words (segment, resolution, ...)
     * @param correlationNote how the correlation was estimated, in words
     * @param channels the probes
     * @param pairs correlations to draw
     * @param checks the verdict's rows
     * @param threshold the verdict's critical |z|
     * @param temperatures band temperatures
     * @param verdict the noise verdict
     * @param indexLink relative link to the run report, or null when there is none
     */
    public record Input(String name, String headline, Map<String, Map<String, String>> sections, double dtSeconds,
                        int traceSteps, int correlationLags, double confidence, double nyquistHz, double temperatureK, long trajectories,
                        String spectraNote, String correlationNote, List<Channel> channels, List<Pair> pairs,
                        List<Check> checks, double threshold, List<Temperature> temperatures, Verdict verdict,
                        String indexLink) {
        /** Copies lists. */
        public Input {
            sections = new java.util.LinkedHashMap<>(sections);
            channels = List.copyOf(channels);
            pairs = List.copyOf(pairs);
            checks = List.copyOf(checks);
            temperatures = List.copyOf(temperatures);
            Objects.requireNonNull(verdict, "verdict");
        }
    }

    /**
     * Renders the figures and writes {@value #HTML}.
     *
     * @param folder the report folder (created if needed)
     * @param in the content
     * @return the page
     * @throws IOException when a file cannot be written
     */
    public static Path write(Path folder, Input in) throws IOException {
        Objects.requireNonNull(folder, "folder");
        Objects.requireNonNull(in, "in");
        Files.createDirectories(folder);
        List<Figure> figures = figures(folder, in);
        Path html = folder.resolve(HTML);
        Path tmp = folder.resolve("." + HTML + ".tmp");
        Files.writeString(tmp, render(folder, in, figures), StandardCharsets.UTF_8);
        Files.move(tmp, html, java.nio.file.StandardCopyOption.REPLACE_EXISTING,
            java.nio.file.StandardCopyOption.ATOMIC_MOVE);
        return html;
    }

    static List<Figure> figures(Path folder, Input in) throws IOException {
        ChartStyle.headless();
        List<Figure> out = new ArrayList<>();
        List<String> names = new ArrayList<>();
        List<String> units = new ArrayList<>();
        double[][] traces = new double[in.channels().size()][];
        double[] sigma = new double[traces.length];
        for (int p = 0; p < traces.length; p++) {
            Channel c = in.channels().get(p);
            names.add(c.name());
            units.add(c.unit());
            traces[p] = c.trace();
            sigma[p] = c.sigma();
        }
        if (!names.isEmpty() && traces[0].length >= 2) {
            NoiseTracePlot trace = NoiseTracePlot.of(names, units, traces, sigma, in.dtSeconds())
                .withSteps(Math.max(2, Math.min(in.traceSteps(), traces[0].length)));
            Path png = trace.writePng(folder.resolve("noise-trace.png"));
            out.add(new Figure("Probe signals", png, String.format(Locale.ROOT, "The first %d steps (%s ns) of"
                    + " trajectory 0 of every probe. One draw, not an average: its spread follows the analytic"
                    + " standard deviation (dashed, ±1σ), its waveform is the beat of the modes the probe sees.",
                trace.steps(), num((trace.steps() - 1) * in.dtSeconds() * 1e9))));
        }
        for (Channel c : in.channels()) {
            NoiseSpectrumPlot plot = NoiseSpectrumPlot.of(c.name(), c.unit(), c.f(), c.psd(), c.lower(), c.upper(),
                c.analytic(), c.lines(), in.nyquistHz(), in.confidence()).withSubtitle(c.name() + " (" + c.kind() + ", "
                + ChartStyle.prettyUnit(c.unit()) + ");  " + in.spectraNote());
            Path png = plot.writePng(folder.resolve("noise-psd-" + safe(c.name()) + ".png"));
            out.add(new Figure("PSD of " + c.name(), png, "One-sided power spectral density of the probe over the"
                + " whole band up to the Nyquist frequency, averaged over all segments of all " + in.trajectories()
                + " trajectories. The shaded band is the " + NoiseSpectrumPlot.percent(in.confidence())
                + " χ² interval of each bin; the dashed line is the analytic spectrum (a Lorentzian per lossy mode,"
                + " with its aliases), which should run inside the band wherever the spectrum is smooth on the scale"
                + " of a bin."));
            if (Double.isFinite(c.zoomLoHz()) && c.zoomHiHz() > c.zoomLoHz()) {
                Path zoom = plot.withRange(c.zoomLoHz(), c.zoomHiHz())
                    .withTitle("PSD of '" + c.name() + "' around " + c.zoomLabel())
                    .writePng(folder.resolve("noise-psd-" + safe(c.name()) + "-zoom.png"));
                out.add(new Figure("PSD of " + c.name() + " around " + c.zoomLabel(), zoom, "The same estimate"
                    + " around the mode that gives this probe the most power, so that its line shape is resolved:"
                    + " the Lorentzian's full width at half maximum is the mode's linewidth f/Q."));
            }
        }
        for (Pair p : in.pairs()) {
            TwoTimeCorrelationPlot plot = TwoTimeCorrelationPlot.of(p.x(), p.y(), p.unit(), p.tau(), p.estimate(),
                p.se(), p.analytic()).withNote(in.correlationNote())
                .withLags(Math.max(2, Math.min(p.tau().length, in.correlationLags())));
            String file = "noise-correlation-" + safe(p.x()) + (p.x().equals(p.y()) ? "" : "-" + safe(p.y())) + ".png";
            Path png = plot.writePng(folder.resolve(file));
            out.add(new Figure((p.x().equals(p.y()) ? "Autocorrelation of " + p.x()
                : "Cross-correlation of " + p.x() + " and " + p.y()), png, "Two-time correlation ⟨x(t+τ) y(t)⟩ at"
                + " the first " + Math.min(p.tau().length, in.correlationLags()) + " sampled lags (all "
                + p.tau().length + " are in the tables) against the analytic mode sum Σ σ² e^{−κ|τ|/2}[A cos ωτ + B sin ωτ] (line,"
                + " drawn between lags too). For Wigner-sampled linear dynamics the ensemble average is the"
                + " symmetrised quantum correlation. Lower panel: the deviation in standard errors; neighbouring"
                + " lags share data, so their deviations are correlated."));
        }
        if (!in.temperatures().isEmpty()) {
            double fMax = 0;
            List<NoiseTemperaturePlot.Point> pts = new ArrayList<>();
            for (Temperature t : in.temperatures()) {
                pts.add(new NoiseTemperaturePlot.Point(t.probe(), t.frequencyHz(), t.measuredK(), t.measuredSeK()));
                fMax = Math.max(fMax, t.frequencyHz());
            }
            Path png = NoiseTemperaturePlot.of(names, pts, in.temperatureK(), Math.min(in.nyquistHz(), fMax * 1.15))
                .writePng(folder.resolve("noise-temperature.png"));
            out.add(new Figure("Noise temperature", png, "Each marker is a band around a mode a probe sees: the"
                + " measured band power over the model's vacuum band power, times the quantum limit hf/2k_B at the"
                + " band centre. With hf ≫ k_B T the thermal (Planck) part is tiny and the noise sits at the quantum"
                + " limit, half a quantum per mode, far above the physical temperature."));
        }
        return out;
    }

    static String render(Path folder, Input in, List<Figure> figures) {
        StringBuilder b = new StringBuilder(16_384);
        b.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
            .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
            .append("<title>").append(esc(in.name())).append(" · Stillfield noise time series</title>\n")
            .append("<style>\n").append(ReportHtml.CSS).append('\n').append(EXTRA_CSS).append("\n</style>\n</head>\n")
            .append("<body>\n<main>\n");
        if (in.indexLink() != null) {
            b.append("<nav><a href=\"").append(esc(in.indexLink())).append("\">← run report</a></nav>\n");
        }
        b.append("<header>\n<p class=\"kicker\">Stillfield noise time series</p>\n<h1>").append(esc(in.name()))
            .append("</h1>\n<p class=\"lede\">").append(esc(in.headline())).append("</p>\n</header>\n");

        Verdict v = in.verdict();
        b.append("<section class=\"verdict ").append(v.passed() ? "pass" : "fail").append("\" id=\"verdict\">\n")
            .append("<div class=\"word\">").append(v.passed() ? "PASS" : "FAIL").append("</div>\n<div>\n")
            .append("<p class=\"sentence\">").append(esc(sentence(v))).append("</p>\n<dl class=\"stats\">\n");
        stat(b, "worst |z|", String.format(Locale.ROOT, "%.3g", v.worst()));
        stat(b, "critical |z|", String.format(Locale.ROOT, "%.3g", v.threshold()));
        stat(b, "probes", Integer.toString(v.tests()));
        stat(b, "false-alarm rate", ReportHtml.percent(v.falseAlarm()));
        stat(b, "trajectories", Long.toString(in.trajectories()));
        b.append("</dl>\n<p class=\"method\">Method: ").append(esc(v.method())).append("</p>\n</div>\n</section>\n");

        b.append("<h2>Settings</h2>\n<div class=\"cards\">\n");
        for (Map.Entry<String, Map<String, String>> s : in.sections().entrySet()) {
            b.append("<div class=\"card\">\n<h3>").append(esc(s.getKey())).append("</h3>\n<table class=\"kv\">\n");
            for (Map.Entry<String, String> e : s.getValue().entrySet()) {
                b.append("<tr><th>").append(esc(e.getKey())).append("</th><td>").append(esc(e.getValue()))
                    .append("</td></tr>\n");
            }
            b.append("</table>\n</div>\n");
        }
        b.append("</div>\n");

        b.append("<h2>Stationary variance per probe</h2>\n<div class=\"rows\">\n<table>\n<tr><th class=\"l\">probe</th>")
            .append("<th>estimate</th><th>analytic</th><th>std. error</th><th>z</th><th class=\"l\">unit</th></tr>\n");
        for (Check c : in.checks()) {
            UnitScale us = UnitScale.forCorrelation(c.unit(), Math.max(Math.abs(c.estimate()), Math.abs(c.analytic())));
            boolean hot = Math.abs(c.z()) > in.threshold();
            b.append("<tr><td class=\"l\">").append(esc(c.probe())).append("</td><td>")
                .append(esc(RunReport.fixed(us.apply(c.estimate())))).append("</td><td>")
                .append(esc(RunReport.fixed(us.apply(c.analytic())))).append("</td><td>")
                .append(esc(RunReport.fixed(us.apply(c.se())))).append("</td><td").append(hot ? " class=\"hot\">" : ">")
                .append(String.format(Locale.ROOT, "%+.2f", c.z())).append("</td><td class=\"l\">")
                .append(esc(us.label())).append("</td></tr>\n");
        }
        b.append("</table>\n</div>\n<p class=\"caption\">Estimate: the mean over trajectories of each trajectory's time"
            + " average of x²; analytic: Σ σ² (a² + b²/ω²) over the modes, the stationary variance of the lossy model"
            + " (losses and the noise that balances them leave it unchanged).</p>\n");

        if (!in.temperatures().isEmpty()) {
            b.append("<h2>Noise temperature per band</h2>\n<div class=\"rows\">\n<table>\n<tr><th class=\"l\">probe</th>")
                .append("<th class=\"l\">modes</th><th>f (GHz)</th><th>quantum limit hf/2k_B (mK)</th>")
                .append("<th>thermal part (mK)</th><th>model T_eq (mK)</th><th>measured T_eq (mK)</th>")
                .append("<th>± s.e. (mK)</th></tr>\n");
            for (Temperature t : in.temperatures()) {
                b.append("<tr><td class=\"l\">").append(esc(in.channels().get(t.probe()).name()))
                    .append("</td><td class=\"l\">").append(esc(t.modes())).append("</td><td>")
                    .append(String.format(Locale.ROOT, "%.4f", t.frequencyHz() / 1e9)).append("</td><td>")
                    .append(milli(t.quantumK())).append("</td><td>").append(milliSci(t.thermalK())).append("</td><td>")
                    .append(milli(t.analyticK())).append("</td><td>").append(milli(t.measuredK())).append("</td><td>")
                    .append(milli(t.measuredSeK())).append("</td></tr>\n");
            }
            b.append("</table>\n</div>\n<p class=\"caption\">T_eq = T_Q + T_P with T_Q = hf/2k_B (the vacuum's half"
                + " quantum) and T_P = hf n̄/k_B (the Planck occupation); model T_eq is the model's band power over its"
                + " vacuum band power on the same frequency bins, times T_Q at the band centre.</p>\n");
        }

        if (!figures.isEmpty()) {
            b.append("<h2>Figures</h2>\n");
            Path base = folder.toAbsolutePath().normalize();
            for (int k = 0; k < figures.size(); k++) {
                Figure f = figures.get(k);
                String rel = base.relativize(f.png().toAbsolutePath().normalize()).toString().replace('\\', '/');
                b.append("<figure id=\"fig").append(k + 1).append("\">\n<img src=\"").append(esc(rel))
                    .append("\" alt=\"").append(esc(f.title())).append("\">\n<figcaption><b>Figure ").append(k + 1)
                    .append(". ").append(esc(f.title())).append(".</b> ").append(esc(f.caption()))
                    .append("</figcaption>\n</figure>\n");
            }
        }
        b.append("<footer>\n<p>").append(esc(NOTE)).append("</p>\n<p>Stillfield ").append(esc(Version.VERSION))
            .append("</p>\n</footer>\n</main>\n</body>\n</html>\n");
        return b.toString();
    }

    static String sentence(Verdict v) {
        if (v.passed()) {
            return String.format(Locale.ROOT, "Every probe's stationary variance agrees with the analytic mode sum: all"
                + " %d |z| lie within the critical %.3g (largest %.3g).", v.tests(), v.threshold(), v.worst());
        }
        return String.format(Locale.ROOT, "A probe's stationary variance disagrees with the analytic mode sum: the"
            + " largest of %d |z| is %.3g, beyond the critical %.3g.", v.tests(), v.worst(), v.threshold());
    }

    private static String milli(double kelvin) {
        return Double.isFinite(kelvin) ? String.format(Locale.ROOT, "%.2f", 1e3 * kelvin) : "–";
    }

    private static String milliSci(double kelvin) {
        if (!Double.isFinite(kelvin)) {
            return "–";
        }
        double mk = 1e3 * kelvin;
        return mk == 0 ? "0" : Math.abs(mk) >= 0.01 ? String.format(Locale.ROOT, "%.2f", mk)
            : String.format(Locale.ROOT, "%.2e", mk);
    }

    private static void stat(StringBuilder b, String k, String v) {
        b.append("<div><dt>").append(esc(k)).append("</dt><dd>").append(esc(v)).append("</dd></div>\n");
    }

    private static String esc(String s) {
        return ReportHtml.esc(s);
    }

    static String num(double v) {
        return ChartStyle.trimZeros(String.format(Locale.ROOT, "%.4g", v));
    }

    static String safe(String name) {
        return name.replaceAll("[^A-Za-z0-9_.-]", "_");
    }
}
