package org.stillfield.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.function.LongConsumer;
import me.tongfei.progressbar.ConsoleProgressBarConsumer;
import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;
import me.tongfei.progressbar.ProgressBarStyle;
import org.stillfield.analysis.AmplitudeCheck;
import org.stillfield.analysis.CorrelationEstimator;
import org.stillfield.analysis.CorrelationTables;
import org.stillfield.analysis.EstimatorSuite;
import org.stillfield.analysis.EstimatorTables;
import org.stillfield.analysis.Verdicts;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.io.Dataset;
import org.stillfield.sampler.io.DatasetWriter;
import org.stillfield.sampler.io.ResourceGuard;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.Shard;
import org.stillfield.viz.EstimatorFigures;
import org.stillfield.viz.Figure;
import org.stillfield.viz.RunReport;

/** The steps of a run, shared by the commands. */
final class Pipeline {
    private Pipeline() {
    }

    /** What a sampling step produced: the run's size, and what this process wrote and found. */
    record SampleSummary(Path folder, long samples, int modes, int points, double seconds, long written,
                         DatasetWriter.Outcome outcome, int partsPresent, int partCount, Shard shard) {
        /** @return true when this process should go on to analyse the dataset */
        boolean analyse() {
            return outcome == DatasetWriter.Outcome.COMPLETED
                || outcome == DatasetWriter.Outcome.ALREADY_COMPLETE && shard.isWhole();
        }
    }

    /** What an analysis step produced. */
    record Analysis(Path dataset, RunSpec spec, ModeTable table, CorrelationResult correlations, Verdict amplitudes,
                    Verdict verdict, EstimatorSuite.Result estimators) {
    }

    static ModeTable modes(RunSpec spec) {
        return ModeTable.of(spec.cavity(), spec.window(), spec.state(), spec.maxModes());
    }

    static void describeModes(RunSpec spec, ModeTable table, PrintWriter out) {
        double kMax = spec.window().truncationOmega() / spec.cavity().medium().waveSpeed();
        out.printf(Locale.ROOT, "cavity   %s %s, eps_r = %g, mu_r = %g, V = %.6g m^3%n", spec.cavity().shape(),
            spec.cavity().parameters(), spec.cavity().medium().epsilonR(), spec.cavity().medium().muR(), spec.cavity().volume());
        out.printf(Locale.ROOT, "window   %s, f_c = %.6g GHz, modes enumerated up to %.6g GHz%n",
            spec.window().kind().name().toLowerCase(Locale.ROOT), spec.window().omegaC() / (2e9 * Math.PI),
            spec.window().truncationOmega() / (2e9 * Math.PI));
        out.printf(Locale.ROOT, "modes    %d (Weyl estimate %.1f); lowest %s at %.9g GHz%n", table.size(),
            spec.cavity().weylCount(kMax), table.modes().get(0).label(), table.frequency(0) / 1e9);
        if (spec.window().kind() != org.stillfield.sampler.api.Window.Kind.HARD) {
            StringBuilder sb = new StringBuilder();
            for (Field f : Field.values()) {
                sb.append(String.format(Locale.ROOT, " <%s^2> %.2e", f.name(), spec.window().neglectedFraction(f)));
            }
            out.printf(Locale.ROOT, "truncation at W < %.1e drops (smooth-density estimate):%s%n", spec.window().tolerance(), sb);
        }
    }

    static SampleSummary sample(RunSpec spec, boolean overwrite, PrintWriter out) throws IOException {
        return sample(spec, overwrite, true, out);
    }

