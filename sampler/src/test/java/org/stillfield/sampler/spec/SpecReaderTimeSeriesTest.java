package org.stillfield.sampler.spec;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.timeseries.TimeSeriesSpec;

/** The timeseries and probes sections as the spec reader hands them out, and its own checks on them. */
class SpecReaderTimeSeriesTest {
    private static final Path BASE = Path.of("/tmp/spec-base");

    private static String spec(String cavity, String timeseries, String probes) {
        return "cavity: " + cavity + "\nwindow: {kind: hard, cutoff_GHz: 12}\nsamples: 40\n"
            + (timeseries == null ? "" : "timeseries: " + timeseries + "\n")
            + (probes == null ? "" : "probes:\n" + probes);
    }

    private static final String BOX = "{shape: box, a_m: 0.03, b_m: 0.02, d_m: 0.04}";
    private static final String PIN = "  - {name: pin, kind: dipole, at: [0.015, 0.01, 0.008], direction: [0, 1, 0],"
        + " length_m: 0.002}\n";

    @Test
    void specWithoutTheSectionHasNoTimeSeries() throws SpecException {
        RunSpec s = SpecReader.parse(spec(BOX, null, null), BASE, "t");
        assertTrue(SpecReader.timeSeries(s).isEmpty());
    }

    @Test
    void trajectoriesDefaultToTheSampleCountAndFollowItsOverride() throws SpecException {
        RunSpec s = SpecReader.parse(spec(BOX, "{sample_rate_GHz: 40, steps: 64}", PIN), BASE, "t");
        TimeSeriesSpec ts = SpecReader.timeSeries(s).orElseThrow();
        // 40 GHz sample rate: dt = 1/(40e9) s = 25 ps.
        assertEquals(2.5e-11, ts.grid().dtSeconds(), 1e-24);
        assertEquals(40, ts.samples());
        assertEquals("pin", ts.probes().get(0).name());
        assertEquals(7, SpecReader.timeSeries(s.withSamples(7)).orElseThrow().samples(), "--samples override");
        RunSpec explicit = SpecReader.parse(spec(BOX, "{sample_rate_GHz: 40, steps: 64, samples: 5}", PIN), BASE, "t");
        assertEquals(5, SpecReader.timeSeries(explicit.withSamples(7)).orElseThrow().samples(), "explicit count stays");
    }

    @Test
    void readerRejectsWhatTheSectionReaderAllowsButTheRunCannotUse() {
        SpecException ex = assertThrows(SpecException.class, () -> SpecReader.parse(spec(BOX, null, PIN), BASE, "t"));
        assertEquals("probes", ex.setting());
        ex = assertThrows(SpecException.class, () -> SpecReader.parse(spec(BOX, "{dt_s: 2.0e-11, steps: 64}", null),
            BASE, "t"));
        assertEquals("probes", ex.setting());
        assertTrue(ex.getMessage().contains("at least one probe"), ex.getMessage());
        ex = assertThrows(SpecException.class, () -> SpecReader.parse(spec(BOX,
            "{dt_s: 2.0e-11, steps: 64, samples: 1}", PIN), BASE, "t"));
        assertEquals("timeseries.samples", ex.setting());
        ex = assertThrows(SpecException.class, () -> SpecReader.parse(spec(BOX, "{dt_s: 2.0e-11, steps: 64}",
            PIN.replace("name: pin", "name: t_s")), BASE, "t"));
        assertEquals("probes[0].name", ex.setting());
        assertTrue(ex.getMessage().contains("reserved"), ex.getMessage());
        ex = assertThrows(SpecException.class, () -> SpecReader.parse(spec("{shape: sphere, radius_m: 0.03}",
            "{dt_s: 2.0e-11, steps: 64, loss: {q: 1000, wall_sigma_S_per_m: 5.8e7}}",
            "  - {name: pin, kind: dipole, at: [0.03, 0.03, 0.03], direction: [0, 1, 0], length_m: 0.002}\n"),
            BASE, "t"));
        assertEquals("timeseries.loss.wall_sigma_S_per_m", ex.setting());
        assertTrue(ex.getMessage().contains("sphere"), ex.getMessage());
    }
}
