package org.stillfield.sampler.timeseries;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.lang.reflect.Method;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.snakeyaml.engine.v2.api.Load;
import org.snakeyaml.engine.v2.api.LoadSettings;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.spec.SpecException;
import org.stillfield.sampler.spec.SpecNode;

class TimeSeriesSpecTest {
    /** Builds the two nodes the spec reader would hand over (SpecNode's factory is package-private). */
    private static TimeSeriesSpec read(String yaml) throws Exception {
        Map<?, ?> doc = (Map<?, ?>) new Load(LoadSettings.builder().build()).loadFromString(yaml);
        Method of = SpecNode.class.getDeclaredMethod("of", String.class, Object.class);
        of.setAccessible(true);
        SpecNode root = (SpecNode) of.invoke(null, "", doc);
        return TimeSeriesSpec.read(root.child("timeseries"), root.children("probes"), Fixtures.box(), 100);
    }

    private static final String GOOD = String.join("\n",
        "timeseries:",
        "  sample_rate_GHz: 40",
        "  steps: 8192",
        "  loss: {wall_sigma_S_per_m: 5.8e7, q: 20000}",
        "  record: [probes, amplitudes]",
        "  spectra: {segment: 1024, origins: first, correlation_lags: 64}",
        "probes:",
        "  - {name: pin, kind: dipole, at: [0.015, 0.01, 0.008], direction: [0, 2, 0], length_m: 0.002}",
        "  - {name: blob, kind: smeared_dipole, at: [0.015, 0.01, 0.02], direction: [0, 1, 0], length_m: 0.002,"
            + " width_m: 5.0e-4}",
        "  - {name: coil, kind: loop, at: [0.005, 0.01, 0.02], normal: [1, 0, 0], area_m2: 1.0e-6, output: emf}",
        "  - {name: ez, kind: field, field: e, component: z, at: [0.01, 0.01, 0.01]}",
        "");

    @Test
    void readsAFullSection() throws Exception {
        TimeSeriesSpec s = read(GOOD);
        assertEquals(2.5e-11, s.grid().dtSeconds(), 1e-24);
        assertEquals(8192, s.grid().steps());
        assertEquals(100, s.samples());
        assertTrue(s.amplitudes());
        assertEquals(1024, s.spectra().segment());
        assertEquals(64, s.spectra().correlationLags());
        assertTrue(!s.spectra().allOrigins());
        assertEquals(4, s.probes().size());
        Probe.ElectricDipole pin = (Probe.ElectricDipole) s.probes().get(0);
        assertEquals(1.0, pin.direction().y(), 0.0);
        assertEquals(Probe.LoopOutput.EMF, ((Probe.MagneticLoop) s.probes().get(2)).output());
        assertEquals(Field.E, ((Probe.FieldProbe) s.probes().get(3)).field());
        assertEquals(2, ((Probe.FieldProbe) s.probes().get(3)).component());
        // Loss parts add as rates.
        ModeTable t = Fixtures.table(7, ThermalState.VACUUM);
        double qc = LossModel.wallConductivity(5.8e7).qualityFactors(t)[0];
        assertEquals(1 / (1 / qc + 1 / 20000.0), ModeDamping.of(t, s.loss()).qualityFactor(0), 1e-9);
    }

    @Test
    void defaultsToLosslessProbesOnly() throws Exception {
        TimeSeriesSpec s = read("timeseries: {dt_s: 1.0e-11, steps: 100}\n");
        assertEquals(LossModel.lossless(), s.loss());
        assertTrue(!s.amplitudes() && !s.failOnAliasing());
        assertEquals(64, s.spectra().segment());
        assertEquals(99, s.spectra().correlationLags());
        assertTrue(s.probes().isEmpty());
    }

    @Test
    void errorsNameTheSetting() {
        SpecException ex = assertThrows(SpecException.class,
            () -> read("timeseries: {dt_s: 1.0e-11, sample_rate_Hz: 1.0e9, steps: 10}\n"));
        assertEquals("timeseries.dt_s", ex.setting());
        ex = assertThrows(SpecException.class, () -> read("timeseries: {dt_s: 1.0e-11}\n"));
        assertEquals("timeseries.steps", ex.setting());
        ex = assertThrows(SpecException.class, () -> read("timeseries: {dt_s: 1.0e-11, steps: 100, spectra: {segment: 48}}\n"));
        assertEquals("timeseries.spectra.segment", ex.setting());
        assertTrue(ex.getMessage().contains("power of two"), ex.getMessage());
        ex = assertThrows(SpecException.class, () -> read("timeseries: {dt_s: 1.0e-11, steps: 100, loss: {Q: 5}}\n"));
        assertEquals("timeseries.loss.Q", ex.setting());
        assertTrue(ex.getMessage().contains("did you mean 'q'"), ex.getMessage());
        ex = assertThrows(SpecException.class, () -> read("timeseries: {dt_s: 1.0e-11, steps: 10}\n"
            + "probes:\n  - {name: p, kind: dipole, at: [0.5, 0.01, 0.01], direction: [0, 1, 0], length_m: 1}\n"));
        assertEquals("probes[0].at", ex.setting());
        assertTrue(ex.getMessage().contains("outside"), ex.getMessage());
        ex = assertThrows(SpecException.class, () -> read("timeseries: {dt_s: 1.0e-11, steps: 10}\n"
            + "probes:\n  - {name: p, kind: loop, at: [0.01, 0.01, 0.01], normal: [0, 1, 0], area_m2: -1}\n"));
        assertEquals("probes[0].area_m2", ex.setting());
        ex = assertThrows(SpecException.class, () -> read("timeseries: {dt_s: 1.0e-11, steps: 10}\n"
            + "probes:\n  - {name: p, kind: antenna, at: [0.01, 0.01, 0.01]}\n"));
        assertEquals("probes[0].kind", ex.setting());
        ex = assertThrows(SpecException.class, () -> read("timeseries: {dt_s: 1.0e-11, steps: 10}\n"
            + "probes:\n  - {name: p, kind: field, field: E, component: z, at: [0.01, 0.01, 0.01]}\n"
            + "  - {name: p, kind: field, field: B, component: x, at: [0.01, 0.01, 0.01]}\n"));
        assertEquals("probes[1].name", ex.setting());
        ex = assertThrows(SpecException.class, () -> read("timeseries: {dt_s: 1.0e-11, steps: 10, record: [probes, q]}\n"));
        assertEquals("timeseries.record", ex.setting());
    }
}
