package org.stillfield.analysis;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecException;
import org.stillfield.sampler.spec.SpecReader;

/**
 * A small run for the estimator tests: the 1 × 1.3 × 1.7 m box with a hard window at k = 10 rad/m
 * (70 modes, REFERENCE-VALUES.md §4), a line from the wall x = 0 across the box, a 4 × 3 × 3 grid
 * and one point.
 */
final class EstimatorFixtures {
    /** ω_c = 10 rad/m × c. */
    static final String YAML = String.join("\n",
        "name: estimators",
        "cavity: {shape: box, a_m: 1.0, b_m: 1.3, d_m: 1.7}",
        "fields: [A, E, B]",
        "window: {kind: hard, omega_c_rad_s: 2997924580}",
        "samples: 400",
        "seed: 20261202",
        "evaluate:",
        "  points:",
        "    - {name: probe, at: [0.31, 0.55, 0.8]}",
        "  lines:",
        "    - {name: across, from: [0.0, 0.55, 0.8], to: [1.0, 0.55, 0.8], n: 11}",
        "  grids:",
        "    - {name: cells, from: [0.0, 0.0, 0.0], to: [1.0, 1.3, 1.7], n: [4, 3, 3]}",
        "analysis:",
        "  false_alarm: 0.01",
        "output: {folder: out/estimators, precision: float64}",
        "threads: 2",
        "");

    private EstimatorFixtures() {
    }

    static RunSpec spec(Path base) throws SpecException {
        return SpecReader.parse(YAML, base, "estimators");
    }

    static ModeTable table(RunSpec spec) {
        return ModeTable.of(spec.cavity(), spec.window(), spec.state(), spec.maxModes());
    }

    /** Samples [first, first + count) of the spec's ensemble into the sink (grid fast path as in a run). */
    static void run(RunSpec spec, ModeTable table, long seed, long first, long count, EnsembleSink sink)
        throws IOException {
        EnsembleRunner.run(new EnsembleRunner.Plan(table, spec.allPoints(), spec.fields(), seed, first, count, 2),
            spec.pointSets(), sink, null);
    }

    /** Global indices from..to−1. */
    static List<Integer> range(int from, int to) {
        List<Integer> out = new ArrayList<>();
        for (int k = from; k < to; k++) {
            out.add(k);
        }
        return out;
    }

    /** Forwards every batch to all sinks. */
    static EnsembleSink tee(EnsembleSink... sinks) {
        return new EnsembleSink() {
            @Override
            public void accept(SampleBatch batch) throws IOException {
                for (EnsembleSink s : sinks) {
                    s.accept(batch);
                }
            }

            @Override
            public void finish() throws IOException {
                for (EnsembleSink s : sinks) {
                    s.finish();
                }
            }
        };
    }

    /** Largest |a − b| / max|b| over two equal-length arrays. */
    static double relativeDifference(double[] a, double[] b) {
        double scale = 0;
        double diff = 0;
        for (int k = 0; k < a.length; k++) {
            scale = Math.max(scale, Math.abs(b[k]));
            diff = Math.max(diff, Math.abs(a[k] - b[k]));
        }
        return scale == 0 ? diff : diff / scale;
    }
}
