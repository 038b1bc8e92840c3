package org.loopstand.plant.fault;

/**
 * A fault on the network between two hosts, applied by the run's {@link HostLinks} when it starts and
 * lifted when it ends. Its targets are exactly two host names.
 */
public interface NetworkFault extends FaultBehaviour {
    /** @return what the host links must do, for the journal: {@code partition} or {@code delayLoss} */
    String action();

    /** The link between the two hosts is cut for the window (link down). */
    record Partition() implements NetworkFault {
        @Override
        public String action() {
            return "partition";
        }
    }

    /**
     * Every packet on the link is held back by {@code delayMs} plus up to {@code jitterMs} and lost with
     * {@code lossProbability} (netem, where the kernel offers it).
     */
    record DelayLoss(double delayMs, double jitterMs, double lossProbability) implements NetworkFault {
        @Override
        public String action() {
            return "delayLoss";
        }
    }
}
