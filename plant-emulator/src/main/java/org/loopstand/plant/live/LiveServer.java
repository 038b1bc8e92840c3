package org.loopstand.plant.live;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.URLDecoder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;

import com.sun.net.httpserver.HttpExchange;
import com.sun.net.httpserver.HttpServer;
import org.loopstand.plant.fault.FaultLibrary;
import org.loopstand.plant.fault.FaultType;
import org.loopstand.plant.fault.ParameterSpec;
import org.loopstand.protocol.metrics.MetricsEndpoint;
import org.loopstand.report.html.ReportAssets;

/**
 * The live view over the JDK's own HTTP server ({@code com.sun.net.httpserver}: no extra library, and
 * a page, a few JSON answers and one event stream need nothing more). Routes: {@code /} the page,
 * {@code /assets/*} its script, style and uPlot (served from the webjar, nothing from the internet),
 * {@code /events} server-sent events (the history, then each snapshot, then the report's address),
 * {@code /api/faults} the fault library, {@code /api/pages} how many pages are open, {@code POST /api/faults/start|stop} the fault controls (only
 * when enabled), {@code /metrics} the Prometheus page, {@code /report.html} the run's report once
 * written. With a token every request must carry it ({@code Authorization: Bearer T} or
 * {@code ?token=T}), else 401.
 */
public final class LiveServer implements AutoCloseable {
    /** Caution shown on the page above the fault controls. */
    public static final String CAUTION = "Caution: fault controls act on the running rig at once. They are offered only"
            + " on the embedded broker or a broker declared a test broker; never point this rig at a live plant."
            + " Local grid codes, site procedures and licensed practice take precedence.";
    static final int MAX_STREAMS = 8;
    /**
     * Header every fault action must carry. A page from elsewhere open in the same browser could send
     * a plain form POST to this loopback port; it cannot add a header of its own without the browser
     * asking this server first (a CORS preflight), which this server never approves.
     */
    public static final String ACTION_HEADER = "X-Loopstand-Live";

    private final HttpServer server;
    private final ExecutorService pool;
    private final LiveEventStream events;
    private final LiveFaultDesk desk;
    private final byte[] token;
    private final Map<String, Asset> assets = new LinkedHashMap<>();
    private final String site;

    private record Asset(String contentType, byte[] body) {
    }

    /**
     * @param bind      address to listen on
     * @param port      TCP port, 0 = any free port
     * @param token     required on every request, or null (loopback only: the caller enforces that)
     * @param desk      fault controls, or null to offer none
     * @param report    where the run's report will be written, or null
     */
    public LiveServer(String bind, int port, String token, String site, LiveFeed feed, LiveFaultDesk desk,
                      PlantMetricsPage metrics, Path report) throws IOException {
        this.token = token == null ? null : token.getBytes(StandardCharsets.UTF_8);
        this.desk = desk;
        this.site = site;
        this.events = new LiveEventStream(feed, report, MAX_STREAMS);
        assets.put("/", new Asset("text/html; charset=utf-8", resource("live.html")));
        assets.put("/assets/live.js", new Asset("text/javascript; charset=utf-8", resource("live.js")));
        assets.put("/assets/live.css", new Asset("text/css; charset=utf-8", resource("live.css")));
        assets.put("/assets/uPlot.js", new Asset("text/javascript; charset=utf-8",
                ReportAssets.uplotJs().getBytes(StandardCharsets.UTF_8)));
        assets.put("/assets/uPlot.css", new Asset("text/css; charset=utf-8", ReportAssets.uplotCss().getBytes(StandardCharsets.UTF_8)));
        this.server = HttpServer.create(new InetSocketAddress(InetAddress.getByName(bind), port), 32);
        this.pool = Executors.newFixedThreadPool(MAX_STREAMS + 4, r -> {
            Thread t = new Thread(r, "live-http");
            t.setDaemon(true);
            return t;
        });
        server.setExecutor(pool);
        MetricsEndpoint metricsHandler = new MetricsEndpoint(metrics);
        server.createContext("/", ex -> guarded(ex, () -> route(ex, metricsHandler, report)));
        server.start();
    }

    /** @return the port listened on */
    public int port() {
        return server.getAddress().getPort();
    }

    private interface Work {
        void run() throws IOException;
    }

    private void guarded(HttpExchange ex, Work w) throws IOException {
        try (ex) {
            if (token != null && !tokenGiven(ex)) {
                send(ex, 401, "text/plain; charset=utf-8", "refused: this live view needs its token"
                        + " (Authorization: Bearer TOKEN, or ?token=TOKEN)");
                return;
            }
            w.run();
        } catch (IOException | UncheckedIOException e) {
            // the browser went away; nothing to tell it
        }
    }

    private boolean tokenGiven(HttpExchange ex) {
        String auth = ex.getRequestHeaders().getFirst("Authorization");
        String given = auth != null && auth.startsWith("Bearer ") ? auth.substring(7).trim()
                : query(ex).getOrDefault("token", "");
        return MessageDigest.isEqual(token, given.getBytes(StandardCharsets.UTF_8));
    }

