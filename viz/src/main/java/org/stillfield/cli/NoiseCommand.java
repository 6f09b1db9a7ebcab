package org.stillfield.cli;

import java.io.PrintWriter;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecException;
import org.stillfield.sampler.spec.SpecReader;
import org.stillfield.sampler.timeseries.TimeSeriesSpec;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** Noise time series of the spec's probes, their spectra and the noise report page. */
@Command(name = "noise", mixinStandardHelpOptions = true,
    description = {"Draw noise time series of the spec's probes (timeseries: and probes: sections), write them to",
        "OUTPUT/timeseries, their spectra, correlations and noise temperatures to OUTPUT/analysis/noise, and the page",
        "OUTPUT/report/noise.html. Here --samples sets the number of trajectories. Exit 0 when every probe's",
        "stationary variance agrees with the analytic one, 1 when not, 2 on bad input (and on aliasing: fail)."})
final class NoiseCommand implements Callable<Integer> {
    @Mixin
    SpecOptions specOptions;

    @Option(names = "--overwrite", description = "Replace an existing OUTPUT/timeseries (only once the new one is complete).")
    boolean overwrite;

    @Spec
    picocli.CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() throws Exception {
        RunSpec spec = specOptions.load();
        Optional<TimeSeriesSpec> found = SpecReader.timeSeries(spec);
        if (found.isEmpty()) {
            throw new SpecException("timeseries", "the spec has no timeseries section; add one (dt_s or sample_rate_GHz,"
                + " steps) and a probes list, see runs/noise-demo.yaml");
        }
        TimeSeriesSpec ts = found.get();
        if (specOptions.samples != null) {
            // --samples was checked by SpecOptions (>= 1); trajectories need two for a standard error.
            if (specOptions.samples < 2) {
                throw new SpecException("--samples", "must be at least 2 trajectories for the noise verdict, got "
                    + specOptions.samples);
            }
            ts = new TimeSeriesSpec(ts.grid(), specOptions.samples, ts.loss(), ts.probes(), ts.amplitudes(),
                ts.failOnAliasing(), ts.spectra());
        }
        PrintWriter out = command.commandLine().getOut();
        PrintWriter err = command.commandLine().getErr();
        NoisePipeline.Setup setup = NoisePipeline.prepare(spec, ts, err);
        NoisePipeline.Result r = NoisePipeline.run(setup, overwrite, out, false);
        NoisePipeline.print(r, out);
        out.flush();
        return r.verdict().passed() ? Main.OK : Main.VERDICT_FAILED;
    }
}
