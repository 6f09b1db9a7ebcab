package org.stillfield.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.stillfield.sampler.io.Dataset;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** Checks a dataset against its manifest. */
@Command(name = "verify", mixinStandardHelpOptions = true,
    description = "Check a dataset against its manifest: files present, sizes, checksums, row counts, footers agree.")
final class VerifyCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "DATASET", description = "Dataset folder.")
    Path dataset;

    @Spec
    picocli.CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() {
        PrintWriter out = command.commandLine().getOut();
        List<String> problems = Dataset.problems(dataset);
        if (problems.isEmpty()) {
            out.println("dataset " + dataset + ": complete and consistent with its manifest");
            out.flush();
            return Main.OK;
        }
        PrintWriter err = command.commandLine().getErr();
        for (String p : problems) {
            err.println("stillfield: " + dataset + ": " + p);
        }
        err.flush();
        return Main.BAD_INPUT;
    }
}
