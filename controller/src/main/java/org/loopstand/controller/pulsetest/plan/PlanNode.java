package org.loopstand.controller.pulsetest.plan;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * A parsed YAML value with the line it starts on, so that every plan error can name file:line.
 * Jackson's tree model drops locations; this small tree keeps them.
 */
public sealed interface PlanNode permits PlanNode.MapNode, PlanNode.ListNode, PlanNode.ScalarNode {
    /** @return 1-based line in the plan file */
    int line();

    /** A mapping, keys in file order. */
    record MapNode(int line, Map<String, PlanNode> entries, Map<String, Integer> keyLines) implements PlanNode {
        public MapNode {
            entries = new LinkedHashMap<>(entries);
            keyLines = new LinkedHashMap<>(keyLines);
        }
    }

    /** A sequence. */
    record ListNode(int line, List<PlanNode> items) implements PlanNode {
        public ListNode {
            items = List.copyOf(items);
        }
    }

    /** A scalar as text; {@code null} text for YAML null. */
    record ScalarNode(int line, String text) implements PlanNode {
    }
}
