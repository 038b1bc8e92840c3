package org.loopstand.protocol.journal;

import java.io.IOException;
import java.util.ArrayList;
import java.util.Collection;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.BeanDescription;
import com.fasterxml.jackson.databind.JsonSerializer;
import com.fasterxml.jackson.databind.SerializationConfig;
import com.fasterxml.jackson.databind.SerializerProvider;
import com.fasterxml.jackson.databind.module.SimpleModule;
import com.fasterxml.jackson.databind.ser.BeanSerializerModifier;
import com.fasterxml.jackson.databind.ser.std.StdSerializer;
import com.fasterxml.jackson.databind.type.CollectionType;
import com.fasterxml.jackson.databind.type.MapType;

/**
 * Journals write the JDK's immutable maps and sets ({@code Map.of}, {@code Set.of}) in key order: their own
 * iteration order changes from one JVM to the next, which would make two runs of the same lockstep
 * scenario and random seed differ byte for byte. Every other map keeps the order it was filled in.
 */
final class StableOrderMaps extends BeanSerializerModifier {
    private static final String IMMUTABLE = "java.util.ImmutableCollections";
    private static final Comparator<Object> BY_TEXT = Comparator.comparing(String::valueOf);

    private StableOrderMaps() {
    }

    /** @return a module that registers this modifier */
    static SimpleModule module() {
        return new SimpleModule("loopstand-stable-order-maps").setSerializerModifier(new StableOrderMaps());
    }

    @Override
    public JsonSerializer<?> modifyMapSerializer(SerializationConfig config, MapType valueType, BeanDescription beanDesc,
            JsonSerializer<?> serializer) {
        if (!beanDesc.getBeanClass().getName().startsWith(IMMUTABLE)) {
            return serializer;
        }
        return new StdSerializer<Map<?, ?>>(Map.class, false) {
            @Override
            public void serialize(Map<?, ?> value, JsonGenerator gen, SerializerProvider provider) throws IOException {
                Map<Object, Object> sorted = new TreeMap<>(BY_TEXT);
                sorted.putAll(value);
                provider.defaultSerializeValue(sorted, gen);
            }
        };
    }

    @Override
    public JsonSerializer<?> modifyCollectionSerializer(SerializationConfig config, CollectionType valueType,
            BeanDescription beanDesc, JsonSerializer<?> serializer) {
        Class<?> c = beanDesc.getBeanClass();
        if (!c.getName().startsWith(IMMUTABLE) || List.class.isAssignableFrom(c)) {
            return serializer; // lists keep their order; only the immutable sets iterate unpredictably
        }
        return new StdSerializer<Collection<?>>(Collection.class, false) {
            @Override
            public void serialize(Collection<?> value, JsonGenerator gen, SerializerProvider provider) throws IOException {
                List<Object> sorted = new ArrayList<>(value);
                sorted.sort(BY_TEXT);
                provider.defaultSerializeValue(sorted, gen);
            }
        };
    }
}
