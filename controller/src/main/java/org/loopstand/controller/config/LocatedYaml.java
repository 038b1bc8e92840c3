package org.loopstand.controller.config;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import java.io.IOException;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * A YAML document as a Jackson tree plus the line of every value, keyed by JSON pointer, so that a
 * refusal can name {@code file:line}. Jackson's tree itself forgets locations.
 */
final class LocatedYaml {
    private final String fileName;
    private final JsonNode root;
    private final Map<String, Integer> lines;

    private LocatedYaml(String fileName, JsonNode root, Map<String, Integer> lines) {
        this.fileName = fileName;
        this.root = root;
        this.lines = lines;
    }

    static LocatedYaml parse(String fileName, String text) {
        YAMLFactory factory = new YAMLFactory();
        Map<String, Integer> lines = new HashMap<>();
        try (JsonParser p = factory.createParser(text)) {
            JsonToken t;
            while ((t = p.nextToken()) != null) {
                if (t == JsonToken.FIELD_NAME || t.isScalarValue() || t.isStructStart()) {
                    String pointer = p.getParsingContext().pathAsPointer().toString();
                    if (t.isStructStart()) {
                        pointer = p.getParsingContext().getParent() == null ? ""
                                : p.getParsingContext().getParent().pathAsPointer().toString();
                    }
                    lines.putIfAbsent(pointer, p.currentLocation().getLineNr());
                }
            }
            JsonNode root = new ObjectMapper(factory).readTree(text);
            if (root == null || root.isMissingNode() || root.isNull()) {
                throw new ControllerConfigException(List.of(fileName + ":1: the file is empty"));
            }
            return new LocatedYaml(fileName, root, lines);
        } catch (JsonProcessingException e) {
            int line = e.getLocation() == null ? 1 : e.getLocation().getLineNr();
            throw new ControllerConfigException(List.of(fileName + ":" + line + ": not valid YAML: "
                    + e.getOriginalMessage()));
        } catch (IOException e) {
            throw new ControllerConfigException(List.of(fileName + ": cannot read: " + e.getMessage()));
        }
    }

    JsonNode root() {
        return root;
    }

    /** @return {@code file:line} of the value at a JSON pointer, or of its nearest parent that has one */
    String where(String pointer) {
        String p = pointer;
        while (true) {
            Integer line = lines.get(p);
            if (line != null) {
                return fileName + ":" + line;
            }
            if (p.isEmpty()) {
                return fileName + ":1";
            }
            p = p.substring(0, p.lastIndexOf('/'));
        }
    }
}
