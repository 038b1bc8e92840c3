package org.loopstand.bench.run;

import java.io.IOException;
import java.io.Reader;
import java.io.Writer;
import java.lang.reflect.RecordComponent;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Properties;
import org.loopstand.plant.runtime.ConnectionGrouping;

/** {@link BenchSettings} as a properties file, one key per component: how the bench tells its processes. */
final class SettingsFile {
    private SettingsFile() {
    }

    static void write(BenchSettings s, Path file) throws IOException {
        Properties p = new Properties();
        try {
            for (RecordComponent c : BenchSettings.class.getRecordComponents()) {
                Object v = c.getAccessor().invoke(s);
                p.setProperty(c.getName(), v instanceof Enum<?> e ? e.name() : String.valueOf(v));
            }
        } catch (ReflectiveOperationException e) {
            throw new IllegalStateException(e);
        }
        try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            p.store(w, "bench settings");
        }
    }

    static BenchSettings read(Path file) throws IOException {
        Properties p = new Properties();
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            p.load(r);
        }
        RecordComponent[] cs = BenchSettings.class.getRecordComponents();
        Object[] args = new Object[cs.length];
        Class<?>[] types = new Class<?>[cs.length];
        for (int i = 0; i < cs.length; i++) {
            types[i] = cs[i].getType();
            String v = p.getProperty(cs[i].getName());
            if (v == null) {
                throw new IOException(file + ": no value for " + cs[i].getName());
            }
            args[i] = value(types[i], v);
        }
        try {
            return BenchSettings.class.getDeclaredConstructor(types).newInstance(args); // the canonical one
        } catch (ReflectiveOperationException e) {
            throw new IOException(file + ": " + e, e);
        }
    }

    private static Object value(Class<?> type, String v) {
        if (type == int.class) {
            return Integer.parseInt(v);
        } else if (type == long.class) {
            return Long.parseLong(v);
        } else if (type == double.class) {
            return Double.parseDouble(v);
        } else if (type == boolean.class) {
            return Boolean.parseBoolean(v);
        } else if (type == Path.class) {
            return Path.of(v);
        } else if (type == ConnectionGrouping.class) {
            return ConnectionGrouping.valueOf(v);
        } else if (type == BenchSettings.Layout.class) {
            return BenchSettings.Layout.valueOf(v);
        } else if (type == BenchSettings.RawPacing.class) {
            return BenchSettings.RawPacing.valueOf(v);
        } else if (type == BenchSettings.PlantPublishing.class) {
            return BenchSettings.PlantPublishing.valueOf(v);
        }
        return v;
    }
}
