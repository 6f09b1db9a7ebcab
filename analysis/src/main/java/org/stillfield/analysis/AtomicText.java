package org.stillfield.analysis;

import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Objects;

/** Writes a text file under a temporary name and renames it, so a reader never sees half a table. */
final class AtomicText {
    /** What goes into the file. */
    interface Body {
        void write(Writer w) throws IOException;
    }

    private AtomicText() {
    }

    static void write(Path file, Body body) throws IOException {
        Objects.requireNonNull(file, "file");
        Path abs = file.toAbsolutePath();
        Path tmp = abs.resolveSibling(abs.getFileName() + ".tmp");
        try (Writer w = Files.newBufferedWriter(tmp, StandardCharsets.UTF_8)) {
            body.write(w);
        } catch (IOException | RuntimeException ex) {
            Files.deleteIfExists(tmp);
            throw ex;
        }
        try {
            Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
        } catch (AtomicMoveNotSupportedException ex) {
            // Some file systems cannot rename atomically; a plain replace is the best they offer.
            Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING);
        }
    }
}
