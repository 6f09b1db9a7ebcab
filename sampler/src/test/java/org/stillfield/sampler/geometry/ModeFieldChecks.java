package org.stillfield.sampler.geometry;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Consumer;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.stillfield.sampler.api.Cavity;
import org.stillfield.sampler.api.EnsembleSink;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeFunctions;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.SampleBatch;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.spec.RunSpec;
import org.stillfield.sampler.spec.SpecException;
import org.stillfield.sampler.spec.SpecReader;

/**
 * Checks shared by the curved- and periodic-cavity tests: finite-difference derivatives of the
 * mode functions (independent of the analytic curls the cavities use) and Gram matrices from
 * quadrature (Gauss–Legendre from Commons Math, an independent implementation).
 */
final class ModeFieldChecks {
    private ModeFieldChecks() {
    }

    /** One quadrature node: position (m) and weight (m³). */
    record Node(double x, double y, double z, double w) {
    }

    /** @return Gauss–Legendre nodes and weights on [a, b] as {points, weights} */
    static double[][] legendre(int n, double a, double b) {
        GaussIntegrator g = new GaussIntegratorFactory().legendre(n, a, b);
        double[] p = new double[n];
        double[] w = new double[n];
        for (int i = 0; i < n; i++) {
            p[i] = g.getPoint(i);
            w[i] = g.getWeight(i);
        }
        return new double[][] {p, w};
    }

    /**
     * Gram matrices (1/V)∫u_l·u_l' and (1/V)∫h_l·h_l' over the given nodes.
     *
     * @return {gramU, gramH}, each M×M
     */
    static double[][][] gram(Cavity cavity, List<Mode> modes, Consumer<Consumer<Node>> nodes) {
        ModeFunctions f = cavity.modeFunctions(modes);
        int m = modes.size();
        double[][] gu = new double[m][m];
        double[][] gh = new double[m][m];
        double[] u = new double[3 * m];
        double[] h = new double[3 * m];
        nodes.accept(node -> {
            f.evaluate(node.x(), node.y(), node.z(), u, h);
            for (int a = 0; a < m; a++) {
                for (int b = 0; b <= a; b++) {
                    double su = u[3 * a] * u[3 * b] + u[3 * a + 1] * u[3 * b + 1] + u[3 * a + 2] * u[3 * b + 2];
                    double sh = h[3 * a] * h[3 * b] + h[3 * a + 1] * h[3 * b + 1] + h[3 * a + 2] * h[3 * b + 2];
                    gu[a][b] += node.w() * su;
                    gh[a][b] += node.w() * sh;
                }
            }
        });
        double v = cavity.volume();
        for (int a = 0; a < m; a++) {
            for (int b = 0; b <= a; b++) {
                gu[a][b] /= v;
                gh[a][b] /= v;
                gu[b][a] = gu[a][b];
                gh[b][a] = gh[a][b];
            }
        }
        return new double[][][] {gu, gh};
    }

    /** Asserts |G − I| ≤ tol entrywise, naming the worst pair. */
    static void assertIdentity(double[][] g, List<Mode> modes, double tol, String what) {
        double worst = 0;
        String where = "";
        for (int a = 0; a < g.length; a++) {
            for (int b = 0; b < g.length; b++) {
                double e = Math.abs(g[a][b] - (a == b ? 1.0 : 0.0));
                if (e > worst) {
                    worst = e;
                    where = modes.get(a).label() + " vs " + modes.get(b).label() + " = " + g[a][b];
                }
            }
        }
        assertTrue(worst <= tol, what + ": worst deviation from identity " + worst + " at " + where);
    }

    /** Values of u (or h) of all modes at a point. */
    static double[] eval(ModeFunctions f, double x, double y, double z, boolean magnetic) {
        double[] out = new double[3 * f.modeCount()];
        if (magnetic) {
            f.evaluate(x, y, z, null, out);
        } else {
            f.evaluate(x, y, z, out, null);
        }
        return out;
    }

    /**
     * Central-difference Jacobian of u for all modes: d[i][3l + j] = ∂_i u_{l,j}, error ~ (kδ)²/6
     * relative to k|u|, rounding ~ ε/(kδ).
     */
    static double[][] jacobian(ModeFunctions f, double[] r, double delta, boolean magnetic) {
        double[][] d = new double[3][];
        for (int i = 0; i < 3; i++) {
            double[] rp = r.clone();
            double[] rm = r.clone();
            rp[i] += delta;
            rm[i] -= delta;
            double[] up = eval(f, rp[0], rp[1], rp[2], magnetic);
            double[] um = eval(f, rm[0], rm[1], rm[2], magnetic);
            d[i] = new double[up.length];
            for (int q = 0; q < up.length; q++) {
                d[i][q] = (up[q] - um[q]) / (2 * delta);
            }
        }
        return d;
    }

    /** Central-difference Laplacian of u for all modes, error ~ (kδ)²/12 relative to k²|u|. */
    static double[] laplacian(ModeFunctions f, double[] r, double delta) {
        double[] c = eval(f, r[0], r[1], r[2], false);
        double[] out = new double[c.length];
        for (int i = 0; i < 3; i++) {
            double[] rp = r.clone();
            double[] rm = r.clone();
            rp[i] += delta;
            rm[i] -= delta;
            double[] up = eval(f, rp[0], rp[1], rp[2], false);
            double[] um = eval(f, rm[0], rm[1], rm[2], false);
            for (int q = 0; q < c.length; q++) {
                out[q] += (up[q] + um[q] - 2 * c[q]) / (delta * delta);
            }
        }
        return out;
    }

