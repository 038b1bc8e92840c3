package org.loopstand.plant.cli;

import org.loopstand.plant.runtime.LinkFactory;
import org.loopstand.plant.runtime.PublisherThread;
import org.loopstand.plant.runtime.StepPassMarks;
import org.loopstand.plant.runtime.TelemetryPacing;
import org.loopstand.protocol.time.WallClock;
import picocli.CommandLine.Option;

/**
 * The {@code plant} options of what runs off the physics thread (docs/plant.md, "Pacing"): the
 * journal's writer thread and the publisher thread. Both are on by default; the options put the
 * work back on the physics thread, to compare.
 */
public final class LoopThreadMixin {
    /** Publishes that may wait for the publisher thread. */
    static final int PUBLISH_QUEUE = 65_536;

    @Option(names = "--journal-queue", defaultValue = "65536", description = "journal entries that may wait for the"
            + " journal's writer thread; beyond, entries are dropped and counted (journalQueue event); 0 = write on the"
            + " physics thread (default ${DEFAULT-VALUE})")
    int journalQueue;

    @Option(names = "--publish-on-loop", description = "publish meters, telemetry, acks and the clock on the physics"
            + " thread instead of the publisher thread (to compare)")
    boolean publishOnLoop;

    @Option(names = "--telemetry-pacing", defaultValue = "burst", description = "how the publisher thread sends each"
            + " physics step's due unit telemetry: burst (all at once, one after the other) or spread (evenly over the"
            + " step's wall period; at once and counted when the thread is behind or the slots would be closer than"
            + " 50 µs) (default ${DEFAULT-VALUE})")
    String telemetryPacing;

    private PublisherThread publisher;

    /** @throws IllegalArgumentException naming a wrong option */
    void check() {
        if (journalQueue < 0 || journalQueue > 10_000_000) {
            throw new IllegalArgumentException("--journal-queue must be in [0, 10000000], got " + journalQueue);
        }
        if (pacing() == TelemetryPacing.SPREAD && publishOnLoop) {
            throw new IllegalArgumentException("--telemetry-pacing spread needs the publisher thread; drop --publish-on-loop");
        }
    }

    TelemetryPacing pacing() {
        return TelemetryPacing.parse(telemetryPacing, "--telemetry-pacing");
    }

    /** @return {@code links}, publishing through a publisher thread unless {@code --publish-on-loop} */
    LinkFactory links(LinkFactory links) {
        if (publishOnLoop) {
            return links;
        }
        publisher = new PublisherThread(PUBLISH_QUEUE, WallClock.INSTANCE, "plant-publisher", pacing());
        return publisher.wrap(links);
    }

    /** @return what the loop tells about each step's unit pass: the publisher thread when it spreads, else nothing */
    StepPassMarks stepMarks() {
        return publisher == null ? StepPassMarks.NONE : publisher;
    }

    /** @return one line on what the publisher thread did, empty when the plant published on its physics thread */
    String summary() {
        if (publisher == null) {
            return "";
        }
        PublisherThread.SpreadCounts c = publisher.spreadCounts();
        return "; publisher thread " + publisher.published() + " published, " + publisher.refusedFull() + " refused (queue full)"
                + (c == null ? "" : ", step telemetry " + c);
    }
}
