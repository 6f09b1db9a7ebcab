package org.stillfield.bench.jmh;

import java.util.ArrayList;
import java.util.EnumMap;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.TimeUnit;
import org.apache.commons.rng.UniformRandomProvider;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.TensorGridSum;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.engine.AmplitudeSampler;
import org.stillfield.sampler.engine.FieldSynthesizer;
import org.stillfield.sampler.engine.SampleStreams;
import org.stillfield.sampler.geometry.RectangularCavity;

/**
 * The synthesis kernels one sample at a time, single-threaded unless stated:
 * the box's 64³ tensor-grid sum (34 218 modes), the tiled point-block product for 1000 points and
 * about 2·10⁴ modes (a batch of 32 samples on the benchmark's own pool), and one sample's amplitude
 * draw. Run: mvn -B -Pbench package -DskipTests && java -jar bench/jmh/target/stillfield-jmh.jar
 */
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class SynthesisKernels {
    /** The 64³ grid case. */
    @State(Scope.Benchmark)
    public static class Grid {
        TensorGridSum sum;
        double[] amplitudes;
        double[] out;
        AmplitudeSampler sampler;
        double[] q;
        double[] e;

        @Setup
        public void setup() {
            RectangularCavity cube = RectangularCavity.of(1, 1, 1, Medium.VACUUM);
            ModeTable t = ModeTable.of(cube, new Window(Window.Kind.HARD,
                32 * Math.PI * Medium.VACUUM.waveSpeed() * (1 + 1e-12), Window.DEFAULT_TOLERANCE), ThermalState.VACUUM, 10_000_000);
            double[] xs = new double[64];
            for (int i = 0; i < 64; i++) {
                xs[i] = (i + 0.5) / 64;
            }
            sum = cube.tensorGridSum(t.modes(), xs, xs, xs);
            sampler = new AmplitudeSampler(t);
            q = new double[t.size()];
            e = new double[t.size()];
            sampler.draw(SampleStreams.forSample(1, 0), q, e);
            amplitudes = e.clone();
            out = new double[3 * 64 * 64 * 64];
        }
    }

    /** The 1000-point case. */
    @State(Scope.Benchmark)
    public static class Points {
        FieldSynthesizer synth;
        double[][] q;
        double[][] e;
        Map<Field, double[][]> out;
        ForkJoinPool pool;

        @Setup
        public void setup() {
            RectangularCavity box = RectangularCavity.of(1, 1.3, 1.7, Medium.VACUUM);
            ModeTable t = ModeTable.of(box, new Window(Window.Kind.HARD, 64.5 * Medium.VACUUM.waveSpeed(),
                Window.DEFAULT_TOLERANCE), ThermalState.VACUUM, 10_000_000);
            UniformRandomProvider rng = SampleStreams.forSample(7, 0);
            List<Vec3> pts = new ArrayList<>();
            for (int p = 0; p < 1000; p++) {
                pts.add(new Vec3(rng.nextDouble(), 1.3 * rng.nextDouble(), 1.7 * rng.nextDouble()));
            }
            synth = new FieldSynthesizer(t, pts, EnumSet.of(Field.E), 1L << 30);
            AmplitudeSampler s = new AmplitudeSampler(t);
            q = new double[32][t.size()];
            e = new double[32][t.size()];
            for (int i = 0; i < 32; i++) {
                s.draw(SampleStreams.forSample(7, i), q[i], e[i]);
            }
            out = new EnumMap<>(Field.class);
            out.put(Field.E, new double[32][3000]);
            pool = new ForkJoinPool(Runtime.getRuntime().availableProcessors());
        }

        @TearDown(Level.Trial)
        public void stop() {
            pool.shutdown();
        }
    }

    /** One sample's E on the 64³ grid, one thread. */
    @Benchmark
    public double gridSum64(Grid g) {
        g.sum.sum(g.amplitudes, false, g.out, 0);
        return g.out[12345];
    }

    /** One sample's 2·34 218 amplitude draws. */
    @Benchmark
    public double drawAmplitudes(Grid g) {
        g.sampler.draw(SampleStreams.forSample(1, 3), g.q, g.e);
        return g.q[0];
    }

    /** 32 samples of E at 1000 points (about 2·10⁴ modes), all cores. */
    @Benchmark
    public double pointBlocks32(Points p) {
        p.synth.synthesize(p.q, p.e, p.out, p.pool, 0);
        return p.out.get(Field.E)[0][0];
    }
}
