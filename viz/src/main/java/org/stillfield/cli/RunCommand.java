package org.stillfield.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.stillfield.sampler.spec.RunSpec;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** Every step: modes, sample, analyze, plot. */
@Command(name = "run", mixinStandardHelpOptions = true,
    description = {"Do every step for a spec: enumerate modes, draw and write the ensemble, analyse it against the",
        "analytic mode sum and render the report. Exit 0 when the verdict passes, 1 when it fails, 2 on bad input."})
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
        Path report = Pipeline.plot(s.folder(), a, facts);
        out.println("analysis: " + s.folder().resolve("analysis"));
        out.println("report:   " + report);
        Pipeline.printVerdict(a, out);
        out.flush();
        return a.verdict().passed() ? Main.OK : Main.VERDICT_FAILED;
    }
}
