package org.stillfield.sampler.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import org.apache.parquet.ParquetReadOptions;
import org.apache.parquet.column.Encoding;
import org.apache.parquet.conf.PlainParquetConfiguration;
import org.apache.parquet.example.data.Group;
import org.apache.parquet.hadoop.ParquetFileReader;
import org.apache.parquet.hadoop.metadata.ColumnChunkMetaData;
import org.apache.parquet.hadoop.metadata.CompressionCodecName;
import org.apache.parquet.io.LocalInputFile;
import org.apache.parquet.schema.Type;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.stillfield.sampler.api.Field;
import org.stillfield.sampler.api.Mode;
import org.stillfield.sampler.api.ModeTable;
import org.stillfield.sampler.api.Vec3;
import org.stillfield.sampler.engine.SampleStreams;
import org.stillfield.sampler.spec.RunSpec;

/** Footers, manifest and the small tables describe the run they came from. */
class DatasetMetadataTest {
    @TempDir
    Path dir;

    private static final ObjectMapper JSON = new ObjectMapper();

    @Test
    void everyFooterCarriesSpecConstantsSeedAndUnits() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        TestRuns.write(spec);
        Dataset d = Dataset.open(spec.outputFolder());
        for (String file : Dataset.requiredFiles(d.partCount())) {
            Map<String, String> f = d.footer(file);
            assertEquals(spec.sourceText(), f.get("stillfield.spec"), file);
            assertEquals("0.1.0", f.get("stillfield.version"), file);
            assertEquals("stillfield-dataset/2", f.get("stillfield.format"), file);
            assertEquals("12345", f.get("stillfield.seed"), file);
            assertEquals("50", f.get("stillfield.samples"), file);
            assertEquals(SampleStreams.GENERATOR, f.get("stillfield.generator"), file);
            assertEquals(file.replaceFirst("/.*", "").replace(".parquet", ""), f.get("stillfield.table"), file);

            JsonNode c = JSON.readTree(f.get("stillfield.constants"));
            // Exact by the 2019 SI definition (BIPM, SI Brochure, 9th edition, Table 1).
            assertEquals(299_792_458.0, c.get("c").asDouble(), 0.0);
            assertEquals(6.62607015e-34, c.get("h").asDouble(), 0.0);
            assertEquals(1.380649e-23, c.get("k_B").asDouble(), 0.0);
            assertEquals("CODATA 2018", c.get("set").asText());
            // CODATA 2018 measured values (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021).
            assertEquals(8.8541878128e-12, c.get("epsilon_0").asDouble(), 0.0);
            assertEquals(1.25663706212e-6, c.get("mu_0").asDouble(), 0.0);

            JsonNode cav = JSON.readTree(f.get("stillfield.cavity"));
            assertEquals("box", cav.get("shape").asText());
            assertEquals(1.3, cav.get("parameters").get("b_m").asDouble(), 0.0);
            assertEquals(1.0 * 1.3 * 1.7, cav.get("volume_m3").asDouble(), 1e-15);
            assertEquals(1.0, cav.get("eps_r").asDouble(), 0.0);
            JsonNode w = JSON.readTree(f.get("stillfield.window"));
            assertEquals("hard", w.get("kind").asText());
            assertEquals(0.38e9, w.get("cutoff_Hz").asDouble(), 1e-6);
            assertEquals("vacuum", JSON.readTree(f.get("stillfield.state")).get("kind").asText());

            // Every column has a unit entry, and nothing else does.
            JsonNode units = JSON.readTree(f.get("stillfield.units"));
            try (ParquetFileReader r = open(spec.outputFolder().resolve(file))) {
                List<Type> columns = r.getFileMetaData().getSchema().getFields();
                assertEquals(columns.size(), units.size(), file + " units");
                for (Type t : columns) {
                    assertTrue(units.has(t.getName()), file + " has no unit for " + t.getName());
                }
            }
        }
        JsonNode fieldUnits = JSON.readTree(d.footer(TestRuns.FIELDS0).get("stillfield.units"));
        assertEquals("V*s/m", fieldUnits.get("A_x").asText());
        assertEquals("V/m", fieldUnits.get("E_y").asText());
        assertEquals("T", fieldUnits.get("B_z").asText());
        JsonNode ampUnits = JSON.readTree(d.footer(TestRuns.AMPLITUDES0).get("stillfield.units"));
        assertEquals("V*s/m", ampUnits.get("q").asText());
        assertEquals("V/m", ampUnits.get("e").asText());
        JsonNode modeUnits = JSON.readTree(d.footer(Layout.MODES).get("stillfield.units"));
        assertEquals("(V/m)^2", modeUnits.get("var_E").asText());
        assertEquals("Hz", modeUnits.get("f_Hz").asText());

