package org.stillfield.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** Renders the charts and the HTML report of a dataset. */
@Command(name = "plot", mixinStandardHelpOptions = true,
    description = {"Render the charts (PNG) and the run report (report/index.html) of a dataset.",
        "Re-runs the analysis in memory, so it needs only the dataset."})
final class PlotCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "DATASET", description = "Dataset folder written by 'stillfield sample'.")
    Path dataset;

    @Spec
    picocli.CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() throws Exception {
        PrintWriter out = command.commandLine().getOut();
        Pipeline.Analysis a = Pipeline.analyze(dataset, false);
        Path report = Pipeline.plot(dataset, a, java.util.Map.of());
        out.println("report: " + report);
        out.flush();
        return Main.OK;
    }
}
