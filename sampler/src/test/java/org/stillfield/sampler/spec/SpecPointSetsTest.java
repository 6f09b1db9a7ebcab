package org.stillfield.sampler.spec;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;

/** Layout of the point sets a spec names: lines end to end, cell-centred grids, size guards. */
class SpecPointSetsTest {
    @Test
    void lineRunsFromEndToEndInEqualSteps() {
        PointSet line = PointSet.line("axis", new Vec3(0.015, 0.01, 0), new Vec3(0.015, 0.01, 0.04), 41);
        assertEquals(41, line.size());
        assertArrayEquals(new int[] {41, 1, 1}, line.dims());
        for (int i = 0; i < 41; i++) {
            Vec3 p = line.points().get(i);
            assertEquals(0.015, p.x(), 0.0);
            assertEquals(0.01, p.y(), 0.0);
            assertEquals(0.001 * i, p.z(), 1e-17, "point " + i);
        }
        assertEquals(0.04, line.points().get(40).z(), 0.0, "the far end is included exactly");
        assertThrows(IllegalArgumentException.class, () -> PointSet.line("l", Vec3.ZERO, Vec3.ZERO, 1));
    }

    @Test
    void gridIsCellCentredWithXFastest() {
        PointSet g = PointSet.grid("mid", Vec3.ZERO, new Vec3(0.03, 0.02, 0.04), 3, 2, 4);
        assertArrayEquals(new int[] {3, 2, 4}, g.dims());
        int p = 0;
        for (int k = 0; k < 4; k++) {
            for (int j = 0; j < 2; j++) {
                for (int i = 0; i < 3; i++) {
                    Vec3 r = g.points().get(p++);
                    assertEquals(0.01 * (i + 0.5), r.x(), 1e-17, "x of " + i + "," + j + "," + k);
                    assertEquals(0.01 * (j + 0.5), r.y(), 1e-17, "y of " + i + "," + j + "," + k);
                    assertEquals(0.01 * (k + 0.5), r.z(), 1e-17, "z of " + i + "," + j + "," + k);
                }
            }
        }
    }

    @Test
    void gridRefusesPointCountsThatWouldOverflow() {
        // 2^21 · 2^21 · 2^22 = 2^64: a long product wraps to 0.
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> PointSet.grid("huge", Vec3.ZERO, new Vec3(1, 1, 1), 1 << 21, 1 << 21, 1 << 22));
        assertTrue(ex.getMessage().contains("too many points"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> PointSet.grid("big", Vec3.ZERO, new Vec3(1, 1, 1), 1 << 20, 1 << 10, 1));
        assertThrows(IllegalArgumentException.class, () -> PointSet.grid("zero", Vec3.ZERO, new Vec3(1, 1, 1), 0, 1, 1));
    }

    @Test
    void dimsMustMatchThePointCount() {
        assertThrows(IllegalArgumentException.class,
            () -> new PointSet("bad", PointSet.Kind.GRID, List.of(Vec3.ZERO), new int[] {2, 1, 1}));
        int[] dims = {1, 1, 1};
        PointSet s = new PointSet("ok", PointSet.Kind.POINT, List.of(Vec3.ZERO), dims);
        dims[0] = 7;
        assertEquals(1, s.dims()[0], "dims are copied in");
    }
}
