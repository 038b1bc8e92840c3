package org.loopstand.protocol.codec;

import java.util.Base64;
import java.util.Collection;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Function;
import org.loopstand.protocol.message.Ids;
import org.loopstand.protocol.message.Quality;

/** Reusable field rules; each failure throws a {@link Violation} naming the field's JSON path. */
final class FieldChecks {
    /** Largest MW magnitude on the wire: far above any unit, catches unit mix-ups (W for MW). */
    static final double MAX_ABS_MW = 1e6;
    static final double MIN_FREQUENCY_HZ = 40;
    static final double MAX_FREQUENCY_HZ = 70;
    static final int MAX_TEXT_CHARS = 256;
    static final int MAX_DETAIL_CHARS = 1024;

    private FieldChecks() {
    }

    /** Carries the first broken rule out of the validator; no stack trace, it is not a bug. */
    static final class Violation extends RuntimeException {
        private static final long serialVersionUID = 1L;
        final transient DecodeError error;

        Violation(DecodeErrorKind kind, String field, String detail) {
            super(field + ": " + detail, null, false, false);
            this.error = new DecodeError(kind, field, detail);
        }
    }

    static Violation fail(DecodeErrorKind kind, String field, String detail) {
        return new Violation(kind, field, detail);
    }

    static String at(String prefix, String field) {
        return prefix.isEmpty() ? field : prefix + "." + field;
    }

    static String at(String prefix, int index) {
        return prefix + "[" + index + "]";
    }

    static <T> T present(String field, T value) {
        if (value == null) {
            throw fail(DecodeErrorKind.MISSING_FIELD, field, "required field is missing");
        }
        return value;
    }

    static void header(long seq, long sourceTime) {
        atLeast("seq", seq, 0);
        if (sourceTime <= 0) {
            throw fail(DecodeErrorKind.OUT_OF_RANGE, "sourceTime", "must be > 0 (epoch ms), got " + sourceTime);
        }
    }

    static void atLeast(String field, long value, long min) {
        if (value < min) {
            throw fail(DecodeErrorKind.OUT_OF_RANGE, field, "must be >= " + min + ", got " + value);
        }
    }

    static void between(String field, long value, long min, long max) {
        if (value < min || value > max) {
            throw fail(DecodeErrorKind.OUT_OF_RANGE, field, "must be in [" + min + ", " + max + "], got " + value);
        }
    }

    static void finite(String field, double value) {
        if (!Double.isFinite(value)) {
            throw fail(DecodeErrorKind.NOT_FINITE, field, "must be a finite number, got " + value);
        }
    }

    static void finite(String field, Double value) {
        finite(field, present(field, value).doubleValue());
    }

    static void between(String field, double value, double min, double max) {
        finite(field, value);
        if (value < min || value > max) {
            throw fail(DecodeErrorKind.OUT_OF_RANGE, field, "must be in [" + min + ", " + max + "], got " + value);
        }
    }

    /** Range (0, max]: zero excluded. */
    static void aboveZeroAtMost(String field, double value, double max) {
        finite(field, value);
        if (value <= 0 || value > max) {
            throw fail(DecodeErrorKind.OUT_OF_RANGE, field, "must be in (0, " + max + "], got " + value);
        }
    }

    static void mw(String field, double value) {
        between(field, value, -MAX_ABS_MW, MAX_ABS_MW);
    }

    static void mw(String field, Double value) {
        mw(field, present(field, value).doubleValue());
    }

    static void frequencyHz(String field, double value) {
        between(field, value, MIN_FREQUENCY_HZ, MAX_FREQUENCY_HZ);
    }

    static void id(String field, String value) {
        if (!Ids.isValid(present(field, value))) {
            throw fail(DecodeErrorKind.INVALID_VALUE, field,
                    "'" + value + "' does not match id pattern " + Ids.PATTERN.pattern());
        }
    }

    static void text(String field, String value, int maxChars) {
        present(field, value);
        if (value.isEmpty() || value.length() > maxChars) {
            throw fail(DecodeErrorKind.INVALID_VALUE, field,
                    "must be 1 to " + maxChars + " characters, got " + value.length());
        }
        for (int i = 0; i < value.length(); i++) {
            if (Character.isISOControl(value.charAt(i))) {
                throw fail(DecodeErrorKind.INVALID_VALUE, field, "must not contain control characters");
            }
        }
    }

    static void base64(String field, String value) {
        present(field, value);
        try {
            if (value.isEmpty() || Base64.getDecoder().decode(value).length == 0) {
                throw fail(DecodeErrorKind.INVALID_VALUE, field, "must not be empty");
            }
        } catch (IllegalArgumentException e) {
            throw fail(DecodeErrorKind.INVALID_VALUE, field, "is not base64: " + e.getMessage());
        }
    }

    static void quality(String field, Quality quality) {
        present(field, quality);
        if (quality.validity() == null) { // the path is built only when it is needed: checked on every reading
            throw fail(DecodeErrorKind.MISSING_FIELD, at(field, "validity"), "required field is missing");
        }
    }

    static <T> void list(String field, List<T> items, ItemCheck<T> check) {
        present(field, items);
        for (int i = 0; i < items.size(); i++) {
            String path = at(field, i);
            check.apply(path, present(path, items.get(i)));
        }
    }

    static <T> void unique(String field, List<T> items, Function<T, String> key, String keyName) {
        Set<String> seen = new HashSet<>();
        for (int i = 0; i < items.size(); i++) {
            String k = key.apply(items.get(i));
            if (!seen.add(k)) {
                throw fail(DecodeErrorKind.INVALID_VALUE, at(at(field, i), keyName), "'" + k + "' appears twice");
            }
        }
    }

    /** Fault parameters: no nulls anywhere, numbers finite, names non-empty. */
    static void freeJson(String field, Object value) {
        if (value == null) {
            throw fail(DecodeErrorKind.WRONG_TYPE, field, "null is not allowed");
        } else if (value instanceof Map<?, ?> map) {
            for (Map.Entry<?, ?> entry : map.entrySet()) {
                String name = String.valueOf(entry.getKey());
                if (name.isEmpty()) {
                    throw fail(DecodeErrorKind.INVALID_VALUE, field, "parameter names must not be empty");
                }
                freeJson(at(field, name), entry.getValue());
            }
        } else if (value instanceof Collection<?> list) {
            int i = 0;
            for (Object element : list) {
                freeJson(at(field, i++), element);
            }
        } else if (value instanceof Double || value instanceof Float) {
            finite(field, ((Number) value).doubleValue());
        } else if (!(value instanceof String || value instanceof Number || value instanceof Boolean)) {
            throw fail(DecodeErrorKind.WRONG_TYPE, field,
                    "must be a string, number, boolean, list or object, got " + value.getClass().getSimpleName());
        }
    }

    @FunctionalInterface
    interface ItemCheck<T> {
        void apply(String path, T item);
    }
}
