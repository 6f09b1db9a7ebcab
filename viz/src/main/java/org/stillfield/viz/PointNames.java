package org.stillfield.viz;

import java.util.List;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;

/** Global point index → the name a spec uses for it ({@code axis[20]}, {@code antenna}). */
final class PointNames {
    private final List<PointSet> sets;
    private final int[] offsets;

    PointNames(List<PointSet> sets) {
        this.sets = List.copyOf(sets);
        offsets = new int[sets.size()];
        int o = 0;
        for (int s = 0; s < sets.size(); s++) {
            offsets[s] = o;
            o += sets.get(s).size();
        }
    }

    /** @return global index of the first point of set s */
    int offset(int s) {
        return offsets[s];
    }

    /** @return the spec-style name of global point p, or {@code #p} when p is outside every set */
    String name(int p) {
        for (int s = sets.size() - 1; s >= 0; s--) {
            if (p >= offsets[s] && p < offsets[s] + sets.get(s).size()) {
                PointSet set = sets.get(s);
                return set.kind() == PointSet.Kind.POINT ? set.name() : set.name() + "[" + (p - offsets[s]) + "]";
            }
        }
        return "#" + p;
    }

    /** @return coordinates of global point p, or null when p is outside every set */
    Vec3 point(int p) {
        for (int s = sets.size() - 1; s >= 0; s--) {
            if (p >= offsets[s] && p < offsets[s] + sets.get(s).size()) {
                return sets.get(s).points().get(p - offsets[s]);
            }
        }
        return null;
    }
}
