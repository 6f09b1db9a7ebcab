package org.stillfield.sampler.timeseries;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;

class TimeGridTest {
    @Test
    void nyquistIsHalfTheSamplingRate() {
        // Sampling theorem: a grid of step dt represents |f| < 1/(2 dt), i.e. ω < π/dt (Shannon 1949).
        TimeGrid g = new TimeGrid(2.5e-11, 100);
        assertEquals(2.0e10, g.nyquistHz(), 1e-6);
        assertEquals(Math.PI / 2.5e-11, g.nyquistOmega(), 1e-3);
        assertEquals(99 * 2.5e-11, g.span(), 1e-24);
        assertEquals(37 * 2.5e-11, g.time(37), 0.0);
    }

    @Test
    void listsExactlyTheModesAboveNyquist() {
        // Box 3x2x4 cm up to 10 GHz: f = (c/2)sqrt((l/a)^2+(m/b)^2+(n/d)^2) (Pozar, rectangular cavity):
        // TE101 6.2457, TE011 8.3799, TM110 = TE102 9.0072, TE111/TM111 9.7550 GHz.
        ModeTable t = Fixtures.table(10, ThermalState.VACUUM);
        assertEquals(6, t.size());
        // Nyquist 8.5 GHz: everything but TE101 and TE011 aliases.
        TimeGrid g = new TimeGrid(1 / (2 * 8.5e9), 10);
        AliasReport r = g.aliasing(t);
        assertEquals(4, r.count());
        assertEquals(List.of(2, 3, 4, 5), r.modes());
        for (int l : r.modes()) {
            assertTrue(t.frequency(l) >= 8.5e9, t.modes().get(l).label());
        }
        assertEquals(t.frequency(5), r.highestHz(), 1e-3);
        assertEquals(0.5 / t.frequency(5), r.largestCleanDt(), 1e-25);
        String msg = r.message();
        assertTrue(msg.contains("timeseries.dt_s") && msg.contains("4 of 6 modes") && msg.contains("TE_1,0,2")
            && msg.contains("8.50000e+09 Hz"), msg);
        // A step below 1/(2 f_max) aliases nothing and says nothing.
        AliasReport clean = new TimeGrid(0.99 * r.largestCleanDt(), 10).aliasing(t);
        assertTrue(clean.clean());
        assertEquals("", clean.message());
    }

    @Test
    void rejectsBadSteps() {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> new TimeGrid(Double.NaN, 3));
        assertTrue(ex.getMessage().contains("timeseries.dt_s") && ex.getMessage().contains("NaN"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> new TimeGrid(-1e-9, 3));
        ex = assertThrows(IllegalArgumentException.class, () -> new TimeGrid(1e-9, 0));
        assertTrue(ex.getMessage().contains("timeseries.steps") && ex.getMessage().contains("0"), ex.getMessage());
    }
}
