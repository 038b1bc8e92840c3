package org.loopstand.controller.pulsetest.plan;

/** What a plan step does; the YAML name is given by {@link #yamlName()}. */
public enum StepKind {
    /** No pulses for a while: the unit must hold its output. */
    HOLD("hold"),
    /** {@code count} equal moves in one direction, each waited out. */
    STAIRCASE("staircase"),
    /** One sustained move to the regulating limit (less a margin) and back to the start. */
    RAMP_TO_LIMIT("rampToLimit"),
    /** {@code count} single short pulses, each waited out: the unit's resolution. */
    SHORT_PULSES("shortPulses"),
    /** A move followed at once by the opposite move: the unit must turn round. */
    REVERSAL("reversal");

    private final String yamlName;

    StepKind(String yamlName) {
        this.yamlName = yamlName;
    }

    /** @return the name used in plan files */
    public String yamlName() {
        return yamlName;
    }

    /** @return the kind for a plan-file name, or null */
    public static StepKind fromYaml(String name) {
        for (StepKind k : values()) {
            if (k.yamlName.equals(name)) {
                return k;
            }
        }
        return null;
    }
}
