package org.wavewarden.deliver.sink;

import jakarta.mail.AuthenticationFailedException;
import jakarta.mail.SendFailedException;
import org.simplejavamail.api.email.Email;
import org.simplejavamail.api.mailer.Mailer;
import org.simplejavamail.api.mailer.MailerRegularBuilder;
import org.simplejavamail.api.mailer.config.TransportStrategy;
import org.simplejavamail.email.EmailBuilder;
import org.simplejavamail.mailer.MailerBuilder;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.SinkSettings;

import javax.net.ssl.SSLContext;
import javax.net.ssl.SSLSocketFactory;
import javax.net.ssl.TrustManagerFactory;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.GeneralSecurityException;
import java.security.KeyStore;
import java.security.cert.Certificate;
import java.security.cert.CertificateFactory;
import java.time.Duration;
import java.util.Collection;
import java.util.List;
import java.util.Objects;
import java.util.function.Function;

/**
 * Sends alerts by e-mail through an SMTP relay: one plain-text message per firing (a {@link RollUp}) by default,
 * or one per alert.
 *
 * <p><b>Transport.</b> STARTTLS is required: a relay that does not offer it, or whose certificate does not chain
 * to a trusted authority or does not name the host, gets nothing (Simple Java Mail's {@code SMTP_TLS} strategy
 * with the server identity checked and no host trusted blindly). A private relay's authority can be given as a PEM
 * file. Plain SMTP is used only when configured, and the configuration allows it only for a loopback relay.
 *
 * <p><b>Credentials</b> come from environment variables named in the configuration; they are never part of the
 * sink's name, a log line or a recorded error.
 *
 * <p><b>Idempotency.</b> Each message's {@code Message-ID} is made from its idempotency key
 * ({@code <key@sender-domain>}), and the key is also in the {@code X-Wavewarden-Delivery} header, so a message
 * sent again after a crash between sending and recording is recognisable as the same one by a mail client or a
 * filter.
 *
 * <p><b>Failures.</b> A failure to connect or a temporary refusal is tried again under the {@link RetryPolicy};
 * a refused login or rejected address is final at once. A message not sent raises {@link UndeliveredException},
 * and the outbox keeps it owed.
 */
