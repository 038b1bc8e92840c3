package org.loopstand.protocol.cli;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;

/**
 * Option spellings kept working for one release after a rename, each with its new name. A command
 * declares the old spelling as an alias of the new option (picocli {@code names = {"--new", "--old"}})
 * and calls {@link #warn} with its original arguments: every old spelling used gives one
 * {@code deprecated:} line, so scripts keep running while their authors learn the new name.
 * The names shared by every command are listed in README.md ("Option names").
 */
public final class OldSpellings {
    /** The release in which the old spellings stop working. */
    public static final String REMOVED_IN = "0.2.0";

    private final Map<String, String> newByOld = new LinkedHashMap<>();

    private OldSpellings() {
    }

    /** @param oldAndNew pairs: old spelling, new spelling, … */
    public static OldSpellings of(String... oldAndNew) {
        OldSpellings s = new OldSpellings();
        s.newByOld.putAll(pairs(oldAndNew));
        return s;
    }

    /** @return the new name by the old one, from pairs old, new, … (also for renamed keys of files) */
    public static Map<String, String> pairs(String... oldAndNew) {
        if (oldAndNew.length % 2 != 0) {
            throw new IllegalArgumentException("old and new spellings come in pairs, got " + oldAndNew.length + " names");
        }
        Map<String, String> newByOld = new LinkedHashMap<>();
        for (int i = 0; i < oldAndNew.length; i += 2) {
            newByOld.put(oldAndNew[i], oldAndNew[i + 1]);
        }
        return newByOld;
    }

    /** @return one line per old spelling among {@code args} ({@code --old} or {@code --old=value}), in order */
    public List<String> lines(List<String> args) {
        List<String> out = new ArrayList<>();
        for (String a : args) {
            if ("--".equals(a)) {
                break; // the rest are positional parameters
            }
            String name = a.contains("=") ? a.substring(0, a.indexOf('=')) : a;
            String renamed = newByOld.get(name);
            if (renamed != null) {
                out.add("deprecated: " + name + " is now " + renamed + "; the old spelling goes in release " + REMOVED_IN);
            }
        }
        return out;
    }

    /** Tells {@code err} about every old spelling among {@code args}. @return how many there were */
    public int warn(List<String> args, Consumer<String> err) {
        List<String> l = lines(args);
        l.forEach(err);
        return l.size();
    }
}
