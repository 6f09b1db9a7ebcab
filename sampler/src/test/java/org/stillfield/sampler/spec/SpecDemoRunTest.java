package org.stillfield.sampler.spec;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.api.Window;

/** The committed demo spec parses to the values written in it. */
class SpecDemoRunTest {
    /** Tests run in the sampler module folder; the run specs live beside it. */
    private static final Path DEMO = Path.of("../runs/demo.yaml");

    @Test
    void demoSpecParsesWithTheValuesItStates() throws Exception {
        RunSpec s = SpecReader.read(DEMO);
        assertEquals("kl7-demo", s.name());
        assertEquals("box", s.cavity().shape());
        assertEquals(Map.of("a_m", 0.030, "b_m", 0.020, "d_m", 0.040), s.cavity().parameters());
        assertEquals(1.0, s.cavity().medium().epsilonR(), 0.0);
        assertEquals(1.0, s.cavity().medium().muR(), 0.0);
        assertTrue(s.state().isVacuum());
        assertEquals(EnumSet.of(Field.E, Field.B), s.fields());
        assertEquals(Window.Kind.GAUSS, s.window().kind());
        assertEquals(2 * Math.PI * 20e9, s.window().omegaC(), 1e-3);
        assertEquals(1e-6, s.window().tolerance(), 0.0);
        assertEquals(1000, s.samples());
        assertEquals(20261201L, s.seed());
        assertEquals(RunSpec.Precision.FLOAT64, s.precision());
        assertEquals(0.01, s.falseAlarm(), 0.0);
        assertEquals(200_000, s.maxModes());
        assertEquals(Runtime.getRuntime().availableProcessors(), s.threads(), "threads: 0 means all cores");
        assertEquals(DEMO.toAbsolutePath().getParent().resolve("out/kl7-demo").normalize(), s.outputFolder());
        assertEquals(Files.readString(DEMO), s.sourceText(), "the spec text is kept verbatim");

        List<PointSet> sets = s.pointSets();
        assertEquals(List.of("antenna", "axis", "midplane"), sets.stream().map(PointSet::name).toList());
        assertEquals(new Vec3(0.015, 0.010, 0.008), sets.get(0).points().get(0));
        assertEquals(41, sets.get(1).size());
        assertEquals(new Vec3(0.015, 0.010, 0.020), sets.get(1).points().get(20), "axis[20] is the centre");
        assertEquals(24 * 32, sets.get(2).size());
        assertEquals(0.010, sets.get(2).points().get(0).y(), 1e-17, "midplane is the y = b/2 slice");
        assertEquals(1 + 41 + 768, s.allPoints().size());

        // pairs: ["axis[20]", "axis"] then ["antenna", "antenna"]; axis starts at global index 1.
        assertEquals(42, s.pairs().size());
        for (int j = 0; j < 41; j++) {
            assertEquals(new RunSpec.PointPair(21, 1 + j), s.pairs().get(j), "pair " + j);
        }
        assertEquals(new RunSpec.PointPair(0, 0), s.pairs().get(41));
    }

    @Test
    void demoCavityHasTheStatedLowestModeAndAnAcceptableModeCount() throws Exception {
        RunSpec s = SpecReader.read(DEMO);
        ModeTable t = ModeTable.of(s.cavity(), s.window(), s.state(), s.maxModes());
        // The spec's comment: TE101 resonates at 6.2457 GHz (REFERENCE-VALUES.md §3, derived: 6.245676 GHz).
        assertEquals("TE_1,0,1", t.modes().get(0).label());
        assertEquals(6.2457e9, t.frequency(0), 0.00005e9);
        assertTrue(t.size() > 100 && t.size() < s.maxModes(), "modes: " + t.size());
    }
}
