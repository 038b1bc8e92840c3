package org.loopstand.plant.runtime;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.loopstand.plant.fault.CommandFaultStage;
import org.loopstand.plant.fault.CommandOutcomeListener;
import org.loopstand.plant.fault.FaultEngine;
import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultObserver;
import org.loopstand.plant.fault.FaultOrderHandler;
import org.loopstand.plant.fault.FaultyPublisher;
import org.loopstand.plant.fault.TargetCatalog;
import org.loopstand.plant.physics.GridSimulator;
import org.loopstand.protocol.bus.Qos;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.AreaMeter;
import org.loopstand.protocol.message.UnitCommand;
import org.loopstand.protocol.time.Clock;

/**
 * Puts the fault stages into a plant: meters publish through a {@link FaultyPublisher} on the plant
 * connection, each in-process unit's telemetry through one on its own connection, its commands
 * through a {@link CommandFaultStage}, and its plant interface reads the engine's plant fault flags.
 * Live fault orders on the faults topic go to a {@link FaultOrderHandler}. Everything runs on the
 * plant agent's thread, in {@link #update}.
 */
public final class FaultHooks {
    /** Order types the plant's {@link OperatorOrders} handles on the same topic. */
    public static final Set<String> OPERATOR_ORDER_TYPES = Set.of("returnToRemote", "setControlMode", "unitLinkDown");
    /** Most messages (or commands) each stage holds back at once. */
    public static final int DELAY_CAPACITY = FaultyPublisher.DEFAULT_DELAY_CAPACITY;

    private final FaultEngine engine;
    private final FaultyPublisher meters;
    private final List<FaultyPublisher> telemetry = new ArrayList<>();
    private final Map<String, CommandFaultStage> commandStages = new HashMap<>();
    private final FaultOrderHandler orders;

    private FaultHooks(FaultEngine engine, FaultyPublisher meters, FaultOrderHandler orders) {
        this.engine = engine;
        this.meters = meters;
        this.orders = orders;
    }

    /**
     * Wires the faults into a built (not yet started) plant.
     *
     * @param engine   the fault windows (scenario faults scheduled already)
     * @param observer journal and run record
     * @param commands told what became of every command (the run record), or {@link CommandOutcomeListener#NONE}
     * @param seed     seeds the stages' random draws
     * @param live     true: take fault orders from the faults topic
     */
    public static FaultHooks wire(PlantRunner plant, FaultEngine engine, FaultObserver observer, CommandOutcomeListener commands,
            Clock clock, long seed, boolean live) {
        TargetCatalog catalog = TargetCatalog.of(plant.sim().grid());
        MessageCodec codec = new MessageCodec();
        FaultyPublisher meterStage = new FaultyPublisher(TargetCatalog.PLANT_CONNECTION, plant.plantBus(), plant.topics(), codec,
                engine, catalog, observer, clock, Qos.AT_MOST_ONCE, seed, DELAY_CAPACITY);
        FaultOrderHandler handler = null;
        if (live) {
            handler = new FaultOrderHandler(engine, FaultLibrary.standard(), catalog, codec, observer, clock, OPERATOR_ORDER_TYPES);
            handler.subscribe(plant.plantBus(), plant.topics());
        }
        FaultHooks hooks = new FaultHooks(engine, meterStage, handler);
        registerLinks(plant, engine, clock);
        long n = 1;
        for (UnitDutyCycle cycle : plant.unitCycles()) {
            String unit = cycle.unit().unitId();
            FaultyPublisher t = new FaultyPublisher(unit, cycle.link().bus(), plant.topics(), codec, engine, catalog, observer,
                    clock, cycle.link().telemetryQos(), seed + n, DELAY_CAPACITY);
            cycle.link().setTelemetryFaults(t);
            hooks.telemetry.add(t);
            hooks.commandStages.put(unit, new CommandFaultStage(unit, engine, clock,
                    c -> cycle.unit().onCommand(c, clock.monotonicNanos()), observer, seed + 1000 + n, DELAY_CAPACITY));
            cycle.unit().setFaultFlags(engine.plantFlags(unit));
            cycle.unit().setCommandListener(commands);
            cycle.attachFaults(hooks);
            n++;
        }
        plant.agent().attachFaults(hooks);
        return hooks;
    }

    /**
     * Lets connection faults cut the real connections: {@code plant} names the plant connection, a unit id
     * the connection that unit's link uses (in the grouped modes a shared one: cutting it cuts its
     * other units too). Buses of other kinds are not registered; the publication stage emulates them.
     */
    private static void registerLinks(PlantRunner plant, FaultEngine engine, Clock clock) {
        Map<org.loopstand.protocol.bus.MessageBus, BusLinkFaults> byBus = new java.util.IdentityHashMap<>();
        BusLinkFaults p = BusLinkFaults.forBus(plant.plantBus(), clock);
        if (p != null) {
            byBus.put(plant.plantBus(), p);
            engine.registerLink(TargetCatalog.PLANT_CONNECTION, p);
        }
        for (UnitDutyCycle cycle : plant.unitCycles()) {
            var bus = cycle.link().bus();
            BusLinkFaults c = byBus.computeIfAbsent(bus, b -> BusLinkFaults.forBus(b, clock));
            if (c != null) {
                engine.registerLink(cycle.unit().unitId(), c);
            }
        }
    }

    public FaultEngine engine() {
        return engine;
    }

    /**
     * Plant thread: applies a live order handed over directly (the live view), exactly as one that
     * came on the faults topic; works while the plant's own connection is cut.
     *
     * @return why it was refused, if it was (already told to the observer)
     */
    public java.util.Optional<String> applyOrder(org.loopstand.protocol.message.FaultOrder order) {
        if (orders == null) {
            return java.util.Optional.of("order " + order.orderId() + " refused: this plant takes no live fault orders");
        }
        return orders.handle(order);
    }

    /** Plant thread: live orders, fault transitions, held messages and commands due, plant trips. @return work done */
    int update(GridSimulator sim) {
        int work = orders == null ? 0 : orders.doWork();
        work += engine.update();
        work += meters.doWork();
        for (FaultyPublisher t : telemetry) {
            work += t.doWork();
        }
        for (CommandFaultStage s : commandStages.values()) {
            work += s.doWork();
        }
        for (var u : sim.grid().units()) {
            if (engine.tripOrdered(u.id()) && !sim.isTripped(u.id())) {
                sim.trip(u.id());
                work++;
            }
        }
        return work;
    }

    void publishMeter(AreaMeter reading) {
        meters.publishMeter(reading);
    }

    /** @return true when a command fault took the command (it reaches the unit later, or never) */
    boolean interceptCommand(String unit, UnitCommand command) {
        CommandFaultStage stage = commandStages.get(unit);
        if (stage == null || engine.active(org.loopstand.plant.fault.FaultCategory.COMMAND,
                org.loopstand.plant.fault.TargetKind.UNIT, unit).isEmpty()) {
            return false;
        }
        stage.offer(command);
        return true;
    }
}
