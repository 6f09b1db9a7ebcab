package org.stillfield.cli;

import java.io.PrintWriter;
import java.util.concurrent.Callable;
import org.stillfield.sampler.spec.RunSpec;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** Draws the ensemble and writes the Parquet dataset. */
@Command(name = "sample", mixinStandardHelpOptions = true,
    description = "Draw the ensemble and write the Parquet dataset (modes, points, amplitudes, fields, manifest).")
final class SampleCommand implements Callable<Integer> {
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
        out.flush();
        return Main.OK;
    }
}
