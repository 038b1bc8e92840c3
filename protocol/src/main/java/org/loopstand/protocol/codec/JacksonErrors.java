package org.loopstand.protocol.codec;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonStreamContext;
import com.fasterxml.jackson.core.exc.InputCoercionException;
import com.fasterxml.jackson.core.exc.StreamConstraintsException;
import com.fasterxml.jackson.core.exc.StreamReadException;
import com.fasterxml.jackson.databind.JsonMappingException;
import com.fasterxml.jackson.databind.exc.InvalidFormatException;
import com.fasterxml.jackson.databind.exc.InvalidNullException;
import com.fasterxml.jackson.databind.exc.MismatchedInputException;
import com.fasterxml.jackson.databind.exc.UnrecognizedPropertyException;
import com.fasterxml.jackson.databind.exc.ValueInstantiationException;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/** Turns Jackson's exceptions into a {@link DecodeError} with a JSON path like {@code ties[1].flowMw}. */
final class JacksonErrors {
    private static final Pattern MISSING_PROPERTY = Pattern.compile("Missing required creator property '([^']+)'");
    private static final Pattern NON_FINITE_TOKEN = Pattern.compile("Non-standard token '([+-]?(NaN|Infinity|INF))'");

    private JacksonErrors() {
    }

    static DecodeError toError(Exception e) {
        // Databind wraps parser errors met inside lists and objects; the parser's own context has the full path.
        if (e instanceof JsonMappingException && e.getCause() instanceof StreamReadException read) {
            return readError(read);
        }
        if (e instanceof JsonMappingException mapping) {
            return mappingError(mapping);
        }
        if (e instanceof StreamReadException read) {
            return readError(read);
        }
        if (e instanceof StreamConstraintsException limit) {
            return new DecodeError(DecodeErrorKind.MALFORMED, DecodeError.ROOT, shorten(limit.getOriginalMessage()));
        }
        return new DecodeError(DecodeErrorKind.MALFORMED, DecodeError.ROOT,
                "unexpected " + e.getClass().getSimpleName() + ": " + e.getMessage());
    }

    private static DecodeError mappingError(JsonMappingException e) {
        String path = path(e.getPath());
        String detail = e.getOriginalMessage();
        if (e instanceof UnrecognizedPropertyException) {
            return new DecodeError(DecodeErrorKind.UNKNOWN_FIELD, path, "unknown field");
        }
        if (e instanceof ValueInstantiationException) {
            Throwable cause = e.getCause() == null ? e : e.getCause();
            return new DecodeError(DecodeErrorKind.INVALID_VALUE, path, cause.getMessage());
        }
        if (e instanceof InvalidNullException) {
            return new DecodeError(DecodeErrorKind.WRONG_TYPE, path, "null is not allowed here");
        }
        if (e instanceof InvalidFormatException format) {
            Class<?> target = format.getTargetType();
            boolean isEnum = target != null && target.isEnum() && format.getValue() instanceof String;
            return new DecodeError(isEnum ? DecodeErrorKind.INVALID_VALUE : DecodeErrorKind.WRONG_TYPE, path,
                    shorten(detail));
        }
        if (e instanceof MismatchedInputException) {
            Matcher missing = MISSING_PROPERTY.matcher(detail == null ? "" : detail);
            if (missing.find()) {
                String name = missing.group(1);
                // Jackson's path names the missing field itself in recent versions; older ones stop at the object.
                String field = path.equals(name) || path.endsWith("." + name) ? path
                        : FieldChecks.at(path.equals(DecodeError.ROOT) ? "" : path, name);
                return new DecodeError(DecodeErrorKind.MISSING_FIELD, field, "required field is missing");
            }
            if (detail != null && detail.startsWith("No content to map")) {
                return new DecodeError(DecodeErrorKind.MALFORMED, DecodeError.ROOT, "empty payload");
            }
            if (detail != null && detail.startsWith("Trailing token")) {
                return new DecodeError(DecodeErrorKind.MALFORMED, DecodeError.ROOT, "content after the JSON value");
            }
            return new DecodeError(DecodeErrorKind.WRONG_TYPE, path, shorten(detail));
        }
        return new DecodeError(DecodeErrorKind.MALFORMED, path, shorten(detail));
    }

    private static DecodeError readError(StreamReadException e) {
        JsonParser parser = e.getProcessor();
        String path = parser == null ? DecodeError.ROOT : path(parser.getParsingContext());
        String detail = e.getOriginalMessage();
        if (e instanceof InputCoercionException) {
            return new DecodeError(DecodeErrorKind.OUT_OF_RANGE, path, shorten(detail));
        }
        Matcher nonFinite = NON_FINITE_TOKEN.matcher(detail == null ? "" : detail);
        if (nonFinite.find()) {
            return new DecodeError(DecodeErrorKind.NOT_FINITE, path,
                    nonFinite.group(1) + " is not a JSON number; values must be finite");
        }
        return new DecodeError(DecodeErrorKind.MALFORMED, path, shorten(detail));
    }

    private static String path(List<JsonMappingException.Reference> references) {
        StringBuilder out = new StringBuilder();
        for (JsonMappingException.Reference ref : references) {
            if (ref.getFieldName() != null) {
                if (out.length() > 0) {
                    out.append('.');
                }
                out.append(ref.getFieldName());
            } else if (ref.getIndex() >= 0) {
                out.append('[').append(ref.getIndex()).append(']');
            }
        }
        return out.length() == 0 ? DecodeError.ROOT : out.toString();
    }

    private static String path(JsonStreamContext context) {
        List<String> parts = new ArrayList<>();
        for (JsonStreamContext c = context; c != null && !c.inRoot(); c = c.getParent()) {
            if (c.inArray()) {
                parts.add("[" + c.getCurrentIndex() + "]");
            } else if (c.getCurrentName() != null) {
                parts.add("." + c.getCurrentName());
            }
        }
        StringBuilder out = new StringBuilder();
        for (int i = parts.size() - 1; i >= 0; i--) {
            out.append(parts.get(i));
        }
        String path = out.length() > 0 && out.charAt(0) == '.' ? out.substring(1) : out.toString();
        return path.isEmpty() ? DecodeError.ROOT : path;
    }

    /** Jackson messages quote the whole source sometimes; keep the first line only. */
    private static String shorten(String detail) {
        if (detail == null) {
            return "";
        }
        int newline = detail.indexOf('\n');
        return newline < 0 ? detail : detail.substring(0, newline);
    }
}
