package org.stillfield.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import org.stillfield.sampler.api.Version;
import org.stillfield.sampler.spec.SpecException;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * The {@code stillfield} command. Exit codes: 0 success, 1 the validation verdict failed,
 * 2 bad input (spec, options, output folder), 3 the run failed for another reason (I/O, a
 * non-finite value).
 */
@Command(name = "stillfield",
    mixinStandardHelpOptions = true,
    versionProvider = Main.VersionInfo.class,
    description = {
        "Samples the quantum vacuum (or thermal) electromagnetic field of a perfectly conducting cavity,",
        "writes the ensemble as Parquet, checks its correlations against the analytic mode sum and plots a report."},
    subcommands = {RunCommand.class, ModesCommand.class, SampleCommand.class, AnalyzeCommand.class,
        PlotCommand.class, VerifyCommand.class, NoiseCommand.class, CommandLine.HelpCommand.class})
public final class Main implements Runnable {
    /** Success. */
    public static final int OK = 0;
    /** The ensemble failed its validation verdict. */
    public static final int VERDICT_FAILED = 1;
    /** Bad input: spec, options or output folder. */
    public static final int BAD_INPUT = 2;
    /** Any other failure. */
    public static final int FAILED = 3;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec commandSpec;

    /** @param args command line */
    public static void main(String[] args) {
        System.exit(execute(args));
    }

    /**
     * Runs the command line and returns its exit code (used by tests too).
     *
     * @param args command line
     * @return exit code
     */
    public static int execute(String... args) {
        return execute(null, null, args);
    }

    /**
     * Runs the command line with the given output streams.
     *
     * @param out standard output, or null for System.out
     * @param err standard error, or null for System.err
     * @param args command line
     * @return exit code
     */
    public static int execute(PrintWriter out, PrintWriter err, String... args) {
        System.setProperty("java.awt.headless", "true");
        CommandLine cl = new CommandLine(new Main());
        if (out != null) {
            cl.setOut(out);
        }
        if (err != null) {
            cl.setErr(err);
        }
        cl.setParameterExceptionHandler((ex, a) -> {
            PrintWriter w = ex.getCommandLine().getErr();
            w.println("stillfield: " + ex.getMessage() + " (see: " + ex.getCommandLine().getCommandSpec().qualifiedName() + " --help)");
            return BAD_INPUT;
        });
        cl.setExecutionExceptionHandler((ex, c, parsed) -> {
            PrintWriter w = c.getErr();
            Throwable t = ex;
            while ((t instanceof UncheckedIOException || t instanceof java.util.concurrent.CompletionException
                || t instanceof java.util.concurrent.ExecutionException) && t.getCause() != null) {
                t = t.getCause();
            }
            if (t instanceof SpecException) {
                w.println("stillfield: spec error: " + t.getMessage());
                return BAD_INPUT;
            }
            if (t instanceof IllegalArgumentException) {
                w.println("stillfield: " + t.getMessage());
                return BAD_INPUT;
            }
            if (t instanceof IOException) {
                w.println("stillfield: i/o error: " + t.getMessage());
                return FAILED;
            }
            // A non-finite value or a broken invariant: its message names the mode, point or sample.
            w.println("stillfield: failed: " + (t instanceof IllegalStateException && t.getMessage() != null
                ? t.getMessage() : t.toString()));
            if (System.getenv("STILLFIELD_DEBUG") != null) {
                t.printStackTrace(w);
            }
            return FAILED;
        });
        return cl.execute(args);
    }

    @Override
    public void run() {
        commandSpec.commandLine().usage(commandSpec.commandLine().getOut());
    }

    /** Version line for --version. */
    static final class VersionInfo implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            return new String[] {"stillfield " + Version.VERSION + " (dataset format " + Version.DATASET_FORMAT + ", "
                + org.stillfield.sampler.api.PhysicalConstants.SET + " constants, Java " + System.getProperty("java.version") + ")"};
        }
    }
}
