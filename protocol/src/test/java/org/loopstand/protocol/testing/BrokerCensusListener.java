package org.loopstand.protocol.testing;

import java.io.FileDescriptor;
import java.io.FileOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.concurrent.atomic.AtomicBoolean;

import org.junit.platform.launcher.LauncherSession;
import org.junit.platform.launcher.LauncherSessionListener;

/**
 * Prints {@link BrokerCensus#line} once per test JVM when the JUnit launcher session opens, so a reader of the
 * build log knows up front which broker tests can pass. Registered through META-INF/services in the protocol
 * test-jar, which every module with broker tests has on its test class path.
 */
public final class BrokerCensusListener implements LauncherSessionListener {
    private static final AtomicBoolean PRINTED = new AtomicBoolean();

    @Override
    public void launcherSessionOpened(LauncherSession session) {
        if (PRINTED.compareAndSet(false, true)) {
            // The native stderr, not System.out: surefire redirects test output to files (redirectTestOutputToFile),
            // and passes the forked JVM's own stderr lines to the build console.
            PrintStream console = new PrintStream(new FileOutputStream(FileDescriptor.err), true, StandardCharsets.UTF_8);
            console.println(BrokerCensus.line(BrokerCensus.probe(System.getenv())));
        }
    }
}
