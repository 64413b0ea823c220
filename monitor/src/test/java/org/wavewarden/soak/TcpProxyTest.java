package org.wavewarden.soak;

import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.net.Socket;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class TcpProxyTest {

    /** Answers every byte with the same byte, one connection at a time, on a thread of its own. */
    static ServerSocket echo() throws IOException {
        ServerSocket s = new ServerSocket(0, 16, InetAddress.getLoopbackAddress());
        Thread t = new Thread(() -> {
            while (!s.isClosed()) {
                try (Socket c = s.accept(); InputStream in = c.getInputStream(); OutputStream out = c.getOutputStream()) {
                    for (int b; (b = in.read()) >= 0; ) {
                        out.write(b);
                        out.flush();
                    }
                } catch (IOException e) {
                    // the client or the proxy dropped the connection; take the next
                }
            }
        }, "echo");
        t.setDaemon(true);
        t.start();
        return s;
    }

    static int roundTrip(Socket c, int b) throws IOException {
        c.getOutputStream().write(b);
        c.getOutputStream().flush();
        return c.getInputStream().read();
    }

    @Test
    void forwardsToANamedHostDropsOpenConnectionsWhenCutRefusesNewOnesAndForwardsAgainWhenRestored()
            throws Exception {
        try (ServerSocket server = echo(); TcpProxy proxy = TcpProxy.start("127.0.0.1", server.getLocalPort())) {
            Socket before = new Socket(InetAddress.getLoopbackAddress(), proxy.port());
            assertEquals(7, roundTrip(before, 7));
            proxy.cut();
            assertTrue(proxy.isCut());
            assertThrows(IOException.class, () -> {
                // A dropped link may take a write or two to show; the read after it must fail or see the end.
                for (int i = 0; i < 3; i++) {
                    if (roundTrip(before, 8) < 0) {
                        throw new IOException("end of stream");
                    }
                }
            });
            try (Socket during = new Socket(InetAddress.getLoopbackAddress(), proxy.port())) {
                assertThrows(IOException.class, () -> {
                    if (roundTrip(during, 9) < 0) {
                        throw new IOException("end of stream");
                    }
                });
            }
            proxy.restore();
            try (Socket after = new Socket(InetAddress.getLoopbackAddress(), proxy.port())) {
                assertEquals(10, roundTrip(after, 10));
            }
            assertTrue(proxy.refused() >= 1);
            before.close();
        }
    }
}
