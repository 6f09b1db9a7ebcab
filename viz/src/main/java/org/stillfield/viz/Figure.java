package org.stillfield.viz;

import java.nio.file.Path;
import java.util.Objects;

/**
 * A rendered chart and what the report says about it.
 *
 * @param title short title, shown above the caption
 * @param png the PNG file
 * @param caption one or two sentences saying what is drawn and what to look for
 */
public record Figure(String title, Path png, String caption) {
    /** Checks for nulls. */
    public Figure {
        Objects.requireNonNull(title, "title");
        Objects.requireNonNull(png, "png");
        Objects.requireNonNull(caption, "caption");
    }
}
