package org.loopstand.plant.fault;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.loopstand.protocol.message.FaultAction;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.message.Ids;

/**
 * Checks a live fault order before it is sent, with one set of rules and one wording for every place
 * that starts or stops faults by hand ({@code loopstand fault}, the live view's fault controls). The
 * plant checks the order again when it arrives ({@link FaultOrderHandler}: targets, contradictions).
 */
public final class FaultOrderCheck {
    /** Either the order or why it is refused (one line starting with "refused: "). */
    public record Result(FaultOrder order, String refusal) {
        public boolean refused() {
            return refusal != null;
        }
    }

    private final FaultLibrary library;

    public FaultOrderCheck(FaultLibrary library) {
        this.library = library;
    }

    /**
     * @param type      fault type name
     * @param targets   target ids (area, unit or connection), at least one
     * @param params    parameters as {@code name=value}
     * @param durationS how long, s, &gt; 0; null = until stopped
     * @param orderId   order id
     * @param nowMs     the order's seq and sourceTime, epoch ms
     */
    public Result start(String type, List<String> targets, List<String> params, Double durationS, String orderId, long nowMs) {
        FaultType t = type == null ? null : library.type(type).orElse(null);
        if (t == null) {
            return refuse("unknown fault type '" + type + "'; known types: " + library.names());
        }
        Map<String, Object> values = new LinkedHashMap<>();
        for (String p : params) {
            int eq = p.indexOf('=');
            if (eq < 1) {
                return refuse("--param must be name=value, got '" + p + "'");
            }
            String name = p.substring(0, eq);
            Object value = parseValue(p.substring(eq + 1));
            ParameterSpec spec = t.parameter(name).orElse(null);
            if (spec == null) {
                return refuse("fault type " + type + " has no parameter '" + name + "'; it takes "
                        + t.parameters().stream().map(ParameterSpec::name).toList());
            }
            var wrong = spec.check(value instanceof Number n ? (Object) n.doubleValue() : value);
            if (wrong.isPresent()) {
                return refuse(wrong.get());
            }
            values.put(name, value);
        }
        if (durationS != null && !(durationS > 0)) {
            return refuse("--duration-s must be greater than 0, got " + durationS);
        }
        if (orderId == null || !Ids.isValid(orderId) || targets.isEmpty() || !targets.stream().allMatch(Ids::isValid)) {
            return refuse("order id and targets must match " + Ids.PATTERN.pattern());
        }
        return new Result(new FaultOrder(nowMs, nowMs, orderId, FaultAction.START, type, targets, values, durationS), null);
    }

    /** A stop order for {@code orderId}. */
    public Result stop(String orderId, long nowMs) {
        if (orderId == null || !Ids.isValid(orderId)) {
            return refuse("order id must match " + Ids.PATTERN.pattern());
        }
        return new Result(new FaultOrder(nowMs, nowMs, orderId, FaultAction.STOP, "stop", List.of(), Map.of(), null), null);
    }

    /** A parameter value as given on a command line or a form: a number when it reads as one. */
    public static Object parseValue(String text) {
        try {
            return Double.parseDouble(text);
        } catch (NumberFormatException e) {
            return text;
        }
    }

    private static Result refuse(String why) {
        return new Result(null, "refused: " + why);
    }
}
