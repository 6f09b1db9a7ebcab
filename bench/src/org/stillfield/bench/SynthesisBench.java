package org.stillfield.bench;

import java.io.IOException;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.List;
import java.util.Locale;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * Synthesis throughput, draws included, no output: prints one line per case with the median
 * samples/s over repeated runs. Cases (same as bench/numpy_reference.py):
 *   grid64  1 m cube, hard cutoff k = 32π/L (indices ≤ 32 per axis), E on a 64³ cell-centred grid;
 *   points  1 × 1.3 × 1.7 m box, about 2·10⁴ modes, E at 1000 fixed pseudo-random points.
 * Usage: java -cp stillfield.jar:bench-classes org.stillfield.bench.SynthesisBench CASE SAMPLES REPEATS
 */
public final class SynthesisBench {
    private SynthesisBench() {
    }

    public static void main(String[] args) throws IOException {
        String which = args.length > 0 ? args[0] : "grid64";
        int samples = args.length > 1 ? Integer.parseInt(args[1]) : 20;
        int repeats = args.length > 2 ? Integer.parseInt(args[2]) : 5;
        int threads = Runtime.getRuntime().availableProcessors();
        ModeTable table;
        List<PointSet> sets = new ArrayList<>();
        if (which.equals("grid64")) {
            RectangularCavity cube = RectangularCavity.of(1, 1, 1, Medium.VACUUM);
            table = ModeTable.of(cube, new Window(Window.Kind.HARD, 32 * Math.PI * Medium.VACUUM.waveSpeed() * (1 + 1e-12),
                Window.DEFAULT_TOLERANCE), ThermalState.VACUUM, 10_000_000);
            sets.add(PointSet.grid("g", new Vec3(0, 0, 0), new Vec3(1, 1, 1), 64, 64, 64));
        } else {
            RectangularCavity box = RectangularCavity.of(1, 1.3, 1.7, Medium.VACUUM);
            // N(k) ≈ V k³/(3π²) = 2·10⁴ at k ≈ 64.5 rad/m
            table = ModeTable.of(box, new Window(Window.Kind.HARD, 64.5 * Medium.VACUUM.waveSpeed(), Window.DEFAULT_TOLERANCE),
                ThermalState.VACUUM, 10_000_000);
            long x = 0x9E3779B97F4A7C15L;
            List<Vec3> pts = new ArrayList<>();
            for (int p = 0; p < 1000; p++) {
                x = x * 6364136223846793005L + 1442695040888963407L;
                double u = (x >>> 11) * 0x1.0p-53;
                x = x * 6364136223846793005L + 1442695040888963407L;
                double v = (x >>> 11) * 0x1.0p-53;
                x = x * 6364136223846793005L + 1442695040888963407L;
                double w = (x >>> 11) * 0x1.0p-53;
                pts.add(new Vec3(u, 1.3 * v, 1.7 * w));
            }
            for (int p = 0; p < pts.size(); p++) {
                sets.add(PointSet.point("p" + p, pts.get(p)));
            }
        }
        List<Vec3> points = new ArrayList<>();
        for (PointSet s : sets) {
            points.addAll(s.points());
        }
        double[] rates = new double[repeats];
        final double[] checksum = {0};
        EnsembleSink sink = new EnsembleSink() {
            @Override
            public void accept(SampleBatch b) {
                checksum[0] += b.values(Field.E, 0)[0];
            }
        };
        for (int r = -1; r < repeats; r++) {
            long t0 = System.nanoTime();
            EnsembleRunner.run(new EnsembleRunner.Plan(table, points, EnumSet.of(Field.E), 1, 0, samples, threads), sets, sink, null);
            double sec = (System.nanoTime() - t0) * 1e-9;
            if (r >= 0) {
                rates[r] = samples / sec;
            }
        }
        java.util.Arrays.sort(rates);
        System.out.printf(Locale.ROOT, "java %s modes=%d points=%d samples=%d threads=%d median_samples_per_s=%.4g (checksum %.3g)%n",
            which, table.size(), points.size(), samples, threads, rates[repeats / 2], checksum[0]);
    }
}
