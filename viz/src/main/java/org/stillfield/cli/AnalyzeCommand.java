package org.stillfield.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** Estimates the correlation table of a dataset and writes it with the verdict. */
@Command(name = "analyze", mixinStandardHelpOptions = true,
    description = {"Estimate C_ij(r, r') of a dataset with standard errors, compare with the analytic mode sum,",
        "and write analysis/correlations.csv, correlations.json and verdict.json. Exit 1 if the verdict fails.",
        "Also writes the extended estimators (pair covariances of lines, separation bins, wall profiles, kernel",
        "fall-off, Gaussianity checks, convergence) as CSV tables listed in analysis/estimators.json."})
final class AnalyzeCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "DATASET", description = "Dataset folder written by 'stillfield sample'.")
    Path dataset;

    @Spec
    picocli.CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() throws Exception {
        PrintWriter out = command.commandLine().getOut();
        Pipeline.Analysis a = Pipeline.analyze(dataset, true);
        Pipeline.printVerdict(a, out);
        out.flush();
        return a.verdict().passed() ? Main.OK : Main.VERDICT_FAILED;
    }
}
