package org.loopstand.protocol.config;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;

import org.loopstand.protocol.cli.OldSpellings;

/**
 * Top-level keys of a configuration file kept working for one release after a rename, each with its
 * new name, as {@link OldSpellings} does for options. The reader accepts both
 * ({@link MappingReader#renamedKey}); the command that reads the file calls {@link #warn} so that
 * every old key written gives one {@code deprecated:} line at its place.
 */
public final class OldKeys {
    /** A scenario names its site with {@code siteId:}, the key the site file itself uses. */
    public static final OldKeys SCENARIO = of("site", "siteId");

    private final Map<String, String> newByOld;

    private OldKeys(Map<String, String> newByOld) {
        this.newByOld = newByOld;
    }

    /** @param oldAndNew pairs: old key, new key, … */
    public static OldKeys of(String... oldAndNew) {
        return new OldKeys(OldSpellings.pairs(oldAndNew));
    }

    /** @return one {@code FILE:LINE:COLUMN: deprecated: …} line per old top-level key of {@code root}, in file order */
    public List<String> lines(YamlNode root) {
        List<String> out = new ArrayList<>();
        if (root instanceof YamlNode.Mapping m) {
            m.entries().forEach((key, entry) -> {
                String renamed = newByOld.get(key);
                if (renamed != null) {
                    out.add(entry.keyLocation() + ": deprecated: key '" + key + "' is now '" + renamed
                            + "'; the old spelling goes in release " + OldSpellings.REMOVED_IN);
                }
            });
        }
        return out;
    }

    /**
     * Tells {@code err} about every old key of the file; a file that cannot be read says nothing here
     * (its reader refuses it).
     *
     * @return how many old keys there were
     */
    public int warn(Path file, Consumer<String> err) {
        List<String> l;
        try {
            l = lines(YamlNode.read(file));
        } catch (ConfigFileException e) {
            return 0;
        }
        l.forEach(err);
        return l.size();
    }
}
