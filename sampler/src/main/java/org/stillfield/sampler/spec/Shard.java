package org.stillfield.sampler.spec;

import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * One of {@code count} shards of a run: shard {@code index} (0-based) writes a contiguous block of
 * the run's parts, so that {@code count} processes together write every part exactly once. With
 * K parts, shard i writes parts [⌊iK/N⌋, ⌊(i+1)K/N⌋) — blocks differ in size by at most one part.
 *
 * @param index this shard, 0 ≤ index &lt; count
 * @param count number of shards, 1 to {@link #MAX_COUNT}
 */
public record Shard(int index, int count) {
    /** Largest shard count accepted. */
    public static final int MAX_COUNT = 100_000;
    /** The whole run in one process. */
    public static final Shard ALL = new Shard(0, 1);

    private static final Pattern FORM = Pattern.compile("\\s*(\\d{1,9})\\s*/\\s*(\\d{1,9})\\s*");

    /** Validates. */
    public Shard {
        if (!(count >= 1 && count <= MAX_COUNT)) {
            throw new IllegalArgumentException("shard count must lie in [1, " + MAX_COUNT + "], got " + count);
        }
        if (!(index >= 0 && index < count)) {
            throw new IllegalArgumentException("shard index must lie in [0, " + (count - 1) + "] for " + count
                + " shards (shards are numbered from 0), got " + index);
        }
    }

    /**
     * @param text "i/N", e.g. "3/8"
     * @return the shard
     * @throws IllegalArgumentException when the text is not of that form or out of range
     */
    public static Shard parse(String text) {
        Matcher m = FORM.matcher(text == null ? "" : text);
        if (!m.matches()) {
            throw new IllegalArgumentException("shard must be written \"i/N\" with 0 <= i < N, e.g. \"0/8\", got '" + text + "'");
        }
        return new Shard(Integer.parseInt(m.group(1)), Integer.parseInt(m.group(2)));
    }

    /** @return true when this is the whole run ({@code 0/1}) */
    public boolean isWhole() {
        return count == 1;
    }

    /**
     * @param parts number of parts of the run, ≥ 1
     * @return first part of this shard (inclusive)
     */
    public int firstPart(int parts) {
        return (int) ((long) index * parts / count);
    }

    /**
     * @param parts number of parts of the run, ≥ 1
     * @return end of this shard's parts (exclusive); equal to {@link #firstPart} when it has none
     */
    public int endPart(int parts) {
        return (int) ((long) (index + 1) * parts / count);
    }

    @Override
    public String toString() {
        return index + "/" + count;
    }
}
