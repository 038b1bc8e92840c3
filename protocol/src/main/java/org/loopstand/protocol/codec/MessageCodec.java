package org.loopstand.protocol.codec;

import com.fasterxml.jackson.annotation.JsonSetter;
import com.fasterxml.jackson.annotation.Nulls;
import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.StreamReadConstraints;
import com.fasterxml.jackson.core.StreamReadFeature;
import com.fasterxml.jackson.core.json.JsonReadFeature;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.MapperFeature;
import com.fasterxml.jackson.databind.ObjectReader;
import com.fasterxml.jackson.databind.ObjectWriter;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.cfg.CoercionAction;
import com.fasterxml.jackson.databind.cfg.CoercionInputShape;
import com.fasterxml.jackson.databind.json.JsonMapper;
import com.fasterxml.jackson.databind.type.LogicalType;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Strict JSON codec for the v1 messages. Thread-safe; share one instance.
 *
 * <p>Decoding never throws: anything wrong (too large, not JSON, a missing, unknown, mistyped or
 * out-of-range field) comes back as {@link Decoded.Rejected} naming the field. Encoding is
 * deterministic: fields in record component order, absent optional fields omitted, map keys sorted,
 * no whitespace, so that the bytes can be signed. On a thread with {@link RecentEncodings} open
 * (lockstep runs), decoding bytes this thread just encoded returns the encoded record.
 */
public final class MessageCodec {
    /** Default payload limit: 64 KiB. */
    public static final int DEFAULT_MAX_PAYLOAD_BYTES = 65_536;
    /** Deepest nesting accepted (fault parameters are the only free-form part). */
    static final int MAX_NESTING_DEPTH = 16;

    private static final JsonMapper MAPPER = buildMapper();
    private static final ObjectWriter WRITER = MAPPER.writer();
    private static final Map<Class<?>, ObjectReader> READERS = new ConcurrentHashMap<>();

    private final int maxPayloadBytes;

    /** Codec with the default 64 KiB payload limit. */
    public MessageCodec() {
        this(DEFAULT_MAX_PAYLOAD_BYTES);
    }

    /** @param maxPayloadBytes largest payload decoded, bytes, ≥ 1 */
    public MessageCodec(int maxPayloadBytes) {
        if (maxPayloadBytes < 1) {
            throw new IllegalArgumentException("maxPayloadBytes must be >= 1, got " + maxPayloadBytes);
        }
        this.maxPayloadBytes = maxPayloadBytes;
    }

    /** @return the payload limit, bytes */
    public int maxPayloadBytes() {
        return maxPayloadBytes;
    }

    /**
     * @param message a record of {@link MessageValidator#MESSAGE_TYPES}
     * @return its canonical JSON bytes (UTF-8)
     * @throws IllegalArgumentException if the message breaks a rule of the contract (naming the
     *                                  field) or is not a message type
     */
    public byte[] encode(Object message) {
        Optional<DecodeError> error = MessageValidator.validate(message);
        if (error.isPresent()) {
            throw new IllegalArgumentException("refusing to encode invalid message: " + error.get());
        }
        try {
            byte[] payload = WRITER.writeValueAsBytes(message);
            RecentEncodings recent = RecentEncodings.onThisThread();
            if (recent != null) {
                recent.remember(payload, message);
            }
            return payload;
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("could not encode " + message.getClass().getSimpleName(), e);
        }
    }

