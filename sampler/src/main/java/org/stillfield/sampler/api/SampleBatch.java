package org.stillfield.sampler.api;

import java.util.EnumMap;
import java.util.Map;
import java.util.Set;

/**
 * A block of consecutive samples as the engine hands them to sinks: amplitudes (q_l, e_l) per
 * sample and the synthesised field values at every evaluation point.
 *
 * <p>Arrays are shared, not copied, for speed: sinks must not modify them and must not keep
 * references after {@code accept} returns.
 */
public final class SampleBatch {
    private final long firstSample;
    private final int count;
    private final double[][] q;
    private final double[][] e;
    private final Map<Field, double[][]> values;

    /**
     * @param firstSample global index of the first sample
     * @param q q[s][l], amplitude of mode l in sample s (V·s/m)
     * @param e e[s][l] = −q̇_l (V/m)
     * @param values per field: values[s][3p + i], component i at point p
     */
    public SampleBatch(long firstSample, double[][] q, double[][] e, Map<Field, double[][]> values) {
        this.firstSample = firstSample;
        this.count = q.length;
        this.q = q;
        this.e = e;
        this.values = values.isEmpty() ? new EnumMap<>(Field.class) : new EnumMap<>(values);
    }

    /** @return global index of the first sample in the batch */
    public long firstSample() {
        return firstSample;
    }

    /** @return number of samples in the batch */
    public int size() {
        return count;
    }

    /** @return q amplitudes of sample s (relative index) */
    public double[] q(int s) {
        return q[s];
    }

    /** @return e amplitudes of sample s (relative index) */
    public double[] e(int s) {
        return e[s];
    }

    /** @return fields present */
    public Set<Field> fields() {
        return values.keySet();
    }

    /** @return values[3p + i] of the field for sample s (relative index) */
    public double[] values(Field field, int s) {
        double[][] v = values.get(field);
        if (v == null) {
            throw new IllegalArgumentException("field not synthesised in this run: " + field);
        }
        return v[s];
    }
}
