package org.wavewarden.testing;

import jakarta.mail.internet.MimeMessage;
import org.subethamail.smtp.MessageHandler;
import org.subethamail.smtp.auth.EasyAuthenticationHandlerFactory;
import org.subethamail.smtp.auth.LoginFailedException;
import org.subethamail.smtp.server.SMTPServer;

import javax.net.ssl.KeyManagerFactory;
import javax.net.ssl.SSLContext;
import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.net.InetAddress;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.KeyStore;
import java.util.ArrayList;
import java.util.List;
import java.util.Properties;
import java.util.concurrent.CopyOnWriteArrayList;

/**
 * A real SMTP server on loopback for the e-mail sink's tests: it offers STARTTLS with a certificate made for the
 * test (by the running JDK's keytool, for localhost and 127.0.0.1), refuses mail before STARTTLS and before AUTH,
 * and checks one user name and password. What it receives is kept as parsed MIME messages with their envelopes.
 */
public final class SmtpRelay implements AutoCloseable {

    /** One message as handed over: the envelope's sender and recipients, and the message. */
    public record Received(String envelopeFrom, List<String> envelopeTo, MimeMessage message) {
    }

    /** The certificate of a relay, and the key store holding its private key. */
    public record Certificate(Path keyStore, char[] password, Path pem) {
    }

    private final SMTPServer server;
    private final List<Received> received = new CopyOnWriteArrayList<>();
    private final List<String> logins = new CopyOnWriteArrayList<>();

    private SmtpRelay(Certificate cert, boolean offerTls, String user, String password) throws Exception {
        SMTPServer.Builder b = SMTPServer.port(0).bindAddress(InetAddress.getLoopbackAddress()).hostName("localhost")
                .messageHandlerFactory(ctx -> new MessageHandler() {
                    private String from;
                    private final List<String> to = new ArrayList<>();

                    @Override
                    public void from(String address) {
                        from = address;
                    }

                    @Override
                    public void recipient(String address) {
                        to.add(address);
                    }

                    @Override
                    public String data(InputStream in) throws IOException {
                        try {
                            received.add(new Received(from, List.copyOf(to), new MimeMessage(
                                    jakarta.mail.Session.getInstance(new Properties()),
                                    new ByteArrayInputStream(in.readAllBytes()))));
                        } catch (jakarta.mail.MessagingException e) {
                            throw new IOException(e);
                        }
                        return null;
                    }

                    @Override
                    public void done() {
                    }
                })
                .requireAuth()
                .authenticationHandlerFactory(new EasyAuthenticationHandlerFactory((u, p, ctx) -> {
                    logins.add(u);
                    if (!u.equals(user) || !p.equals(password)) {
                        throw new LoginFailedException("wrong user name or password");
                    }
                }));
        if (offerTls) {
            b.enableTLS().requireTLS().startTlsSocketFactory(serverContext(cert));
        } else {
            // Without TLS the server would offer AUTH only after STARTTLS, which it does not offer.
            b.showAuthCapabilitiesBeforeSTARTTLS(true);
        }
        server = b.build();
        server.start();
    }

    /** A relay that requires STARTTLS (with this certificate) and AUTH. */
    public static SmtpRelay start(Certificate cert, String user, String password) throws Exception {
        return new SmtpRelay(cert, true, user, password);
    }

    /** A relay that offers no STARTTLS at all. */
    public static SmtpRelay withoutTls(String user, String password) throws Exception {
        return new SmtpRelay(null, false, user, password);
    }

    /** Makes a key pair and a self-signed certificate for localhost and 127.0.0.1 with the JDK's keytool. */
    public static Certificate certificate(Path dir) throws IOException, InterruptedException {
        Path store = dir.resolve("relay.p12");
        Path pem = dir.resolve("relay.pem");
        String pass = "relay-store-pass";
        String keytool = Path.of(System.getProperty("java.home"), "bin", "keytool").toString();
        run(dir, keytool, "-genkeypair", "-alias", "relay", "-keyalg", "RSA", "-keysize", "2048", "-validity", "2",
                "-dname", "CN=localhost, O=Harrowmere County test relay", "-ext", "san=dns:localhost,ip:127.0.0.1",
                "-keystore", store.toString(), "-storetype", "PKCS12", "-storepass", pass, "-keypass", pass);
        run(dir, keytool, "-exportcert", "-rfc", "-alias", "relay", "-keystore", store.toString(), "-storepass",
                pass, "-file", pem.toString());
        return new Certificate(store, pass.toCharArray(), pem);
    }

    private static void run(Path dir, String... command) throws IOException, InterruptedException {
        Process p = new ProcessBuilder(command).directory(dir.toFile()).redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes());
        if (p.waitFor() != 0) {
            throw new IOException(String.join(" ", command) + " failed: " + out);
        }
    }

    private static SSLContext serverContext(Certificate cert) throws Exception {
        KeyStore ks = KeyStore.getInstance("PKCS12");
        try (InputStream in = Files.newInputStream(cert.keyStore())) {
            ks.load(in, cert.password());
        }
        KeyManagerFactory kmf = KeyManagerFactory.getInstance(KeyManagerFactory.getDefaultAlgorithm());
        kmf.init(ks, cert.password());
        SSLContext ctx = SSLContext.getInstance("TLS");
        ctx.init(kmf.getKeyManagers(), null, null);
        return ctx;
    }

    public int port() {
        return server.getPortAllocated();
    }

    /** Every message received so far, in arrival order. */
    public List<Received> received() {
        return new ArrayList<>(received);
    }

    /** The user names of every login attempt, accepted or not. */
    public List<String> logins() {
        return new ArrayList<>(logins);
    }

    @Override
    public void close() {
        server.stop();
    }
}
