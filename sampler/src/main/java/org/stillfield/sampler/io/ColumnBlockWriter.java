package org.stillfield.sampler.io;

import java.io.Closeable;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.apache.parquet.bytes.BytesInput;
import org.apache.parquet.bytes.HeapByteBufferAllocator;
import org.apache.parquet.column.ColumnDescriptor;
import org.apache.parquet.column.Encoding;
import org.apache.parquet.column.statistics.Statistics;
import org.apache.parquet.column.values.delta.DeltaBinaryPackingValuesWriterForInteger;
import org.apache.parquet.column.values.delta.DeltaBinaryPackingValuesWriterForLong;
import org.apache.parquet.column.values.rle.RunLengthBitPackingHybridEncoder;
import org.apache.parquet.compression.CompressionCodecFactory.BytesInputCompressor;
import org.apache.parquet.hadoop.ParquetFileWriter;
import org.apache.parquet.hadoop.metadata.CompressionCodecName;
import org.apache.parquet.schema.MessageType;
import org.apache.parquet.schema.PrimitiveType;
import org.apache.parquet.schema.PrimitiveType.PrimitiveTypeName;
import org.apache.parquet.schema.Type;

/**
 * One Parquet file of a flat table written a page at a time from primitive arrays: the amplitude
 * and field tables, which grow with the sample count, and the mode and point tables.
 *
 * <p>Why not the record API: going through a record consumer costs several calls and checks per
 * value plus a growing byte buffer per column and page, which made writing the field table take ten
 * times longer than synthesising it. Here a caller fills plain arrays ({@link Page}); each full
 * page is encoded in one loop per column, compressed, and kept until its row group is complete
 * (a row group's column chunks must be contiguous in the file), then handed to
 * {@link ParquetFileWriter}, which writes page headers, column and offset indexes and the footer.
 *
 * <p>Encodings (Parquet format specification, Encodings.md): BOOLEAN and text columns PLAIN,
 * INT32/INT64 columns
 * DELTA_BINARY_PACKED (sample, point and mode numbers are runs and steps, which pack to almost
 * nothing), FLOAT/DOUBLE columns BYTE_STREAM_SPLIT (Gaussian noise does not repeat; splitting the
 * bytes lets the codec squeeze the exponent bytes). Every page carries min/max/null-count
 * statistics, so readers can skip pages by sample number. Optional columns share one presence
 * flag per row: a row's optional values are all present or all null (a point outside the cavity).
 *
 * <p>Memory: one page of arrays plus the compressed pages of one row group.
 */
final class ColumnBlockWriter implements Closeable {
    /** Most rows per page: a float page is then 512 KiB, a double page 1 MiB (Parquet's usual page size). */
    static final int MAX_PAGE_ROWS = 1 << 17;
    /** Fewest rows a fill task gets when a fill is split over threads. */
    private static final int FILL_CHUNK = 8192;
    /** Fewest rows per page, Parquet's own default row limit per page. */
    static final int MIN_PAGE_ROWS = 20_000;

    /**
     * Page length for a table that grows by {@code rowsPerSample} rows per sample: one sample per
     * page where that fits, so a reader fetching one sample decodes little else, but never pages
     * so short that per-page costs (headers, codec set-up) dominate.
     *
     * @param rowsPerSample rows one sample adds
     * @return rows per page
     */
    static int pageRows(long rowsPerSample) {
        return (int) Math.max(MIN_PAGE_ROWS, Math.min(MAX_PAGE_ROWS, rowsPerSample));
    }

    /**
     * Fills {@code count} rows of a page at array index {@code at}; {@code first} counts rows from
     * the start of the append. It may be called concurrently for disjoint row ranges, so it must
     * write only its own rows and read only shared, unchanging data.
     */
    @FunctionalInterface
    interface Filler {
        /**
         * @param first index of the first row to fill, counted from the start of this append
         * @param count rows to fill
         * @param page the arrays to fill
         * @param at array index of the first row
         */
        void fill(long first, int count, Page page, int at);
    }