    /**
     * @param payload received bytes (UTF-8 JSON)
     * @param type    expected message type, one of {@link MessageValidator#MESSAGE_TYPES}
     * @return the valid message, or the first problem found; never throws
     */
    public <T> Decoded<T> decode(byte[] payload, Class<T> type) {
        try {
            if (type == null || !MessageValidator.MESSAGE_TYPES.contains(type)) {
                return rejected(DecodeErrorKind.INVALID_VALUE, "not a v1 message type: " + type);
            }
            if (payload == null || payload.length == 0) {
                return rejected(DecodeErrorKind.MALFORMED, "empty payload");
            }
            if (payload.length > maxPayloadBytes) {
                return rejected(DecodeErrorKind.OVERSIZED,
                        "payload is " + payload.length + " bytes, limit " + maxPayloadBytes);
            }
            RecentEncodings recent = RecentEncodings.onThisThread();
            Decoded<T> known = recent == null ? null : recent.find(payload, type);
            if (known != null) {
                return known;
            }
            T value = reader(type).readValue(payload);
            if (value == null) {
                return rejected(DecodeErrorKind.WRONG_TYPE, "payload is JSON null, expected an object");
            }
            Optional<DecodeError> error = MessageValidator.validate(value);
            return error.<Decoded<T>>map(Decoded.Rejected::new).orElseGet(() -> new Decoded.Ok<>(value));
        } catch (Exception e) {
            return new Decoded.Rejected<>(JacksonErrors.toError(e));
        } catch (StackOverflowError e) {
            // Cannot happen with the nesting limit; kept so that decode keeps its promise.
            return rejected(DecodeErrorKind.MALFORMED, "nesting too deep");
        }
    }

    private static <T> Decoded<T> rejected(DecodeErrorKind kind, String detail) {
        return new Decoded.Rejected<>(new DecodeError(kind, DecodeError.ROOT, detail));
    }

    private static ObjectReader reader(Class<?> type) {
        return READERS.computeIfAbsent(type, MAPPER::readerFor);
    }

    private static JsonMapper buildMapper() {
        JsonFactory factory = JsonFactory.builder()
                .disable(JsonReadFeature.ALLOW_NON_NUMERIC_NUMBERS)
                .enable(StreamReadFeature.STRICT_DUPLICATE_DETECTION)
                .streamReadConstraints(StreamReadConstraints.builder().maxNestingDepth(MAX_NESTING_DEPTH).build())
                .build();
        JsonMapper mapper = JsonMapper.builder(factory)
                .annotationIntrospector(new WireAnnotationIntrospector())
                .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
                .enable(DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES)
                .enable(DeserializationFeature.FAIL_ON_NUMBERS_FOR_ENUMS)
                .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
                .enable(DeserializationFeature.FAIL_ON_READING_DUP_TREE_KEY)
                .disable(DeserializationFeature.ACCEPT_FLOAT_AS_INT)
                .disable(MapperFeature.ALLOW_COERCION_OF_SCALARS)
                .enable(SerializationFeature.ORDER_MAP_ENTRIES_BY_KEYS)
                .disable(SerializationFeature.FAIL_ON_EMPTY_BEANS)
                .defaultSetterInfo(JsonSetter.Value.construct(Nulls.FAIL, Nulls.FAIL))
                .build();
        for (LogicalType target : new LogicalType[] {LogicalType.Integer, LogicalType.Float, LogicalType.Boolean}) {
            mapper.coercionConfigFor(target)
                    .setCoercion(CoercionInputShape.String, CoercionAction.Fail)
                    .setCoercion(CoercionInputShape.EmptyString, CoercionAction.Fail);
        }
        mapper.coercionConfigFor(LogicalType.Boolean).setCoercion(CoercionInputShape.Integer, CoercionAction.Fail);
        mapper.coercionConfigFor(LogicalType.Integer).setCoercion(CoercionInputShape.Float, CoercionAction.Fail);
        mapper.coercionConfigFor(LogicalType.Textual)
                .setCoercion(CoercionInputShape.Integer, CoercionAction.Fail)
                .setCoercion(CoercionInputShape.Float, CoercionAction.Fail)
                .setCoercion(CoercionInputShape.Boolean, CoercionAction.Fail);
        mapper.coercionConfigFor(LogicalType.Enum)
                .setCoercion(CoercionInputShape.EmptyString, CoercionAction.Fail)
                .setCoercion(CoercionInputShape.Integer, CoercionAction.Fail);
        return mapper;
    }

    /** Parser feature check for tests: the strict parser refuses NaN literals. */
    static boolean allowsNonNumericNumbers() {
        return MAPPER.isEnabled(JsonReadFeature.ALLOW_NON_NUMERIC_NUMBERS);
    }
}
