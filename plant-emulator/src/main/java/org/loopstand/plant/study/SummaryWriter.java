package org.loopstand.plant.study;

import java.io.IOException;
import java.io.Writer;
import java.util.Map;

/**
 * Writes summary.json by hand (fixed key order, numbers as in the trace) so two runs with the same
 * inputs give the same bytes except the last line, {@code wallSeconds}.
 */
public final class SummaryWriter {
    private SummaryWriter() {
    }

    public static void write(Writer out, StudyResult r) throws IOException {
        StringBuilder sb = new StringBuilder();
        sb.append("{\n");
        sb.append("  \"siteId\": \"").append(escape(r.siteId())).append("\",\n");
        sb.append("  \"seed\": ").append(r.seed()).append(",\n");
        sb.append("  \"stepS\": ").append(DecimalText.of(r.stepS())).append(",\n");
        sb.append("  \"simulatedSeconds\": ").append(DecimalText.of(r.simulatedSeconds())).append(",\n");
        sb.append("  \"eventsApplied\": ").append(r.eventsApplied()).append(",\n");
        sb.append("  \"settled\": ").append(r.settled()).append(",\n");
        sb.append("  \"settledCriterion\": \"").append(escape(r.settledCriterion())).append("\",\n");
        section(sb, "areas", r.areas());
        section(sb, "ties", r.ties());
        section(sb, "units", r.units());
        sb.append("  \"wallSeconds\": ").append(DecimalText.of(r.wallSeconds())).append("\n");
        sb.append("}\n");
        out.append(sb);
    }

    private static void section(StringBuilder sb, String name, Map<String, Map<String, Double>> items) {
        sb.append("  \"").append(name).append("\": {");
        boolean first = true;
        for (var item : items.entrySet()) {
            sb.append(first ? "\n" : ",\n");
            first = false;
            sb.append("    \"").append(escape(item.getKey())).append("\": {");
            boolean firstValue = true;
            for (var v : item.getValue().entrySet()) {
                sb.append(firstValue ? "" : ", ");
                firstValue = false;
                sb.append('"').append(v.getKey()).append("\": ").append(DecimalText.of(v.getValue()));
            }
            sb.append('}');
        }
        sb.append(first ? "},\n" : "\n  },\n");
    }

    private static String escape(String s) {
        StringBuilder out = new StringBuilder();
        for (char c : s.toCharArray()) {
            if (c == '"' || c == '\\') {
                out.append('\\').append(c);
            } else if (c < 0x20) {
                out.append(String.format("\\u%04x", (int) c));
            } else {
                out.append(c);
            }
        }
        return out.toString();
    }
}
