package org.stillfield.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.analysis.api.CorrelationResult;
import org.stillfield.analysis.api.CorrelationRow;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.PointSet;
import org.stillfield.sampler.api.Vec3;

/** CSV (RFC 4180) and JSON output read back by an independent parser (Jackson's tree model). */
class CorrelationTablesTest {
    @TempDir
    Path dir;

    private static CorrelationResult result() throws IOException {
        ModeTable table = EnsembleFixtures.tinyTable();
        CorrelationEstimator est = new CorrelationEstimator(EnsembleFixtures.PAIRS, EnsembleFixtures.FIELDS, 4);
        EnsembleFixtures.run(table, 11L, 0, 300, est);
        return est.result(table, EnsembleFixtures.POINTS, 0.01);
    }

    private static final List<String> NAMES = List.of("probe", "line[0]", "line[1]", "corner");

    @Test
    void csvHasOneLinePerRowWithFiniteNumbers() throws IOException {
        CorrelationResult r = result();
        Path csv = dir.resolve("correlations.csv");
        CorrelationTables.writeCsv(r, EnsembleFixtures.POINTS, NAMES, csv);
        List<String> lines = Files.readAllLines(csv, StandardCharsets.UTF_8);
        assertEquals(CorrelationTables.CSV_HEADER, lines.get(0));
        assertEquals(r.rows().size() + 1, lines.size());
        int columns = lines.get(0).split(",", -1).length;
        for (int k = 1; k < lines.size(); k++) {
            String[] cells = lines.get(k).split(",", -1);
            assertEquals(columns, cells.length, "line " + k);
            CorrelationRow row = r.rows().get(k - 1);
            assertEquals(row.field().name(), cells[0]);
            assertEquals(NAMES.get(row.first()), cells[3]);
            assertEquals(row.estimate(), Double.parseDouble(cells[13]), 0.0, "estimate round-trips");
            assertEquals(row.z(), Double.parseDouble(cells[16]), 0.0, "z round-trips");
            assertEquals(row.tested() ? "tested" : "zero_variance", cells[17]);
            assertEquals(row.field().correlationUnit(), cells[18]);
            assertFalse(lines.get(k).contains("NaN") || lines.get(k).contains("Infinity"), lines.get(k));
        }
        assertFalse(Files.exists(dir.resolve("correlations.csv.tmp")));
    }

    @Test
    void jsonCarriesVerdictSamplesUnitsAndRows() throws IOException {
        CorrelationResult r = result();
        Path json = dir.resolve("correlations.json");
        CorrelationTables.writeJson(r, EnsembleFixtures.POINTS, NAMES, json);
        JsonNode root = new ObjectMapper().readTree(json.toFile());
        assertEquals(CorrelationTables.FORMAT, root.get("format").asText());
        assertEquals(300, root.get("samples").asLong());
        assertEquals("(V/m)^2", root.get("units").get("E").asText());
        assertEquals(r.verdict().passed(), root.get("verdict").get("passed").asBoolean());
        assertEquals(r.verdict().threshold(), root.get("verdict").get("threshold").asDouble(), 0.0);
        assertEquals(r.rows().size(), root.get("rows").size());
        JsonNode first = root.get("rows").get(0);
        assertEquals(r.rows().get(0).analytic(), first.get("analytic").asDouble(), 0.0);
        assertEquals(EnsembleFixtures.POINTS.get(r.rows().get(0).first()).y(), first.get("r1_m").get(1).asDouble(), 0.0);
        assertEquals(r.zeroVarianceRows(), root.get("zero_variance_rows").asInt());
    }

    @Test
    void verdictFileListsTheParts() throws IOException {
        Verdict a = new Verdict(true, 0.005, 10, 3.9, 2.0, "correlations");
        Verdict b = new Verdict(false, 0.005, 1, 0.02, 0.03, "amplitudes");
        Verdict all = Verdicts.combine(0.01, a, b);
        Path file = dir.resolve("verdict.json");
        CorrelationTables.writeVerdict(all, List.of(a, b), file);
        JsonNode root = new ObjectMapper().readTree(file.toFile());
        assertFalse(root.get("passed").asBoolean());
        assertEquals(2, root.get("parts").size());
        assertEquals("amplitudes", root.get("parts").get(1).get("method").asText());
    }

    @Test
    void pointNamesFollowTheSpecReferences() {
        List<PointSet> sets = List.of(PointSet.point("antenna", new Vec3(0.1, 0.1, 0.1)),
            PointSet.line("axis", new Vec3(0, 0, 0), new Vec3(0, 0, 1), 3));
        assertEquals(List.of("antenna", "axis[0]", "axis[1]", "axis[2]"), CorrelationTables.pointNames(sets));
    }

    @Test
    void rejectsMismatchedNames() throws IOException {
        CorrelationResult r = result();
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
            () -> CorrelationTables.writeCsv(r, EnsembleFixtures.POINTS, List.of("a"), dir.resolve("x.csv")));
        assertTrue(ex.getMessage().contains("pointNames"), ex.getMessage());
    }
}
