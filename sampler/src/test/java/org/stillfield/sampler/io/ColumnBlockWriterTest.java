package org.stillfield.sampler.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.apache.parquet.ParquetReadOptions;
import org.apache.parquet.column.Encoding;
import org.apache.parquet.conf.PlainParquetConfiguration;
import org.apache.parquet.example.data.Group;
import org.apache.parquet.hadoop.ParquetFileReader;
import org.apache.parquet.hadoop.metadata.BlockMetaData;
import org.apache.parquet.hadoop.metadata.ColumnChunkMetaData;
import org.apache.parquet.hadoop.metadata.CompressionCodecName;
import org.apache.parquet.io.LocalInputFile;
import org.apache.parquet.schema.MessageType;
import org.apache.parquet.schema.MessageTypeParser;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The page writer's files read back through Parquet's own record reader (an implementation
 * independent of ours): every value, every null, the footer and the per-chunk statistics, across
 * page and row-group boundaries and with every codec we offer.
 */
class ColumnBlockWriterTest {
    @TempDir
    Path dir;

    private static final MessageType SCHEMA = MessageTypeParser.parseMessageType(
        "message t { required int64 sample; required int32 point; optional float fx; optional double dx; }");

    // Rows: sample = r / 7, point = r % 7; values null where point == 3 (as for a point outside the cavity).
    private static long sample(long r) {
        return r / 7;
    }

    private static int point(long r) {
        return (int) (r % 7);
    }

    private static boolean present(long r) {
        return point(r) != 3;
    }

    private static double value(long r) {
        return Math.sin(0.37 * r) * 1e-3 - 2.5e-4;
    }

    private Path write(CompressionCodecName codec, long rows, int pageRows, long rowGroupBytes, int chunk) throws Exception {
        Path file = dir.resolve("t-" + codec + "-" + rows + ".parquet");
        try (ColumnBlockWriter w = new ColumnBlockWriter(file, SCHEMA, Map.of("k", "v"), rowGroupBytes, codec, pageRows)) {
            for (long start = 0; start < rows; start += chunk) {
                long base = start;
                w.append(Math.min(chunk, rows - start), (first, n, page, at) -> {
                    for (int i = 0; i < n; i++) {
                        long r = base + first + i;
                        page.int64(0)[at + i] = sample(r);
                        page.int32(1)[at + i] = point(r);
                        page.present()[at + i] = present(r);
                        page.float32(2)[at + i] = (float) value(r);
                        page.float64(3)[at + i] = present(r) ? value(r) : Double.NaN;
                    }
                });
            }
            assertEquals(rows, w.rows());
        }
        return file;
    }

    private static void assertReadsBack(Path file, long rows) throws Exception {
        List<Group> groups = TestRuns.groups(file);
        assertEquals(rows, groups.size(), "row count");
        for (int r = 0; r < rows; r++) {
            Group g = groups.get(r);
            assertEquals(sample(r), g.getLong("sample", 0), "sample of row " + r);
            assertEquals(point(r), g.getInteger("point", 0), "point of row " + r);
            if (present(r)) {
                assertEquals((float) value(r), g.getFloat("fx", 0), 0f, "fx of row " + r);
                assertEquals(value(r), g.getDouble("dx", 0), 0.0, "dx of row " + r);
            } else {
                assertEquals(0, g.getFieldRepetitionCount("fx"), "fx null in row " + r);
                assertEquals(0, g.getFieldRepetitionCount("dx"), "dx null in row " + r);
            }
        }
    }