    /**
     * Samples the parts of the spec's shard that the output folder still lacks, then writes the
     * manifest if every part of the run is present.
     */
    static SampleSummary sample(RunSpec spec, boolean overwrite, boolean checkSpace, PrintWriter out) throws IOException {
        ModeTable table = modes(spec);
        describeModes(spec, table, out);
        DatasetWriter.Plan plan = DatasetWriter.plan(spec, table, overwrite);
        ResourceGuard.Estimate est = ResourceGuard.check(plan, spec, table, checkSpace);
        out.printf(Locale.ROOT, "parts    %d of %d samples%s; %s%n", plan.partCount(), plan.partSamples(),
            plan.shard().isWhole() ? "" : String.format(Locale.ROOT, "; shard %s has parts [%d, %d)", plan.shard(),
                plan.firstPart(), plan.endPart()),
            plan.complete() ? "the dataset is already complete"
                : String.format(Locale.ROOT, "%d part(s) to write%s, up to %s on disk, about %s of heap",
                    plan.pendingParts().size(), plan.resuming() ? " (resuming)" : "", ResourceGuard.size(est.diskBytes()),
                    ResourceGuard.size(est.memoryBytes())));
        if (plan.pendingSamples() > 0) {
            out.printf(Locale.ROOT, "sampling %d samples of %s at %d points on %d threads%n", plan.pendingSamples(),
                spec.fields(), spec.allPoints().size(), spec.threads());
        }
        out.flush();
        long t0 = System.nanoTime();
        DatasetWriter.Outcome outcome;
        int present;
        try (DatasetWriter writer = plan.open(); Progress progress = Progress.of(plan.pendingSamples())) {
            long written = 0;
            for (DatasetWriter.Range r : plan.pending()) {
                long before = written;
                EnsembleRunner.Plan run = new EnsembleRunner.Plan(table, spec.allPoints(), spec.fields(), spec.seed(),
                    r.firstSample(), r.sampleCount(), spec.threads());
                EnsembleRunner.run(run, spec.pointSets(), writer.batches(), n -> progress.accept(before + n));
                written += r.sampleCount();
            }
            writer.finish();
            outcome = writer.outcome();
            present = writer.partsPresent();
        }
        double seconds = (System.nanoTime() - t0) * 1e-9;
        return new SampleSummary(plan.folder(), spec.samples(), table.size(), spec.allPoints().size(), seconds,
            plan.pendingSamples(), outcome, present, plan.partCount(), plan.shard());
    }

    static void printSample(SampleSummary s, PrintWriter out) {
        String wrote = String.format(Locale.ROOT, "wrote %d samples in %.2f s%s", s.written(), s.seconds(),
            s.written() > 0 ? String.format(Locale.ROOT, ", %.1f samples/s", s.written() / s.seconds()) : "");
        switch (s.outcome()) {
            case WAITING:
                out.printf(Locale.ROOT, "shard    %s done (%s); %d of %d parts present: the manifest is written by whichever"
                    + " shard completes the set, or by re-running the spec without --shard%n", s.shard(), wrote, s.partsPresent(),
                    s.partCount());
                break;
            case ALREADY_COMPLETE:
                if (s.written() == 0) {
                    out.printf(Locale.ROOT, "dataset  %s is complete (%d samples, %d modes, %d points, %d parts); nothing to"
                        + " sample%n", s.folder(), s.samples(), s.modes(), s.points(), s.partCount());
                    break;
                }
                // fall through: another process wrote the manifest after this one's last part
            default:
                out.printf(Locale.ROOT, "dataset  %s (%d samples, %d modes, %d points, %d parts; %s)%n", s.folder(), s.samples(),
                    s.modes(), s.points(), s.partCount(), wrote);
        }
    }

    static Analysis analyze(Path folder, boolean write) throws Exception {
        Dataset ds = Dataset.open(folder);
        RunSpec spec = ds.spec();
        ModeTable table = modes(spec);
        double alpha = spec.falseAlarm();
        CorrelationEstimator estimator = new CorrelationEstimator(spec.pairs(), spec.fields(), spec.allPoints().size());
        AmplitudeCheck amplitudes = new AmplitudeCheck(table);
        EstimatorSuite suite = EstimatorSuite.forRun(spec, table);
        ds.replay(tee(estimator, amplitudes, suite.sink()), 256);
        // Bonferroni split of the run's false-alarm rate between the two checks.
        CorrelationResult correlations = estimator.result(table, spec.allPoints(), alpha / 2);
        Verdict ks = amplitudes.verdict(alpha / 2);
        Verdict verdict = Verdicts.combine(alpha, correlations.verdict(), ks);
        EstimatorSuite.Result estimators = suite.result(alpha);
        if (write) {
            Path dir = folder.resolve("analysis");
            Files.createDirectories(dir);
            List<String> names = pointNames(spec);
            CorrelationTables.writeCsv(correlations, spec.allPoints(), names, dir.resolve("correlations.csv"));
            CorrelationTables.writeJson(correlations, spec.allPoints(), names, dir.resolve("correlations.json"));
            CorrelationTables.writeVerdict(verdict, List.of(correlations.verdict(), ks), dir.resolve("verdict.json"));
            EstimatorTables.write(estimators, dir, spec.allPoints(), names);
        }
        return new Analysis(folder, spec, table, correlations, ks, verdict, estimators);
    }

