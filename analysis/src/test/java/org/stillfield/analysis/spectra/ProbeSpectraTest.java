package org.stillfield.analysis.spectra;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Medium;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.ThermalState;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;
import org.stillfield.sampler.geometry.RectangularCavity;
import org.stillfield.sampler.timeseries.LossModel;
import org.stillfield.sampler.timeseries.ModeDamping;
import org.stillfield.sampler.timeseries.Probe;
import org.stillfield.sampler.timeseries.SeriesAssembler;
import org.stillfield.sampler.timeseries.TimeGrid;
import org.stillfield.sampler.timeseries.TimeSeriesRunner;

class ProbeSpectraTest {
    @Test
    void accumulatesTheSameAsTheEstimatorsFedByHand() throws IOException {
        // The sink must equal the estimators fed with the whole series of each sample (interleaved
        // blocks of a group reassembled in order).
        RectangularCavity box = RectangularCavity.of(0.03, 0.02, 0.04, Medium.VACUUM);
        ModeTable t = ModeTable.of(box, new Window(Window.Kind.HARD, 2 * Math.PI * 12e9, 1e-9), ThermalState.VACUUM,
            100);
        ModeDamping d = ModeDamping.of(t, LossModel.constant(80));
        List<Probe> probes = List.of(new Probe.FieldProbe("ex", Field.E, new Vec3(0.01, 0.01, 0.01), 0),
            new Probe.FieldProbe("by", Field.B, new Vec3(0.02, 0.005, 0.03), 1));
        int steps = 300;
        double dt = 2e-11;
        TimeSeriesRunner.Plan plan = TimeSeriesRunner.Plan.of(t, d, new TimeGrid(dt, steps), probes, 3, 0, 7, 2)
            .withBlocking(4, 64);
        ProbeSpectra sink = ProbeSpectra.of(List.of("ex", "by"), steps, dt, 64, Detrend.NONE, 20,
            TwoTimeCorrelation.Origins.ALL);
        TimeSeriesRunner.run(plan, sink, null);
        List<double[][]> series = new ArrayList<>();
        TimeSeriesRunner.run(plan, new SeriesAssembler(new int[] {0, 1}, steps, (s, v) -> series.add(v)), null);
        WelchPsd p1 = WelchPsd.of(64, dt, Detrend.NONE);
        WelchCsd c01 = WelchCsd.of(64, dt, Detrend.NONE);
        TwoTimeCorrelation r10 = TwoTimeCorrelation.of(20, dt, TwoTimeCorrelation.Origins.ALL);
        for (double[][] v : series) {
            p1.add(v[1]);
            c01.add(v[0], v[1]);
            r10.add(v[1], v[0]);
        }
        assertArrayEquals(p1.estimate().values(), sink.psd(1).values(), 0.0);
        assertEquals(c01.estimate().imaginary(7), sink.csd(0, 1).imaginary(7), 0.0);
        assertArrayEquals(r10.mean(), sink.correlation(1, 0).mean(), 0.0);
        assertEquals(7, sink.correlation(0, 0).count());
        assertThrows(IllegalArgumentException.class, () -> sink.csd(1, 0));
        assertThrows(IllegalArgumentException.class, () -> ProbeSpectra.of(List.of("a"), 10, dt, 16, Detrend.NONE, 3,
            TwoTimeCorrelation.Origins.ALL));
    }
}
