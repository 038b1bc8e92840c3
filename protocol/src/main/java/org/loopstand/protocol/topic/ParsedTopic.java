package org.loopstand.protocol.topic;

import java.util.List;
import java.util.Objects;

/**
 * A concrete topic of the v1 tree taken apart.
 *
 * @param site site id
 * @param kind which topic it is
 * @param ids  the ids the topic holds, in the order of {@link TopicKind#idNames()}
 */
public record ParsedTopic(String site, TopicKind kind, List<String> ids) {
    public ParsedTopic {
        Objects.requireNonNull(site, "site");
        Objects.requireNonNull(kind, "kind");
        ids = List.copyOf(ids);
        if (ids.size() != kind.idNames().size()) {
            throw new IllegalArgumentException(
                    kind + " holds ids " + kind.idNames() + " but got " + ids.size() + " ids: " + ids);
        }
    }

    /**
     * @param idName one of {@link TopicKind#idNames()}, e.g. "unit"
     * @return that id of this topic
     * @throws IllegalArgumentException if this kind of topic holds no such id
     */
    public String id(String idName) {
        int index = kind.idNames().indexOf(idName);
        if (index < 0) {
            throw new IllegalArgumentException(kind + " topics hold no '" + idName + "' id, only " + kind.idNames());
        }
        return ids.get(index);
    }

    /** @return the unit id; only for unit and field-unit topics */
    public String unit() {
        return id("unit");
    }

    /** @return the area id; only for area meter and schedule topics */
    public String area() {
        return id("area");
    }
}
