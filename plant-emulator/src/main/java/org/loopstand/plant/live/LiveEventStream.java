package org.loopstand.plant.live;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;

import com.sun.net.httpserver.HttpExchange;

/**
 * {@code GET /events}: server-sent events. First {@code history} (the snapshots kept, as one JSON
 * array), then one {@code snapshot} per new snapshot, and {@code report} with the report's address
 * once it is written. At most {@code maxStreams} browsers at once (others get 503); each holds one
 * HTTP thread while open.
 */
final class LiveEventStream {
    private final LiveFeed feed;
    private final Path report;
    private final int maxStreams;
    private final AtomicInteger open = new AtomicInteger();
    private volatile boolean closed;

    LiveEventStream(LiveFeed feed, Path report, int maxStreams) {
        this.feed = feed;
        this.report = report;
        this.maxStreams = maxStreams;
    }

    void serve(HttpExchange ex) throws IOException {
        if (open.incrementAndGet() > maxStreams) {
            open.decrementAndGet();
            LiveServer.send(ex, 503, "text/plain; charset=utf-8", "too many live views open (" + maxStreams + ")");
            return;
        }
        try {
            ex.getResponseHeaders().set("Content-Type", "text/event-stream; charset=utf-8");
            ex.getResponseHeaders().set("Cache-Control", "no-store");
            ex.sendResponseHeaders(200, 0);
            OutputStream out = ex.getResponseBody();
            List<LiveSnapshot> history = feed.history();
            long last = history.isEmpty() ? 0 : history.get(history.size() - 1).seq();
            event(out, "history", LiveJson.write(history));
            boolean reportSent = false;
            while (!closed && !Thread.currentThread().isInterrupted()) {
                List<LiveSnapshot> fresh = feed.awaitNewer(last, 1000);
                for (LiveSnapshot s : fresh) {
                    event(out, "snapshot", LiveJson.write(s));
                    last = s.seq();
                }
                if (!reportSent && report != null && Files.isRegularFile(report)) {
                    event(out, "report", "\"/report.html\"");
                    reportSent = true;
                }
                if (fresh.isEmpty()) {
                    out.write(": keep-alive\n\n".getBytes(StandardCharsets.UTF_8));
                    out.flush();
                }
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } finally {
            open.decrementAndGet();
        }
    }

    private static void event(OutputStream out, String name, String json) throws IOException {
        out.write(("event: " + name + "\ndata: " + json + "\n\n").getBytes(StandardCharsets.UTF_8));
        out.flush();
    }

    /** @return pages with their event stream open now */
    int openStreams() {
        return open.get();
    }

    void close() {
        closed = true;
    }
}
