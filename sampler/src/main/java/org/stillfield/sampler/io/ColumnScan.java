package org.stillfield.sampler.io;

import java.io.Closeable;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.List;
import org.apache.parquet.ParquetReadOptions;
import org.apache.parquet.column.ColumnDescriptor;
import org.apache.parquet.column.ColumnReader;
import org.apache.parquet.column.impl.ColumnReadStoreImpl;
import org.apache.parquet.column.page.PageReadStore;
import org.apache.parquet.conf.PlainParquetConfiguration;
import org.apache.parquet.hadoop.ParquetFileReader;
import org.apache.parquet.hadoop.metadata.BlockMetaData;
import org.apache.parquet.hadoop.metadata.ColumnChunkMetaData;
import org.apache.parquet.hadoop.metadata.ColumnPath;
import org.apache.parquet.internal.column.columnindex.OffsetIndex;
import org.apache.parquet.internal.filter2.columnindex.RowRanges;
import org.apache.parquet.io.LocalInputFile;
import org.apache.parquet.io.api.Converter;
import org.apache.parquet.io.api.GroupConverter;
import org.apache.parquet.io.api.PrimitiveConverter;
import org.apache.parquet.schema.MessageType;
import org.apache.parquet.schema.PrimitiveType.PrimitiveTypeName;
import org.apache.parquet.schema.Type;
import org.apache.parquet.schema.Types;

/**
 * Row-by-row reading of chosen columns of a flat Parquet file, one row group in memory at a time,
 * straight from the column readers: primitives only, no record objects.
 *
 * <p>Call {@link #next()} to move to a row, then read any of its columns (each at most once).
 * After {@link #restrictTo(long, long)} only the pages holding the given rows are read (Parquet
 * offset index); other rows of those pages are still returned, so the caller tests each row.
 */
final class ColumnScan implements Closeable {
    private final ParquetFileReader reader;
    private final MessageType projection;
    private final ColumnDescriptor[] columns;
    private final int[] maxDefinition;
    private final boolean[] isFloat;
    private final String createdBy;
    /** Row groups still to read after {@link #restrictTo}, with the rows to read in each; null = all. */
    private Deque<Selected> selection;
    private final ColumnReader[] readers;
    private PageReadStore group;
    private long rowsLeft;
    private boolean pending;

    /**
     * @param file the Parquet file
     * @param names columns to read, by name
     */
    ColumnScan(Path file, List<String> names) throws IOException {
        // No record filter: FilterCompat would log every predicate at INFO level.
        this.reader = ParquetFileReader.open(new LocalInputFile(file),
            ParquetReadOptions.builder(new PlainParquetConfiguration()).withCodecFactory(new PureJavaCodecs()).build());
        try {
            MessageType schema = reader.getFileMetaData().getSchema();
            Types.MessageTypeBuilder b = Types.buildMessage();
            for (String n : names) {
                if (!schema.containsField(n)) {
                    throw new IOException(file.getFileName() + " has no column '" + n + "'");
                }
                b.addField(schema.getType(n));
            }
            this.projection = b.named(schema.getName());
            reader.setRequestedSchema(projection);
            this.createdBy = reader.getFileMetaData().getCreatedBy();
            int n = names.size();
            columns = new ColumnDescriptor[n];
            maxDefinition = new int[n];
            isFloat = new boolean[n];
            for (int c = 0; c < n; c++) {
                columns[c] = projection.getColumnDescription(new String[] {names.get(c)});
                maxDefinition[c] = columns[c].getMaxDefinitionLevel();
                isFloat[c] = columns[c].getPrimitiveType().getPrimitiveTypeName() == PrimitiveTypeName.FLOAT;
            }
            readers = new ColumnReader[n];
        } catch (IOException | RuntimeException ex) {
            reader.close();
            throw ex;
        }
    }

    /** @return the file's rows according to its footer */
    long rowCount() {
        return reader.getRecordCount();
    }