    @Test
    void everyValueAndNullReadsBackAcrossPagesAndRowGroups() throws Exception {
        // 50 003 rows with 20 000-row pages and tiny row groups: three pages, several row groups,
        // appends of 997 rows straddling page ends.
        long rows = 50_003;
        Path file = write(CompressionCodecName.ZSTD, rows, 20_000, 1, 997);
        assertReadsBack(file, rows);
        try (ParquetFileReader r = ParquetFileReader.open(new LocalInputFile(file),
            ParquetReadOptions.builder(new PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build())) {
            assertEquals("v", r.getFileMetaData().getKeyValueMetaData().get("k"));
            List<BlockMetaData> blocks = r.getRowGroups();
            assertTrue(blocks.size() >= 3, "one row group per page with a 1-byte row-group target, got " + blocks.size());
            long nulls = 0;
            long minSample = Long.MAX_VALUE;
            long maxSample = Long.MIN_VALUE;
            for (BlockMetaData b : blocks) {
                for (ColumnChunkMetaData c : b.getColumns()) {
                    String name = c.getPath().toDotString();
                    boolean floating = name.equals("fx") || name.equals("dx");
                    assertEquals(floating, c.getEncodings().contains(Encoding.BYTE_STREAM_SPLIT), name);
                    assertEquals(!floating, c.getEncodings().contains(Encoding.DELTA_BINARY_PACKED), name);
                    if (name.equals("fx")) {
                        nulls += c.getStatistics().getNumNulls();
                    }
                    if (name.equals("sample") || name.equals("point")) {
                        assertEquals(0, c.getStatistics().getNumNulls(), "a required column has no nulls: " + name);
                    }
                    if (name.equals("sample")) {
                        minSample = Math.min(minSample, (Long) c.getStatistics().genericGetMin());
                        maxSample = Math.max(maxSample, (Long) c.getStatistics().genericGetMax());
                    }
                }
            }
            long expectedNulls = 0;
            for (long q = 0; q < rows; q++) {
                expectedNulls += present(q) ? 0 : 1;
            }
            assertEquals(expectedNulls, nulls, "null count of fx over all chunks");
            assertEquals(0, minSample);
            assertEquals(sample(rows - 1), maxSample);
            // The sample column's page index lets a reader skip to one sample's pages.
            assertEquals(3, r.readOffsetIndex(blocks.get(0).getColumns().get(0)).getPageCount()
                + r.readOffsetIndex(blocks.get(1).getColumns().get(0)).getPageCount()
                + r.readOffsetIndex(blocks.get(2).getColumns().get(0)).getPageCount());
        }
    }

    @Test
    void everyCodecReadsBack() throws Exception {
        for (CompressionCodecName codec : new CompressionCodecName[] {
            CompressionCodecName.UNCOMPRESSED, CompressionCodecName.SNAPPY, CompressionCodecName.ZSTD}) {
            Path file = write(codec, 4_321, 20_000, 64L << 20, 4_321);
            assertReadsBack(file, 4_321);
        }
    }

    @Test
    void oneLargeAppendFilledByConcurrentTasksReadsBack() throws Exception {
        // Whole-page fills of 131 072 rows are split over the encoding threads (on a machine with
        // more than one core); each row must still land in its own place.
        long rows = 3L * ColumnBlockWriter.MAX_PAGE_ROWS + 11;
        Path file = write(CompressionCodecName.SNAPPY, rows, ColumnBlockWriter.MAX_PAGE_ROWS, 64L << 20, (int) rows);
        assertReadsBack(file, rows);
    }

    @Test
    void textAndBooleanColumnsReadBack() throws Exception {
        // Text repeats in runs (as set names do) and changes; booleans cross byte boundaries; the
        // optional boolean is null where the row's optional values are.
        MessageType schema = MessageTypeParser.parseMessageType(
            "message t { required binary name (STRING); required boolean flag; optional boolean maybe; }");
        Path file = dir.resolve("text.parquet");
        String[] names = {"grid", "grid", "line \u00e9", "", "p"};
        long rows = 25_013;
        try (ColumnBlockWriter w = new ColumnBlockWriter(file, schema, Map.of(), 64L << 20, CompressionCodecName.ZSTD, 20_000)) {
            w.append(rows, (first, n, page, at) -> {
                for (int i = 0; i < n; i++) {
                    long r = first + i;
                    page.text(0)[at + i] = names[(int) (r / 1000 % names.length)];
                    page.bool(1)[at + i] = r % 3 == 0;
                    page.present()[at + i] = r % 5 != 0;
                    page.bool(2)[at + i] = r % 2 == 0;
                }
            });
        }
        List<Group> groups = TestRuns.groups(file);
        assertEquals(rows, groups.size());
        for (int r = 0; r < rows; r++) {
            Group g = groups.get(r);
            assertEquals(names[r / 1000 % names.length], g.getString("name", 0), "name of row " + r);
            assertEquals(r % 3 == 0, g.getBoolean("flag", 0), "flag of row " + r);
            if (r % 5 != 0) {
                assertEquals(r % 2 == 0, g.getBoolean("maybe", 0), "maybe of row " + r);
            } else {
                assertEquals(0, g.getFieldRepetitionCount("maybe"), "maybe null in row " + r);
            }
        }
    }

    @Test
    void anEmptyTableIsAValidFile() throws Exception {
        Path file = write(CompressionCodecName.ZSTD, 0, 20_000, 64L << 20, 1);
        assertReadsBack(file, 0);
    }

    @Test
    void pageLengthFollowsTheSampleSizeWithinBounds() {
        assertEquals(ColumnBlockWriter.MIN_PAGE_ROWS, ColumnBlockWriter.pageRows(18));
        assertEquals(100_000, ColumnBlockWriter.pageRows(100_000));
        assertEquals(ColumnBlockWriter.MAX_PAGE_ROWS, ColumnBlockWriter.pageRows(64L * 64 * 64));
        assertFalse(ColumnBlockWriter.pageRows(Long.MAX_VALUE) > ColumnBlockWriter.MAX_PAGE_ROWS);
    }
}
