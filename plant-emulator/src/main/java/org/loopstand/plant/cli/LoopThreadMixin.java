package org.loopstand.plant.cli;

import org.loopstand.plant.runtime.LinkFactory;
import org.loopstand.plant.runtime.PublisherThread;
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

    /** @throws IllegalArgumentException naming a wrong option */
    void check() {
        if (journalQueue < 0 || journalQueue > 10_000_000) {
            throw new IllegalArgumentException("--journal-queue must be in [0, 10000000], got " + journalQueue);
        }
    }

    /** @return {@code links}, publishing through a publisher thread unless {@code --publish-on-loop} */
    LinkFactory links(LinkFactory links) {
        return publishOnLoop ? links : new PublisherThread(PUBLISH_QUEUE, WallClock.INSTANCE, "plant-publisher").wrap(links);
    }
}