    /** The arrays of the page being filled, one per column, indexed by schema position. */
    static final class Page {
        private final Object[] arrays;
        private final boolean[] present;

        Page(List<PrimitiveType> columns, boolean anyOptional, int rows) {
            arrays = new Object[columns.size()];
            for (int c = 0; c < arrays.length; c++) {
                switch (columns.get(c).getPrimitiveTypeName()) {
                    case INT64: arrays[c] = new long[rows]; break;
                    case INT32: arrays[c] = new int[rows]; break;
                    case FLOAT: arrays[c] = new float[rows]; break;
                    case DOUBLE: arrays[c] = new double[rows]; break;
                    case BOOLEAN: arrays[c] = new boolean[rows]; break;
                    case BINARY: arrays[c] = new String[rows]; break;
                    default: throw new IllegalArgumentException("column type not supported by the block writer: " + columns.get(c));
                }
            }
            present = anyOptional ? new boolean[rows] : null;
        }

        long[] int64(int column) {
            return (long[]) arrays[column];
        }

        int[] int32(int column) {
            return (int[]) arrays[column];
        }

        float[] float32(int column) {
            return (float[]) arrays[column];
        }

        double[] float64(int column) {
            return (double[]) arrays[column];
        }

        boolean[] bool(int column) {
            return (boolean[]) arrays[column];
        }

        /** @return a UTF-8 text column's values */
        String[] text(int column) {
            return (String[]) arrays[column];
        }

        /** @return per row: true if the optional columns hold values, false if they are null; null if no column is optional */
        boolean[] present() {
            return present;
        }
    }

    /** One column's encoding state: its own buffers and codec, so columns can be encoded concurrently. */
    private static final class ColumnEncoder {
        final byte[] scratch;
        final DeltaBinaryPackingValuesWriterForInteger ints;
        final DeltaBinaryPackingValuesWriterForLong longs;
        final BytesInputCompressor compressor;

        ColumnEncoder(PrimitiveTypeName type, int pageRows, CompressionCodecName codec) {
            HeapByteBufferAllocator heap = HeapByteBufferAllocator.getInstance();
            scratch = type == PrimitiveTypeName.DOUBLE ? new byte[8 * pageRows]
                : type == PrimitiveTypeName.FLOAT ? new byte[4 * pageRows] : null;
            ints = type == PrimitiveTypeName.INT32 ? new DeltaBinaryPackingValuesWriterForInteger(1 << 16, 4 * pageRows, heap) : null;
            longs = type == PrimitiveTypeName.INT64 ? new DeltaBinaryPackingValuesWriterForLong(1 << 16, 8 * pageRows, heap) : null;
            compressor = new PureJavaCodecs().getCompressor(codec);
        }
    }

    /** An encoded, compressed page waiting for its row group. */
    private record EncodedPage(byte[] bytes, int uncompressedSize, int values, int rows, Statistics<?> stats,
                               Encoding dlEncoding, Encoding valuesEncoding) {
    }

    private final HashingOutputFile file;
    private final List<PrimitiveType> columns = new ArrayList<>();
    private final List<ColumnDescriptor> descriptors;
    private final boolean[] optional;
    private final Map<String, String> metadata;
    private final long rowGroupBytes;
    private final CompressionCodecName codec;
    private final ColumnEncoder[] encoders;
    private final java.util.concurrent.ExecutorService pool;
    private final ParquetFileWriter writer;
    private final Page pageA;
    private final Page pageB;
    /** The page being filled by the caller. */
    private Page page;
    /** The page being encoded on the page thread, and its row count (page thread only). */
    private Page encPage;
    private int encRows;
    private final java.util.concurrent.ExecutorService sequencer;
    private java.util.concurrent.Future<Void> inflight;
    private final int pageRows;
    private final List<List<EncodedPage>> pending = new ArrayList<>();
    private final RunLengthBitPackingHybridEncoder levels;
    private final int fillThreads;
    private int fill;
    private long groupRows;
    private long groupBytes;
    private long rows;
    private boolean closed;

