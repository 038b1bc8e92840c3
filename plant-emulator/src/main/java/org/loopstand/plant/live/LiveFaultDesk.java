package org.loopstand.plant.live;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.concurrent.atomic.LongAdder;

import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultOrderCheck;
import org.loopstand.plant.runtime.FaultHooks;
import org.loopstand.plant.runtime.PlantAgent;
import org.loopstand.protocol.message.FaultOrder;
import org.loopstand.protocol.time.Clock;

/**
 * The live view's fault controls: an order from the page is checked with the same rules and words as
 * {@code loopstand fault start|stop} ({@link FaultOrderCheck}), journaled as an event
 * {@code liveFaultAction} with who (the name given on the page and the remote address) and when (the
 * plant's injected clock), then applied on the plant thread by the same handler as an order from the
 * faults topic, whose verdict is returned.
 */
public final class LiveFaultDesk {
    /** What became of one request from the page. */
    public record Answer(boolean done, String text) {
    }

    private final FaultOrderCheck check = new FaultOrderCheck(FaultLibrary.standard());
    private final PlantAgent agent;
    private final FaultHooks hooks;
    private final Clock clock;
    private final Map<String, LongAdder> actions = new ConcurrentHashMap<>();

    /** @param clock the plant's injected clock: stamps order ids and seq */
    public LiveFaultDesk(PlantAgent agent, FaultHooks hooks, Clock clock) {
        this.agent = agent;
        this.hooks = hooks;
        this.clock = clock;
    }

    /**
     * Any thread: starts a fault.
     *
     * @param params    parameters as {@code name=value}
     * @param who       the name given on the page (may be blank)
     * @param from      the request's remote address
     */
    public Answer start(String type, List<String> targets, List<String> params, Double durationS, String orderId,
                        String who, String from) {
        long now = clock.epochMillis();
        FaultOrderCheck.Result r = check.start(type, targets, params, durationS,
                orderId == null || orderId.isBlank() ? "live-" + now : orderId.trim(), now);
        return apply("start", r, type, who, from);
    }

    /** Any thread: stops the fault started by order {@code orderId}. */
    public Answer stop(String orderId, String who, String from) {
        return apply("stop", check.stop(orderId, clock.epochMillis()), "stop", who, from);
    }

    private Answer apply(String action, FaultOrderCheck.Result r, String type, String who, String from) {
        Map<String, Object> event = new LinkedHashMap<>();
        event.put("event", "liveFaultAction");
        event.put("action", action);
        event.put("by", who == null || who.isBlank() ? "unnamed" : who.trim());
        event.put("from", from);
        if (r.refused()) {
            event.put("faultType", type);
            event.put("result", "refused");
            event.put("detail", r.refusal());
            agent.noteEvent(event);
            count(action, "refused");
            return new Answer(false, r.refusal());
        }
        FaultOrder o = r.order();
        if (agent.finished()) {
            count(action, "refused");
            return new Answer(false, "refused: the scenario is over; faults can no longer be started or stopped");
        }
        event.put("orderId", o.orderId());
        event.put("faultType", o.faultType());
        event.put("targets", o.targets());
        event.put("parameters", o.parameters());
        if (o.durationS() != null) {
            event.put("durationS", o.durationS());
        }
        CompletableFuture<Optional<String>> verdict = new CompletableFuture<>();
        agent.runOnLoop(() -> verdict.complete(hooks.applyOrder(o)));
        Optional<String> why;
        try {
            why = verdict.get(5, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            why = Optional.of("interrupted before the plant answered");
        } catch (ExecutionException | TimeoutException e) {
            why = Optional.of("the plant loop did not answer within 5 s (is the run over?)");
        }
        event.put("result", why.isPresent() ? "refused" : "applied");
        why.ifPresent(w -> event.put("detail", w));
        agent.noteEvent(event);
        count(action, why.isPresent() ? "refused" : "applied");
        return why.map(w -> new Answer(false, "refused: " + w))
                .orElseGet(() -> new Answer(true, ("start".equals(action) ? "started" : "stopped") + " fault order "
                        + o.orderId() + ("start".equals(action) ? " (" + o.faultType() + " on " + o.targets() + ")" : "")));
    }

    private void count(String action, String result) {
        actions.computeIfAbsent(action + "|" + result, k -> new LongAdder()).increment();
    }

    /** @return actions so far by "action|result" (start/stop, applied/refused) */
    public Map<String, Long> actionCounts() {
        Map<String, Long> out = new java.util.TreeMap<>();
        actions.forEach((k, v) -> out.put(k, v.sum()));
        return out;
    }

    /** @return lines of a form's parameter box: one {@code name=value} per non-blank line */
    static List<String> paramLines(String box) {
        List<String> out = new ArrayList<>();
        if (box != null) {
            for (String line : box.split("[\\r\\n]+")) {
                if (!line.isBlank()) {
                    out.add(line.trim());
                }
            }
        }
        return out;
    }
}
