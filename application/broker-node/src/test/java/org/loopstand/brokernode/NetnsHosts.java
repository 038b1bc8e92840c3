package org.loopstand.brokernode;

import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Assertions;
import org.junit.jupiter.api.Assumptions;
import org.loopstand.brokernode.hosts.NamespaceHosts;

/** Network-namespace hosts for a test ({@link NamespaceHosts}), or a clear refusal when they cannot be made. */
final class NetnsHosts {
    private static final AtomicInteger CREATED = new AtomicInteger();
    private static final String FAMILY = "ls";

    private NetnsHosts() {
    }

    /**
     * As {@link NamespaceHosts#create}, named after this JVM; when namespaces cannot be made the test fails under
     * CI=true (it must run there) and is skipped otherwise, saying why either way.
     */
    static NamespaceHosts createOrSkip(int count) {
        try {
            // a test JVM killed before its clean-up (a CI timeout) leaves its hosts and their processes behind
            NamespaceHosts.sweepOrphans(FAMILY).forEach(ns -> System.err.println("removed hosts left by a gone test run: " + ns));
            // unique per JVM and per call
            return NamespaceHosts.forThisProcess(FAMILY, (char) ('a' + CREATED.getAndIncrement() % 26), count);
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
