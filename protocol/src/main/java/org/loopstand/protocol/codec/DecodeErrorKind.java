package org.loopstand.protocol.codec;

/** Why a payload was refused. */
public enum DecodeErrorKind {
    /** Not well-formed JSON: syntax error, truncated, empty, duplicate key, trailing content. */
    MALFORMED,
    /** A required field is absent. */
    MISSING_FIELD,
    /** A field has the wrong JSON type (string for number, null for a required value, ...). */
    WRONG_TYPE,
    /** A number is NaN or infinite (literal NaN/Infinity, or too large for a double). */
    NOT_FINITE,
    /** A number lies outside its allowed range. */
    OUT_OF_RANGE,
    /** The payload is larger than the codec's limit. */
    OVERSIZED,
    /** A field the record does not have. */
    UNKNOWN_FIELD,
    /** A value of the right type that is still not allowed: unknown enum name, bad id, broken rule. */
    INVALID_VALUE
}
