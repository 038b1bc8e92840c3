package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonValue;

/** Where a plant run is: connected and holding scenario time at 0, running, or over. */
public enum RunPhase {
    /** Connected, scenario time held at 0 until the rehearsal says go. */
    WAITING("waiting"),
    /** Scenario time runs. */
    RUNNING("running"),
    /** The scenario reached its end or the plant was stopped: nothing more is published for this run. */
    ENDED("ended");

    private final String wireName;

    RunPhase(String wireName) {
        this.wireName = wireName;
    }

    /** @return the name used on the wire */
    @JsonValue
    public String wireName() {
        return wireName;
    }
}