    static List<String> pointNames(RunSpec spec) {
        List<String> names = new ArrayList<>();
        for (org.stillfield.sampler.api.PointSet s : spec.pointSets()) {
            for (int i = 0; i < s.size(); i++) {
                names.add(s.kind() == org.stillfield.sampler.api.PointSet.Kind.POINT ? s.name() : s.name() + "[" + i + "]");
            }
        }
        return names;
    }

    static Path plot(Path folder, Analysis a, Map<String, String> facts) throws Exception {
        Dataset ds = Dataset.open(folder);
        Path dir = folder.resolve("report");
        Files.createDirectories(dir);
        List<Figure> figures = RunReport.figuresFor(dir, a.spec(), a.table(), a.correlations(), f -> {
            try {
                return ds.sample(0, f);
            } catch (IOException ex) {
                throw new java.io.UncheckedIOException(ex);
            }
        });
        figures = new ArrayList<>(figures);
        figures.addAll(EstimatorFigures.figuresFor(dir, a.spec(), a.table(), a.estimators()));
        java.util.LinkedHashMap<String, String> all = new java.util.LinkedHashMap<>(facts);
        all.put("verdict", a.verdict().passed() ? "PASS" : "FAIL");
        all.put("verdict method", a.verdict().method());
        all.put("amplitude check", a.amplitudes().method() + (a.amplitudes().passed() ? " (pass)" : " (FAIL)"));
        return RunReport.write(dir, a.spec(), a.table(), a.correlations(), all, figures,
            EstimatorFigures.sections(a.estimators()));
    }

    static void printVerdict(Analysis a, PrintWriter out) {
        Verdict v = a.verdict();
        out.printf(Locale.ROOT, "verdict  %s: %s%n", v.passed() ? "PASS" : "FAIL", v.method());
        Verdict c = a.correlations().verdict();
        out.printf(Locale.ROOT, "  correlations: %d entries, worst |z| = %.3f, threshold %.3f (%s)%n", c.tests(), c.worst(),
            c.threshold(), c.passed() ? "pass" : "FAIL");
        Verdict k = a.amplitudes();
        out.printf(Locale.ROOT, "  amplitudes:   %s (%s)%n", k.method(), k.passed() ? "pass" : "FAIL");
    }

    static EnsembleSink tee(EnsembleSink... sinks) {
        return new EnsembleSink() {
            @Override
            public void accept(SampleBatch batch) throws IOException {
                for (EnsembleSink s : sinks) {
                    s.accept(batch);
                }
            }

            @Override
            public void finish() throws IOException {
                for (EnsembleSink s : sinks) {
                    s.finish();
                }
            }
        };
    }

    /** A progress bar on stderr when a terminal is attached; silent otherwise. */
    static final class Progress implements LongConsumer, AutoCloseable {
        private final ProgressBar bar;

        private Progress(ProgressBar bar) {
            this.bar = bar;
        }

        static Progress of(long total) {
            if (System.console() == null) {
                return new Progress(null);
            }
            ProgressBar bar = new ProgressBarBuilder().setTaskName("sampling").setInitialMax(total)
                .setStyle(ProgressBarStyle.ASCII).setConsumer(new ConsoleProgressBarConsumer(System.err))
                .setUnit(" samples", 1).build();
            return new Progress(bar);
        }

        @Override
        public void accept(long done) {
            if (bar != null) {
                bar.stepTo(done);
            }
        }

        @Override
        public void close() {
            if (bar != null) {
                bar.close();
            }
        }
    }
}
