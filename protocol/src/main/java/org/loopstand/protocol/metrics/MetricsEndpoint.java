package org.loopstand.protocol.metrics;

import java.io.IOException;
import java.io.OutputStream;
import java.net.InetSocketAddress;
import java.nio.charset.StandardCharsets;
import java.util.concurrent.Executors;
import java.util.function.Supplier;

import com.sun.net.httpserver.HttpExchange;
import com.sun.net.httpserver.HttpHandler;
import com.sun.net.httpserver.HttpServer;

/**
 * {@code GET /metrics} on the JDK's own HTTP server: the page comes from a supplier, built per request
 * on the server's thread. Used alone by the controller ({@code control --metrics-port}) and as a
 * handler by the plant's live view.
 */
public final class MetricsEndpoint implements HttpHandler, AutoCloseable {
    private final Supplier<String> page;
    private HttpServer server;

    public MetricsEndpoint(Supplier<String> page) {
        this.page = page;
    }

    /**
     * Serves {@code /metrics} on its own server.
     *
     * @param bind address to listen on (loopback unless the operator says otherwise)
     * @param port TCP port, 0 = any free port
     */
    public MetricsEndpoint start(String bind, int port) throws IOException {
        server = HttpServer.create(new InetSocketAddress(bind, port), 16);
        server.createContext("/metrics", this);
        server.setExecutor(Executors.newFixedThreadPool(2, r -> {
            Thread t = new Thread(r, "metrics-http");
            t.setDaemon(true);
            return t;
        }));
        server.start();
        return this;
    }

    /** @return the port listened on (after {@link #start}) */
    public int port() {
        return server.getAddress().getPort();
    }

    @Override
    public void handle(HttpExchange exchange) throws IOException {
        try (exchange) {
            if (!"GET".equals(exchange.getRequestMethod())) {
                exchange.sendResponseHeaders(405, -1);
                return;
            }
            byte[] body = page.get().getBytes(StandardCharsets.UTF_8);
            exchange.getResponseHeaders().set("Content-Type", PrometheusText.CONTENT_TYPE);
            exchange.sendResponseHeaders(200, body.length);
            try (OutputStream out = exchange.getResponseBody()) {
                out.write(body);
            }
        }
    }

    @Override
    public void close() {
        if (server != null) {
            server.stop(0);
        }
    }
}
