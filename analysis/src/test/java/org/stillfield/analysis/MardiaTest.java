package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

/**
 * Mardia's measures (Biometrika 57, 519 (1970), source from memory): the tensor form of b₁ against
 * the double-sum definition, b₂ against its definition, and the tests on normal and skewed data.
 *
 * <p>False-failure budget: 1e-6 for the normal case (both p-values ≥ 5e-7).
 */
class MardiaTest {
    private static double[][] normal(long seed, int n, int p, double mix) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        double[][] x = new double[n][p];
        for (double[] row : x) {
            for (int k = 0; k < p; k++) {
                row[k] = g.sample() + (k > 0 ? mix * row[0] : 0);
            }
        }
        return x;
    }

    @Test
    void measuresEqualTheirDefinitions() {
        double[][] x = normal(5, 60, 3, 0.4);
        int n = x.length;
        int p = 3;
        double[] mean = new double[p];
        for (double[] r : x) {
            for (int k = 0; k < p; k++) {
                mean[k] += r[k] / n;
            }
        }
        DMatrixRMaj s = new DMatrixRMaj(p, p);
        for (double[] r : x) {
            for (int i = 0; i < p; i++) {
                for (int j = 0; j < p; j++) {
                    s.add(i, j, (r[i] - mean[i]) * (r[j] - mean[j]) / n);
                }
            }
        }
        DMatrixRMaj si = new DMatrixRMaj(p, p);
        CommonOps_DDRM.invert(s, si);
        double b1 = 0;
        double b2 = 0;
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                double g = 0;
                for (int i = 0; i < p; i++) {
                    for (int j = 0; j < p; j++) {
                        g += (x[a][i] - mean[i]) * si.get(i, j) * (x[b][j] - mean[j]);
                    }
                }
                b1 += g * g * g / ((double) n * n);
                if (a == b) {
                    b2 += g * g / n;
                }
            }
        }
        Mardia.Result r = Mardia.test(x);
        assertEquals(b1, r.b1(), 1e-10 * b1, "b1");
        assertEquals(b2, r.b2(), 1e-10 * b2, "b2");
    }

    @Test
    void normalDataPassAndSkewedDataFail() {
        long seed = 31L;
        Mardia.Result ok = Mardia.test(normal(seed, 2000, 6, 0.5));
        assertTrue(ok.skewnessP() >= 5e-7 && ok.kurtosisP() >= 5e-7, String.format(
            "seed %d, n = 2000, p = 6: skewness p %.3g, kurtosis z %.2f", seed, ok.skewnessP(), ok.kurtosisZ()));
        // One coordinate replaced by a centred exponential: strongly skewed and heavy-tailed.
        double[][] x = normal(seed, 2000, 6, 0.5);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed + 1);
        for (double[] row : x) {
            row[2] = -Math.log(rng.nextDouble()) - 1;
        }
        Mardia.Result bad = Mardia.test(x);
        assertTrue(bad.skewnessP() < 1e-10 && bad.kurtosisZ() > 5, "skewed data: " + bad);
        assertThrows(IllegalArgumentException.class, () -> Mardia.test(new double[][] {{1, 2}, {2, 4}, {3, 6}, {1, 2}}));
    }
}
