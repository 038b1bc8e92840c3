package org.loopstand.brokernode.cli;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.loopstand.brokernode.BrokerNode;

/**
 * Reads orders from the node's standard input: {@code counters LABEL} writes the node's counters to
 * {@code DIR/counters-NAME-LABEL.properties}. The hosts bench orders them at its window's start and end. A label is
 * letters, digits and '-' only (it becomes part of a file name); anything else is answered on standard error.
 */
final class CountersOrders {
    private CountersOrders() {
    }

    static void start(BrokerNode node, Path dir, String nodeName) throws IOException {
        Files.createDirectories(dir);
        Thread t = new Thread(() -> {
            try (BufferedReader in = new BufferedReader(new InputStreamReader(System.in, StandardCharsets.UTF_8))) {
                for (String line; (line = in.readLine()) != null; ) {
                    handle(node, dir, nodeName, line.strip());
                }
            } catch (IOException e) {
                System.err.println("broker-node: standard input: " + e.getMessage());
            }
        }, "broker-node-orders");
        t.setDaemon(true);
        t.start();
    }

    static void handle(BrokerNode node, Path dir, String nodeName, String line) {
        String[] words = line.split("\\s+");
        if (line.isEmpty()) {
            return;
        }
        if (words.length != 2 || !words[0].equals("counters") || !words[1].matches("[A-Za-z0-9-]{1,40}")) {
            System.err.println("broker-node: order '" + line + "' not understood: expected 'counters LABEL' (LABEL: letters,"
                    + " digits, '-')");
            return;
        }
        try {
            node.writeCounters(dir.resolve("counters-" + nodeName + "-" + words[1] + ".properties"));
            System.out.println("counters " + words[1] + " written");
        } catch (Exception e) {
            System.err.println("broker-node: counters " + words[1] + " not written: " + e);
        }
        System.out.flush();
    }
}
