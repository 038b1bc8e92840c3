package org.loopstand.plant.fault;

import java.util.List;
import java.util.Optional;
import java.util.Set;

/**
 * What network faults need from the rig's hosts: which hosts there are, and a way to cut, impair and
 * restore the link between two of them. Implemented for hosts that are network namespaces on one
 * machine ({@code NamespaceHostLinks} in the plant's network package); a deployment on real machines
 * plugs in its own (e.g. one that asks each host's agent to filter the other's address). Called on
 * the plant agent's thread when a fault starts and ends.
 */
public interface HostLinks {
    /** No hosts: a scenario naming a host is refused when it is read. */
    HostLinks NONE = new HostLinks() {
        @Override
        public Set<String> hosts() {
            return Set.of();
        }

        @Override
        public Optional<String> cannotApply(NetworkFault fault, String hostA, String hostB) {
            return Optional.of("no host links in this run (give the plant a hosts file)");
        }

        @Override
        public List<String> apply(NetworkFault fault, String hostA, String hostB) {
            throw new HostLinkException("no host links in this run");
        }

        @Override
        public List<String> lift(NetworkFault fault, String hostA, String hostB) {
            throw new HostLinkException("no host links in this run");
        }
    };

    /** @return the host names faults may name */
    Set<String> hosts();

    /**
     * Asked when a scenario is read, before the run starts.
     *
     * @return why {@code fault} cannot be applied between the two hosts here (e.g. the kernel offers no
     *         netem), if it cannot
     */
    Optional<String> cannotApply(NetworkFault fault, String hostA, String hostB);

    /**
     * Applies the fault. @return the links acted on, each as {@code namespace/interface} or the
     * implementation's own name @throws HostLinkException with what failed
     */
    List<String> apply(NetworkFault fault, String hostA, String hostB);

    /** Restores the link. @return the links acted on @throws HostLinkException with what failed */
    List<String> lift(NetworkFault fault, String hostA, String hostB);

    /** A link could not be changed: the message says which command failed and what it said. */
    final class HostLinkException extends RuntimeException {
        public HostLinkException(String message) {
            super(message);
        }
    }
}
