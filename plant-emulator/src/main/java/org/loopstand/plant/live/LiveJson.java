package org.loopstand.plant.live;

import java.io.IOException;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.JsonSerializer;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializerProvider;
import com.fasterxml.jackson.databind.module.SimpleModule;

/** JSON for the page: a number that is not known (NaN, ±∞) is written as null, which the charts skip. */
final class LiveJson {
    private static final ObjectMapper MAPPER = new ObjectMapper().registerModule(new SimpleModule()
            .addSerializer(Double.class, new FiniteOrNull()).addSerializer(double.class, new FiniteOrNull()));

    private LiveJson() {
    }

    static String write(Object value) {
        try {
            return MAPPER.writeValueAsString(value);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("live view: cannot write JSON: " + e.getMessage(), e);
        }
    }

    private static final class FiniteOrNull extends JsonSerializer<Double> {
        @Override
        public void serialize(Double v, JsonGenerator g, SerializerProvider p) throws IOException {
            if (v == null || !Double.isFinite(v)) {
                g.writeNull();
            } else {
                g.writeNumber(v);
            }
        }
    }
}
