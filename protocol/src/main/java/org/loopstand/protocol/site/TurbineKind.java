package org.loopstand.protocol.site;

/** A unit's turbine model (docs/physics.md), as written in the site file's {@code turbine:} key. */
public enum TurbineKind {
    NON_REHEAT("nonReheat"),
    REHEAT("reheat"),
    HYDRO("hydro");

    private final String yamlName;

    TurbineKind(String yamlName) {
        this.yamlName = yamlName;
    }

    /** @return the spelling in the site file */
    public String yamlName() {
        return yamlName;
    }
}
