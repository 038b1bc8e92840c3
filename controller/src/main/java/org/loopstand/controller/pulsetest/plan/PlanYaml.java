package org.loopstand.controller.pulsetest.plan;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import java.io.IOException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** Reads YAML text into a {@link PlanNode} tree that remembers line numbers. */
final class PlanYaml {
    private static final YAMLFactory FACTORY = new YAMLFactory();

    private PlanYaml() {
    }

    /**
     * @param text   YAML text
     * @param source file name for messages
     * @return the document's root node
     * @throws PlanException on a YAML syntax error or an empty document
     */
    static PlanNode parse(String text, String source) {
        try (JsonParser p = FACTORY.createParser(text)) {
            JsonToken t = p.nextToken();
            if (t == null) {
                throw new PlanException(List.of(source + ":1: the plan file is empty"));
            }
            return read(p, t, source);
        } catch (JsonProcessingException e) {
            int line = e.getLocation() == null ? 1 : e.getLocation().getLineNr();
            throw new PlanException(List.of(source + ":" + line + ": YAML syntax error: " + e.getOriginalMessage()));
        } catch (IOException e) {
            throw new PlanException(List.of(source + ": cannot read: " + e.getMessage()));
        }
    }

    private static PlanNode read(JsonParser p, JsonToken t, String source) throws IOException {
        int line = p.currentTokenLocation().getLineNr();
        switch (t) {
            case START_OBJECT -> {
                Map<String, PlanNode> entries = new LinkedHashMap<>();
                Map<String, Integer> keyLines = new LinkedHashMap<>();
                List<String> duplicates = new ArrayList<>();
                while (p.nextToken() == JsonToken.FIELD_NAME) {
                    String key = p.currentName();
                    int keyLine = p.currentTokenLocation().getLineNr();
                    PlanNode value = read(p, p.nextToken(), source);
                    if (entries.containsKey(key)) {
                        duplicates.add(source + ":" + keyLine + ": key '" + key + "' appears twice");
                    }
                    entries.put(key, value);
                    keyLines.put(key, keyLine);
                }
                if (!duplicates.isEmpty()) {
                    throw new PlanException(duplicates);
                }
                return new PlanNode.MapNode(line, entries, keyLines);
            }
            case START_ARRAY -> {
                List<PlanNode> items = new ArrayList<>();
                JsonToken next;
                while ((next = p.nextToken()) != JsonToken.END_ARRAY) {
                    items.add(read(p, next, source));
                }
                return new PlanNode.ListNode(line, items);
            }
            case VALUE_NULL -> {
                return new PlanNode.ScalarNode(line, null);
            }
            default -> {
                return new PlanNode.ScalarNode(line, p.getText());
            }
        }
    }
}
