package org.loopstand.protocol.message;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonProperty;
import java.util.Collection;
import java.util.Collections;
import java.util.EnumSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;

/**
 * IEC 61850-7-3 style quality of a measured value.
 *
 * @param validity good, questionable or invalid
 * @param flags    detail flags; held and encoded in declaration order of {@link QualityFlag}
 */
public record Quality(Validity validity, Set<QualityFlag> flags) {
    /** Good, no flags. */
    public static final Quality GOOD = new Quality(Validity.GOOD, Set.of());

    public Quality {
        Objects.requireNonNull(validity, "validity");
        flags = copyInOrder(flags);
    }

    /** @return a quality with the given validity and flags */
    public static Quality of(Validity validity, QualityFlag... flags) {
        return new Quality(validity, Set.of(flags));
    }

    /**
     * JSON entry: takes the flags as a list so that a repeated flag is refused rather than merged
     * silently.
     */
    @JsonCreator
    static Quality fromJson(@JsonProperty("validity") Validity validity,
            @JsonProperty("flags") List<QualityFlag> flags) {
        Set<QualityFlag> set = copyInOrder(flags);
        if (set.size() != flags.size()) {
            throw new IllegalArgumentException("flags: each quality flag may appear once, got " + flags);
        }
        return new Quality(validity, set);
    }

    /** @return whether the flag is set */
    public boolean has(QualityFlag flag) {
        return flags.contains(flag);
    }

    private static Set<QualityFlag> copyInOrder(Collection<QualityFlag> flags) {
        EnumSet<QualityFlag> copy = EnumSet.noneOf(QualityFlag.class);
        for (QualityFlag flag : flags) {
            copy.add(Objects.requireNonNull(flag, "quality flag"));
        }
        return Collections.unmodifiableSet(copy);
    }
}
