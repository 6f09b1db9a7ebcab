package org.stillfield.analysis.spectra;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;

class WelchPsdTest {
    private static double[] noise(long seed, int n) {
        UniformRandomProvider rng = RandomSource.L64_X128_MIX.create(seed);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = g.sample();
        }
        return x;
    }

    @Test
    void integratedPsdIsTheMeanWindowedPower() {
        // Parseval for the DFT, Σ_k |X_k|² = L Σ_n |w_n x_n|², makes Σ_k G_k Δf equal to the mean over
        // segments of Σ_n w_n² x_n² / Σ_n w_n² (computed here directly); exact to rounding.
        int len = 128;
        double dt = 3e-12;
        double[] x = noise(1, 1000);
        double[] y = noise(2, 1000);
        WelchPsd psd = WelchPsd.of(len, dt, Detrend.NONE);
        psd.add(x);
        WelchCsd csd = WelchCsd.of(len, dt, Detrend.NONE);
        csd.add(x, y);
        double[] w = HannWelch.hann(len);
        double u = 0;
        for (double v : w) {
            u += v * v;
        }
        double pxx = 0;
        double pxy = 0;
        int k = 0;
        for (int s = 0; s + len <= x.length; s += len / 2) {
            for (int n = 0; n < len; n++) {
                pxx += w[n] * w[n] * x[s + n] * x[s + n];
                pxy += w[n] * w[n] * x[s + n] * y[s + n];
            }
            k++;
        }
        assertEquals(k, psd.segments());
        assertEquals((1000 - 128) / 64 + 1, k);
        assertEquals(pxx / (k * u), psd.estimate().integratedPower(), 1e-12 * pxx / (k * u));
        assertEquals(pxy / (k * u), csd.estimate().integratedReal(), 1e-12 * pxx / (k * u));
        assertEquals(pxx / (k * u), sum(csd.estimate(), true), 1e-12 * pxx / (k * u));
    }

    private static double sum(CsdEstimate c, boolean x) {
        double s = 0;
        for (int k = 0; k < c.size(); k++) {
            s += x ? c.psdX(k) : c.psdY(k);
        }
        return s * c.resolutionHz();
    }

    @Test
    void binCentredToneHasTheHannLeakagePattern() {
        // A cosine of amplitude A at bin k0: the periodic Hann window's DFT has W(0) = L/2,
        // W(±1) = −L/4 and no other terms (Harris, Proc. IEEE 66, 51 (1978), source from memory), so
        // G(k0) = 2Δt (A L/4)²/U = Δt A² L/3 and G(k0 ± 1) = Δt A² L/12 with U = 3L/8, other bins ≈ 0;
        // together they carry the tone's power A²/2.
        int len = 256;
        double dt = 1e-9;
        int k0 = 37;
        double amp = 1.7;
        double[] x = new double[len * 4];
        for (int n = 0; n < x.length; n++) {
            x[n] = amp * Math.cos(2 * Math.PI * k0 * n / len + 0.4);
        }
        WelchPsd psd = WelchPsd.of(len, dt, Detrend.NONE);
        psd.add(x);
        PsdEstimate e = psd.estimate();
        assertEquals(k0 / (len * dt), e.frequency(k0), 1e-6);
        assertEquals(dt * amp * amp * len / 3, e.value(k0), 1e-12 * e.value(k0));
        assertEquals(dt * amp * amp * len / 12, e.value(k0 - 1), 1e-12 * e.value(k0));
        assertEquals(dt * amp * amp * len / 12, e.value(k0 + 1), 1e-12 * e.value(k0));
        assertEquals(0.0, e.value(k0 + 5), 1e-12 * e.value(k0));
        assertEquals(amp * amp / 2, e.integratedPower(), 1e-12);
    }

    @Test
    void crossSpectrumPhaseFollowsADelay() {
        // y(t) = x(t − d): G_xy = G_xx e^{−i 2π f d} for the convention G_xy ∝ X* Y (transform of
        // E[x(t) y(t+τ)]). With a bin-centred tone the identity is exact to rounding.
        int len = 128;
        int k0 = 19;
        int d = 5;
        double[] x = new double[512];
        double[] y = new double[512];
        for (int n = 0; n < x.length; n++) {
            x[n] = Math.cos(2 * Math.PI * k0 * n / len);
            y[n] = Math.cos(2 * Math.PI * k0 * (n - d) / len);
        }
        WelchCsd csd = WelchCsd.of(len, 1.0, Detrend.NONE);
        csd.add(x, y);
        CsdEstimate c = csd.estimate();
        double phase = Math.atan2(c.imaginary(k0), c.real(k0));
        assertEquals(0.0, Math.IEEEremainder(phase + 2 * Math.PI * k0 * d / len, 2 * Math.PI), 1e-12, "phase " + phase);
        assertEquals(1.0, c.coherence(k0), 1e-12);
        // A series against itself: the cross spectrum is the PSD, real.
        WelchCsd self = WelchCsd.of(64, 2.0, Detrend.NONE);
        double[] z = noise(3, 700);
        self.add(z, z);
        WelchPsd auto = WelchPsd.of(64, 2.0, Detrend.NONE);
        auto.add(z);
        CsdEstimate cs = self.estimate();
        PsdEstimate ps = auto.estimate();
        for (int k = 0; k < cs.size(); k++) {
            assertEquals(ps.value(k), cs.real(k), 1e-12 * ps.value(k), "bin " + k);
            assertEquals(0.0, cs.imaginary(k), 1e-12 * ps.value(k), "bin " + k);
        }
    }

    @Test
    void expectedEstimateOfWhiteNoiseIsFlat() {
        // White noise of variance σ² sampled at Δt: one-sided PSD 2σ²Δt (0 < f < f_N), σ²Δt at DC and
        // Nyquist (standard). The Hann smoothing leaves a flat spectrum unchanged.
        double[] g = WelchPsd.expected(64, 0.5, tau -> tau == 0 ? 3.0 : 0.0);
        assertEquals(33, g.length);
        for (int k = 0; k < g.length; k++) {
            double c = (k == 0 || k == 32) ? 1 : 2;
            assertEquals(c * 3.0 * 0.5, g[k], 1e-12, "bin " + k);
        }
    }

    @Test
    void equivalentDofMatchesTheVarianceOfTheEstimate() {
        // Welch (1967) / Percival & Walden (1993) eq. 292b (source from memory): for K segments with
        // 50 % Hann overlap ν = 2K/(1 + (1 − 1/K)/18); K = 15 gives 28.52 (2K = 30 without the overlap
        // correction). Check: white noise, 4000 series of 15 segments (L = 64); at the bins k = 2, 6, …, 30
        // (more than two bins apart, hence independent for white noise and Hann) Ĝ/G has variance 2/ν.
        // The relative SE of the sample variance of n values of χ²_ν/ν is √((2 + 12/ν)/n) = 0.87 % for
        // n = 32 000; the test allows 4.9 SE (two-sided normal tail 1e-6, this test's share of the suite
        // budget). The uncorrected 2K would sit 6 SE away.
        int len = 64;
        int k = 15;
        double expectedNu = 2.0 * k / (1 + (1 - 1.0 / k) / 18);
        assertEquals(expectedNu, WelchPsd.equivalentDof(len, k), 1e-12);
        assertEquals(28.52, expectedNu, 0.005);
        int n = len + (k - 1) * len / 2;
        int reps = 4000;
        long seed = 42;
        double sum = 0;
        double sum2 = 0;
        int count = 0;
        UniformRandomProvider rng = RandomSource.L64_X128_MIX.create(seed);
        ZigguratSampler.NormalizedGaussian g = ZigguratSampler.NormalizedGaussian.of(rng);
        for (int r = 0; r < reps; r++) {
            double[] x = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = g.sample();
            }
            WelchPsd p = WelchPsd.of(len, 1.0, Detrend.NONE);
            p.add(x);
            PsdEstimate e = p.estimate();
            assertEquals(expectedNu, e.dof(5), 1e-12);
            for (int b = 2; b < len / 2; b += 4) {
                double z = e.value(b) / 2.0;
                sum += z;
                sum2 += z * z;
                count++;
            }
        }
        double mean = sum / count;
        double var = sum2 / count - mean * mean;
        double ratio = var / (2 / expectedNu);
        double se = Math.sqrt((2 + 12 / expectedNu) / count);
        double z = new NormalDistribution().inverseCumulativeProbability(1 - 0.5e-6);
        assertTrue(Math.abs(ratio - 1) <= z * se, "Var(Ĝ/G)·ν/2 = " + ratio + " (seed " + seed + ", n = " + count
            + ", SE " + se + ")");
        assertTrue(Math.abs(mean - 1) <= z * Math.sqrt(2 / expectedNu / count), "mean Ĝ/G = " + mean);
    }

    @Test
    void dofOfUnequalSeriesCombinesByWeight() {
        // Mean over all segments of series with K_1, K_2 segments: Var = Σ (K_i/K)² 2/ν_i, so
        // ν = K²/Σ(K_i²/ν_i) (derived); equal series give Σ ν_i.
        WelchPsd p = WelchPsd.of(16, 1.0, Detrend.NONE);
        p.add(noise(5, 16 + 8 * 4));
        p.add(noise(6, 16 + 8 * 9));
        double nu1 = WelchPsd.equivalentDof(16, 5);
        double nu2 = WelchPsd.equivalentDof(16, 10);
        double expected = 15.0 * 15.0 / (25 / nu1 + 100 / nu2);
        assertEquals(expected, p.estimate().dof(3), 1e-12);
        assertEquals(0.5 * expected, p.estimate().dof(0), 1e-12);
    }

    @Test
    void meanDetrendRemovesAnOffset() {
        // An offset puts power at DC and, through the window's leakage, into bin 1; removing the
        // segment mean takes it out again: same as the offset-free series up to the mean of the noise.
        double[] x = noise(7, 2048);
        double[] shifted = x.clone();
        for (int i = 0; i < shifted.length; i++) {
            shifted[i] += 50.0;
        }
        WelchPsd a = WelchPsd.of(128, 1.0, Detrend.MEAN);
        a.add(x);
        WelchPsd b = WelchPsd.of(128, 1.0, Detrend.MEAN);
        b.add(shifted);
        PsdEstimate ea = a.estimate();
        PsdEstimate eb = b.estimate();
        for (int k = 0; k < ea.size(); k++) {
            assertEquals(ea.value(k), eb.value(k), 1e-9 * (1 + ea.value(k)), "bin " + k);
        }
        WelchPsd raw = WelchPsd.of(128, 1.0, Detrend.NONE);
        raw.add(shifted);
        assertTrue(raw.estimate().value(0) > 1000 * ea.value(0));
    }

    @Test
    void rejectsBadSettingsAndShortSeries() {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> WelchPsd.of(100, 1, Detrend.NONE));
        assertTrue(ex.getMessage().contains("power of two") && ex.getMessage().contains("100"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class, () -> WelchPsd.of(64, -1, Detrend.NONE));
        assertTrue(ex.getMessage().contains("dt_s"), ex.getMessage());
        WelchPsd p = WelchPsd.of(64, 1, Detrend.NONE);
        ex = assertThrows(IllegalArgumentException.class, () -> p.add(new double[10]));
        assertTrue(ex.getMessage().contains("shorter than one segment"), ex.getMessage());
        assertThrows(IllegalStateException.class, p::estimate);
        WelchCsd c = WelchCsd.of(64, 1, Detrend.NONE);
        assertThrows(IllegalArgumentException.class, () -> c.add(new double[100], new double[90]));
    }
}
