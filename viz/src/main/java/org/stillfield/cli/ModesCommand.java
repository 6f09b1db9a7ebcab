package org.stillfield.cli;

import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.spec.RunSpec;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** Enumerates the spec's modes and prints a summary (and optionally all of them as CSV). */
@Command(name = "modes", mixinStandardHelpOptions = true,
    description = "List the cavity modes the spec keeps: count against Weyl's law, the lowest modes, window truncation.")
final class ModesCommand implements Callable<Integer> {
    @Mixin
    SpecOptions specOptions;

    @Option(names = "--show", paramLabel = "N", defaultValue = "12", description = "How many of the lowest modes to print (default ${DEFAULT-VALUE}).")
    int show;

    @Option(names = "--csv", paramLabel = "FILE", description = "Also write every mode to this CSV file.")
    Path csv;

    @Spec
    picocli.CommandLine.Model.CommandSpec command;

    @Override
    public Integer call() throws Exception {
        RunSpec spec = specOptions.load();
        ModeTable table = Pipeline.modes(spec);
        PrintWriter out = command.commandLine().getOut();
        Pipeline.describeModes(spec, table, out);
        int n = Math.min(Math.max(show, 0), table.size());
        if (n > 0) {
            out.printf(Locale.ROOT, "%n  %-16s %14s %12s %14s%n", "mode", "f (GHz)", "weight W", "sigma_E (V/m)");
            for (int l = 0; l < n; l++) {
                Mode m = table.modes().get(l);
                out.printf(Locale.ROOT, "  %-16s %14.9f %12.6g %14.6g%n", m.label(), table.frequency(l) / 1e9,
                    table.weight(l), Math.sqrt(table.variance(Field.E, l)));
            }
        }
        if (csv != null) {
            StringBuilder sb = new StringBuilder("mode,label,family,i1,i2,i3,orientation,k_rad_per_m,f_Hz,weight,var_A,var_E,var_B\n");
            for (int l = 0; l < table.size(); l++) {
                Mode m = table.modes().get(l);
                sb.append(String.format(Locale.ROOT, "%d,%s,%s,%d,%d,%d,%d,%.17g,%.17g,%.17g,%.17g,%.17g,%.17g%n", l, m.label(),
                    m.family(), m.i1(), m.i2(), m.i3(), m.orientation(), m.k(), table.frequency(l), table.weight(l),
                    table.variance(Field.A, l), table.variance(Field.E, l), table.variance(Field.B, l)));
            }
            Path tmp = csv.resolveSibling(csv.getFileName() + ".partial");
            Files.writeString(tmp, sb.toString(), StandardCharsets.UTF_8);
            Files.move(tmp, csv, java.nio.file.StandardCopyOption.REPLACE_EXISTING, java.nio.file.StandardCopyOption.ATOMIC_MOVE);
            out.println("  all modes written to " + csv);
        }
        out.flush();
        return Main.OK;
    }
}
