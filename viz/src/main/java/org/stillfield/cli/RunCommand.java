package org.stillfield.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecReader;
import org.stillfield.sampler.timeseries.TimeSeriesSpec;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** Every step: modes, sample, analyze, plot. */
@Command(name = "run", mixinStandardHelpOptions = true,
    description = {"Do every step for a spec: enumerate modes, draw and write the ensemble, analyse it against the",
        "analytic mode sum and render the report. Exit 0 when the verdict passes, 1 when it fails, 2 on bad input.",
        "A spec with a timeseries section also gets the noise step (see 'noise'); each verdict uses the spec's",
        "false_alarm, and the run fails when either fails."})
final class RunCommand implements Callable<Integer> {
    @Mixin
    SpecOptions specOptions;

    @Mixin
    ShardOptions shardOptions;

    @Option(names = "--overwrite", description = {"Replace the dataset or incomplete run in the output folder, whatever its",
        "spec (removes its manifest first). Without it, the same spec resumes and another spec is refused."})
    boolean overwrite;

    @Spec
    picocli.CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() throws Exception {
        RunSpec spec = shardOptions.apply(specOptions.load());
        PrintWriter out = command.commandLine().getOut();
        // The noise step's settings are checked against the modes before anything is drawn.
        Optional<TimeSeriesSpec> ts = SpecReader.timeSeries(spec);
        NoisePipeline.Setup noiseSetup = ts.isPresent()
            ? NoisePipeline.prepare(spec, ts.get(), command.commandLine().getErr()) : null;
        Pipeline.SampleSummary s = Pipeline.sample(spec, overwrite, !shardOptions.noSpaceCheck, out);
        Pipeline.printSample(s, out);
        if (!s.analyse()) {
            out.println("analysis waits for the complete dataset: run 'stillfield analyze " + s.folder() + "' once it is");
            out.flush();
            return Main.OK;
        }
        long t0 = System.nanoTime();
        Pipeline.Analysis a = Pipeline.analyze(s.folder(), true);
        double analysisSeconds = (System.nanoTime() - t0) * 1e-9;
        Map<String, String> facts = new LinkedHashMap<>();
        facts.put("dataset", s.folder().toString());
        facts.put("sampling time", s.written() == s.samples()
            ? String.format(Locale.ROOT, "%.2f s (%.1f samples/s)", s.seconds(), s.samples() / s.seconds())
            : String.format(Locale.ROOT, "%.2f s for %d of %d samples (the rest written earlier or by other shards)",
                s.seconds(), s.written(), s.samples()));
        facts.put("analysis time", String.format(Locale.ROOT, "%.2f s", analysisSeconds));
        NoisePipeline.Result noise = null;
        if (noiseSetup != null) {
            noise = NoisePipeline.run(noiseSetup, overwrite, out, true);
            facts.put("noise time series", noise.seriesFolder() + " (report/noise.html, verdict "
                + (noise.verdict().passed() ? "PASS" : "FAIL") + ")");
        }
        Path report = Pipeline.plot(s.folder(), a, facts);
        out.println("analysis: " + s.folder().resolve("analysis"));
        out.println("report:   " + report);
        Pipeline.printVerdict(a, out);
        if (noise != null) {
            NoisePipeline.print(noise, out);
        }
        out.flush();
        boolean passed = a.verdict().passed() && (noise == null || noise.verdict().passed());
        return passed ? Main.OK : Main.VERDICT_FAILED;
    }
}
