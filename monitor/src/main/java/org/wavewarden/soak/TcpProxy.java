package org.wavewarden.soak;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicLong;

/**
 * A loopback TCP forwarder that stands between the monitor and its database server, so the soak (and the
 * reliability tests) can take the database away the way a network partition or a restarting server does:
 * {@link #cut()} drops every open connection at once (the server sees its clients vanish and rolls back their
 * open transactions) and turns every new connection away until {@link #restore()}. The listening port stays the
 * same throughout, so the monitor's JDBC URL keeps pointing at it. It listens on 127.0.0.1 only.
 */
public final class TcpProxy implements AutoCloseable {

    private static final int CONNECT_TIMEOUT_MILLIS = 5_000;

    private final ServerSocket listener;
    private final String targetHost;
    private final int targetPort;
    private final Object lock = new Object();
    private final List<Socket> open = new ArrayList<>();
    private final AtomicLong accepted = new AtomicLong();
    private final AtomicLong refused = new AtomicLong();
    private boolean cut;
    private volatile boolean closed;

    private TcpProxy(ServerSocket listener, String targetHost, int targetPort) {
        this.listener = listener;
        this.targetHost = targetHost;
        this.targetPort = targetPort;
    }

    /** Listens on 127.0.0.1 at a free port and forwards every connection to 127.0.0.1:{@code targetPort}. */
    public static TcpProxy start(int targetPort) throws IOException {
        return start(null, targetPort);
    }

    /**
     * Listens on 127.0.0.1 at a free port and forwards every connection to {@code targetHost:targetPort}
     * (loopback when the host is null).
     */
    public static TcpProxy start(String targetHost, int targetPort) throws IOException {
        if (targetPort <= 0 || targetPort > 65535) {
            throw new IllegalArgumentException("targetPort: expected 1 to 65535 but got " + targetPort);
        }
        ServerSocket s = new ServerSocket();
        s.setReuseAddress(true);
        s.bind(new InetSocketAddress(InetAddress.getLoopbackAddress(), 0), 64);
        TcpProxy p = new TcpProxy(s, targetHost, targetPort);
        Thread t = new Thread(p::acceptLoop, "tcp-proxy-accept-" + s.getLocalPort());
        t.setDaemon(true);
        t.start();
        return p;
    }

    public int port() {
        return listener.getLocalPort();
    }

    /** Drops every open connection and turns new ones away (reset at once) until {@link #restore()}. */
    public void cut() {
        List<Socket> victims;
        synchronized (lock) {
            cut = true;
            victims = new ArrayList<>(open);
            open.clear();
        }
        victims.forEach(TcpProxy::reset);
    }

    /** Forwards new connections again. */
    public void restore() {
        synchronized (lock) {
            cut = false;
        }
    }

    /** Connections forwarded since the start. */
    public long accepted() {
        return accepted.get();
    }

    /** Whether new connections are turned away now. */
    public boolean isCut() {
        synchronized (lock) {
            return cut;
        }
    }

    /** Connections turned away while cut. */
    public long refused() {
        return refused.get();
    }

    private void acceptLoop() {
        while (!closed) {
            Socket client;
            try {
                client = listener.accept();
            } catch (IOException e) {
                if (closed) {
                    return;
                }
                continue;
            }
            Socket upstream = null;
            boolean forward;
            synchronized (lock) {
                forward = !cut;
            }
            if (forward) {
                try {
                    upstream = new Socket();
                    // Bounded, as a connection is made in the accept loop: a silent server must not stall it.
                    upstream.connect(targetHost == null ? new InetSocketAddress(InetAddress.getLoopbackAddress(),
                            targetPort) : new InetSocketAddress(targetHost, targetPort), CONNECT_TIMEOUT_MILLIS);
                    upstream.setTcpNoDelay(true);
                    client.setTcpNoDelay(true);
                } catch (IOException e) {
                    forward = false;
                }
            }
            synchronized (lock) {
                // A cut may have come while the upstream connection was being made: it must not survive the cut.
                if (forward && !cut) {
                    open.add(client);
                    open.add(upstream);
                } else {
                    forward = false;
                }
            }
            if (!forward) {
                refused.incrementAndGet();
                reset(client);
                if (upstream != null) {
                    reset(upstream);
                }
                continue;
            }
            accepted.incrementAndGet();
            pump(client, upstream);
            pump(upstream, client);
        }
    }

    private void pump(Socket from, Socket to) {
        Thread t = new Thread(() -> {
            byte[] buf = new byte[16 * 1024];
            try (InputStream in = from.getInputStream(); OutputStream out = to.getOutputStream()) {
                for (int n; (n = in.read(buf)) >= 0; ) {
                    out.write(buf, 0, n);
                    out.flush();
                }
            } catch (IOException e) {
                // The peer went away or the proxy cut the pair: either way both ends are closed below.
            } finally {
                synchronized (lock) {
                    open.remove(from);
                    open.remove(to);
                }
                reset(from);
                reset(to);
            }
        }, "tcp-proxy-pump-" + from.getLocalPort() + "-" + from.getPort());
        t.setDaemon(true);
        t.start();
    }

    /** Closes with a TCP reset rather than an orderly shutdown, as a dropped link looks to both peers. */
    private static void reset(Socket s) {
        try {
            s.setSoLinger(true, 0);
        } catch (IOException ignored) {
            // already closed
        }
        try {
            s.close();
        } catch (IOException ignored) {
            // already closed
        }
    }

    @Override
    public void close() {
        closed = true;
        try {
            listener.close();
        } catch (IOException ignored) {
            // closing anyway
        }
        cut();
    }
}
