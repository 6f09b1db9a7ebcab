package org.stillfield.sampler.spec;

import java.util.ArrayList;
import java.util.Collection;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * A mapping read from the spec, with its dotted path, that hands out typed values and remembers
 * which keys were read so that unknown keys can be reported with a did-you-mean.
 */
public final class SpecNode {
    private final String path;
    private final Map<String, Object> map;
    private final Set<String> used = new LinkedHashSet<>();

    SpecNode(String path, Map<String, Object> map) {
        this.path = path;
        this.map = map;
    }

    static SpecNode of(String path, Object value) throws SpecException {
        if (!(value instanceof Map)) {
            throw new SpecException(path, "must be a mapping of settings (key: value), got " + describe(value));
        }
        Map<String, Object> m = new LinkedHashMap<>();
        for (Map.Entry<?, ?> e : ((Map<?, ?>) value).entrySet()) {
            if (!(e.getKey() instanceof String)) {
                throw new SpecException(path, "keys must be names, got " + describe(e.getKey()));
            }
            m.put((String) e.getKey(), e.getValue());
        }
        return new SpecNode(path, m);
    }

    /** @return the dotted path of a key under this node */
    public String at(String key) {
        return path.isEmpty() ? key : path + "." + key;
    }

    /** @return true if the key is present */
    public boolean has(String key) {
        return map.containsKey(key);
    }

    Object raw(String key) {
        used.add(key);
        return map.get(key);
    }

    /** @return a child mapping, or an empty one when absent */
    public SpecNode child(String key) throws SpecException {
        Object v = raw(key);
        return v == null ? new SpecNode(at(key), new LinkedHashMap<>()) : of(at(key), v);
    }

    /** @return a list of child mappings; empty when absent */
    public List<SpecNode> children(String key) throws SpecException {
        Object v = raw(key);
        List<SpecNode> out = new ArrayList<>();
        if (v == null) {
            return out;
        }
        if (!(v instanceof List)) {
            throw new SpecException(at(key), "must be a list, got " + describe(v));
        }
        int i = 0;
        for (Object o : (List<?>) v) {
            out.add(of(at(key) + "[" + i++ + "]", o));
        }
        return out;
    }

    /** @return a required string */
    public String string(String key) throws SpecException {
        Object v = raw(key);
        if (v == null) {
            throw new SpecException(at(key), "is required");
        }
        if (!(v instanceof String)) {
            throw new SpecException(at(key), "must be text, got " + describe(v));
        }
        return (String) v;
    }

    /** @return an optional string */
    public String string(String key, String fallback) throws SpecException {
        return has(key) ? string(key) : fallback;
    }

    /** @return one of the allowed words (case-insensitive), lower case */
    public String choice(String key, String fallback, Collection<String> allowed) throws SpecException {
        String v = has(key) ? string(key).toLowerCase(Locale.ROOT) : fallback;
        if (v == null) {
            throw new SpecException(at(key), "is required; allowed: " + String.join(", ", allowed));
        }
        if (!allowed.contains(v)) {
            throw new SpecException(at(key), "must be one of " + String.join(", ", allowed) + ", got '" + v + "'"
                + suggestion(v, allowed));
        }
        return v;
    }

    /** @return a required number */
    public double number(String key) throws SpecException {
        Object v = raw(key);
        if (v == null) {
            throw new SpecException(at(key), "is required");
        }
        return asNumber(at(key), v);
    }

    /** @return an optional number */
    public double number(String key, double fallback) throws SpecException {
        return has(key) ? number(key) : fallback;
    }

    /** @return a number that must be positive and finite */
    public double positive(String key, String unit) throws SpecException {
        double v = number(key);
        if (!(v > 0) || !Double.isFinite(v)) {
            throw new SpecException(at(key), "must be positive and finite (" + unit + "), got " + v);
        }
        return v;
    }

    /** @return an integer in [min, max] */
    public long integer(String key, long fallback, long min, long max) throws SpecException {
        Object v = raw(key);
        if (v == null) {
            return fallback;
        }
        if (!(v instanceof Integer || v instanceof Long || v instanceof java.math.BigInteger)) {
            throw new SpecException(at(key), "must be a whole number in [" + min + ", " + max + "], got " + describe(v));
        }
        java.math.BigInteger b = new java.math.BigInteger(v.toString());
        if (b.compareTo(java.math.BigInteger.valueOf(min)) < 0 || b.compareTo(java.math.BigInteger.valueOf(max)) > 0) {
            throw new SpecException(at(key), "must be a whole number in [" + min + ", " + max + "], got " + b);
        }
        return b.longValue();
    }

    /** @return a list of three finite numbers (a point, metres) */
    public double[] triple(String key) throws SpecException {
        Object v = raw(key);
        if (v == null) {
            throw new SpecException(at(key), "is required: a list of three numbers [x, y, z] in metres");
        }
        if (!(v instanceof List) || ((List<?>) v).size() != 3) {
            throw new SpecException(at(key), "must be a list of three numbers [x, y, z] in metres, got " + describe(v));
        }
        double[] out = new double[3];
        for (int i = 0; i < 3; i++) {
            out[i] = asNumber(at(key) + "[" + i + "]", ((List<?>) v).get(i));
            if (!Double.isFinite(out[i])) {
                throw new SpecException(at(key) + "[" + i + "]", "must be finite, got " + out[i]);
            }
        }
        return out;
    }

    /** @return a list of raw values; empty when absent */
    public List<Object> list(String key) throws SpecException {
        Object v = raw(key);
        if (v == null) {
            return List.of();
        }
        if (!(v instanceof List)) {
            throw new SpecException(at(key), "must be a list, got " + describe(v));
        }
        return new ArrayList<>((List<?>) v);
    }

    /**
     * Fails on the first key that was never read, with the closest known key as a suggestion.
     *
     * @param known every key this node allows
     */
    public void rejectUnknown(Collection<String> known) throws SpecException {
        for (String key : map.keySet()) {
            if (!known.contains(key)) {
                throw new SpecException(at(key), "unknown setting; allowed here: " + String.join(", ", known)
                    + suggestion(key, known));
            }
        }
    }

    static double asNumber(String path, Object v) throws SpecException {
        if (v instanceof Number) {
            return ((Number) v).doubleValue();
        }
        throw new SpecException(path, "must be a number, got " + describe(v));
    }

    static String describe(Object v) {
        if (v == null) {
            return "nothing";
        }
        if (v instanceof String) {
            return "text '" + v + "'";
        }
        if (v instanceof List) {
            return "a list of " + ((List<?>) v).size();
        }
        if (v instanceof Map) {
            return "a mapping";
        }
        return v.getClass().getSimpleName().toLowerCase(Locale.ROOT) + " " + v;
    }

    static String suggestion(String word, Collection<String> known) {
        String best = null;
        int bestDist = Integer.MAX_VALUE;
        for (String k : known) {
            int dist = distance(word.toLowerCase(Locale.ROOT), k.toLowerCase(Locale.ROOT));
            if (dist < bestDist) {
                bestDist = dist;
                best = k;
            }
        }
        return best != null && bestDist <= Math.max(2, word.length() / 3) ? " (did you mean '" + best + "'?)" : "";
    }

    /** Levenshtein distance, for did-you-mean. */
    static int distance(String a, String b) {
        int[] prev = new int[b.length() + 1];
        int[] cur = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            prev[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            cur[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int sub = prev[j - 1] + (a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1);
                cur[j] = Math.min(sub, Math.min(prev[j] + 1, cur[j - 1] + 1));
            }
            int[] t = prev;
            prev = cur;
            cur = t;
        }
        return prev[b.length()];
    }
}
