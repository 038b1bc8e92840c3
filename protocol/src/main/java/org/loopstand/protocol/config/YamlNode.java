package org.loopstand.protocol.config;

import java.io.IOException;
import java.io.Reader;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;

/**
 * A YAML document read into a small tree that remembers where every key and value came from, so a
 * refusal can point at the line. Jackson's own tree forgets locations.
 */
public sealed interface YamlNode permits YamlNode.Mapping, YamlNode.Sequence, YamlNode.Scalar {
    SourceLocation location();

    /** A mapping; keys keep file order. */
    record Mapping(SourceLocation location, Map<String, Entry> entries) implements YamlNode {
        /** @return the text of a plain, non-null value under {@code key}, if there is one */
        public java.util.Optional<String> text(String key) {
            Entry e = entries.get(key);
            return e != null && e.value() instanceof Scalar s && s.token() != JsonToken.VALUE_NULL
                    ? java.util.Optional.of(s.text()) : java.util.Optional.empty();
        }
    }

    /**
     * The text of one top-level key of a YAML file, for a command that only needs to know which file
     * to read next (the site a scenario names); the file itself is read and checked by its own reader.
     *
     * @throws ConfigFileException when the file cannot be read or is not valid YAML
     */
    static java.util.Optional<String> topLevelText(Path file, String key) {
        return read(file) instanceof Mapping m ? m.text(key) : java.util.Optional.empty();
    }

    /** A key and its value; {@code keyLocation} is where the key is written. */
    record Entry(SourceLocation keyLocation, YamlNode value) {
    }

    record Sequence(SourceLocation location, List<YamlNode> items) implements YamlNode {
    }

    /** A plain value; {@code token} tells number, string, boolean or null apart. */
    record Scalar(SourceLocation location, String text, JsonToken token) implements YamlNode {
    }

    /**
     * Reads one YAML file; the path as given is the file name in messages.
     *
     * @throws ConfigFileException when the file cannot be read, on a syntax error or a duplicate key
     */
    static YamlNode read(Path file) {
        if (Files.isDirectory(file)) {
            throw new ConfigFileException(List.of(file + ": is a folder, not a file")); // it opens on Linux, then reads nothing
        }
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            return read(file.toString(), r);
        } catch (IOException e) {
            throw new ConfigFileException(List.of(YamlErrors.cannotRead(file, e)));
        }
    }

    /**
     * Reads one YAML document from text.
     *
     * @param fileName shown in messages
     * @throws ConfigFileException on a syntax error or a duplicate key, with the location
     */
    static YamlNode read(String fileName, String text) {
        try {
            return read(fileName, new StringReader(text));
        } catch (IOException e) {
            throw new ConfigFileException(List.of(fileName + ": cannot read: " + e));
        }
    }

    /**
     * Reads one YAML document.
     *
     * @param fileName shown in messages
     * @throws ConfigFileException on a syntax error or a duplicate key, with the location
     */
    static YamlNode read(String fileName, Reader reader) throws IOException {
        try (JsonParser p = new YAMLFactory().createParser(reader)) {
            JsonToken first = p.nextToken();
            if (first == null) {
                throw new ConfigFileException(List.of(fileName + ":1:1: the file is empty"));
            }
            return readValue(fileName, p);
        } catch (JsonProcessingException e) {
            throw new ConfigFileException(List.of(YamlErrors.notValid(fileName, e)));
        }
    }

    private static YamlNode readValue(String file, JsonParser p) throws IOException {
        SourceLocation at = locate(file, p);
        JsonToken token = p.currentToken();
        if (token == JsonToken.START_OBJECT) {
            Map<String, Entry> entries = new LinkedHashMap<>();
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String key = p.currentName();
                SourceLocation keyAt = locate(file, p);
                p.nextToken();
                YamlNode value = readValue(file, p);
                if (entries.putIfAbsent(key, new Entry(keyAt, value)) != null) {
                    throw new ConfigFileException(List.of(keyAt + ": key '" + key + "' appears twice (first at line "
                            + entries.get(key).keyLocation().line() + ")"));
                }
            }
            return new Mapping(at, entries);
        }
        if (token == JsonToken.START_ARRAY) {
            List<YamlNode> items = new ArrayList<>();
            while (p.nextToken() != JsonToken.END_ARRAY) {
                items.add(readValue(file, p));
            }
            return new Sequence(at, items);
        }
        return new Scalar(at, p.getText(), token);
    }

    private static SourceLocation locate(String file, JsonParser p) {
        JsonLocation l = p.currentTokenLocation();
        return new SourceLocation(file, l.getLineNr(), l.getColumnNr());
    }
}
