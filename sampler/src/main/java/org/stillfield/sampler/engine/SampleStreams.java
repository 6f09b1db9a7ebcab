package org.stillfield.sampler.engine;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.core.source64.SplitMix64;
import org.apache.commons.rng.simple.RandomSource;

/**
 * The random stream of each sample, derived from (master seed, sample index) alone so that a
 * sample's values never depend on thread count, batch size or shard split.
 *
 * <p>Derivation (changing it changes every output, so it is part of the dataset format):
 * <ol>
 *   <li>s = mix64(seed) + (index + 1)·0x9E3779B97F4A7C15 (Weyl increment, as in SplitMix64);</li>
 *   <li>a SplitMix64 seeded with s gives four longs;</li>
 *   <li>those seed an L64X128Mix generator ({@link RandomSource#L64_X128_MIX}; Steele &amp; Vigna,
 *       "LXM: better splittable pseudorandom number generators", OOPSLA 2021).</li>
 * </ol>
 */
public final class SampleStreams {
    /** Generator name recorded in dataset footers. */
    public static final String GENERATOR = "L64_X128_MIX (commons-rng), per-sample seed from SplitMix64(mix64(seed) + (i+1)*golden)";

    private static final long GOLDEN = 0x9E3779B97F4A7C15L;

    private SampleStreams() {
    }

    /**
     * @param seed master seed of the run
     * @param sampleIndex global sample index, ≥ 0
     * @return the sample's generator
     */
    public static UniformRandomProvider forSample(long seed, long sampleIndex) {
        if (sampleIndex < 0) {
            throw new IllegalArgumentException("sample index must be >= 0: " + sampleIndex);
        }
        SplitMix64 mixer = new SplitMix64(mix64(seed) + (sampleIndex + 1) * GOLDEN);
        long[] state = {mixer.nextLong(), mixer.nextLong(), mixer.nextLong(), mixer.nextLong()};
        return RandomSource.L64_X128_MIX.create(state);
    }

    /** Stafford's variant 13 finaliser, the output function of SplitMix64. */
    static long mix64(long z) {
        z = (z ^ (z >>> 30)) * 0xbf58476d1ce4e5b9L;
        z = (z ^ (z >>> 27)) * 0x94d049bb133111ebL;
        return z ^ (z >>> 31);
    }
}