    /**
     * @param path file to create (must not exist)
     * @param schema flat schema of INT32, INT64, FLOAT, DOUBLE, BOOLEAN and BINARY (UTF-8 text) columns
     * @param metadata footer key-value metadata, written in this order
     * @param rowGroupBytes target compressed size of a row group
     * @param codec page compression
     * @param pageRows rows per page, see {@link #pageRows(long)}
     */
    ColumnBlockWriter(Path path, MessageType schema, Map<String, String> metadata, long rowGroupBytes,
                      CompressionCodecName codec, int pageRows) throws IOException {
        if (pageRows < 1 || pageRows > MAX_PAGE_ROWS) {
            throw new IllegalArgumentException("pageRows " + pageRows + " outside [1, " + MAX_PAGE_ROWS + "]");
        }
        this.pageRows = pageRows;
        this.descriptors = schema.getColumns();
        this.optional = new boolean[schema.getFieldCount()];
        boolean anyOptional = false;
        for (int c = 0; c < schema.getFieldCount(); c++) {
            Type t = schema.getType(c);
            columns.add(t.asPrimitiveType());
            optional[c] = t.getRepetition() == Type.Repetition.OPTIONAL;
            anyOptional |= optional[c];
            pending.add(new ArrayList<>());
        }
        this.metadata = new java.util.LinkedHashMap<>(metadata);
        this.rowGroupBytes = rowGroupBytes;
        this.codec = codec;
        this.pageA = new Page(columns, anyOptional, pageRows);
        this.pageB = new Page(columns, anyOptional, pageRows);
        this.page = pageA;
        HeapByteBufferAllocator heap = HeapByteBufferAllocator.getInstance();
        this.levels = new RunLengthBitPackingHybridEncoder(1, 256, Math.max(256, pageRows / 8 + 64), heap);
        this.encoders = new ColumnEncoder[columns.size()];
        for (int c = 0; c < encoders.length; c++) {
            encoders[c] = new ColumnEncoder(columns.get(c).getPrimitiveTypeName(), pageRows, codec);
        }
        // Columns are encoded and compressed concurrently: the page bytes do not depend on it, and
        // a single encoding thread would otherwise leave a core idle behind the synthesis.
        int threads = Math.min(encoders.length, Runtime.getRuntime().availableProcessors());
        this.fillThreads = Runtime.getRuntime().availableProcessors();
        this.sequencer = java.util.concurrent.Executors.newSingleThreadExecutor(r -> {
            Thread t = new Thread(r, "stillfield-pages");
            t.setDaemon(true);
            return t;
        });
        this.pool = threads <= 1 ? null : java.util.concurrent.Executors.newFixedThreadPool(threads, r -> {
            Thread t = new Thread(r, "stillfield-encode");
            t.setDaemon(true);
            return t;
        });
        this.file = new HashingOutputFile(path);
        this.writer = new ParquetFileWriter(file, schema, ParquetFileWriter.Mode.CREATE, rowGroupBytes, 0);
        writer.start();
    }

    /**
     * Appends rows; the filler is called once per page the rows touch, in row order.
     *
     * @param count rows to append
     * @param filler writes the rows' values into the page arrays
     */
    void append(long count, Filler filler) throws IOException {
        if (closed) {
            throw new IllegalStateException("block writer is closed");
        }
        long done = 0;
        while (done < count) {
            int take = (int) Math.min(count - done, pageRows - fill);
            fill(filler, done, take);
            fill += take;
            done += take;
            rows += take;
            if (fill == pageRows) {
                flushPage();
            }
        }
    }

    // Large fills are split over the encoding threads: copying and narrowing the values is a
    // serial cost comparable to encoding them.
    private void fill(Filler filler, long first, int take) throws IOException {
        int parts = pool == null || take < 2 * FILL_CHUNK ? 1 : Math.min(fillThreads, take / FILL_CHUNK);
        if (parts == 1) {
            filler.fill(first, take, page, fill);
            return;
        }
        List<java.util.concurrent.Future<EncodedPage>> jobs = new ArrayList<>();
        int at = fill;
        for (int k = 0; k < parts; k++) {
            int lo = (int) ((long) take * k / parts);
            int hi = (int) ((long) take * (k + 1) / parts);
            jobs.add(pool.submit(() -> {
                filler.fill(first + lo, hi - lo, page, at + lo);
                return null;
            }));
        }
        for (java.util.concurrent.Future<EncodedPage> j : jobs) {
            result(j);
        }
    }

