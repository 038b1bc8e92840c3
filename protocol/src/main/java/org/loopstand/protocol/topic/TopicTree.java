package org.loopstand.protocol.topic;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ConcurrentHashMap;
import org.loopstand.protocol.message.Ids;

/**
 * The only place that builds and parses topic strings of the v1 tree, rooted at
 * {@code loopstand/v1/{site}}.
 *
 * <p>One instance serves one site. Builders validate every id against {@link Ids#PATTERN} and throw
 * {@link IllegalArgumentException} naming the bad id; {@link #parse(String)} never throws.
 */
public final class TopicTree {
    /** First two levels of every topic. */
    public static final String PREFIX = "loopstand/v1";

    /**
     * Topics already taken apart: a site has a few hundred topics and every received message is
     * parsed. Parsing is a pure function and the result immutable, so one cache serves every
     * thread; only valid topics are kept, and no more than {@link #MAX_PARSED_KEPT} of them.
     */
    private static final Map<String, Optional<ParsedTopic>> PARSED = new ConcurrentHashMap<>();
    private static final int MAX_PARSED_KEPT = 4096;

    private final String site;
    private final String root;

    private TopicTree(String site) {
        this.site = Ids.requireValid("site", site);
        this.root = PREFIX + "/" + site;
    }

    /**
     * @param site site id, {@link Ids#PATTERN}
     * @return the topic tree of that site
     */
    public static TopicTree forSite(String site) {
        return new TopicTree(site);
    }

    /** @return the site id */
    public String site() {
        return site;
    }

    /** @return {@code loopstand/v1/{site}} */
    public String root() {
        return root;
    }

    public String areaMeter(String area, String meter) {
        return topic(TopicKind.AREA_METER, area, meter);
    }

    public String unitTelemetry(String unit) {
        return topic(TopicKind.UNIT_TELEMETRY, unit);
    }

    public String unitCommand(String unit) {
        return topic(TopicKind.UNIT_COMMAND, unit);
    }

    public String unitAck(String unit) {
        return topic(TopicKind.UNIT_ACK, unit);
    }

    public String unitLink(String unit) {
        return topic(TopicKind.UNIT_LINK, unit);
    }

    public String areaSchedule(String area) {
        return topic(TopicKind.AREA_SCHEDULE, area);
    }

    public String controllerStatus(String controller) {
        return topic(TopicKind.CONTROLLER_STATUS, controller);
    }

    public String clock() {
        return topic(TopicKind.CLOCK);
    }

    public String run() {
        return topic(TopicKind.RUN);
    }

    public String faults() {
        return topic(TopicKind.FAULTS);
    }

    public String fieldReference(String unit) {
        return topic(TopicKind.FIELD_REFERENCE, unit);
    }

    public String fieldReading(String unit) {
        return topic(TopicKind.FIELD_READING, unit);
    }

    /**
     * @param kind which topic
     * @param ids  its ids in the order of {@link TopicKind#idNames()}
     * @return the concrete topic
     * @throws IllegalArgumentException if the number of ids is wrong or an id is invalid
     */
    public String topic(TopicKind kind, String... ids) {
        return build(kind, ids, false);
    }

    /**
     * Subscription filter for every topic of one kind in this site, e.g.
     * {@code loopstand/v1/s/area/+/meter/+}.
     */
    public String filterAll(TopicKind kind) {
        return build(kind, new String[kind.idNames().size()], true);
    }

    /** @return filter for all meters of one area: {@code …/area/{area}/meter/+} */
    public String filterAreaMeters(String area) {
        return build(TopicKind.AREA_METER, new String[] {area, null}, true);
    }

    /** @return filter for every topic of one unit below {@code …/unit/{unit}/} */
    public String filterUnit(String unit) {
        return root + "/unit/" + Ids.requireValid("unit", unit) + "/+";
    }

    /** @return filter for every topic of this site: {@code loopstand/v1/{site}/#} */
    public String filterEverything() {
        return root + "/#";
    }

    private String build(TopicKind kind, String[] ids, boolean nullIsWildcard) {
        List<String> idNames = kind.idNames();
        if (ids.length != idNames.size()) {
            throw new IllegalArgumentException(
                    kind + " topic needs ids " + idNames + " but got " + ids.length + " ids");
        }
        StringBuilder out = new StringBuilder(root);
        int next = 0;
        for (String level : kind.levelTemplate()) {
            out.append('/');
            if (TopicKind.isPlaceholder(level)) {
                String id = ids[next];
                String idName = idNames.get(next);
                next++;
                out.append(nullIsWildcard && id == null ? "+" : Ids.requireValid(idName, id));
            } else {
                out.append(level);
            }
        }
        return out.toString();
    }

    /**
     * Takes a concrete topic of any site apart.
     *
     * @param topic a topic name as received
     * @return the parsed topic, or empty if the topic is not a v1 topic of this tree (never throws)
     */
    public static Optional<ParsedTopic> parse(String topic) {
        if (topic == null) {
            return Optional.empty();
        }
        Optional<ParsedTopic> known = PARSED.get(topic);
        if (known != null) {
            return known;
        }
        Optional<ParsedTopic> parsed = parseLevels(topic);
        if (parsed.isPresent() && PARSED.size() < MAX_PARSED_KEPT) {
            PARSED.put(topic, parsed);
        }
        return parsed;
    }

    private static Optional<ParsedTopic> parseLevels(String topic) {
        String[] levels = topic.split("/", -1);
        if (levels.length < 4 || !levels[0].equals("loopstand") || !levels[1].equals("v1")
                || !Ids.isValid(levels[2])) {
            return Optional.empty();
        }
        for (TopicKind kind : TopicKind.values()) {
            List<String> template = kind.levelTemplate();
            if (template.size() != levels.length - 3) {
                continue;
            }
            List<String> ids = new ArrayList<>(kind.idNames().size());
            boolean fits = true;
            for (int i = 0; i < template.size() && fits; i++) {
                String expected = template.get(i);
                String actual = levels[i + 3];
                if (TopicKind.isPlaceholder(expected)) {
                    fits = Ids.isValid(actual);
                    ids.add(actual);
                } else {
                    fits = expected.equals(actual);
                }
            }
            if (fits) {
                return Optional.of(new ParsedTopic(levels[2], kind, ids));
            }
        }
        return Optional.empty();
    }
}
