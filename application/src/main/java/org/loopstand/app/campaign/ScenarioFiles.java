package org.loopstand.app.campaign;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import com.fasterxml.jackson.dataformat.yaml.YAMLGenerator;

/**
 * Writes a run's scenario: the base scenario with the run's random seed and its drawn faults and load
 * events added, as a scenario file that {@code study --with-controller} and {@code rehearse} take as it is.
 * The run itself is made from this file, so the file is exactly what ran.
 */
final class ScenarioFiles {
    private final ObjectMapper yaml = new ObjectMapper(new YAMLFactory()
            .disable(YAMLGenerator.Feature.WRITE_DOC_START_MARKER).enable(YAMLGenerator.Feature.MINIMIZE_QUOTES));
    private final Map<String, Object> base;
    private final String header;

    /** @param header comment lines put on top of every file (without the leading '# ') */
    @SuppressWarnings("unchecked")
    ScenarioFiles(Path baseScenario, List<String> header) {
        try {
            this.base = yaml.readValue(baseScenario.toFile(), LinkedHashMap.class);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + baseScenario + ": " + e.getMessage(), e);
        }
        StringBuilder sb = new StringBuilder();
        header.forEach(l -> sb.append("# ").append(l).append('\n'));
        this.header = sb.toString();
    }

    /** Writes {@code plan}'s scenario to {@code file}, with {@code note} as an extra comment line. */
    void write(RunPlan plan, Path file, String note) {
        Map<String, Object> doc = new LinkedHashMap<>(base);
        doc.put("seed", plan.seed());
        List<Object> events = new ArrayList<>(listOf(base.get("events")));
        for (RunPlan.PlannedLoad l : plan.loads()) {
            Map<String, Object> e = new LinkedHashMap<>();
            e.put("atS", l.atS());
            e.put("type", l.type());
            e.put("area", l.area());
            e.put("deltaMw", l.deltaMw());
            if (!Double.isNaN(l.durationS())) {
                e.put("durationS", l.durationS());
            }
            events.add(e);
        }
        if (!events.isEmpty()) {
            doc.put("events", events);
        }
        List<Object> faults = new ArrayList<>(listOf(base.get("faults")));
        for (RunPlan.PlannedFault f : plan.faults()) {
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("id", f.id());
            m.put("type", f.type());
            m.put("target", f.target());
            m.put("startS", f.startS());
            m.put("endS", f.endS());
            m.putAll(f.parameters());
            faults.add(m);
        }
        if (!faults.isEmpty()) {
            doc.remove("faults");
            // faults before checks, as people write them (a check's 'after' may name a fault)
            Map<String, Object> ordered = new LinkedHashMap<>();
            doc.forEach((k, v) -> {
                if (k.equals("checks")) {
                    ordered.put("faults", faults);
                }
                ordered.put(k, v);
            });
            ordered.putIfAbsent("faults", faults);
            doc = ordered;
        }
        try {
            Files.createDirectories(file.getParent());
            Files.writeString(file, header + "# " + note + "\n" + yaml.writeValueAsString(doc), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file + ": " + e.getMessage(), e);
        }
    }

    private static List<?> listOf(Object v) {
        return v instanceof List<?> l ? l : List.of();
    }
}
