package org.stillfield.sampler.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import com.github.luben.zstd.Zstd;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import org.apache.parquet.bytes.BytesInput;
import org.apache.parquet.compression.CompressionCodecFactory;
import org.apache.parquet.hadoop.metadata.CompressionCodecName;
import org.junit.jupiter.api.Test;
import org.xerial.snappy.Snappy;

/**
 * The pure-Java page codecs agree with the reference C implementations that other Parquet
 * readers use: libzstd through zstd-jni and Google's snappy through snappy-java.
 */
class PureJavaCodecsTest {
    /** Page-like data: doubles of a fixed-seed linear congruential sequence (Knuth's MMIX constants). */
    private static byte[] page() {
        ByteBuffer b = ByteBuffer.allocate(8 * 40_000).order(ByteOrder.LITTLE_ENDIAN);
        long x = 42;
        for (int i = 0; i < 40_000; i++) {
            x = 6364136223846793005L * x + 1442695040888963407L;
            b.putDouble(i % 5 == 0 ? 0.0 : (x >>> 11) * 0x1.0p-53 - 0.5);
        }
        return b.array();
    }

    private static byte[] compress(CompressionCodecName codec, byte[] data) throws Exception {
        CompressionCodecFactory.BytesInputCompressor c = new PureJavaCodecs().getCompressor(codec);
        byte[] out = new byte[0];
        // Twice through one compressor: the reused output buffer must not leak into the result.
        c.compress(BytesInput.from(new byte[] {1, 2, 3}));
        BytesInput r = c.compress(BytesInput.from(data));
        out = BytesInput.copy(r).toByteBuffer().array();
        return out;
    }

    private static byte[] decompress(CompressionCodecName codec, byte[] data, int size) throws Exception {
        BytesInput r = new PureJavaCodecs().getDecompressor(codec).decompress(BytesInput.from(data), size);
        ByteBuffer b = r.toByteBuffer();
        byte[] out = new byte[b.remaining()];
        b.get(out);
        return out;
    }

    @Test
    void zstdPagesAreStandardFrames() throws Exception {
        byte[] data = page();
        byte[] ours = compress(CompressionCodecName.ZSTD, data);
        assertArrayEquals(data, Zstd.decompress(ours, data.length), "libzstd decodes our frame");
        byte[] theirs = Zstd.compress(data, 3);
        assertArrayEquals(data, decompress(CompressionCodecName.ZSTD, theirs, data.length), "we decode libzstd's frame");
    }

    @Test
    void snappyPagesAreRawSnappyBlocks() throws Exception {
        byte[] data = page();
        byte[] ours = compress(CompressionCodecName.SNAPPY, data);
        assertArrayEquals(data, Snappy.uncompress(ours), "snappy decodes our block");
        byte[] theirs = Snappy.compress(data);
        assertArrayEquals(data, decompress(CompressionCodecName.SNAPPY, theirs, data.length), "we decode snappy's block");
    }
}
