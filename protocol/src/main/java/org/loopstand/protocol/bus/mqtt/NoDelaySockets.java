package org.loopstand.protocol.bus.mqtt;

import java.io.IOException;
import java.net.InetAddress;
import java.net.Socket;
import javax.net.SocketFactory;
import javax.net.ssl.SSLSocketFactory;

/**
 * Socket factories for Paho that switch Nagle's algorithm off on every socket (Paho never does; with
 * Nagle on, a QoS 1 round trip on loopback grows from ~0.2 ms to ~20 ms) and remember the last socket
 * so a test can cut the TCP connection without an MQTT DISCONNECT.
 */
final class NoDelaySockets {
    private volatile Socket lastSocket;

    /** @return a factory for tcp:// (plain) connections */
    SocketFactory plain() {
        return new Plain(SocketFactory.getDefault());
    }

    /** @return a factory for ssl:// connections; Paho requires it to be an SSLSocketFactory */
    SSLSocketFactory tls(SSLSocketFactory delegate) {
        return new Tls(delegate);
    }

    /** @return the socket most recently handed to Paho, or null before the first connect */
    Socket lastSocket() {
        return lastSocket;
    }

    private Socket track(Socket socket) throws IOException {
        socket.setTcpNoDelay(true);
        lastSocket = socket;
        return socket;
    }

    private final class Plain extends SocketFactory {
        private final SocketFactory delegate;

        Plain(SocketFactory delegate) {
            this.delegate = delegate;
        }

        @Override
        public Socket createSocket() throws IOException {
            return track(delegate.createSocket());
        }

        @Override
        public Socket createSocket(String host, int port) throws IOException {
            return track(delegate.createSocket(host, port));
        }

        @Override
        public Socket createSocket(String host, int port, InetAddress localHost, int localPort) throws IOException {
            return track(delegate.createSocket(host, port, localHost, localPort));
        }

        @Override
        public Socket createSocket(InetAddress host, int port) throws IOException {
            return track(delegate.createSocket(host, port));
        }

        @Override
        public Socket createSocket(InetAddress address, int port, InetAddress localAddress, int localPort)
                throws IOException {
            return track(delegate.createSocket(address, port, localAddress, localPort));
        }
    }

    private final class Tls extends SSLSocketFactory {
        private final SSLSocketFactory delegate;

        Tls(SSLSocketFactory delegate) {
            this.delegate = delegate;
        }

        @Override
        public String[] getDefaultCipherSuites() {
            return delegate.getDefaultCipherSuites();
        }

        @Override
        public String[] getSupportedCipherSuites() {
            return delegate.getSupportedCipherSuites();
        }

        @Override
        public Socket createSocket() throws IOException {
            return track(delegate.createSocket());
        }

        @Override
        public Socket createSocket(Socket s, String host, int port, boolean autoClose) throws IOException {
            return track(delegate.createSocket(s, host, port, autoClose));
        }

        @Override
        public Socket createSocket(String host, int port) throws IOException {
            return track(delegate.createSocket(host, port));
        }

        @Override
        public Socket createSocket(String host, int port, InetAddress localHost, int localPort) throws IOException {
            return track(delegate.createSocket(host, port, localHost, localPort));
        }

        @Override
        public Socket createSocket(InetAddress host, int port) throws IOException {
            return track(delegate.createSocket(host, port));
        }

        @Override
        public Socket createSocket(InetAddress address, int port, InetAddress localAddress, int localPort)
                throws IOException {
            return track(delegate.createSocket(address, port, localAddress, localPort));
        }
    }
}