    /**
     * At each point: ∇·u = 0 (relative to k), ∇²u + k²u = 0 (relative to k²) and
     * h = (1/k)∇×u, all by finite differences, for every mode. Points must lie at least
     * 2δ inside the cavity.
     */
    static void assertFieldEquations(Cavity cavity, List<Mode> modes, double[][] points) {
        ModeFunctions f = cavity.modeFunctions(modes);
        double kMax = modes.stream().mapToDouble(Mode::k).max().orElseThrow();
        double delta1 = 1e-4 / kMax;
        double delta2 = 2e-3 / kMax;
        for (double[] r : points) {
            double[][] d = jacobian(f, r, delta1, false);
            double[] lap = laplacian(f, r, delta2);
            double[] u = eval(f, r[0], r[1], r[2], false);
            double[] h = eval(f, r[0], r[1], r[2], true);
            for (int l = 0; l < modes.size(); l++) {
                double k = modes.get(l).k();
                int j = 3 * l;
                String at = modes.get(l).label() + " at (" + r[0] + ", " + r[1] + ", " + r[2] + ")";
                double div = d[0][j] + d[1][j + 1] + d[2][j + 2];
                // Truncation (kδ)²/6 ≈ 2e-9 and rounding ε/(kδ) ≈ 2e-12 per unit |u| ~ O(1–5).
                assertTrue(Math.abs(div) / k < 1e-7, "div u = " + div + " for " + at);
                for (int i = 0; i < 3; i++) {
                    // (kδ)²/12 ≈ 3e-7 truncation, ε/(kδ)² ≈ 6e-11 rounding, relative to k²|u|.
                    double helm = (lap[j + i] + k * k * u[j + i]) / (k * k);
                    assertTrue(Math.abs(helm) < 5e-6, "Helmholtz residual " + helm + " in component " + i + " of " + at);
                }
                double cx = (d[1][j + 2] - d[2][j + 1]) / k;
                double cy = (d[2][j] - d[0][j + 2]) / k;
                double cz = (d[0][j + 1] - d[1][j]) / k;
                double err = Math.max(Math.abs(cx - h[j]), Math.max(Math.abs(cy - h[j + 1]), Math.abs(cz - h[j + 2])));
                assertTrue(err < 1e-7, "h - curl(u)/k = " + err + " for " + at + ", h = (" + h[j] + ", " + h[j + 1]
                    + ", " + h[j + 2] + ")");
            }
        }
    }

    /** Field values the pipeline produced: per field, per sample, [3p + i]. */
    record PipelineResult(RunSpec spec, List<Vec3> points, java.util.Map<Field, List<double[]>> values) {
    }

    /**
     * Parses a YAML spec and runs the engine end to end into an in-memory sink.
     *
     * @param yaml spec text
     * @return what the sink received
     */
    static PipelineResult runPipeline(String yaml) throws SpecException, IOException {
        RunSpec spec = SpecReader.parse(yaml, Path.of("."), "test");
        ModeTable table = ModeTable.of(spec.cavity(), spec.window(), spec.state(), spec.maxModes());
        List<Vec3> points = spec.allPoints();
        java.util.Map<Field, List<double[]>> values = new java.util.EnumMap<>(Field.class);
        EnsembleSink sink = new EnsembleSink() {
            @Override
            public void accept(SampleBatch batch) {
                for (Field f : batch.fields()) {
                    for (int s = 0; s < batch.size(); s++) {
                        values.computeIfAbsent(f, x -> new ArrayList<>()).add(batch.values(f, s).clone());
                    }
                }
            }
        };
        EnsembleRunner.run(new EnsembleRunner.Plan(table, points, spec.fields(), spec.seed(), 0, spec.samples(),
            spec.threads()), sink, null);
        return new PipelineResult(spec, points, values);
    }

    /** Asserts every value is finite at points inside the cavity and NaN outside, and that both kinds occur. */
    static void assertMaskedInsideFinite(PipelineResult r) {
        assertMaskedInsideFinite(r, true);
    }

    /**
     * Asserts every value is finite at points inside the cavity and NaN outside.
     *
     * @param expectOutside whether the spec is meant to put some points outside
     */
    static void assertMaskedInsideFinite(PipelineResult r, boolean expectOutside) {
        Cavity cavity = r.spec().cavity();
        int inside = 0;
        int outside = 0;
        for (int p = 0; p < r.points().size(); p++) {
            if (cavity.contains(r.points().get(p))) {
                inside++;
            } else {
                outside++;
            }
        }
        assertTrue(inside > 0 && (outside > 0) == expectOutside, "points inside/outside: " + inside + "/" + outside);
        assertTrue(!r.values().isEmpty(), "no field values received");
        double largest = 0;
        for (java.util.Map.Entry<Field, List<double[]>> e : r.values().entrySet()) {
            assertTrue(e.getValue().size() == r.spec().samples(), "samples received for " + e.getKey() + ": " + e.getValue().size());
            for (double[] v : e.getValue()) {
                for (int p = 0; p < r.points().size(); p++) {
                    boolean in = cavity.contains(r.points().get(p));
                    for (int i = 0; i < 3; i++) {
                        double x = v[3 * p + i];
                        assertTrue(in ? Double.isFinite(x) : Double.isNaN(x), e.getKey() + " component " + i + " at point " + p
                            + " " + r.points().get(p) + (in ? " (inside)" : " (outside)") + " = " + x);
                        if (in) {
                            largest = Math.max(largest, Math.abs(x));
                        }
                    }
                }
            }
        }
        assertTrue(largest > 0, "all field values inside are zero");
    }
}
