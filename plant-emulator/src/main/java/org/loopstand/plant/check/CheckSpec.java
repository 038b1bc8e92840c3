package org.loopstand.plant.check;

import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.plant.fault.FaultSpec.Problem;
import org.loopstand.plant.fault.ParameterSpec;
import org.loopstand.plant.fault.TargetCatalog;

/**
 * One check of a scenario, validated: name, type and every parameter (defaults filled in). For checks
 * that measure from a moment, {@code afterS} holds that moment in scenario seconds (the loader turns
 * {@code after: <event type or fault id>} into it).
 */
public record CheckSpec(String name, CheckType type, Map<String, Object> parameters) {
    public CheckSpec {
        parameters = Collections.unmodifiableMap(new LinkedHashMap<>(parameters));
    }

    public double number(String p) {
        return (Double) parameters.get(p);
    }

    public String text(String p) {
        return (String) parameters.get(p);
    }

    public CheckOutcome evaluate(RunRecord run, org.loopstand.plant.grid.Grid grid) {
        return type.evaluator().evaluate(this, run, grid);
    }

    /**
     * Checks and completes a check's parameters.
     *
     * @param given parameters as written (Number or String values); {@code after} must be resolved to
     *              {@code afterS} by the caller already
     * @param out   receives every problem, by parameter name
     * @return the spec, meaningful only when no problem was added
     */
    public static CheckSpec assemble(String name, CheckType type, Map<String, Object> given, TargetCatalog catalog,
            List<Problem> out) {
        Map<String, Object> params = new LinkedHashMap<>();
        for (String k : given.keySet()) {
            if (type.parameter(k).isEmpty()) {
                out.add(new Problem(k, "check type " + type.name() + " has no parameter '" + k + "'; it takes "
                        + type.parameters().stream().map(ParameterSpec::name).toList()));
            }
        }
        for (ParameterSpec p : type.parameters()) {
            Object v = given.get(p.name());
            if (v == null) {
                if (p.required()) {
                    out.add(new Problem(p.name(), "check type " + type.name() + " needs parameter " + p.name()));
                }
                params.put(p.name(), p.defaultValue());
                continue;
            }
            Object normal = v instanceof Number n ? (Object) n.doubleValue() : v;
            p.check(normal).ifPresentOrElse(w -> out.add(new Problem(p.name(), w)), () -> params.put(p.name(), normal));
        }
        idCheck(type, params, "area", catalog.areas(), out);
        idCheck(type, params, "tie", catalog.ties(), out);
        idCheck(type, params, "unit", catalog.units(), out);
        if (type.needsAfter() && params.get("afterS") instanceof Double d && d.isNaN()) {
            out.add(new Problem("afterS", "check type " + type.name() + " needs afterS (s) or after (an event type or fault id)"));
        }
        return new CheckSpec(name, type, params);
    }

    /** An id must name one of the site's; {@code *} is accepted where the type's default is {@code *} (any). */
    private static void idCheck(CheckType type, Map<String, Object> params, String key, java.util.Set<String> known,
                                List<Problem> out) {
        boolean wildcard = "*".equals(params.get(key))
                && type.parameter(key).map(p -> "*".equals(p.defaultValue())).orElse(false);
        if (params.get(key) instanceof String s && !known.contains(s) && !wildcard) {
            out.add(new Problem(key, "unknown " + key + " '" + s + "' (the site has " + new ArrayList<>(known) + ")"));
        }
    }
}
