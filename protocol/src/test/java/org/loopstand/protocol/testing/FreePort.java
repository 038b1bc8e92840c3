package org.loopstand.protocol.testing;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.net.Socket;

/** Loopback ports for tests. */
public final class FreePort {
    private FreePort() {
    }

    /** @return a TCP port on 127.0.0.1 that was free a moment ago (the OS picks it) */
    public static int find() {
        try (ServerSocket s = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            s.setReuseAddress(true);
            return s.getLocalPort();
        } catch (IOException e) {
            throw new UncheckedIOException("no free port on 127.0.0.1", e);
        }
    }

    /** @return true when something accepts TCP connections on 127.0.0.1:port */
    public static boolean isOpen(int port) {
        return isOpen(port, 500);
    }

    /** @return true when something accepts TCP connections on 127.0.0.1:port within timeoutMs (ms, &gt; 0) */
    public static boolean isOpen(int port, int timeoutMs) {
        try (Socket s = new Socket()) {
            s.connect(new InetSocketAddress(InetAddress.getLoopbackAddress(), port), timeoutMs);
            return true;
        } catch (IOException e) {
            return false;
        }
    }
}
