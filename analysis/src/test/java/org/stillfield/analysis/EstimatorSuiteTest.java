package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.spec.RunSpec;

/**
 * The suite a run's analysis uses, on the small run: which estimators it sets up from the spec, and
 * the tables it writes (headers, row counts, no NaN or infinity where a number is required).
 * Deterministic structure checks; the statistics are tested in the estimators' own tests.
 */
class EstimatorSuiteTest {
    @TempDir
    Path tmp;

    @Test
    void setsUpTheStandardEstimatorsAndWritesTheirTables() throws Exception {
        RunSpec spec = EstimatorFixtures.spec(tmp);
        ModeTable table = EstimatorFixtures.table(spec);
        EstimatorSuite suite = EstimatorSuite.forRun(spec, table);
        EstimatorFixtures.run(spec, table, spec.seed(), 0, spec.samples(), suite.sink());
        EstimatorSuite.Result r = suite.result(0.01);
        // Line 'across' (11 points, all inside): covariance, bins and profile for A, E, B; grid bins.
        assertEquals(3, r.covariances().size());
        assertEquals(6, r.binned().size());
        assertEquals(3, r.profiles().size());
        assertEquals(2, r.kernels().size());
        assertNotNull(r.gaussianity());
        assertNotNull(r.convergence());
        assertEquals(List.of(50L, 100L, 200L, 400L), r.convergence().points().stream().map(p -> p.samples()).toList());
        // The kernel runs from the line's middle (x = 0.5) outwards, short of the walls: 0.1 .. 0.4 m.
        assertEquals(4, r.kernels().get(0).points().size());

        List<Path> files = EstimatorTables.write(r, tmp.resolve("analysis"), spec.allPoints(),
            CorrelationTables.pointNames(spec.pointSets()));
        Path dir = tmp.resolve("analysis");
        for (String name : List.of("covariance-across-E.csv", "separation-cells-B.csv", "wall-profile-across-A.csv",
            "kernel-E.csv", "kernel-A.csv", "gaussianity.csv", "convergence.csv", EstimatorTables.SUMMARY)) {
            assertTrue(Files.isRegularFile(dir.resolve(name)), name);
        }
        assertEquals(3 + 6 + 3 + 2 + 1 + 1 + 1, files.size());
        List<String> cov = Files.readAllLines(dir.resolve("covariance-across-E.csv"));
        assertEquals(CorrelationTables.CSV_HEADER, cov.get(0));
        assertEquals(1 + 561, cov.size());
        List<String> prof = Files.readAllLines(dir.resolve("wall-profile-across-E.csv"));
        assertEquals(1 + 44, prof.size());
        assertTrue(prof.get(1).startsWith("E,across,1,across[0],0.0,"), prof.get(1));
        List<String> gauss = Files.readAllLines(dir.resolve("gaussianity.csv"));
        assertEquals(1 + r.gaussianity().tests().size(), gauss.size());
        for (Path f : files) {
            String text = Files.readString(f);
            assertFalse(text.contains("NaN") || text.contains("Infinity"), "no NaN or infinity in " + f.getFileName());
        }
        JsonNode root = new ObjectMapper().readTree(dir.resolve(EstimatorTables.SUMMARY).toFile());
        assertEquals(EstimatorTables.FORMAT, root.path("format").asText());
        assertEquals(2, root.path("kernels").size());
        assertTrue(root.path("gaussianity").path("verdict").has("passed"));
        assertTrue(root.path("convergence").path("slope").isNumber());
    }
}
