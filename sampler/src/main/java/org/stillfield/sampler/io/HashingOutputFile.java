package org.stillfield.sampler.io;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import org.apache.parquet.io.OutputFile;
import org.apache.parquet.io.PositionOutputStream;

/**
 * A local file for Parquet output that computes its SHA-256 and length while the bytes go out,
 * so the manifest needs no second pass over the data, and forces the file to disk on close so a
 * dataset renamed into place afterwards cannot lose its contents in a crash.
 */
final class HashingOutputFile implements OutputFile {
    private static final int BUFFER = 1 << 16;

    private final Path path;
    private final MessageDigest digest;
    private long length = -1;
    private String sha256;
    private volatile boolean forceOnClose = true;

    HashingOutputFile(Path path) {
        this.path = path;
        this.digest = sha256Digest();
    }

    static MessageDigest sha256Digest() {
        try {
            return MessageDigest.getInstance("SHA-256");
        } catch (NoSuchAlgorithmException ex) {
            // Every Java platform must provide SHA-256 (java.security.MessageDigest javadoc).
            throw new IllegalStateException("SHA-256 is not available", ex);
        }
    }

    @Override
    public PositionOutputStream create(long blockSizeHint) throws IOException {
        return open(FileChannel.open(path, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE));
    }

    @Override
    public PositionOutputStream createOrOverwrite(long blockSizeHint) throws IOException {
        return open(FileChannel.open(path, StandardOpenOption.CREATE, StandardOpenOption.TRUNCATE_EXISTING,
            StandardOpenOption.WRITE));
    }

    @Override
    public boolean supportsBlockSize() {
        return false;
    }

    @Override
    public long defaultBlockSize() {
        return -1;
    }

    @Override
    public String getPath() {
        return path.toString();
    }

    /**
     * Closing will not wait for the disk; the owner calls {@link #force()} later (on another
     * thread, so the next file's writing overlaps this one's flush to disk) and must not rename the
     * file into place before that returns.
     */
    void deferForce() {
        forceOnClose = false;
    }

    /** Forces the closed file's contents to disk (fsync acts on the file, whichever descriptor). */
    void force() throws IOException {
        try (FileChannel c = FileChannel.open(path, StandardOpenOption.WRITE)) {
            c.force(true);
        }
    }

    /** @return bytes written; valid after the stream is closed */
    long length() {
        if (sha256 == null) {
            throw new IllegalStateException("file not closed yet: " + path);
        }
        return length;
    }

    /** @return lower-case hex SHA-256 of the file; valid after the stream is closed */
    String sha256() {
        if (sha256 == null) {
            throw new IllegalStateException("file not closed yet: " + path);
        }
        return sha256;
    }

    private PositionOutputStream open(FileChannel channel) {
        return new PositionOutputStream() {
            private final ByteBuffer buf = ByteBuffer.allocate(BUFFER);
            private long pos;
            private boolean closed;

            @Override
            public long getPos() {
                return pos;
            }

            @Override
            public void write(int b) throws IOException {
                if (!buf.hasRemaining()) {
                    drain();
                }
                buf.put((byte) b);
                pos++;
            }

            @Override
            public void write(byte[] b, int off, int len) throws IOException {
                if (len > buf.remaining()) {
                    drain();
                }
                if (len >= BUFFER) {
                    digest.update(b, off, len);
                    ByteBuffer direct = ByteBuffer.wrap(b, off, len);
                    while (direct.hasRemaining()) {
                        channel.write(direct);
                    }
                } else {
                    buf.put(b, off, len);
                }
                pos += len;
            }

            private void drain() throws IOException {
                buf.flip();
                digest.update(buf.array(), 0, buf.limit());
                while (buf.hasRemaining()) {
                    channel.write(buf);
                }
                buf.clear();
            }

            @Override
            public void flush() throws IOException {
                drain();
            }

            @Override
            public void close() throws IOException {
                if (closed) {
                    return;
                }
                closed = true;
                try (channel) {
                    drain();
                    if (forceOnClose) {
                        channel.force(true);
                    }
                }
                length = pos;
                sha256 = HexFormat.of().formatHex(digest.digest());
            }
        };
    }
}