    /** @return rows written so far */
    long rows() {
        return rows;
    }

    /** @return the file, for its length and hash after close */
    HashingOutputFile file() {
        return file;
    }

    // The full page goes to the page thread (encoding, then the row group's file writes) while the
    // caller fills the other page: filling and encoding overlap. One page job at a time keeps the
    // pages in order and bounds memory to two pages.
    private void flushPage() throws IOException {
        if (fill == 0) {
            return;
        }
        Page full = page;
        int rows = fill;
        awaitPageJob();
        inflight = sequencer.submit(() -> {
            encPage = full;
            encRows = rows;
            encodePage();
            return null;
        });
        page = full == pageA ? pageB : pageA;
        fill = 0;
    }

    private void awaitPageJob() throws IOException {
        java.util.concurrent.Future<Void> f = inflight;
        inflight = null;
        if (f != null) {
            result(f);
        }
    }

    private void encodePage() throws IOException {
        boolean[] present = encPage.present();
        BytesInput dl = null;
        int presentCount = encRows;
        if (present != null) {
            presentCount = 0;
            for (int r = 0; r < encRows; r++) {
                presentCount += present[r] ? 1 : 0;
            }
            dl = definitionLevels(present, presentCount);
        }
        EncodedPage[] pages = new EncodedPage[columns.size()];
        if (pool == null) {
            for (int c = 0; c < pages.length; c++) {
                pages[c] = encode(c, optional[c] ? present : null, optional[c] ? presentCount : encRows, optional[c] ? dl : null);
            }
        } else {
            List<java.util.concurrent.Future<EncodedPage>> jobs = new ArrayList<>();
            for (int c = 0; c < pages.length; c++) {
                int col = c;
                // A required column has a value in every row, whatever the optional ones hold.
                int valueCount = optional[c] ? presentCount : encRows;
                BytesInput levelsOfPage = dl;
                jobs.add(pool.submit(() -> encode(col, optional[col] ? present : null, valueCount,
                    optional[col] ? levelsOfPage : null)));
            }
            for (int c = 0; c < pages.length; c++) {
                pages[c] = result(jobs.get(c));
            }
        }
        for (int c = 0; c < pages.length; c++) {
            pending.get(c).add(pages[c]);
            groupBytes += pages[c].bytes.length;
        }
        groupRows += encRows;
        if (groupBytes >= rowGroupBytes) {
            flushRowGroup();
        }
    }

    private static <T> T result(java.util.concurrent.Future<T> job) throws IOException {
        try {
            return job.get();
        } catch (InterruptedException ex) {
            Thread.currentThread().interrupt();
            throw new java.io.InterruptedIOException("interrupted while encoding a page");
        } catch (java.util.concurrent.ExecutionException ex) {
            throw Tasks.failure(ex, "page encoding failed");
        }
    }

    // RLE/bit-packed hybrid with bit width 1, prefixed by its 4-byte length (data page v1). The
    // bytes are materialised, so column tasks may read them concurrently.
    private BytesInput definitionLevels(boolean[] present, int presentCount) throws IOException {
        byte[] body;
        if (presentCount == encRows) {
            // One RLE run of 1s: header varint (count << 1), then the value in one byte.
            BytesInput run = BytesInput.concat(BytesInput.fromUnsignedVarInt(encRows << 1), BytesInput.from(new byte[] {1}));
            body = run.toByteArray();
        } else {
            levels.reset();
            for (int r = 0; r < encRows; r++) {
                levels.writeInt(present[r] ? 1 : 0);
            }
            body = levels.toBytes().toByteArray();
        }
        return BytesInput.from(BytesInput.concat(BytesInput.fromInt(body.length), BytesInput.from(body)).toByteArray());
    }

