package org.stillfield.cli;

import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.Shard;
import org.stillfield.sampler.spec.SpecException;
import picocli.CommandLine.Option;

/** Options of the commands that write a dataset: which shard, and the free-space estimate. */
final class ShardOptions {
    @Option(names = "--shard", paramLabel = "i/N",
        description = {"Write only shard i of N (0 <= i < N): a contiguous block of the run's parts. Shards may run",
            "at the same time into the same output folder; the one that completes the set writes the manifest."})
    String shard;

    @Option(names = "--no-space-check",
        description = "Skip the comparison of the estimated dataset size with the file system's free space.")
    boolean noSpaceCheck;

    RunSpec apply(RunSpec spec) throws SpecException {
        if (shard == null) {
            return spec;
        }
        try {
            return spec.withShard(Shard.parse(shard));
        } catch (IllegalArgumentException ex) {
            throw new SpecException("--shard", ex.getMessage());
        }
    }
}
