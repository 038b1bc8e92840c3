package org.loopstand.plant.fault;

import java.util.ArrayList;
import java.util.List;

/** The outgoing record of one publication while the stale, clock and value faults shape it. */
public final class MessageDraft {
    private final Object truth;
    private final StreamMemory memory;
    private Object record;
    private boolean repeated;
    private long clockShiftMs;
    private final List<ValueFaults.Applied> values = new ArrayList<>();
    private double activeForS;

    MessageDraft(Object truth, StreamMemory memory) {
        this.truth = truth;
        this.record = truth;
        this.memory = memory;
    }

    public Object truth() {
        return truth;
    }

    public Object record() {
        return record;
    }

    public StreamMemory memory() {
        return memory;
    }

    /** @return seconds the fault being applied has been active */
    public double activeForS() {
        return activeForS;
    }

    void activeForS(double s) {
        this.activeForS = s;
    }

    /** The record is replaced (frozen values or timestamp). */
    public void replace(Object newRecord) {
        this.record = newRecord;
    }

    /** The publisher repeats its last message byte for byte: no value or clock fault touches it. */
    public void repeatLastSent() {
        if (memory.lastSent != null) {
            record = memory.lastSent;
            repeated = true;
        }
    }

    /** @param ms added to sourceTime, ms */
    public void shiftClockMs(long ms) {
        clockShiftMs += ms;
    }

    public void addValue(ValueFaults.Applied applied) {
        values.add(applied);
    }

    boolean repeated() {
        return repeated;
    }

    long clockShiftMs() {
        return clockShiftMs;
    }

    List<ValueFaults.Applied> values() {
        return values;
    }
}