    private EncodedPage encode(int c, boolean[] present, int valueCount, BytesInput dl) throws IOException {
        PrimitiveType type = columns.get(c);
        ColumnEncoder st = encoders[c];
        DeltaBinaryPackingValuesWriterForLong longs = st.longs;
        DeltaBinaryPackingValuesWriterForInteger ints = st.ints;
        Statistics<?> stats = Statistics.createStats(type);
        stats.incrementNumNulls(encRows - valueCount);
        BytesInput values;
        Encoding enc;
        switch (type.getPrimitiveTypeName()) {
            case INT64:
            case INT32: {
                // One loop for both widths: the page array decides which delta writer gets the value.
                long[] lv = type.getPrimitiveTypeName() == PrimitiveTypeName.INT64 ? encPage.int64(c) : null;
                int[] iv = lv == null ? encPage.int32(c) : null;
                if (lv != null) {
                    longs.reset();
                } else {
                    ints.reset();
                }
                long min = Long.MAX_VALUE;
                long max = Long.MIN_VALUE;
                for (int r = 0; r < encRows; r++) {
                    if (present == null || present[r]) {
                        long x = lv != null ? lv[r] : iv[r];
                        if (lv != null) {
                            longs.writeLong(x);
                        } else {
                            ints.writeInteger((int) x);
                        }
                        min = Math.min(min, x);
                        max = Math.max(max, x);
                    }
                }
                if (valueCount > 0 && lv != null) {
                    stats.updateStats(min);
                    stats.updateStats(max);
                } else if (valueCount > 0) {
                    stats.updateStats((int) min);
                    stats.updateStats((int) max);
                }
                values = BytesInput.copy(lv != null ? longs.getBytes() : ints.getBytes());
                enc = Encoding.DELTA_BINARY_PACKED;
                break;
            }
            case BOOLEAN: {
                values = plainBooleans(encPage.bool(c), present, valueCount, stats);
                enc = Encoding.PLAIN;
                break;
            }
            case BINARY: {
                values = plainText(encPage.text(c), present, stats);
                enc = Encoding.PLAIN;
                break;
            }
            case FLOAT: {
                values = splitFloats(st.scratch, encPage.float32(c), present, valueCount, stats);
                enc = Encoding.BYTE_STREAM_SPLIT;
                break;
            }
            case DOUBLE: {
                values = splitDoubles(st.scratch, encPage.float64(c), present, valueCount, stats);
                enc = Encoding.BYTE_STREAM_SPLIT;
                break;
            }
            default:
                throw new IllegalStateException("unsupported column " + type);
        }
        BytesInput body = dl == null ? values : BytesInput.concat(dl, values);
        long raw = body.size();
        byte[] compressed = st.compressor.compress(body).toByteArray();
        boolean hasLevels = optional[c];
        return new EncodedPage(compressed, Math.toIntExact(raw), encRows, encRows, stats,
            hasLevels ? Encoding.RLE : Encoding.BIT_PACKED, enc);
    }

    // BYTE_STREAM_SPLIT: byte k of the i-th present value goes to scratch[k * n + i]. Present
    // values are finite (the synthesiser checks), so plain comparisons give min and max.
    private BytesInput splitFloats(byte[] out, float[] v, boolean[] present, int n, Statistics<?> stats) {
        float min = Float.POSITIVE_INFINITY;
        float max = Float.NEGATIVE_INFINITY;
        boolean all = n == encRows;
        int i = 0;
        for (int r = 0; r < encRows; r++) {
            if (all || present[r]) {
                float x = v[r];
                int bits = Float.floatToRawIntBits(x);
                out[i] = (byte) bits;
                out[n + i] = (byte) (bits >>> 8);
                out[2 * n + i] = (byte) (bits >>> 16);
                out[3 * n + i] = (byte) (bits >>> 24);
                min = x < min ? x : min;
                max = x > max ? x : max;
                i++;
            }
        }
        return finish(stats, n > 0, min, max, out, 4 * n);
    }

