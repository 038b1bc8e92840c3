package org.loopstand.brokernode;

import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Assertions;
import org.junit.jupiter.api.Assumptions;
import org.loopstand.brokernode.hosts.NamespaceHosts;

/** Network-namespace hosts for a test ({@link NamespaceHosts}), or a clear refusal when they cannot be made. */
final class NetnsHosts {
    private static final AtomicInteger CREATED = new AtomicInteger();

    private NetnsHosts() {
    }

    /**
     * As {@link NamespaceHosts#create}, named after this JVM; when namespaces cannot be made the test fails under
     * CI=true (it must run there) and is skipped otherwise, saying why either way.
     */
    static NamespaceHosts createOrSkip(int count) {
        // unique per JVM and per call, short enough for interface names (at most 15 characters)
        String prefix = "ls" + (ProcessHandle.current().pid() % 100_000) + (char) ('a' + CREATED.getAndIncrement() % 26);
        try {
            return NamespaceHosts.create(prefix, count);
        } catch (IllegalStateException e) {
            String why = "cannot create network namespaces (needs root and iproute2): " + e.getMessage();
            if ("true".equals(System.getenv("CI"))) {
                Assertions.fail("CI=true: the test on network-namespace hosts must run; " + why);
            }
            Assumptions.abort(why);
            return null;
        }
    }
}
