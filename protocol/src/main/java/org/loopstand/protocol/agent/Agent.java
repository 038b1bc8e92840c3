package org.loopstand.protocol.agent;

/**
 * A unit of work with a duty cycle. Production code drives an agent from an {@link AgentRunner} on
 * its own thread; deterministic tests call {@link #doWork()} by hand after advancing a virtual clock.
 * An agent never sleeps and never reads the system clock: it is given a clock and asked to work.
 */
public interface Agent {
    /** Called once on the runner's thread before the first {@link #doWork()}. */
    default void onStart() {
    }

    /**
     * Do whatever is due now and return at once.
     *
     * @return how much work was done (0 = nothing was due), used by the runner to decide to idle
     */
    int doWork();

    /** Called once on the runner's thread after the last {@link #doWork()}. */
    default void onClose() {
    }

    /** @return a short name for logs and thread names */
    String roleName();
}
