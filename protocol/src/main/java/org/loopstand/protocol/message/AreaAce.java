package org.loopstand.protocol.message;

import java.util.Objects;

/**
 * Area control error of one area as the controller sees it.
 *
 * @param area          area id
 * @param aceMw         raw ACE, MW
 * @param filteredAceMw filtered ACE the regulation acts on, MW
 * @param band          regulation band name (id pattern), e.g. "deadband"
 */
public record AreaAce(String area, double aceMw, double filteredAceMw, String band) {
    public AreaAce {
        Objects.requireNonNull(area, "area");
    }
}
