package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.engine.EnsembleRunner;
import org.stillfield.sampler.io.Dataset;
import org.stillfield.sampler.io.DatasetWriter;
import org.stillfield.sampler.spec.RunSpec;

/**
 * Mergeable statistics: the estimators run on parts of an ensemble and merged equal the same
 * estimators on the whole (Chan, Golub &amp; LeVeque 1979, source from memory), and a dataset
 * streamed back from Parquet gives the same statistics as the live run. Deterministic.
 */
class MergeAndReplayTest {
    private static final long SEED = 20261206L;

    @TempDir
    Path tmp;

    /** The estimators under test, one instance per part. */
    private static final class Set {
        final FullCovarianceEstimator cov;
        final SeparationBins bins;
        final WallProfile profile;
        final ModeVariances modes;
        final GaussianityCheck gauss;
        final ModeTable table;
        final List<org.stillfield.sampler.api.Vec3> points;

        Set(RunSpec spec, ModeTable table) {
            this.table = table;
            this.points = spec.allPoints();
            List<Integer> line = EstimatorFixtures.range(1, 12);
            cov = FullCovarianceEstimator.of(Field.E, line, spec.allPoints().size());
            bins = SeparationBins.byDistance(Field.B, EstimatorFixtures.range(12, 48), spec.allPoints());
            profile = WallProfile.of(Field.E, line, spec.allPoints().size());
            modes = ModeVariances.of(table, 4);
            gauss = GaussianityCheck.of(table, Field.E, List.of(0, 3, 6), spec.allPoints(), 16, 10_000);
        }

        org.stillfield.sampler.api.EnsembleSink sink() {
            return EstimatorFixtures.tee(cov, bins, profile, modes, gauss);
        }

        void merge(Set o) {
            cov.merge(o.cov);
            bins.merge(o.bins);
            profile.merge(o.profile);
            modes.merge(o.modes);
            gauss.merge(o.gauss);
        }
    }

    @Test
    void partsMergedEqualTheWhole() throws Exception {
        RunSpec spec = EstimatorFixtures.spec(tmp);
        ModeTable table = EstimatorFixtures.table(spec);
        Set whole = new Set(spec, table);
        EstimatorFixtures.run(spec, table, SEED, 0, 700, whole.sink());
        Set merged = new Set(spec, table);
        long[] cuts = {0, 123, 124, 500, 700};
        for (int c = 0; c + 1 < cuts.length; c++) {
            Set part = new Set(spec, table);
            EstimatorFixtures.run(spec, table, SEED, cuts[c], cuts[c + 1] - cuts[c], part.sink());
            merged.merge(part);
        }
        assertSame(whole, merged, 1e-12);
    }

    @Test
    void replayFromParquetGivesTheLiveStatistics() throws Exception {
        RunSpec spec = EstimatorFixtures.spec(tmp);
        ModeTable table = EstimatorFixtures.table(spec);
        Set live = new Set(spec, table);
        try (DatasetWriter w = DatasetWriter.create(spec, table, false)) {
            EnsembleRunner.run(new EnsembleRunner.Plan(table, spec.allPoints(), spec.fields(), spec.seed(), 0,
                spec.samples(), 2), spec.pointSets(), EstimatorFixtures.tee(w, live.sink()), null);
        }
        Dataset ds = Dataset.open(spec.outputFolder());
        assertEquals(spec.samples(), ds.samples());
        Set replayed = new Set(spec, table);
        // Another batch size than the live run: the statistics must not depend on it.
        ds.replay(replayed.sink(), 37);
        assertSame(live, replayed, 1e-12);
    }

    private static void assertSame(Set a, Set b, double tol) {
        assertEquals(a.cov.samples(), b.cov.samples());
        check("covariance", a.cov.moments().comoment(), b.cov.moments().comoment(), tol);
        check("covariance mean", a.cov.moments().mean(), b.cov.moments().mean(), tol);
        check("bins", a.bins.moments().comoment(), b.bins.moments().comoment(), tol);
        check("bins mean", a.bins.moments().mean(), b.bins.moments().mean(), tol);
        check("profile", a.profile.result(a.table, a.points).stream()
            .mapToDouble(r -> r.estimate()).toArray(), b.profile.result(b.table, b.points).stream()
            .mapToDouble(r -> r.estimate()).toArray(), tol);
        check("mode variances q", a.modes.sumSquares(Field.A), b.modes.sumSquares(Field.A), tol);
        check("mode variances e", a.modes.sumSquares(Field.E), b.modes.sumSquares(Field.E), tol);
        check("mode groups", a.modes.groupSumSquares(Field.E, 1), b.modes.groupSumSquares(Field.E, 1), tol);
        assertEquals(a.gauss.result(0.01).tests().size(), b.gauss.result(0.01).tests().size());
        check("gaussianity statistics", a.gauss.result(0.01).tests().stream().mapToDouble(t -> t.statistic()).toArray(),
            b.gauss.result(0.01).tests().stream().mapToDouble(t -> t.statistic()).toArray(), 1e-9);
    }

    private static void check(String what, double[] x, double[] y, double tol) {
        assertEquals(x.length, y.length, what);
        double d = EstimatorFixtures.relativeDifference(x, y);
        assertTrue(d <= tol, what + ": relative difference " + d + " > " + tol);
    }
}