    // PLAIN booleans: one bit per present value, least significant bit first.
    private BytesInput plainBooleans(boolean[] v, boolean[] present, int n, Statistics<?> stats) {
        byte[] out = new byte[(n + 7) / 8];
        int i = 0;
        for (int r = 0; r < encRows; r++) {
            if (present == null || present[r]) {
                if (v[r]) {
                    out[i >>> 3] |= (byte) (1 << (i & 7));
                }
                stats.updateStats(v[r]);
                i++;
            }
        }
        return BytesInput.from(out);
    }

    // PLAIN byte arrays: each value as a 4-byte little-endian length and its UTF-8 bytes. Text
    // columns repeat (set names, kinds), so a value equal to the one before reuses its bytes.
    private BytesInput plainText(String[] v, boolean[] present, Statistics<?> stats) {
        java.io.ByteArrayOutputStream out = new java.io.ByteArrayOutputStream();
        String last = null;
        byte[] bytes = null;
        for (int r = 0; r < encRows; r++) {
            if (present == null || present[r]) {
                if (!v[r].equals(last)) {
                    last = v[r];
                    bytes = last.getBytes(java.nio.charset.StandardCharsets.UTF_8);
                    stats.updateStats(org.apache.parquet.io.api.Binary.fromConstantByteArray(bytes));
                }
                int len = bytes.length;
                out.write(len);
                out.write(len >>> 8);
                out.write(len >>> 16);
                out.write(len >>> 24);
                out.write(bytes, 0, len);
            }
        }
        return BytesInput.from(out.toByteArray());
    }

    private static BytesInput finish(Statistics<?> stats, boolean any, double min, double max, byte[] out, int length) {
        if (any && stats.type().getPrimitiveTypeName() == PrimitiveTypeName.FLOAT) {
            stats.updateStats((float) min);
            stats.updateStats((float) max);
        } else if (any) {
            stats.updateStats(min);
            stats.updateStats(max);
        }
        return BytesInput.from(out, 0, length);
    }

    private BytesInput splitDoubles(byte[] scratch, double[] v, boolean[] present, int n, Statistics<?> stats) {
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        int i = 0;
        for (int r = 0; r < encRows; r++) {
            if (present == null || present[r]) {
                double x = v[r];
                long bits = Double.doubleToRawLongBits(x);
                for (int k = 0; k < 8; k++) {
                    scratch[k * n + i] = (byte) (bits >>> (8 * k));
                }
                min = x < min ? x : min;
                max = x > max ? x : max;
                i++;
            }
        }
        return finish(stats, n > 0, min, max, scratch, 8 * n);
    }

    private void flushRowGroup() throws IOException {
        if (groupRows == 0) {
            return;
        }
        writer.startBlock(groupRows);
        for (int c = 0; c < columns.size(); c++) {
            List<EncodedPage> pages = pending.get(c);
            long values = 0;
            for (EncodedPage p : pages) {
                values += p.values;
            }
            writer.startColumn(descriptors.get(c), values, codec);
            for (EncodedPage p : pages) {
                writer.writeDataPage(p.values, p.uncompressedSize, BytesInput.from(p.bytes), p.stats, p.rows,
                    Encoding.BIT_PACKED, p.dlEncoding, p.valuesEncoding);
            }
            writer.endColumn();
            pages.clear();
        }
        writer.endBlock();
        groupRows = 0;
        groupBytes = 0;
    }

    @Override
    public void close() throws IOException {
        if (closed) {
            return;
        }
        closed = true;
        try {
            flushPage();
            awaitPageJob();
            flushRowGroup();
            writer.end(metadata);
        } catch (IOException | RuntimeException ex) {
            try {
                awaitPageJob();
            } catch (IOException | RuntimeException suppressed) {
                ex.addSuppressed(suppressed);
            }
            try {
                writer.close();
            } catch (IOException | RuntimeException suppressed) {
                ex.addSuppressed(suppressed);
            }
            throw ex;
        } finally {
            sequencer.shutdownNow();
            if (pool != null) {
                pool.shutdownNow();
            }
        }
    }

}
