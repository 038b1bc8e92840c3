package org.loopstand.app.rehearsal;

import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;

import org.loopstand.plant.cli.FaultAnnouncer;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaAce;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.ClockTick;
import org.loopstand.protocol.message.ControllerStatus;
import org.loopstand.protocol.topic.ParsedTopic;
import org.loopstand.protocol.topic.TopicTree;

/**
 * The latest of what the rehearsal shows on the terminal: scenario time and rate from the clock,
 * frequency per area from the meters, ACE and state from the controller status, active faults from
 * the plant's own fault lines (scenario faults and live fault orders alike, as applied), and the areas
 * the controller suspends and the units it excludes while it regulates the rest. Fed from bus and
 * output threads, read by the progress printer: every method is synchronized.
 */
final class ProgressView {
    private final MessageCodec codec = new MessageCodec();
    private final double durationS;
    private double scenarioS = Double.NaN;
    private double rate = Double.NaN;
    private final Map<String, Double> frequencyHz = new TreeMap<>();
    private final Map<String, Double> aceMw = new TreeMap<>();
    private String state = "-";
    private final Set<String> faults = new TreeSet<>();
    private boolean runEnded;

    ProgressView(double durationS) {
        this.durationS = durationS;
    }

    synchronized void onMessage(String topic, byte[] payload) {
        ParsedTopic t = TopicTree.parse(topic).orElse(null);
        if (t == null) {
            return;
        }
        switch (t.kind()) {
            case CLOCK -> codec.decode(payload, ClockTick.class).message().ifPresent(this::onClock);
            case AREA_METER -> codec.decode(payload, AreaMeter.class).message()
                    .ifPresent(m -> frequencyHz.put(m.area(), m.frequencyHz()));
            case CONTROLLER_STATUS -> codec.decode(payload, ControllerStatus.class).message().ifPresent(this::onStatus);
            case RUN -> codec.decode(payload, org.loopstand.protocol.message.RunState.class).message()
                    .ifPresent(r -> runEnded |= r.phase() == org.loopstand.protocol.message.RunPhase.ENDED);
            default -> {
            }
        }
    }

    private void onClock(ClockTick c) {
        scenarioS = c.scenarioTimeMs() / 1000.0;
        rate = c.rate();
    }

    private void onStatus(ControllerStatus s) {
        state = s.state().wireName() + (s.reasons().isEmpty() || "regulating".equals(s.state().wireName()) ? ""
                : "(" + String.join(",", s.reasons()) + ")");
        // while it regulates the others, the areas it holds and the units it left out, each with its reason
        if (s.suspendedAreas() != null) {
            state += s.suspendedAreas().stream().map(a -> a.area() + "(" + String.join(",", a.reasons()) + ")")
                    .collect(java.util.stream.Collectors.joining(" ", " suspended:", ""));
        }
        if (s.excludedUnits() != null) {
            state += s.excludedUnits().stream().map(u -> u.unit() + "(" + u.reason() + ")")
                    .collect(java.util.stream.Collectors.joining(" ", " excluded:", ""));
        }
        for (AreaAce a : s.areas()) {
            aceMw.put(a.area(), a.aceMw());
        }
    }

    /** Follows the plant's own announcement of faults starting and ending ({@link FaultAnnouncer}). */
    synchronized void onPlantLine(String line) {
        if (line.startsWith(FaultAnnouncer.STARTED)) {
            faults.add(firstWord(line.substring(FaultAnnouncer.STARTED.length())));
        } else if (line.startsWith(FaultAnnouncer.STOPPED)) {
            faults.remove(firstWord(line.substring(FaultAnnouncer.STOPPED.length())));
        }
    }

    private static String firstWord(String s) {
        int sp = s.indexOf(' ');
        return sp < 0 ? s : s.substring(0, sp);
    }

    /** @return one line: time, rate, per area frequency and ACE, controller state, faults */
    synchronized String line() {
        StringBuilder b = new StringBuilder();
        b.append(Double.isNaN(scenarioS) ? "t=   -  " : String.format(Locale.ROOT, "t=%5.0f/%.0f s", scenarioS, durationS));
        b.append(Double.isNaN(rate) ? "  x-" : String.format(Locale.ROOT, "  x%s", trim(rate)));
        Set<String> areas = new TreeSet<>(frequencyHz.keySet());
        areas.addAll(aceMw.keySet());
        for (String a : areas) {
            Double f = frequencyHz.get(a);
            Double ace = aceMw.get(a);
            b.append(String.format(Locale.ROOT, "  %s f=%s ACE=%s", a, f == null ? "-" : String.format(Locale.ROOT, "%.3f Hz", f),
                    ace == null ? "-" : String.format(Locale.ROOT, "%+.1f MW", ace)));
        }
        b.append("  ctl=").append(state);
        b.append("  faults=").append(faults.isEmpty() ? "none" : String.join(",", faults));
        return b.toString();
    }

    /** @return true once the plant announced the end of the run on its run topic */
    synchronized boolean runEnded() {
        return runEnded;
    }

    synchronized double scenarioS() {
        return scenarioS;
    }

    private static String trim(double v) {
        return v == Math.rint(v) ? Long.toString((long) v) : Double.toString(v);
    }
}
