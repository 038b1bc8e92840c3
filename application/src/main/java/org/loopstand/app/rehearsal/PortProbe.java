package org.loopstand.app.rehearsal;

import java.io.IOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;

/** Tells whether a TCP port can be listened on, so a rehearsal fails early with a clear message. */
final class PortProbe {
    private PortProbe() {
    }

    /**
     * @param host a loopback or local address
     * @param port 1–65535
     * @return true when nothing listens there and we may bind it
     */
    static boolean isFree(String host, int port) {
        try (ServerSocket s = new ServerSocket()) {
            s.setReuseAddress(true);
            s.bind(new InetSocketAddress(InetAddress.getByName(host), port));
            return true;
        } catch (IOException e) {
            return false;
        }
    }
}