        RunSpec back = d.spec();
        assertEquals(spec.seed(), back.seed());
        assertEquals(spec.allPoints(), back.allPoints());
        assertEquals(d.folder(), back.outputFolder());
    }

    private static ParquetFileReader open(Path file) throws java.io.IOException {
        return ParquetFileReader.open(new LocalInputFile(file),
            ParquetReadOptions.builder(new PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build());
    }

    private static String sha256(Path p) throws Exception {
        MessageDigest md = MessageDigest.getInstance("SHA-256");
        try (InputStream in = Files.newInputStream(p)) {
            md.update(in.readAllBytes());
        }
        return HexFormat.of().formatHex(md.digest());
    }

    @Test
    void manifestListsRowsSizesAndHashesOfEveryFile() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        ModeTable table = TestRuns.table(spec);
        TestRuns.write(spec, table, false);
        Path folder = spec.outputFolder();
        JsonNode m = JSON.readTree(folder.resolve("manifest.json").toFile());
        assertEquals("stillfield-dataset/2", m.get("format").asText());
        assertEquals("t", m.get("name").asText());
        assertEquals(12345, m.get("seed").asLong());
        assertEquals(50, m.get("samples").asLong());
        assertEquals(table.size(), m.get("modes").asInt());
        assertEquals(18, m.get("points").asInt());
        assertEquals("[\"A\",\"E\",\"B\"]", m.get("fields").toString());
        assertEquals("float64", m.get("precision").asText());
        Map<String, Long> rows = Map.of("modes.parquet", (long) table.size(), "points.parquet", 18L,
            "amplitudes/part-00000.parquet", 50L * table.size(), "fields/part-00000.parquet", 50L * 18);
        assertEquals(4, m.get("files").size());
        for (JsonNode f : m.get("files")) {
            Path p = folder.resolve(f.get("name").asText());
            assertEquals(rows.get(f.get("name").asText()), f.get("rows").asLong(), p + " rows");
            assertEquals(Files.size(p), f.get("bytes").asLong(), p + " bytes");
            // Digest of the bytes on disk, computed here in one piece (FIPS 180-4 SHA-256).
            assertEquals(sha256(p), f.get("sha256").asText(), p + " sha256");
            try (ParquetFileReader r = open(p)) {
                assertEquals(f.get("rows").asLong(), r.getRecordCount(), p + " Parquet row count");
            }
        }
        assertEquals(List.of(), Dataset.problems(folder));
    }

    @Test
    void modeAndPointTablesMatchTheRun() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        ModeTable table = TestRuns.table(spec);
        TestRuns.write(spec, table, false);
        List<Group> modes = TestRuns.groups(spec.outputFolder().resolve(Layout.MODES));
        assertEquals(table.size(), modes.size());
        for (int l = 0; l < table.size(); l++) {
            Group g = modes.get(l);
            Mode mode = table.modes().get(l);
            assertEquals(l, g.getInteger("mode", 0));
            assertEquals(mode.label(), g.getString("label", 0));
            assertEquals(mode.i3(), g.getInteger("i3", 0));
            assertEquals(mode.k(), g.getDouble("k_rad_per_m", 0), 0.0);
            // f = ω/2π by definition; ω = c k in an empty cavity (PHYSICS.md §1).
            assertEquals(g.getDouble("omega_rad_per_s", 0) / (2 * Math.PI), g.getDouble("f_Hz", 0),
                1e-15 * g.getDouble("f_Hz", 0));
            assertEquals(299_792_458.0 * mode.k(), g.getDouble("omega_rad_per_s", 0), 1e-15 * 299_792_458.0 * mode.k());
            assertEquals(table.variance(Field.E, l), g.getDouble("var_E", 0), 0.0);
            assertEquals(table.vacuumVariance(Field.B, l), g.getDouble("var_B_vacuum", 0), 0.0);
        }
        List<Group> points = TestRuns.groups(spec.outputFolder().resolve(Layout.POINTS));
        List<Vec3> all = spec.allPoints();
        assertEquals(18, points.size());
        for (int p = 0; p < 18; p++) {
            Group g = points.get(p);
            assertEquals(p, g.getInteger("point", 0));
            assertEquals(all.get(p).x(), g.getDouble("x_m", 0), 0.0);
            assertEquals(all.get(p).z(), g.getDouble("z_m", 0), 0.0);
            assertTrue(g.getBoolean("inside", 0));
        }
        assertEquals("p", points.get(0).getString("set", 0));
        assertEquals("point", points.get(0).getString("kind", 0));
        assertEquals("line", points.get(3).getString("kind", 0));
        assertEquals(2, points.get(3).getInteger("i", 0));
        assertEquals(2, points.get(3).getInteger("index_in_set", 0));
        // Grid 3 x 2 x 2, x fastest: set index 7 is (i, j, k) = (1, 0, 1).
        Group g7 = points.get(6 + 7);
        assertEquals("grid", g7.getString("kind", 0));
        assertEquals(List.of(1, 0, 1), List.of(g7.getInteger("i", 0), g7.getInteger("j", 0), g7.getInteger("k", 0)));
    }

    @Test
    void largeTablesUseZstdAndByteStreamSplitForFloatingPoint() throws Exception {
        RunSpec spec = TestRuns.spec(dir);
        TestRuns.write(spec);
        for (String file : List.of(TestRuns.AMPLITUDES0, TestRuns.FIELDS0)) {
            try (ParquetFileReader r = open(spec.outputFolder().resolve(file))) {
                for (ColumnChunkMetaData c : r.getRowGroups().get(0).getColumns()) {
                    assertEquals(CompressionCodecName.ZSTD, c.getCodec(), file + " " + c.getPath());
                    boolean floating = c.getPrimitiveType().getPrimitiveTypeName().javaType == double.class
                        || c.getPrimitiveType().getPrimitiveTypeName().javaType == float.class;
                    assertEquals(floating, c.getEncodings().contains(Encoding.BYTE_STREAM_SPLIT),
                        file + " " + c.getPath() + " " + c.getEncodings());
                }
            }
        }
    }

    @Test
    void theSpecsCompressionIsUsedForEveryFileAndTheDataAreTheSame() throws Exception {
        RunSpec zstd = TestRuns.spec(dir.resolve("z"));
        TestRuns.Recorder reference = TestRuns.write(zstd);
        for (String name : List.of("snappy", "none")) {
            RunSpec spec = TestRuns.spec(dir.resolve(name), TestRuns.yaml("float64", 12345, 50)
                .replace("precision: float64}", "precision: float64, compression: " + name + "}"));
            assertEquals(name, spec.storage().compression().name().toLowerCase(java.util.Locale.ROOT));
            TestRuns.write(spec);
            CompressionCodecName want = name.equals("none") ? CompressionCodecName.UNCOMPRESSED : CompressionCodecName.SNAPPY;
            for (String file : List.of(TestRuns.AMPLITUDES0, TestRuns.FIELDS0, Layout.MODES, Layout.POINTS)) {
                try (ParquetFileReader r = open(spec.outputFolder().resolve(file))) {
                    for (ColumnChunkMetaData c : r.getRowGroups().get(0).getColumns()) {
                        assertEquals(want, c.getCodec(), name + ": " + file + " " + c.getPath());
                    }
                }
            }
            TestRuns.Recorder read = TestRuns.replay(Dataset.open(spec.outputFolder()), 9);
            for (int s = 0; s < 50; s++) {
                org.junit.jupiter.api.Assertions.assertArrayEquals(reference.q.get(s), read.q.get(s), 0.0, name + " q " + s);
                org.junit.jupiter.api.Assertions.assertArrayEquals(reference.values.get(org.stillfield.sampler.api.Field.B).get(s),
                    read.values.get(org.stillfield.sampler.api.Field.B).get(s), 0.0, name + " B " + s);
            }
        }
    }
}
