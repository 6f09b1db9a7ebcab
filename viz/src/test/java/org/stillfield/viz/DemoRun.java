package org.stillfield.viz;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecReader;

/**
 * A run shaped like runs/demo.yaml (box 30 × 20 × 40 mm, Gaussian window at 20 GHz) with a
 * fabricated correlation table: analytic mode sums from the real mode table plus Gaussian noise
 * of one standard error. Fabricated data for rendering tests only; not a physics check.
 */
final class DemoRun {
    static final String YAML = String.join("\n",
        "name: kl7-demo",
        "cavity: {shape: box, a_m: 0.030, b_m: 0.020, d_m: 0.040}",
        "fields: [E, B]",
        "window: {kind: gauss, cutoff_GHz: 20, tolerance: 1.0e-6}",
        "samples: 1000",
        "seed: 20261201",
        "evaluate:",
        "  points:",
        "    - {name: antenna, at: [0.015, 0.010, 0.008]}",
        "  lines:",
        "    - {name: axis, from: [0.015, 0.010, 0.0], to: [0.015, 0.010, 0.040], n: 41}",
        "  grids:",
        "    - {name: midplane, from: [0.0, 0.0, 0.0], to: [0.030, 0.020, 0.040], n: [24, 1, 32]}",
        "analysis:",
        "  pairs:",
        "    - [\"axis[20]\", \"axis\"]",
        "    - [\"antenna\", \"antenna\"]",
        "  false_alarm: 0.01",
        "");

    final RunSpec spec;
    final ModeTable table;
    final CorrelationResult result;
    final Map<Field, double[]> sample0;

    private DemoRun(RunSpec spec, ModeTable table, CorrelationResult result, Map<Field, double[]> sample0) {
        this.spec = spec;
        this.table = table;
        this.result = result;
        this.sample0 = sample0;
    }

    /**
     * @param noiseSeed seed of the fabricated estimate noise
     * @param shift added to every estimate, in standard errors (0 for a passing table)
     */
    static DemoRun build(long noiseSeed, double shift) throws Exception {
        RunSpec spec = SpecReader.parse(YAML, Path.of("."), "kl7-demo");
        ModeTable table = ModeTable.of(spec.cavity(), spec.window(), spec.state(), spec.maxModes());
        List<Vec3> pts = spec.allPoints();
        int m = table.size();
        ModeFunctions mf = table.cavity().modeFunctions(table.modes());
        double[][] u = new double[pts.size()][3 * m];
        double[][] h = new double[pts.size()][3 * m];
        for (int p = 0; p < pts.size(); p++) {
            Vec3 r = pts.get(p);
            mf.evaluate(r.x(), r.y(), r.z(), u[p], h[p]);
        }
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(noiseSeed);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        long n = spec.samples();
        List<CorrelationRow> rows = new ArrayList<>();
        for (Field f : spec.fields()) {
            double[][] basis = f == Field.B ? h : u;
            for (RunSpec.PointPair pair : spec.pairs()) {
                for (int i = 0; i < 3; i++) {
                    for (int j = 0; j < 3; j++) {
                        double cij = sum(table, f, basis[pair.first()], i, basis[pair.second()], j);
                        double cii = sum(table, f, basis[pair.first()], i, basis[pair.first()], i);
                        double cjj = sum(table, f, basis[pair.second()], j, basis[pair.second()], j);
                        double se = Math.sqrt((cii * cjj + cij * cij) / n);
                        double est = cij + se * (g.sample() + shift);
                        double z = se > 0 ? (est - cij) / se : 0.0;
                        rows.add(new CorrelationRow(f, pair.first(), pair.second(), i, j, est, se, cij, z));
                    }
                }
            }
        }
        double alpha = spec.falseAlarm();
        int tests = rows.size();
        double crit = new NormalDistribution().inverseCumulativeProbability(1 - alpha / (2.0 * tests));
        double worst = rows.stream().mapToDouble(r -> Math.abs(r.z())).max().orElse(0);
        Verdict v = new Verdict(worst <= crit, alpha, tests, crit, worst,
            "two-sided normal test of every row, Bonferroni-corrected over all rows");
        CorrelationResult result = new CorrelationResult(n, rows, v);

        Map<Field, double[]> s0 = new EnumMap<>(Field.class);
        UniformRandomProvider rs = RandomSource.XO_RO_SHI_RO_128_PP.create(noiseSeed + 1);
        ZigguratSampler.NormalizedGaussian gs = ZigguratSampler.NormalizedGaussian.of(rs);
        double[] q = new double[m];
        double[] e = new double[m];
        for (int l = 0; l < m; l++) {
            q[l] = Math.sqrt(table.variance(Field.A, l)) * gs.sample();
            e[l] = Math.sqrt(table.variance(Field.E, l)) * gs.sample();
        }
        double[] ev = new double[3 * pts.size()];
        double[] bv = new double[3 * pts.size()];
        for (int p = 0; p < pts.size(); p++) {
            for (int i = 0; i < 3; i++) {
                double se = 0;
                double sb = 0;
                for (int l = 0; l < m; l++) {
                    se += e[l] * u[p][3 * l + i];
                    sb += table.modes().get(l).k() * q[l] * h[p][3 * l + i];
                }
                ev[3 * p + i] = se;
                bv[3 * p + i] = sb;
            }
        }
        s0.put(Field.E, ev);
        s0.put(Field.B, bv);
        return new DemoRun(spec, table, result, s0);
    }

    private static double sum(ModeTable t, Field f, double[] a, int i, double[] b, int j) {
        double s = 0;
        for (int l = 0; l < t.size(); l++) {
            s += t.variance(f, l) * a[3 * l + i] * b[3 * l + j];
        }
        return s;
    }
}
