package org.loopstand.plant.fault;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.junit.jupiter.api.Test;
import org.loopstand.plant.scenario.ScenarioDocs;
import org.loopstand.protocol.codec.Decoded;
import org.loopstand.protocol.codec.MessageCodec;
import org.loopstand.protocol.message.FaultOrder;

/** docs/faults.md against the code: its tables are the libraries', its examples parse and are accepted. */
class FaultDocsTest {
    private static final Path DOC = Path.of("..", "docs", "faults.md");

    private static String doc() throws Exception {
        return Files.readString(DOC, StandardCharsets.UTF_8);
    }

    private static String between(String text, String marker) {
        int a = text.indexOf("<!-- " + marker + " -->\n");
        int b = text.indexOf("<!-- /" + marker + " -->");
        assertThat(a).as(marker).isNotNegative();
        return text.substring(a + ("<!-- " + marker + " -->\n").length(), b);
    }

    @Test
    void shouldCarryTheFaultAndCheckTablesAsTheCodeWritesThem() throws Exception {
        String text = doc();
        assertThat(between(text, "fault-table")).isEqualTo(ScenarioDocs.faultTable());
        assertThat(between(text, "check-table")).isEqualTo(ScenarioDocs.checkTable());
    }

    @Test
    void shouldHaveFaultOrderExamplesThatDecodeAndThePlantAccepts() throws Exception {
        List<String> orders = new ArrayList<>();
        Matcher m = Pattern.compile("```json\\n(.*?)```", Pattern.DOTALL).matcher(doc());
        while (m.find()) {
            StringBuilder current = new StringBuilder();
            for (String line : m.group(1).split("\n")) {
                if (line.startsWith("{") && current.length() > 0) {
                    orders.add(current.toString());
                    current.setLength(0);
                }
                current.append(line);
            }
            orders.add(current.toString());
        }
        assertThat(orders).hasSize(3);
        FaultRig rig = new FaultRig();
        FaultOrderHandler handler = new FaultOrderHandler(rig.engine, FaultLibrary.standard(), rig.catalog, new MessageCodec(),
                FaultObserver.NONE, rig.clock);
        for (String json : orders) {
            Decoded<FaultOrder> d = new MessageCodec().decode(json.getBytes(StandardCharsets.UTF_8), FaultOrder.class);
            assertThat(d).as(json).isInstanceOf(Decoded.Ok.class);
            assertThat(handler.handle(((Decoded.Ok<FaultOrder>) d).value())).as(json).isEmpty();
        }
        assertThat(rig.transitions).containsExactly("start op-7 at 0", "start op-8 at 0", "stop op-8 at 0");
    }
}
