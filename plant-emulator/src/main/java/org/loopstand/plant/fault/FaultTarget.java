package org.loopstand.plant.fault;

import java.util.Objects;

/** One resolved fault target: what it is and its id. */
public record FaultTarget(TargetKind kind, String id) {
    public FaultTarget {
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(id, "id");
    }

    @Override
    public String toString() {
        return kind.wireName() + " " + id;
    }
}
