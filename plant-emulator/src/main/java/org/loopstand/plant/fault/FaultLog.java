package org.loopstand.plant.fault;

import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/** Writes fault starts, stops and refusals to the log ({@code org.loopstand.plant.faults}) when no journal is kept. */
public final class FaultLog implements FaultObserver {
    private static final Logger LOG = LoggerFactory.getLogger("org.loopstand.plant.faults");

    @Override
    public void faultStarted(long tMs, FaultSpec spec, String source) {
        LOG.info("{} fault started ({}): {}", tMs, source, spec);
    }

    @Override
    public void faultStopped(long tMs, FaultSpec spec, String source, String reason) {
        LOG.info("{} fault {} stopped: {}", tMs, spec.id(), reason);
    }

    @Override
    public void networkFault(long tMs, FaultSpec spec, String action, java.util.List<String> links, String detail) {
        if (detail.isEmpty()) {
            LOG.info("{} network fault {}: {} between {} on links {}", tMs, spec.id(), action, spec.targets(), links);
        } else {
            LOG.warn("{} network fault {}: {} between {}: {}", tMs, spec.id(), action, spec.targets(), detail);
        }
    }

    @Override
    public void faultRefused(long tMs, String orderId, String reason) {
        LOG.warn("{} fault order {} refused: {}", tMs, orderId, reason);
    }
}