    /**
     * Limits the scan to the pages that hold file rows first..last (0-based, inclusive), chosen
     * with the offset index of the first requested column; a row group without offset index is
     * read whole. Call before the first {@link #next()}.
     */
    void restrictTo(long first, long last) throws IOException {
        if (group != null || pending) {
            throw new IllegalStateException("restrictTo must come before the first row is read");
        }
        selection = new ArrayDeque<>();
        ColumnPath key = ColumnPath.get(columns[0].getPath());
        List<BlockMetaData> blocks = reader.getRowGroups();
        long start = 0;
        for (int b = 0; b < blocks.size(); b++) {
            BlockMetaData block = blocks.get(b);
            long count = block.getRowCount();
            long lo = Math.max(first - start, 0);
            long hi = Math.min(last - start, count - 1);
            if (lo <= hi) {
                OffsetIndex index = null;
                for (ColumnChunkMetaData chunk : block.getColumns()) {
                    if (chunk.getPath().equals(key)) {
                        index = reader.readOffsetIndex(chunk);
                    }
                }
                RowRanges ranges;
                if (index == null) {
                    ranges = RowRanges.createSingle(count);
                } else {
                    List<Integer> pages = new ArrayList<>();
                    for (int i = 0; i < index.getPageCount(); i++) {
                        if (index.getFirstRowIndex(i) <= hi && index.getLastRowIndex(i, count) >= lo) {
                            pages.add(i);
                        }
                    }
                    ranges = RowRanges.create(count, pages.stream().mapToInt(Integer::intValue).iterator(), index);
                }
                selection.add(new Selected(b, ranges));
            }
            start += count;
        }
    }

    private PageReadStore nextGroup() throws IOException {
        if (selection == null) {
            return reader.readNextRowGroup();
        }
        Selected next = selection.poll();
        return next == null ? null : reader.readFilteredRowGroup(next.block(), next.ranges());
    }

    private record Selected(int block, RowRanges ranges) {
    }

    /**
     * Moves to the next row.
     *
     * @return false at the end of the file
     */
    boolean next() throws IOException {
        if (pending) {
            for (int c = 0; c < readers.length; c++) {
                // consume() only advances the levels: a non-null value that was not read must be
                // skipped explicitly (skip() does nothing when it was read), or the value stream
                // falls behind the level stream.
                if (readers[c].getCurrentDefinitionLevel() == maxDefinition[c]) {
                    readers[c].skip();
                }
                readers[c].consume();
            }
            pending = false;
        }
        while (rowsLeft == 0) {
            if (group != null) {
                group.close();
                group = null;
            }
            group = nextGroup();
            if (group == null) {
                return false;
            }
            ColumnReadStoreImpl store = new ColumnReadStoreImpl(group, new Ignore(projection), projection, createdBy);
            for (int c = 0; c < columns.length; c++) {
                readers[c] = store.getColumnReader(columns[c]);
            }
            rowsLeft = group.getRowCount();
        }
        rowsLeft--;
        pending = true;
        return true;
    }

    /** @return column c of the current row (int64) */
    long getLong(int c) {
        return readers[c].getLong();
    }

    /** @return column c of the current row (int32) */
    int getInt(int c) {
        return readers[c].getInteger();
    }

    private boolean isNull(int c) {
        return readers[c].getCurrentDefinitionLevel() < maxDefinition[c];
    }

    /** @return column c of the current row (double or float, widened exactly), NaN when null */
    double getDouble(int c) {
        if (isNull(c)) {
            return Double.NaN;
        }
        ColumnReader r = readers[c];
        return isFloat[c] ? r.getFloat() : r.getDouble();
    }

    @Override
    public void close() throws IOException {
        try {
            if (group != null) {
                group.close();
            }
        } finally {
            reader.close();
        }
    }

    /** Converters are required by the column store but unused: values are read from the readers. */
    private static final class Ignore extends GroupConverter {
        private final Converter[] children;

        Ignore(org.apache.parquet.schema.GroupType type) {
            children = new Converter[type.getFieldCount()];
            for (int i = 0; i < children.length; i++) {
                Type t = type.getType(i);
                children[i] = t.isPrimitive() ? new PrimitiveConverter() {
                } : new Ignore(t.asGroupType());
            }
        }

        @Override
        public Converter getConverter(int fieldIndex) {
            return children[fieldIndex];
        }

        @Override
        public void start() {
        }

        @Override
        public void end() {
        }
    }
}
