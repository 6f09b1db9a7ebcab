package org.stillfield.cli;

import java.nio.file.Path;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecException;
import org.stillfield.sampler.spec.SpecReader;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** The spec argument and the overrides every spec-reading command accepts. */
final class SpecOptions {
    @Parameters(index = "0", paramLabel = "SPEC", description = "Run spec (YAML), e.g. runs/demo.yaml.")
    Path spec;

    @Option(names = "--samples", paramLabel = "N", description = "Override the spec's sample count.")
    Long samples;

    @Option(names = "--threads", paramLabel = "N", description = "Worker threads (default: the spec's, 0 = all cores).")
    Integer threads;

    @Option(names = "--output", paramLabel = "DIR", description = "Write the dataset here instead of the spec's output.folder.")
    Path output;

    RunSpec load() throws SpecException {
        RunSpec s = SpecReader.read(spec);
        if (samples != null) {
            if (samples < 1) {
                throw new SpecException("--samples", "must be a whole number >= 1, got " + samples);
            }
            s = s.withSamples(samples);
        }
        if (threads != null) {
            if (threads < 0 || threads > 1024) {
                throw new SpecException("--threads", "must be in [0, 1024] (0 = all cores), got " + threads);
            }
            s = s.withThreads(threads == 0 ? Runtime.getRuntime().availableProcessors() : threads);
        }
        if (output != null) {
            s = s.withOutputFolder(output.toAbsolutePath().normalize());
        }
        return s;
    }
}
