package org.stillfield.analysis;

import java.io.IOException;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.spec.RunSpec;

/** A tiny cavity ensemble shared by the estimator and amplitude tests. */
final class EnsembleFixtures {
    /** Box 1 × 1.3 × 1.7 m, hard window at k = 10 rad/m: 70 modes (REFERENCE-VALUES.md §4). */
    static ModeTable tinyTable() {
        return ModeTable.of(RectangularCavity.of(1.0, 1.3, 1.7, Medium.VACUUM),
            new Window(Window.Kind.HARD, 10 * Medium.VACUUM.waveSpeed(), Window.DEFAULT_TOLERANCE), ThermalState.VACUUM,
            10_000);
    }

    /** Interior points, one on the wall x = 0 (index 2) where E_y, E_z, A_y, A_z and B_x vanish. */
    static final List<Vec3> POINTS = List.of(new Vec3(0.3, 0.5, 0.7), new Vec3(0.31, 0.55, 0.8), new Vec3(0.0, 0.4, 0.9),
        new Vec3(0.9, 1.2, 0.2));

    static final List<RunSpec.PointPair> PAIRS = List.of(new RunSpec.PointPair(0, 0), new RunSpec.PointPair(0, 1),
        new RunSpec.PointPair(1, 2), new RunSpec.PointPair(2, 2), new RunSpec.PointPair(3, 0), new RunSpec.PointPair(3, 3));

    static final Set<Field> FIELDS = Set.of(Field.A, Field.E, Field.B);

    private EnsembleFixtures() {
    }

    static void run(ModeTable table, long seed, long first, long samples, EnsembleSink sink) throws IOException {
        EnsembleRunner.run(new EnsembleRunner.Plan(table, POINTS, FIELDS, seed, first, samples, 2), sink, null);
    }

    /** Forwards every batch with fields multiplied by fieldScale and amplitudes by amplitudeScale. */
    static EnsembleSink scaled(EnsembleSink target, double fieldScale, double amplitudeScale) {
        return batch -> {
            int n = batch.size();
            double[][] q = new double[n][];
            double[][] e = new double[n][];
            Map<Field, double[][]> values = new EnumMap<>(Field.class);
            for (Field f : batch.fields()) {
                values.put(f, new double[n][]);
            }
            for (int s = 0; s < n; s++) {
                q[s] = times(batch.q(s), amplitudeScale);
                e[s] = times(batch.e(s), amplitudeScale);
                for (Field f : batch.fields()) {
                    values.get(f)[s] = times(batch.values(f, s), fieldScale);
                }
            }
            target.accept(new SampleBatch(batch.firstSample(), q, e, values));
        };
    }

    private static double[] times(double[] v, double s) {
        double[] out = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            out[i] = s * v[i];
        }
        return out;
    }
}
