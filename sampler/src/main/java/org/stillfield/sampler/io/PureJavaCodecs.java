package org.stillfield.sampler.io;

import io.airlift.compress.Compressor;
import io.airlift.compress.Decompressor;
import io.airlift.compress.MalformedInputException;
import io.airlift.compress.snappy.SnappyCompressor;
import io.airlift.compress.snappy.SnappyDecompressor;
import io.airlift.compress.zstd.ZstdCompressor;
import io.airlift.compress.zstd.ZstdDecompressor;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.ByteBuffer;
import org.apache.parquet.bytes.BytesInput;
import org.apache.parquet.compression.CompressionCodecFactory;
import org.apache.parquet.hadoop.metadata.CompressionCodecName;

/**
 * Page compression for Parquet without Hadoop: ZSTD and SNAPPY from aircompressor's pure-Java
 * implementations, plus pass-through for UNCOMPRESSED.
 *
 * <p>Why not Parquet's own factory: it creates codecs through a Hadoop {@code Configuration},
 * whose class needs libraries (Woodstox, Hadoop's shaded Guava) that are deliberately kept off
 * the classpath. Parquet's ZSTD pages are standard zstd frames and its SNAPPY pages raw snappy
 * blocks (Parquet format spec, Compression.md), which is what these produce and accept.
 *
 * <p>Not thread-safe: one instance per reader or writer.
 */
final class PureJavaCodecs implements CompressionCodecFactory {

    @Override
    public BytesInputCompressor getCompressor(CompressionCodecName codec) {
        switch (codec) {
            case UNCOMPRESSED: return new Passthrough();
            case ZSTD: return new Block(codec, new ZstdCompressor(), null);
            case SNAPPY: return new Block(codec, new SnappyCompressor(), null);
            default: throw new IllegalArgumentException("compression codec not available without native libraries: " + codec);
        }
    }

    @Override
    public BytesInputDecompressor getDecompressor(CompressionCodecName codec) {
        switch (codec) {
            case UNCOMPRESSED: return new Passthrough();
            case ZSTD: return new Block(codec, null, new ZstdDecompressor());
            case SNAPPY: return new Block(codec, null, new SnappyDecompressor());
            default: throw new IllegalArgumentException("compression codec not supported by this reader: " + codec
                + "; supported: UNCOMPRESSED, ZSTD, SNAPPY");
        }
    }

    @Override
    public void release() {
        // Nothing pooled.
    }

    /** One codec, compressing whole pages into a reused buffer (the page writer copies it at once). */
    private static final class Block implements BytesInputCompressor, BytesInputDecompressor {
        private final CompressionCodecName name;
        private final Compressor compressor;
        private final Decompressor decompressor;
        private final Exposed in = new Exposed();
        private byte[] out = new byte[0];

        Block(CompressionCodecName name, Compressor compressor, Decompressor decompressor) {
            this.name = name;
            this.compressor = compressor;
            this.decompressor = decompressor;
        }

        @Override
        public BytesInput compress(BytesInput bytes) throws IOException {
            in.reset();
            bytes.writeAllTo(in);
            int max = compressor.maxCompressedLength(in.size());
            if (out.length < max) {
                out = new byte[max];
            }
            int n = compressor.compress(in.array(), 0, in.size(), out, 0, out.length);
            return BytesInput.from(out, 0, n);
        }

        @Override
        public CompressionCodecName getCodecName() {
            return name;
        }

        @Override
        public BytesInput decompress(BytesInput bytes, int uncompressedSize) throws IOException {
            in.reset();
            bytes.writeAllTo(in);
            return BytesInput.from(decompress(in.array(), in.size(), uncompressedSize));
        }

        private byte[] decompress(byte[] src, int length, int uncompressedSize) throws IOException {
            byte[] result = new byte[uncompressedSize];
            int n;
            try {
                n = decompressor.decompress(src, 0, length, result, 0, uncompressedSize);
            } catch (MalformedInputException ex) {
                throw new IOException("corrupt " + name + " page: " + ex.getMessage(), ex);
            }
            if (n != uncompressedSize) {
                throw new IOException("corrupt " + name + " page: expected " + uncompressedSize + " bytes, got " + n);
            }
            return result;
        }

        @Override
        public void decompress(ByteBuffer input, int compressedSize, ByteBuffer output, int uncompressedSize)
            throws IOException {
            byte[] src = new byte[compressedSize];
            input.duplicate().get(src);
            output.put(decompress(src, compressedSize, uncompressedSize));
        }

        @Override
        public void release() {
            out = new byte[0];
        }
    }

    /** A byte sink whose array can be handed to the codec without copying. */
    private static final class Exposed extends ByteArrayOutputStream {
        byte[] array() {
            return buf;
        }
    }

    /** UNCOMPRESSED pages. */
    private static final class Passthrough implements BytesInputCompressor, BytesInputDecompressor {
        @Override
        public BytesInput compress(BytesInput bytes) {
            return bytes;
        }

        @Override
        public CompressionCodecName getCodecName() {
            return CompressionCodecName.UNCOMPRESSED;
        }

        @Override
        public BytesInput decompress(BytesInput bytes, int uncompressedSize) {
            return bytes;
        }

        @Override
        public void decompress(ByteBuffer input, int compressedSize, ByteBuffer output, int uncompressedSize) {
            ByteBuffer in = input.duplicate();
            in.limit(in.position() + compressedSize);
            output.put(in);
        }

        @Override
        public void release() {
        }
    }
}
