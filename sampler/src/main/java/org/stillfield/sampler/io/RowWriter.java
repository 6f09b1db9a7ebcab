package org.stillfield.sampler.io;

import java.io.Closeable;
import java.io.IOException;
import java.nio.file.Path;
import java.util.Map;
import org.apache.parquet.column.ParquetProperties;
import org.apache.parquet.conf.ParquetConfiguration;
import org.apache.parquet.conf.PlainParquetConfiguration;
import org.apache.parquet.hadoop.ParquetFileWriter;
import org.apache.parquet.hadoop.ParquetWriter;
import org.apache.parquet.hadoop.api.WriteSupport;
import org.apache.parquet.hadoop.metadata.CompressionCodecName;
import org.apache.parquet.io.api.RecordConsumer;
import org.apache.parquet.schema.MessageType;
import org.apache.parquet.schema.PrimitiveType;
import org.apache.parquet.schema.PrimitiveType.PrimitiveTypeName;
import org.apache.parquet.schema.Type;

/**
 * One Parquet file written row by row straight into a {@link RecordConsumer}: no record objects,
 * no boxing. Used for the time-series tables; the dataset's tables go through the faster
 * {@link ColumnBlockWriter}. A {@link Row} (typically one mutable instance reused for every row) calls the typed
 * {@code add} methods in schema order.
 *
 * <p>Encodings: floating-point columns use BYTE_STREAM_SPLIT without dictionary and without
 * statistics (noise does not repeat and has no useful min/max); integer and text columns keep
 * dictionary/RLE encoding and statistics, so the column index on {@code sample} lets a reader jump
 * to one sample's pages.
 */
final class RowWriter implements Closeable {
    private final HashingOutputFile file;
    private final MessageType schema;
    private final ParquetWriter<Row> writer;
    private RecordConsumer rc;
    private int field;
    private long rows;
    private boolean closed;

    /**
     * @param path file to create (must not exist)
     * @param schema flat schema
     * @param metadata footer key-value metadata
     * @param rowGroupBytes target row-group size, bytes
     * @param codec page compression
     */
    RowWriter(Path path, MessageType schema, Map<String, String> metadata, long rowGroupBytes,
              CompressionCodecName codec) throws IOException {
        this.file = new HashingOutputFile(path);
        this.schema = schema;
        Builder b = new Builder(this, metadata)
            .withConf(new PlainParquetConfiguration())
            .withCodecFactory(new PureJavaCodecs())
            .withCompressionCodec(codec)
            .withWriteMode(ParquetFileWriter.Mode.CREATE)
            .withWriterVersion(ParquetProperties.WriterVersion.PARQUET_1_0)
            .withRowGroupSize(rowGroupBytes)
            .withValidation(false)
            .withByteStreamSplitEncoding(true)
            .withSizeStatisticsEnabled(false);
        for (Type t : schema.getFields()) {
            PrimitiveTypeName p = t.asPrimitiveType().getPrimitiveTypeName();
            if (p == PrimitiveTypeName.DOUBLE || p == PrimitiveTypeName.FLOAT) {
                b.withDictionaryEncoding(t.getName(), false).withStatisticsEnabled(t.getName(), false);
            }
        }
        this.writer = b.build();
    }

    /** Fills one row by calling the writer's {@code add} methods in schema order. */
    @FunctionalInterface
    interface Row {
        /** @param w the writer to add this row's values to */
        void emit(RowWriter w);
    }

    /**
     * Writes one row; the row is read at once and may be reused afterwards.
     *
     * @param row the row
     */
    void write(Row row) throws IOException {
        writer.write(row);
    }

    void addLong(long v) {
        start();
        rc.addLong(v);
        end();
    }

    void addInt(int v) {
        start();
        rc.addInteger(v);
        end();
    }

    void addDouble(double v) {
        start();
        rc.addDouble(v);
        end();
    }

    void addFloat(float v) {
        start();
        rc.addFloat(v);
        end();
    }

    void addBoolean(boolean v) {
        start();
        rc.addBoolean(v);
        end();
    }

    void addString(String v) {
        start();
        rc.addBinary(org.apache.parquet.io.api.Binary.fromString(v));
        end();
    }

    /** Leaves an optional column null in this row. */
    void addNull() {
        field++;
    }

    private void start() {
        rc.startField(schema.getFieldName(field), field);
    }

    private void end() {
        rc.endField(schema.getFieldName(field), field);
        field++;
    }

    /** @return rows written */
    long rows() {
        return rows;
    }

    /** @return the file, for its length and hash after close */
    HashingOutputFile file() {
        return file;
    }

    @Override
    public void close() throws IOException {
        if (!closed) {
            closed = true;
            writer.close();
        }
    }

    /** The write support: one message per row, filled by the row itself. */
    private static final class Support extends WriteSupport<Row> {
        private final RowWriter owner;
        private final Map<String, String> metadata;

        Support(RowWriter owner, Map<String, String> metadata) {
            this.owner = owner;
            // Insertion order, not Map.copyOf: its iteration order changes from one JVM to the next,
            // and the footer bytes with it.
            this.metadata = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(metadata));
        }

        // Abstract in WriteSupport, so it must exist; never called with a ParquetConfiguration set.
        @Override
        @SuppressWarnings("deprecation")
        public WriteContext init(org.apache.hadoop.conf.Configuration configuration) {
            return new WriteContext(owner.schema, metadata);
        }

        @Override
        public WriteContext init(ParquetConfiguration configuration) {
            return new WriteContext(owner.schema, metadata);
        }

        @Override
        public void prepareForWrite(RecordConsumer recordConsumer) {
            owner.rc = recordConsumer;
        }

        @Override
        public void write(Row row) {
            owner.field = 0;
            owner.rc.startMessage();
            row.emit(owner);
            if (owner.field != owner.schema.getFieldCount()) {
                throw new IllegalStateException("row has " + owner.field + " values, schema has "
                    + owner.schema.getFieldCount());
            }
            owner.rc.endMessage();
            owner.rows++;
        }
    }

    private static final class Builder extends ParquetWriter.Builder<Row, Builder> {
        private final Support support;

        Builder(RowWriter owner, Map<String, String> metadata) {
            super(owner.file);
            this.support = new Support(owner, metadata);
        }

        @Override
        protected Builder self() {
            return this;
        }

        // Abstract in ParquetWriter.Builder, so it must exist; not called with a ParquetConfiguration set.
        @Override
        @SuppressWarnings("deprecation")
        protected WriteSupport<Row> getWriteSupport(org.apache.hadoop.conf.Configuration conf) {
            return support;
        }

        @Override
        protected WriteSupport<Row> getWriteSupport(ParquetConfiguration conf) {
            return support;
        }
    }

    /** @return the named primitive column of a flat schema */
    static PrimitiveType column(MessageType schema, String name) {
        return schema.getType(name).asPrimitiveType();
    }
}