    private void route(HttpExchange ex, MetricsEndpoint metrics, Path report) throws IOException {
        String path = ex.getRequestURI().getPath();
        String method = ex.getRequestMethod();
        if ("POST".equals(method) && path.startsWith("/api/faults/")) {
            faultAction(ex, path.substring("/api/faults/".length()));
        } else if (!"GET".equals(method)) {
            send(ex, 405, "text/plain; charset=utf-8", "only GET here");
        } else if (assets.containsKey(path)) {
            Asset a = assets.get(path);
            send(ex, 200, a.contentType(), a.body());
        } else if ("/events".equals(path)) {
            events.serve(ex);
        } else if ("/metrics".equals(path)) {
            metrics.handle(ex);
        } else if ("/api/pages".equals(path)) {
            send(ex, 200, "application/json", "{\"open\":" + events.openStreams() + "}");
        } else if ("/api/faults".equals(path)) {
            send(ex, 200, "application/json", LiveJson.write(library()));
        } else if ("/report.html".equals(path) && report != null && Files.isRegularFile(report)) {
            send(ex, 200, "text/html; charset=utf-8", Files.readAllBytes(report));
        } else {
            send(ex, 404, "text/plain; charset=utf-8", "no such page: " + path);
        }
    }

    private Map<String, Object> library() {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("site", site);
        out.put("controls", desk != null);
        out.put("caution", CAUTION);
        List<Map<String, Object>> types = new ArrayList<>();
        for (FaultType t : FaultLibrary.standard().types()) {
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("name", t.name());
            m.put("description", t.description());
            m.put("targets", t.targetKinds().stream().map(k -> k.wireName()).sorted().toList());
            m.put("parameters", t.parameters().stream().map(ParameterSpec::name).toList());
            m.put("parameterHelp", t.parameters().stream().map(p -> p.name() + " " + p.rangeText() + ", default "
                    + p.defaultText()).toList());
            types.add(m);
        }
        out.put("types", types);
        return out;
    }

    private void faultAction(HttpExchange ex, String action) throws IOException {
        if (desk == null) {
            send(ex, 403, "text/plain; charset=utf-8", "refused: fault controls are off for this run (not on the embedded"
                    + " broker or a declared test broker)");
            return;
        }
        if (ex.getRequestHeaders().getFirst(ACTION_HEADER) == null) {
            send(ex, 403, "text/plain; charset=utf-8", "refused: a fault action must come from the live view's own page"
                    + " (header " + ACTION_HEADER + " missing)");
            return;
        }
        Map<String, String> form = form(ex);
        String from = ex.getRemoteAddress().getAddress().getHostAddress();
        LiveFaultDesk.Answer a;
        if ("start".equals(action)) {
            Double durationS = null;
            String d = form.getOrDefault("durationS", "").trim();
            if (!d.isEmpty()) {
                try {
                    durationS = Double.parseDouble(d);
                } catch (NumberFormatException e) {
                    send(ex, 400, "text/plain; charset=utf-8", "refused: --duration-s must be a number, got '" + d + "'");
                    return;
                }
            }
            List<String> targets = new ArrayList<>();
            for (String t : form.getOrDefault("targets", "").split(",")) {
                if (!t.isBlank()) {
                    targets.add(t.trim());
                }
            }
            a = desk.start(form.get("type"), targets, LiveFaultDesk.paramLines(form.get("params")), durationS,
                    form.get("orderId"), form.get("name"), from);
        } else if ("stop".equals(action)) {
            a = desk.stop(form.get("orderId"), form.get("name"), from);
        } else {
            send(ex, 404, "text/plain; charset=utf-8", "no such action: " + action);
            return;
        }
        send(ex, a.done() ? 200 : 400, "text/plain; charset=utf-8", a.text());
    }

    private static Map<String, String> form(HttpExchange ex) throws IOException {
        try (InputStream in = ex.getRequestBody()) {
            byte[] body = in.readNBytes(64 * 1024);
            return decode(new String(body, StandardCharsets.UTF_8));
        }
    }

    private static Map<String, String> query(HttpExchange ex) {
        String q = ex.getRequestURI().getRawQuery();
        return q == null ? Map.of() : decode(q);
    }

    static Map<String, String> decode(String urlEncoded) {
        Map<String, String> out = new LinkedHashMap<>();
        for (String pair : urlEncoded.split("&")) {
            if (pair.isEmpty()) {
                continue;
            }
            int eq = pair.indexOf('=');
            String k = URLDecoder.decode(eq < 0 ? pair : pair.substring(0, eq), StandardCharsets.UTF_8);
            String v = eq < 0 ? "" : URLDecoder.decode(pair.substring(eq + 1), StandardCharsets.UTF_8);
            out.put(k, v);
        }
        return out;
    }

    static void send(HttpExchange ex, int status, String type, String body) throws IOException {
        send(ex, status, type, body.getBytes(StandardCharsets.UTF_8));
    }

    static void send(HttpExchange ex, int status, String type, byte[] body) throws IOException {
        ex.getResponseHeaders().set("Content-Type", type);
        ex.getResponseHeaders().set("Cache-Control", "no-store");
        ex.sendResponseHeaders(status, body.length == 0 ? -1 : body.length);
        if (body.length > 0) {
            try (OutputStream out = ex.getResponseBody()) {
                out.write(body);
            }
        }
    }

    private static byte[] resource(String name) {
        try (InputStream in = LiveServer.class.getResourceAsStream(name)) {
            if (in == null) {
                throw new IllegalStateException("live view asset missing from the class path: " + name);
            }
            return in.readAllBytes();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read live view asset " + name, e);
        }
    }

    @Override
    public void close() {
        events.close();
        server.stop(0);
        pool.shutdownNow();
    }
}
