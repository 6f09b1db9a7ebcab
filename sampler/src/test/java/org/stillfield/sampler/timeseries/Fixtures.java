package org.stillfield.sampler.timeseries;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;

/** Shared test set-ups: the 3 × 2 × 4 cm box of REFERENCE-VALUES.md §3 with a hard window. */
final class Fixtures {
    static final double A = 0.03;
    static final double B = 0.02;
    static final double D = 0.04;

    private Fixtures() {
    }

    static RectangularCavity box() {
        return RectangularCavity.of(A, B, D, Medium.VACUUM);
    }

    /** Modes of the 3×2×4 cm box up to fGHz. */
    static ModeTable table(double fGHz, ThermalState state) {
        return ModeTable.of(box(), new Window(Window.Kind.HARD, 2 * Math.PI * fGHz * 1e9, Window.DEFAULT_TOLERANCE),
            state, 100_000);
    }

    /** Collects every block's values and amplitudes, in arrival order. */
    static final class Collector implements TimeSeriesSink {
        final List<long[]> order = new ArrayList<>();
        final java.util.Map<Long, double[][]> values = new java.util.TreeMap<>();
        final java.util.Map<Long, double[][]> q = new java.util.TreeMap<>();
        final java.util.Map<Long, double[][]> e = new java.util.TreeMap<>();
        final int steps;
        boolean finished;

        Collector(int steps) {
            this.steps = steps;
        }

        @Override
        public void accept(TimeSeriesBlock b) throws IOException {
            order.add(new long[] {b.sample(), b.firstStep(), b.steps(), b.last() ? 1 : 0});
            double[][] v = values.computeIfAbsent(b.sample(), s -> new double[steps][]);
            for (int s = 0; s < b.steps(); s++) {
                double[] row = new double[b.channels()];
                for (int c = 0; c < row.length; c++) {
                    row[c] = b.value(s, c);
                }
                v[b.firstStep() + s] = row;
                if (b.hasAmplitudes()) {
                    double[] qs = new double[b.modeCount()];
                    double[] es = new double[b.modeCount()];
                    b.copyAmplitudes(s, qs, es);
                    q.computeIfAbsent(b.sample(), x -> new double[steps][])[b.firstStep() + s] = qs;
                    e.computeIfAbsent(b.sample(), x -> new double[steps][])[b.firstStep() + s] = es;
                }
            }
        }

        @Override
        public void finish() {
            finished = true;
        }
    }
}