public final class EmailSink implements AlertSink, AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(EmailSink.class);
    /** The header that carries the idempotency key, as the webhook's header of the same name. */
    public static final String DELIVERY_HEADER = WebhookSink.DELIVERY_HEADER;
    /** How long connecting and each SMTP exchange may take. */
    static final Duration SESSION_TIMEOUT = Duration.ofSeconds(10);

    private final String name;
    private final String from;
    private final List<String> to;
    private final SinkFilter filter;
    private final SinkSettings.Messages messages;
    private final RetryLoop attempts;
    private final Mailer mailer;
    private final String password;

    /**
     * @param environment looks a variable up ({@code System::getenv} in production)
     * @throws IllegalArgumentException when a credential variable is not set or the CA file cannot be read
     */
    public EmailSink(SinkSettings.Email settings, Function<String, String> environment, SinkFilter filter,
                     RetryPolicy retry) {
        Objects.requireNonNull(settings, "settings");
        this.name = "email:" + settings.host() + ":" + settings.port();
        this.from = settings.from();
        this.to = List.copyOf(settings.to());
        this.filter = Objects.requireNonNull(filter, "filter");
        this.messages = settings.messages();
        Objects.requireNonNull(retry, "retry");
        this.attempts = new RetryLoop(name, retry, LOG);
        String user = settings.userEnv() == null ? null : variable(settings.userEnv(), "userEnv", environment);
        this.password = settings.passwordEnv() == null ? null
                : variable(settings.passwordEnv(), "passwordEnv", environment);
        MailerRegularBuilder<?> b = user == null ? MailerBuilder.withSMTPServer(settings.host(), settings.port())
                : MailerBuilder.withSMTPServer(settings.host(), settings.port(), user, password);
        if (settings.tls() == SinkSettings.Tls.STARTTLS) {
            b.withTransportStrategy(TransportStrategy.SMTP_TLS).verifyingServerIdentity(true).trustingAllHosts(false);
            if (settings.caFile() != null) {
                b.withCustomSSLFactoryInstance(trusting(Path.of(settings.caFile())));
            }
        } else {
            // Configured only for a loopback relay (the configuration refuses it elsewhere); no upgrade is tried.
            b.withTransportStrategy(TransportStrategy.SMTP).withProperty("mail.smtp.starttls.enable", "false");
        }
        this.mailer = b.withSessionTimeout((int) SESSION_TIMEOUT.toMillis()).buildMailer();
    }

    @Override
    public String name() {
        return name;
    }

    @Override
    public SinkFilter filter() {
        return filter;
    }

    @Override
    public SinkSettings.Messages messages() {
        return messages;
    }

    /**
     * Sends each accepted message as an e-mail of its own.
     *
     * @throws UndeliveredException at the first message not sent; the ones before it were sent
     */
    @Override
    public DeliveryReport deliver(List<AlertMessage> alerts) {
        int filteredOut = 0;
        int duplicates = 0;
        int delivered = 0;
        java.util.Set<String> seen = new java.util.HashSet<>();
        for (AlertMessage m : alerts) {
            if (!filter.accepts(m)) {
                filteredOut++;
                continue;
            }
            if (!seen.add(m.idempotencyKey())) {
                duplicates++;
                continue;
            }
            send(RollUp.subject(m), RollUp.text(m), m.idempotencyKey());
            delivered++;
        }
        return new DeliveryReport(name, alerts.size(), filteredOut, duplicates, delivered, 0);
    }

    @Override
    public void deliverRollUp(RollUp rollUp) {
        send(rollUp.subject(), rollUp.text(), rollUp.idempotencyKey());
    }

    private void send(String subject, String text, String key) {
        Email email = EmailBuilder.startingBlank()
                .from(from)
                .toMultiple(to)
                .withSubject(subject)
                .withPlainText(text)
                .withHeader(DELIVERY_HEADER, key)
                .fixingMessageId(messageId(key, from))
                .buildEmail();
        RetryLoop.Result r = attempts.run(key, "sent", () -> {
            try {
                mailer.sendMail(email, false).join();
                return RetryLoop.Outcome.DELIVERED;
            } catch (RuntimeException e) {
                return RetryLoop.Outcome.failed(describe(e), !isFinal(e), null);
            }
        });
        if (r.interrupted()) {
            Thread.currentThread().interrupt();
        }
        if (!r.delivered()) {
            throw new UndeliveredException(r.lastError(), r.attempts());
        }
    }

    /** {@code <key@domain of the sender>}: stable for the same outbox row, unique across rows. */
    static String messageId(String key, String from) {
        return "<" + key + "@" + from.substring(from.lastIndexOf('@') + 1) + ">";
    }

    /** A refused login or a rejected address: trying again with the same settings gives the same answer. */
    private static boolean isFinal(Throwable e) {
        for (Throwable t = e; t != null; t = t.getCause() == t ? null : t.getCause()) {
            if (t instanceof AuthenticationFailedException || t instanceof SendFailedException) {
                return true;
            }
        }
        return false;
    }

    /** The exception chain in a line, with the password masked should a server echo it. */
    private String describe(Throwable e) {
        StringBuilder sb = new StringBuilder();
        for (Throwable t = e; t != null && sb.length() < 400; t = t.getCause() == t ? null : t.getCause()) {
            if (t instanceof java.util.concurrent.CompletionException && t.getCause() != null) {
                continue;
            }
            if (sb.length() > 0) {
                sb.append(" <- ");
            }
            sb.append(t.getClass().getSimpleName());
            if (t.getMessage() != null) {
                sb.append(": ").append(t.getMessage().strip().replaceAll("\\s+", " "));
            }
        }
        String out = sb.toString();
        return password == null || password.isEmpty() ? out : out.replace(password, "[secret]");
    }

    private static String variable(String env, String key, Function<String, String> environment) {
        String value = environment.apply(env);
        if (value == null || value.isEmpty()) {
            throw new IllegalArgumentException(key + ": environment variable " + env + " is not set or empty");
        }
        return value;
    }

    /** A socket factory trusting exactly the certificates of a PEM file (a private relay's authority). */
    public static SSLSocketFactory trusting(Path pem) {
        try (InputStream in = Files.newInputStream(pem)) {
            Collection<? extends Certificate> certs = CertificateFactory.getInstance("X.509")
                    .generateCertificates(in);
            if (certs.isEmpty()) {
                throw new IllegalArgumentException("caFile: " + pem + " holds no certificate");
            }
            KeyStore store = KeyStore.getInstance(KeyStore.getDefaultType());
            store.load(null, null);
            int i = 0;
            for (Certificate c : certs) {
                store.setCertificateEntry("ca-" + i++, c);
            }
            TrustManagerFactory tmf = TrustManagerFactory.getInstance(TrustManagerFactory.getDefaultAlgorithm());
            tmf.init(store);
            SSLContext ctx = SSLContext.getInstance("TLS");
            ctx.init(null, tmf.getTrustManagers(), null);
            return ctx.getSocketFactory();
        } catch (IOException | GeneralSecurityException e) {
            throw new IllegalArgumentException("caFile: cannot read certificates from " + pem + ": "
                    + e.getMessage(), e);
        }
    }

    @Override
    public void close() {
        try {
            mailer.close();
        } catch (Exception e) {
            LOG.debug("{}: closing: {}", name, e.toString());
        }
    }

    @Override
    public String toString() {
        return name;
    }
}
