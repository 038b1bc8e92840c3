package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.function.Consumer;

import org.loopstand.protocol.agent.Agent;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.Clock;

/**
 * The fault stage on a unit's inbound commands, between the decoded command and the unit plant
 * interface: drop, delay and duplicate. Delayed commands are released by {@link #doWork()} on the
 * injected clock (they keep their validUntil, so a long delay makes them expire on the way).
 * Single-threaded: the unit's agent calls every method.
 */
public final class CommandFaultStage implements Agent {
    /** Fates told to the observer. */
    public static final String PASSED = "passed";
    public static final String DROPPED = "dropped";
    public static final String DELAYED = "delayed";
    public static final String DUPLICATED = "duplicated";
    public static final String QUEUE_FULL = "queueFull";

    private final String unit;
    private final FaultEngine engine;
    private final Clock clock;
    private final Consumer<UnitCommand> downstream;
    private final FaultObserver observer;
    private final SplittableRandom random;
    private final DelayLine<UnitCommand> delayLine;

    /**
     * @param downstream the unit plant interface's command entry
     * @param seed       seeds drop, duplicate and jitter draws
     */
    public CommandFaultStage(String unit, FaultEngine engine, Clock clock, Consumer<UnitCommand> downstream,
            FaultObserver observer, long seed, int delayCapacity) {
        this.unit = unit;
        this.engine = engine;
        this.clock = clock;
        this.downstream = downstream;
        this.observer = observer;
        this.random = new SplittableRandom(seed);
        this.delayLine = new DelayLine<>(delayCapacity);
    }

    /** Takes one command that arrived for this unit. */
    public void offer(UnitCommand command) {
        List<FaultSpec> faults = engine.active(FaultCategory.COMMAND, TargetKind.UNIT, unit);
        List<String> ids = faults.stream().map(FaultSpec::id).toList();
        long delayMs = 0;
        int copies = 1;
        for (FaultSpec f : faults) {
            if (!(f.behaviour() instanceof CommandFault cf)) {
                continue;
            }
            if (cf.drops(random)) {
                observer.commandPassed(clock.epochMillis(), command, DROPPED, ids);
                return;
            }
            delayMs += cf.delayMs(random);
            copies += cf.extraCopies(random);
        }
        List<String> touched = new ArrayList<>(ids);
        for (int c = 0; c < copies; c++) {
            String fate = c > 0 ? DUPLICATED : delayMs > 0 ? DELAYED : PASSED;
            if (delayMs == 0) {
                observer.commandPassed(clock.epochMillis(), command, fate, touched);
                downstream.accept(command);
            } else if (delayLine.offer(clock.monotonicNanos() + delayMs * 1_000_000L, command)) {
                observer.commandPassed(clock.epochMillis(), command, fate, touched);
            } else {
                observer.commandPassed(clock.epochMillis(), command, QUEUE_FULL, touched);
            }
        }
    }

    /** Hands over the delayed commands that are due. @return how many */
    @Override
    public int doWork() {
        List<UnitCommand> due = delayLine.due(clock.monotonicNanos());
        due.forEach(downstream);
        return due.size();
    }

    @Override
    public String roleName() {
        return "command-faults-" + unit;
    }

    public int held() {
        return delayLine.size();
    }
}
