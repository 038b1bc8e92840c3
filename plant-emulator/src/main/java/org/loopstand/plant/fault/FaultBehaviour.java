package org.loopstand.plant.fault;

import java.lang.reflect.Constructor;
import java.lang.reflect.RecordComponent;
import java.util.Map;

/**
 * What one fault does, bound to its validated parameters: a record whose components are the fault
 * type's own parameters (same names, {@code double} for numbers, {@code String} for texts), so every
 * stage reads typed fields and never a parameter by its name. Each stage takes its own kind:
 * {@link StreamFault} (publication stage), {@link CommandFault} (command stage), {@link PlantFault}
 * (unit plant interface), {@link LinkFault} (connections). {@link FaultLibrary} pairs every fault
 * type with its behaviour record and checks the names and types agree when it is built.
 */
public interface FaultBehaviour {
    /**
     * Builds a {@code kind} record from {@code parameters}: each component takes the parameter of the
     * same name (a missing number is NaN, a missing text is empty: the builder reports it as a problem).
     */
    static <B extends Record & FaultBehaviour> FaultBehaviour bind(Class<B> kind, Map<String, Object> parameters) {
        RecordComponent[] components = kind.getRecordComponents();
        Class<?>[] types = new Class<?>[components.length];
        Object[] values = new Object[components.length];
        for (int i = 0; i < components.length; i++) {
            types[i] = components[i].getType();
            Object v = parameters.get(components[i].getName());
            values[i] = types[i] == double.class ? (v instanceof Double d ? d : Double.NaN) : (v instanceof String s ? s : "");
        }
        try {
            Constructor<B> c = kind.getDeclaredConstructor(types);
            return c.newInstance(values);
        } catch (ReflectiveOperationException e) {
            throw new IllegalStateException("fault behaviour " + kind.getSimpleName() + " cannot be built: " + e, e);
        }
    }
}
