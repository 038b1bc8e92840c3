package org.loopstand.app.rehearsal;

import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.time.Duration;
import java.util.concurrent.locks.LockSupport;
import java.util.function.BooleanSupplier;
import java.util.function.Consumer;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.loopstand.protocol.time.Clock;

/**
 * After the report is written the plant's live view links it; while a page is open the rehearsal
 * keeps the plant (and so the page's server) up a little longer so the watchers can follow the link.
 */
final class LiveViewHold {
    /** Longest wait for open pages after the report, wall ms. */
    static final long HOLD_MS = 15_000;
    private static final Pattern OPEN = Pattern.compile("\"open\"\\s*:\\s*(\\d+)");

    private LiveViewHold() {
    }

    /**
     * Waits up to {@link #HOLD_MS} while the live view at {@code url} has pages open.
     *
     * @param stop true ends the wait at once (Ctrl-C, the plant died)
     */
    static void whilePagesOpen(String url, Clock wall, BooleanSupplier stop, Consumer<String> say) {
        HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(2)).build();
        if (openPages(http, url) <= 0) {
            return;
        }
        say.accept("rehearsal: the live view links the report; it stays up while a page is open, at most "
                + HOLD_MS / 1000 + " s (Ctrl-C ends it now)");
        long end = wall.monotonicNanos() + HOLD_MS * 1_000_000L;
        while (!stop.getAsBoolean() && wall.monotonicNanos() < end && openPages(http, url) > 0) {
            LockSupport.parkNanos(500_000_000L);
        }
    }

    /** @return pages open on the live view, or −1 when it does not answer */
    static int openPages(HttpClient http, String url) {
        try {
            HttpResponse<String> r = http.send(HttpRequest.newBuilder(URI.create(url + "api/pages"))
                    .timeout(Duration.ofSeconds(2)).build(), HttpResponse.BodyHandlers.ofString());
            Matcher m = OPEN.matcher(r.body());
            return r.statusCode() == 200 && m.find() ? Integer.parseInt(m.group(1)) : -1;
        } catch (IOException | IllegalArgumentException e) {
            return -1;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return -1;
        }
    }
}
